package chart

import (
	"fmt"
	"math"
	"strings"

	"lotlens/stats"
)

// Styles of the spec section's models: colour, dash pattern and label, so
// that no model is told from another by colour alone.
type specStyle struct {
	colour, dash, label string
}

func specModelStyle(model string) specStyle {
	switch model {
	case "normal-within":
		return specStyle{Blue, "", "normal, within σ"}
	case "normal-overall":
		return specStyle{Orange, "8 4", "normal, overall SD"}
	}
	return specStyle{Green, "2 4", familyName(model) + " fit"}
}

// familyName writes a fitted family for a label.
func familyName(f string) string {
	switch f {
	case "lognormal-3", "weibull-3", "gamma-3":
		name := strings.TrimSuffix(f, "-3")
		if name == "weibull" {
			name = "Weibull"
		}
		return name + " (3 par.)"
	case "weibull":
		return "Weibull"
	case "box-cox":
		return "Box-Cox normal"
	case "empirical":
		return "readings' own"
	}
	return f
}

// SpecFit draws the spec section's histogram: the bins of the readings,
// the densities of the models the section fitted (spec.curves: the normal
// with the within-process sigma, the normal with the overall SD and the
// chosen non-normal fit) scaled to readings per bin, and LSL, USL and the
// target as labelled lines. Empty without a spec section.
func SpecFit(r *stats.Report) string {
	if r == nil || r.Charts == nil || r.Spec == nil {
		return ""
	}
	const height = 330.0
	const top = 48.0 // two legend lines above the plot
	f := FormatOf(r)
	hf, ok := newHistFrame(r, f)
	if !ok {
		return ""
	}
	h, refs, lo, hi, n, maxc, width := hf.h, hf.refs, hf.lo, hf.hi, hf.n, hf.maxc, hf.width
	var curves []stats.SpecCurve
	for _, cv := range r.Spec.Curves {
		if len(cv.X) >= 2 && len(cv.X) == len(cv.Density) && finite(cv.X...) && finite(cv.Density...) {
			curves = append(curves, cv)
		}
	}
	peak := float64(maxc)
	for _, cv := range curves {
		m := 0.0
		for i, d := range cv.Density {
			if cv.X[i] >= lo && cv.X[i] <= hi {
				m = math.Max(m, d)
			}
		}
		m *= float64(n) * width
		if cv.Model != "normal-within" && cv.Model != "normal-overall" {
			// a fitted density may rise steeply at its threshold: it may
			// lift the axis to twice the tallest bar, no more (clipped)
			m = math.Min(m, 2*float64(maxc))
		}
		peak = math.Max(peak, m)
	}
	yt, ydec := Ticks(0, peak, 5)
	ytop := math.Max(peak, yt[len(yt)-1])
	xs := scale{lo, hi, marginL, Width - marginR}
	ys := scale{0, ytop, height - marginB, top + 40}
	xt, xdec := Ticks(lo, hi, 7)
	xdec = max(xdec, 0)
	desc := fmt.Sprintf("%d values in %d bins", n, len(h.Counts))
	for _, cv := range curves {
		desc += "; " + specModelStyle(cv.Model).label
	}
	for _, rl := range refs {
		desc += "; " + rl.label
	}
	c := newCanvas(Width, height, "spec", "Readings against the limits, "+valueLabel(r), desc)
	c.yAxis(ys, yt, ydec, f, "count", marginL, Width-marginR)
	c.bars(h, xs, ys, f, ` fill-opacity="0.6"`)
	items := []legendItem{{"bar", SkyBlue, "", "per bin"}}
	yTop := ys.at(ytop)
	for _, cv := range curves {
		st := specModelStyle(cv.Model)
		// the points inside the x range, clipped at the top of the plot
		var idx []int
		for i, x := range cv.X {
			if x >= lo && x <= hi {
				idx = append(idx, i)
			}
		}
		if len(idx) < 2 {
			continue
		}
		attrs := `class="curve" data-model="` + esc(cv.Model) + `" stroke="` + st.colour + `" stroke-width="2.5"`
		if st.dash != "" {
			attrs += ` stroke-dasharray="` + st.dash + `"`
		}
		c.path(len(idx), func(i int) (float64, float64) {
			j := idx[i]
			return xs.at(cv.X[j]), math.Max(ys.at(float64(n)*width*cv.Density[j]), yTop)
		}, attrs)
		items = append(items, legendItem{"line", st.colour, st.dash, st.label})
	}
	lanes, _ := markerLanes(refs, xs, 15)
	for i, rl := range refs {
		c.vMarker(xs.at(rl.v), ys.at(0), top+20, rl.colour, rl.dash, rl.label, rl.class, top+14+15*float64(lanes[i]))
	}
	items = append(items, refLegend(refs)...)
	c.xAxis(xs, xt, xdec, f, valueLabel(r), height-marginB)
	c.legend(items)
	return c.done()
}

// specSpan is one row of the spread picture.
type specSpan struct {
	class, label string
	lo, hi       float64
	kind         string // "band", "bar", "range"
	colour, dash string
}

// SpecSpread draws the spread of the process against the tolerance: one
// row each for the tolerance band (LSL to USL; open towards a missing
// limit), the within-process and overall ±3σ spans about the mean, the
// 0.135 to 99.865 % span of the chosen non-normal model (or of the
// readings' own percentiles), and the smallest to the largest reading;
// LSL, USL and the target cross every row. Each row is named beside it
// with its ends and whether it stays inside the limits, so nothing rests
// on colour. Empty without a spec section.
func SpecSpread(r *stats.Report) string {
	if r == nil || r.Spec == nil || r.Centre == nil {
		return ""
	}
	sp := r.Spec
	f := FormatOf(r)
	s := r.Settings
	lsl, usl := math.NaN(), math.NaN()
	if s.LSL != nil && finite(*s.LSL) {
		lsl = *s.LSL
	}
	if s.USL != nil && finite(*s.USL) {
		usl = *s.USL
	}
	if math.IsNaN(lsl) && math.IsNaN(usl) {
		return ""
	}
	mean := r.Centre.Mean
	var rows []specSpan
	if w := sp.Sigma.Within; w != nil && w.Value > 0 && finite(mean, w.Value) {
		rows = append(rows, specSpan{"within", "within ±3σ", mean - 3*w.Value, mean + 3*w.Value, "bar", Blue, ""})
	}
	if o := sp.Sigma.Overall.Value; o > 0 && finite(mean, o) {
		rows = append(rows, specSpan{"overall", "overall ±3σ", mean - 3*o, mean + 3*o, "bar", Orange, "6 3"})
	}
	if m := sp.Model; m != nil && m.Chosen != "normal" && len(m.Percentiles) == 3 && finite(m.Percentiles[0].Value, m.Percentiles[2].Value) &&
		(m.Chosen != "empirical" || (m.Percentiles[0].CI != nil && m.Percentiles[2].CI != nil)) {
		rows = append(rows, specSpan{"fitted", familyName(m.Chosen) + " 99.73 %", m.Percentiles[0].Value, m.Percentiles[2].Value, "bar", Green, "2 3"})
	}
	if q := r.Quantile; q != nil && finite(q.Min, q.Max) {
		rows = append(rows, specSpan{"readings", "readings min–max", q.Min, q.Max, "range", Black, ""})
	}
	vals := []float64{lsl, usl}
	for _, rw := range rows {
		vals = append(vals, rw.lo, rw.hi)
	}
	if s.Target != nil {
		vals = append(vals, *s.Target)
	}
	lo, hi, ok := padded(0.05, vals...)
	if !ok {
		return ""
	}
	// the tolerance band: open ends reach the edge of the plot
	tlo, thi := lsl, usl
	if math.IsNaN(tlo) {
		tlo = lo
	}
	if math.IsNaN(thi) {
		thi = hi
	}
	rows = append([]specSpan{{"tolerance", "tolerance", tlo, thi, "band", Black, ""}}, rows...)

	const labelW, rowH, top = 232.0, 36.0, 44.0
	height := top + rowH*float64(len(rows)) + marginB
	xs := scale{lo, hi, labelW, Width - marginR}
	xt, xdec := Ticks(lo, hi, 6)
	xdec = max(xdec, 0)
	d := f.Decimals
	inside := func(a, b float64) string {
		switch {
		case !math.IsNaN(lsl) && a < lsl && !math.IsNaN(usl) && b > usl:
			return "beyond both limits"
		case !math.IsNaN(lsl) && a < lsl:
			return "beyond LSL"
		case !math.IsNaN(usl) && b > usl:
			return "beyond USL"
		}
		return "inside"
	}
	ends := make([]string, len(rows))
	for i, rw := range rows {
		e := f.Num(rw.lo, d) + " to " + f.Num(rw.hi, d)
		switch {
		case rw.class == "tolerance" && math.IsNaN(lsl):
			e = "up to USL " + f.Num(usl, f.Decimals)
		case rw.class == "tolerance" && math.IsNaN(usl):
			e = "from LSL " + f.Num(lsl, f.Decimals)
		case rw.class == "tolerance":
			e = f.Num(lsl, f.Decimals) + " to " + f.Num(usl, f.Decimals)
		default:
			e += ", " + inside(rw.lo, rw.hi)
		}
		ends[i] = e
	}
	desc := make([]string, len(rows))
	for i, rw := range rows {
		desc[i] = rw.label + ": " + ends[i]
	}
	c := newCanvas(Width, height, "spec-spread", "Spread of the process against the tolerance, "+valueLabel(r), strings.Join(desc, "; "))
	plotBottom := top + rowH*float64(len(rows))
	for i, rw := range rows {
		yc := top + rowH*float64(i) + rowH/2
		c.printf(`<g class="span %s">`, rw.class)
		c.printf(`<text x="%.1f" y="%.1f" text-anchor="end" font-size="14" class="span-label">%s</text>`, labelW-8, yc-3, esc(rw.label))
		c.printf(`<text x="%.1f" y="%.1f" text-anchor="end" font-size="12" class="span-ends">%s</text>`, labelW-8, yc+12, esc(ends[i]))
		x0, x1 := xs.at(rw.lo), xs.at(rw.hi)
		switch rw.kind {
		case "band":
			c.printf(`<rect x="%.1f" y="%.1f" width="%.1f" height="22" fill="#e8e8e8" stroke="%s" stroke-width="1" class="span-bar"><title>%s</title></rect>`,
				x0, yc-11, math.Max(x1-x0, 1), Black, esc(desc[i]))
		case "bar":
			dash := ""
			if rw.dash != "" {
				dash = ` stroke-dasharray="` + rw.dash + `"`
			}
			c.printf(`<rect x="%.1f" y="%.1f" width="%.1f" height="14" fill="%s" fill-opacity="0.55" stroke="%s" stroke-width="2"%s class="span-bar"><title>%s</title></rect>`,
				x0, yc-7, math.Max(x1-x0, 1), rw.colour, Black, dash, esc(desc[i]))
		default: // a line with end caps
			c.printf(`<g class="span-bar"><title>%s</title>`, esc(desc[i]))
			c.line(x0, yc, x1, yc, Black, 2, "", "range")
			c.line(x0, yc-8, x0, yc+8, Black, 2, "", "range-cap")
			c.line(x1, yc-8, x1, yc+8, Black, 2, "", "range-cap")
			c.printf(`</g>`)
		}
		c.printf(`</g>`)
	}
	refs := refLines(r, f)
	lanes, _ := markerLanes(refs, xs, 15)
	for i, rl := range refs {
		c.vMarker(xs.at(rl.v), plotBottom, top-6, rl.colour, rl.dash, rl.label, rl.class, 16+15*float64(lanes[i]))
	}
	c.xAxis(xs, xt, xdec, f, valueLabel(r), plotBottom)
	return c.done()
}
