package chart

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"lotlens/stats"
)

// Size of every chart's viewBox; the page scales it to its card.
const (
	Width  = 640.0
	Height = 300.0
)

// FormatOf takes the number format from the report: the data's decimals,
// decimal mark and unit.
func FormatOf(r *stats.Report) Format {
	return Format{Decimals: r.Counts.Decimals, DecimalComma: r.Input.DecimalComma, Unit: r.Input.Unit}
}

// All draws every chart the report has data for, keyed "histogram", "box",
// "probplot", "run", "control" (control.go) and "groups". A chart without
// data is left out.
func All(r *stats.Report) map[string]string {
	out := map[string]string{}
	if r == nil || r.Charts == nil {
		return out
	}
	for k, f := range map[string]func(*stats.Report) string{
		"histogram": Histogram, "box": Box, "probplot": ProbPlot, "run": Run, "control": Control, "groups": Groups, "spec": SpecFit, "spec-spread": SpecSpread,
	} {
		if s := f(r); s != "" {
			out[k] = s
		}
	}
	return out
}

func valueLabel(r *stats.Report) string {
	name := r.Input.Column
	if name == "" {
		name = "value"
	}
	if r.Input.Unit != "" {
		return name + " (" + r.Input.Unit + ")"
	}
	return name
}

// refLines are the target and specification limits, where given.
type refLine struct {
	v      float64
	label  string
	colour string
	dash   string
	class  string
}

// refLegend is the legend's entries for the reference lines drawn: the
// target's and the limits', each only when drawn.
func refLegend(refs []refLine) []legendItem {
	hasTarget, hasLimit := false, false
	for _, rl := range refs {
		hasTarget = hasTarget || rl.class == "target"
		hasLimit = hasLimit || rl.class != "target"
	}
	var items []legendItem
	if hasTarget {
		items = append(items, legendItem{"line", Black, "8 4", "target"})
	}
	if hasLimit {
		items = append(items, legendItem{"line", Vermilion, "10 4 2 4", "spec limits"})
	}
	return items
}

func refLines(r *stats.Report, f Format) []refLine {
	var out []refLine
	s := r.Settings
	if s.LSL != nil && finite(*s.LSL) {
		out = append(out, refLine{*s.LSL, "LSL " + f.Num(*s.LSL, f.Decimals), Vermilion, "10 4 2 4", "lsl"})
	}
	if s.Target != nil && finite(*s.Target) {
		out = append(out, refLine{*s.Target, "target " + f.Num(*s.Target, f.Decimals), Black, "8 4", "target"})
	}
	if s.USL != nil && finite(*s.USL) {
		out = append(out, refLine{*s.USL, "USL " + f.Num(*s.USL, f.Decimals), Vermilion, "10 4 2 4", "usl"})
	}
	return out
}

// span returns the smallest interval holding every finite value.
func span(vs ...float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	return
}

// padded is span widened by frac of its width on each side (pad); false
// when no value is finite.
func padded(frac float64, vs ...float64) (lo, hi float64, ok bool) {
	lo, hi = span(vs...)
	if !finite(lo, hi) {
		return 0, 0, false
	}
	lo, hi = pad(lo, hi, frac)
	return lo, hi, true
}

func pad(lo, hi, frac float64) (float64, float64) {
	d := (hi - lo) * frac
	if d == 0 {
		d = math.Max(math.Abs(lo)*0.01, 1e-9)
	}
	return lo - d, hi + d
}

// histFrame is what the histogram and the spec chart share: the report's
// bins, the reference lines (limits, target), the x range covering both
// (padded by 3 %), the number of values, the tallest bin and the bin width.
type histFrame struct {
	h       stats.Histogram
	refs    []refLine
	lo, hi  float64
	n, maxc int
	width   float64
}

// newHistFrame sets up the frame; false when the report has no usable bins.
func newHistFrame(r *stats.Report, f Format) (histFrame, bool) {
	h := r.Charts.Histogram
	if len(h.Counts) == 0 || len(h.Edges) != len(h.Counts)+1 || !finite(h.Edges...) {
		return histFrame{}, false
	}
	fr := histFrame{h: h, refs: refLines(r, f)}
	vals := []float64{h.Edges[0], h.Edges[len(h.Edges)-1]}
	for _, rl := range fr.refs {
		vals = append(vals, rl.v)
	}
	lo, hi := span(vals...)
	fr.lo, fr.hi = pad(lo, hi, 0.03)
	for _, k := range h.Counts {
		fr.n += k
		fr.maxc = max(fr.maxc, k)
	}
	fr.width = (h.Edges[len(h.Edges)-1] - h.Edges[0]) / float64(len(h.Counts))
	return fr, true
}

// Histogram draws the bins with the fitted normal curve (mean and SD of the
// report) and the target and specification limits as labelled lines.
func Histogram(r *stats.Report) string {
	if r == nil || r.Charts == nil {
		return ""
	}
	f := FormatOf(r)
	hf, ok := newHistFrame(r, f)
	if !ok {
		return ""
	}
	h, refs, lo, hi, n, width := hf.h, hf.refs, hf.lo, hf.hi, hf.n, hf.width
	// fitted normal curve, scaled to counts per bin
	var mean, sd float64
	fit := r.Centre != nil && r.Spread != nil && r.Spread.SD > 0 && finite(r.Centre.Mean, r.Spread.SD)
	peak := float64(hf.maxc)
	if fit {
		mean, sd = r.Centre.Mean, r.Spread.SD
		peak = math.Max(peak, float64(n)*width/(sd*math.Sqrt(2*math.Pi)))
	}
	yt, ydec := Ticks(0, peak, 5)
	ytop := math.Max(peak, yt[len(yt)-1])
	xs := scale{lo, hi, marginL, Width - marginR}
	// the labels of the target and limits sit above the bars: a second
	// lane (labels that would collide) lowers the top of the plot
	lanes, used := markerLanes(refs, xs, 15)
	ys := scale{0, ytop, Height - marginB, marginT + 16 + 13*float64(max(used-1, 0))}
	xt, xdec := Ticks(lo, hi, 7)
	xdec = max(xdec, 0)
	desc := fmt.Sprintf("%d values in %d bins (%s rule)", n, len(h.Counts), h.Rule)
	if fit {
		desc += fmt.Sprintf("; normal curve with mean %s and SD %s", f.Num(mean, f.Decimals+2), f.Num(sd, f.Decimals+2))
	}
	c := newCanvas(Width, Height, "histogram", "Histogram of "+valueLabel(r), desc)
	c.yAxis(ys, yt, ydec, f, "count", marginL, Width-marginR)
	c.bars(h, xs, ys, f, "")
	items := []legendItem{{"bar", SkyBlue, "", "count per bin"}}
	if fit {
		const steps = 160
		c.path(steps+1, func(i int) (float64, float64) {
			x := lo + (hi-lo)*float64(i)/steps
			z := (x - mean) / sd
			return xs.at(x), ys.at(float64(n) * width * math.Exp(-z*z/2) / (sd * math.Sqrt(2*math.Pi)))
		}, `class="normal-fit" stroke="`+Blue+`" stroke-width="2.5"`)
		items = append(items, legendItem{"line", Blue, "", "normal curve"})
	}
	for i, rl := range refs {
		x, lane := xs.at(rl.v), float64(lanes[i])
		c.vMarker(x, ys.at(0), marginT+26+13*lane, rl.colour, rl.dash, rl.label, rl.class, marginT+10+13*lane)
	}
	items = append(items, refLegend(refs)...)
	c.xAxis(xs, xt, xdec, f, valueLabel(r), Height-marginB)
	c.legend(items)
	return c.done()
}

// bars draws a histogram's bins as a group of bars, each titled with its
// range and count; style goes after the fill colour.
func (c *canvas) bars(h stats.Histogram, xs, ys scale, f Format, style string) {
	b := append(c.b, `<g class="bars">`...)
	for i, k := range h.Counts {
		x0, x1 := xs.at(h.Edges[i]), xs.at(h.Edges[i+1])
		y := ys.at(float64(k))
		b = append(b, `<rect x="`...)
		b = appendFixed1(b, x0)
		b = append(b, `" y="`...)
		b = appendFixed1(b, y)
		b = append(b, `" width="`...)
		b = appendFixed1(b, math.Max(x1-x0, 0.5))
		b = append(b, `" height="`...)
		b = appendFixed1(b, ys.at(0)-y)
		b = append(b, `" fill="`+SkyBlue+`"`...)
		b = append(b, style...)
		b = append(b, ` stroke="`+Black+`" stroke-width="1" class="bar" data-bin="`...)
		b = strconv.AppendInt(b, int64(i), 10)
		b = append(b, `" data-count="`...)
		b = strconv.AppendInt(b, int64(k), 10)
		b = append(b, `"><title>`...) // numbers and words: nothing to escape
		b = f.appendNum(b, h.Edges[i], f.Decimals+1)
		b = append(b, " to "...)
		b = f.appendNum(b, h.Edges[i+1], f.Decimals+1)
		b = append(b, ": "...)
		b = strconv.AppendInt(b, int64(k), 10)
		b = append(b, " values</title></rect>"...)
	}
	c.b = append(b, `</g>`...)
}

// suspectKind sorts a flagged reading by how far out it lies.
func suspectKind(v float64, b stats.Box) (shape, colour, class string) {
	switch {
	case v < b.OuterLo || v > b.OuterHi:
		return "triangle", Vermilion, "far"
	case v < b.InnerLo || v > b.InnerHi:
		return "open-circle", Orange, "near"
	default:
		return "diamond", Purple, "other"
	}
}

// Box draws a horizontal box plot: the box from Q1 to Q3 with the median,
// whiskers to the last values inside the inner fences, the inner (1.5 IQR)
// and outer (3 IQR) fences (Tukey 1977), and every flagged reading labelled
// by its row.
func Box(r *stats.Report) string {
	if r == nil || r.Charts == nil {
		return ""
	}
	b := r.Charts.Box
	if !finite(b.Q1, b.Median, b.Q3, b.LoWhisker, b.HiWhisker, b.InnerLo, b.InnerHi) || b.Q3 < b.Q1 {
		return ""
	}
	f := FormatOf(r)
	var sus []stats.Suspect
	if r.Suspects != nil {
		// a copy: the report is not reordered. The engine lists the most
		// extreme first; beyond MaxMarkers only those are drawn.
		sus = append(sus, r.Suspects.Readings[:min(len(r.Suspects.Readings), MaxMarkers)]...)
	}
	vals := []float64{b.LoWhisker, b.HiWhisker, b.InnerLo, b.InnerHi}
	far := false
	for _, s := range sus {
		vals = append(vals, s.Value)
		if s.Value < b.InnerLo || s.Value > b.InnerHi {
			far = true
		}
	}
	if far && finite(b.OuterLo, b.OuterHi) {
		vals = append(vals, b.OuterLo, b.OuterHi)
	}
	lo, hi := span(vals...)
	lo, hi = pad(lo, hi, 0.04)
	const h = 240.0
	xs := scale{lo, hi, marginL, Width - marginR}
	xt, xdec := Ticks(lo, hi, 7)
	mid := 130.0
	desc := fmt.Sprintf("Q1 %s, median %s, Q3 %s; inner fences %s and %s; %d flagged readings",
		f.Num(b.Q1, f.Decimals+1), f.Num(b.Median, f.Decimals+1), f.Num(b.Q3, f.Decimals+1),
		f.Num(b.InnerLo, f.Decimals+1), f.Num(b.InnerHi, f.Decimals+1), len(sus))
	c := newCanvas(Width, h, "box", "Box plot of "+valueLabel(r), desc)
	c.line(xs.at(b.InnerLo), 34, xs.at(b.InnerLo), h-marginB, Orange, 2, "6 4", "fence inner")
	c.line(xs.at(b.InnerHi), 34, xs.at(b.InnerHi), h-marginB, Orange, 2, "6 4", "fence inner")
	if far && finite(b.OuterLo, b.OuterHi) {
		c.line(xs.at(b.OuterLo), 34, xs.at(b.OuterLo), h-marginB, Vermilion, 2, "2 3", "fence outer")
		c.line(xs.at(b.OuterHi), 34, xs.at(b.OuterHi), h-marginB, Vermilion, 2, "2 3", "fence outer")
	}
	// whiskers
	c.line(xs.at(b.LoWhisker), mid, xs.at(b.Q1), mid, Black, 1.5, "", "whisker")
	c.line(xs.at(b.Q3), mid, xs.at(b.HiWhisker), mid, Black, 1.5, "", "whisker")
	c.line(xs.at(b.LoWhisker), mid-12, xs.at(b.LoWhisker), mid+12, Black, 1.5, "", "whisker-cap")
	c.line(xs.at(b.HiWhisker), mid-12, xs.at(b.HiWhisker), mid+12, Black, 1.5, "", "whisker-cap")
	c.printf(`<rect class="box" x="%.1f" y="%.1f" width="%.1f" height="44" fill="%s" fill-opacity="0.45" stroke="%s" stroke-width="1.5"><title>%s</title></rect>`,
		xs.at(b.Q1), mid-22, math.Max(xs.at(b.Q3)-xs.at(b.Q1), 1), SkyBlue, Black,
		esc("Q1 "+f.Num(b.Q1, f.Decimals+1)+" to Q3 "+f.Num(b.Q3, f.Decimals+1)))
	c.line(xs.at(b.Median), mid-22, xs.at(b.Median), mid+22, Black, 3.5, "", "median")
	// flagged readings, then their row labels laid out without collisions
	sort.SliceStable(sus, func(i, j int) bool { return sus[i].Value < sus[j].Value })
	at := make([]labelPoint, len(sus))
	for i, s := range sus {
		shape, colour, class := suspectKind(s.Value, b)
		x := xs.at(s.Value)
		// small vertical jitter by position in list keeps ties visible
		y := mid + float64((i%3)-1)*8
		c.marker(shape, x, y, 6, colour, s.Row, fmt.Sprintf("row %d: %s", s.Row, f.Value(s.Value)), "suspect "+class)
		at[i] = labelPoint{x: x, row: s.Row}
	}
	lanes := []float64{mid - 32, mid - 48, mid + 40, mid - 64, mid + 56, mid - 80}
	for _, l := range layoutRowLabels(at, lanes, 2, Width-2) {
		c.printf(`<text x="%.1f" y="%.1f" text-anchor="middle" font-size="%g" class="row-label" data-rows="%s"><title>%s</title>%s</text>`,
			l.cx, l.y, rowLabelFont, joinInts(l.rows, " "), esc(rowsTitle(l.rows)), esc(l.text))
	}
	c.xAxis(xs, xt, xdec, f, valueLabel(r), h-marginB)
	items := []legendItem{{"line", Orange, "6 4", "inner fence"}}
	if far {
		items = append(items, legendItem{"line", Vermilion, "2 3", "outer fence"})
	}
	kinds := map[string]bool{}
	for _, s := range sus {
		_, _, class := suspectKind(s.Value, b)
		kinds[class] = true
	}
	c.legend(markKey(items, kinds, []markEntry{
		{"near", legendItem{"open-circle", Orange, "", "beyond inner"}},
		{"far", legendItem{"triangle", Vermilion, "", "beyond outer"}},
		{"other", legendItem{"diamond", Purple, "", "other rules"}},
	}))
	return c.done()
}

// ProbPlot draws the normal probability plot: each ordered value against its
// normal quantile, the fitted line (intercept mean, slope SD) and the
// simultaneous envelope (charts.probPlot.band at bandLevel: a normal sample
// has every point inside it with that probability).
func ProbPlot(r *stats.Report) string {
	if r == nil || r.Charts == nil || len(r.Charts.ProbPlot.Points) == 0 {
		return ""
	}
	p := r.Charts.ProbPlot
	f := FormatOf(r)
	zs := make([]float64, 0, len(p.Points)+len(p.Band))
	ys := make([]float64, 0, len(p.Points)+2*len(p.Band))
	for _, pt := range p.Points {
		zs = append(zs, pt.Z)
		ys = append(ys, pt.Y)
	}
	for _, bp := range p.Band {
		zs = append(zs, bp.Z)
		ys = append(ys, bp.Lo, bp.Hi)
	}
	zlo, zhi, zok := padded(0.05, zs...)
	ylo, yhi, yok := padded(0.05, ys...)
	if !zok || !yok {
		return ""
	}
	xs := scale{zlo, zhi, marginL, Width - marginR}
	ysc := scale{ylo, yhi, Height - marginB, marginT + 12}
	xt, xdec := Ticks(zlo, zhi, 7)
	yt, ydec := Ticks(ylo, yhi, 6)
	c := newCanvas(Width, Height, "probplot", "Normal probability plot of "+valueLabel(r),
		probPlotDesc(p))
	c.grow(4096 + 16*len(p.Points) + 150*min(len(p.Points), MaxMarkers))
	c.yAxis(ysc, yt, ydec, f, valueLabel(r), marginL, Width-marginR)
	// the band as one lightly shaded envelope (upper edge out, lower edge
	// back), no outline: the line and the points stay in front of it
	if nb := len(p.Band); nb >= 2 {
		c.b = append(c.b, `<path class="envelope" fill="`+SkyBlue+`" fill-opacity="0.28" stroke="none" d="`...)
		for i := 0; i < 2*nb; i++ {
			var bp stats.BandPt
			var y float64
			if i < nb {
				bp = p.Band[i]
				y = bp.Hi
			} else {
				bp = p.Band[2*nb-1-i]
				y = bp.Lo
			}
			if i == 0 {
				c.b = append(c.b, 'M')
			} else {
				c.b = append(c.b, 'L')
			}
			c.b = appendF(c.b, xs.at(bp.Z))
			c.b = append(c.b, ' ')
			c.b = appendF(c.b, ysc.at(y))
		}
		c.b = append(c.b, `Z"/>`...)
	}
	a, s := p.Line[0], p.Line[1]
	if finite(a, s) {
		c.line(xs.at(zlo), ysc.at(a+s*zlo), xs.at(zhi), ysc.at(a+s*zhi), Black, 1.5, "", "fit")
	}
	rad := 4.0
	if len(p.Points) > 300 {
		rad = 2.5
	}
	keep := pickTails(len(p.Points), MaxMarkers)
	if keep != nil {
		// every point in a faint line, symbols for the selection
		c.path(len(p.Points), func(i int) (float64, float64) { return xs.at(p.Points[i].Z), ysc.at(p.Points[i].Y) },
			`class="all-points" stroke="`+Blue+`" stroke-width="1.5" stroke-opacity="0.5"`)
	}
	c.pointGroup(Blue)
	for i, pt := range p.Points {
		if keep != nil && !keep[i] {
			continue
		}
		c.markerStart("circle", xs.at(pt.Z), ysc.at(pt.Y), rad, "", pt.Row, "")
		c.b = append(c.b, "row "...)
		c.b = strconv.AppendInt(c.b, int64(pt.Row), 10)
		c.b = append(c.b, ": "...)
		c.b = f.appendValue(c.b, pt.Y)
		c.b = append(c.b, " (z = "...)
		c.b = f.appendNum(c.b, pt.Z, 2)
		c.b = append(c.b, ')')
		c.markerEnd("circle")
	}
	c.printf(`</g>`)
	c.xAxis(xs, xt, xdec, f, "normal quantile (z)", Height-marginB)
	// the key sits in the plot's lower right corner, which a straight
	// rising line leaves empty
	items := []legendItem{{"circle", Blue, "", "reading, in order"}, {"line", Black, "", "normal line (mean, SD)"}}
	if len(p.Band) >= 2 {
		items = append(items, legendItem{"band", SkyBlue, "", pctLabel(bandLevel(r)) + " envelope, all points"})
	}
	c.keyBox(items, xs.p1-6, ysc.p0-6)
	return c.done()
}

// bandLevel is the probability plot's simultaneous level: the report's
// bandLevel, else (a report without it) the confidence setting.
func bandLevel(r *stats.Report) float64 {
	if l := r.Charts.ProbPlot.BandLevel; l > 0 {
		return l
	}
	return r.Settings.Confidence
}

// probPlotDesc is the probability plot's description for screen readers.
func probPlotDesc(p stats.ProbPlot) string {
	d := fmt.Sprintf("%d points; plotting positions %s; straight line = normal", len(p.Points), p.Positions)
	if len(p.Band) >= 2 && p.BandLevel > 0 {
		d += fmt.Sprintf("; shaded: %s simultaneous envelope (%s): if any point leaves it, the normal model is doubtful at that level", pctLabel(p.BandLevel), p.BandMethod)
	}
	return d
}

// Run draws the values in data order joined by a thin line, with the median
// as a horizontal reference, the target and limits where given, and flagged
// readings marked.
func Run(r *stats.Report) string {
	const marginR = runMarginR // room for the line tags right of the plot
	if r == nil || r.Charts == nil || len(r.Charts.Series) == 0 {
		return ""
	}
	pts := r.Charts.Series
	f := FormatOf(r)
	med, hasMed := 0.0, false
	if r.Centre != nil && finite(r.Centre.Median) {
		med, hasMed = r.Centre.Median, true
	}
	refs := refLines(r, f)
	vals := make([]float64, 0, len(pts)+4)
	ilo, ihi := math.Inf(1), math.Inf(-1)
	for _, p := range pts {
		vals = append(vals, p.Y)
		ilo, ihi = math.Min(ilo, float64(p.I)), math.Max(ihi, float64(p.I))
	}
	for _, rl := range refs {
		vals = append(vals, rl.v)
	}
	ylo, yhi, ok := padded(0.06, vals...)
	if !ok {
		return ""
	}
	ilo, ihi = pad(ilo, ihi, 0.02)
	xs := scale{ilo, ihi, marginL, Width - marginR}
	ys := scale{ylo, yhi, Height - marginB, marginT + 12}
	yt, ydec := Ticks(ylo, yhi, 6)
	desc := fmt.Sprintf("%d values in data order", len(pts))
	if r.Charts.Thinned {
		desc += " (thinned for drawing)"
	}
	if hasMed {
		desc += "; median " + f.Num(med, f.Decimals+1)
	}
	c := newCanvas(Width, Height, "run", "Run chart of "+valueLabel(r), desc)
	c.yAxis(ys, yt, ydec, f, valueLabel(r), marginL, Width-marginR)
	// reference lines across the plot; their names go right of the plot
	// (never over a reading), moved apart where lines lie close, and their
	// values in the legend
	var tags []tag
	for _, rl := range refs {
		y := ys.at(rl.v)
		c.line(marginL, y, Width-marginR, y, rl.colour, 1.5, rl.dash, "marker "+rl.class)
		name := strings.ToUpper(rl.class)
		if rl.class == "target" {
			name = "target"
		}
		tags = append(tags, tag{y: y, text: name, class: rl.class})
	}
	if hasMed {
		y := ys.at(med)
		c.line(marginL, y, Width-marginR, y, Green, 2, "12 5", "median")
		tags = append(tags, tag{y: y, text: "median", class: "median"})
	}
	for _, t := range spreadTags(tags, marginT, Height-marginB, 14) {
		c.text(Width-marginR+6, t.y+4, "start", "marker-label "+t.class, t.text)
	}
	c.path(len(pts), func(i int) (float64, float64) { return xs.at(float64(pts[i].I)), ys.at(pts[i].Y) },
		`class="trace" stroke="#888888" stroke-width="1"`)
	flagged := map[int]bool{}
	if r.Suspects != nil {
		for _, s := range r.Suspects.Readings {
			flagged[s.Row] = true
		}
	}
	rad := 3.5
	if len(pts) > 300 {
		rad = 2
	}
	c.grow(2048 + 16*len(pts) + 120*min(len(pts), MaxMarkers+len(flagged)))
	keep := pickExtremes(pts, MaxMarkers)
	c.pointGroup(Blue)
	for i, p := range pts {
		if keep != nil && !keep[i] && !flagged[p.Row] {
			continue
		}
		shape := "circle"
		if flagged[p.Row] {
			shape = "triangle"
			c.markerStart(shape, xs.at(float64(p.I)), ys.at(p.Y), 6, Vermilion, p.Row, "suspect")
		} else {
			c.markerStart(shape, xs.at(float64(p.I)), ys.at(p.Y), rad, "", p.Row, "")
		}
		c.b = append(c.b, "row "...)
		c.b = strconv.AppendInt(c.b, int64(p.Row), 10)
		c.b = append(c.b, ": "...)
		c.b = f.appendValue(c.b, p.Y)
		if flagged[p.Row] {
			c.b = append(c.b, ", flagged"...)
		}
		c.markerEnd(shape)
	}
	c.printf(`</g>`)
	// the x axis is labelled with the rows (as everywhere else on the page)
	c.line(xs.p0, Height-marginB, xs.p1, Height-marginB, Black, 1, "", "axis x")
	for _, t := range rowTicks(pts, 7) {
		x := xs.at(t.pos)
		c.line(x, Height-marginB, x, Height-marginB+5, Black, 1, "", "tick x")
		c.text(x, Height-marginB+19, "middle", "tick-label x", strconv.Itoa(t.row))
	}
	axis := "row (data order)"
	if r.Input.Order != "" {
		axis = "row, in the order of " + r.Input.Order
	}
	c.text((xs.p0+xs.p1)/2, Height-8, "middle", "axis-label x", axis)
	items := []legendItem{{"circle", Blue, "", "reading"}}
	if hasMed {
		items = append(items, legendItem{"line", Green, "12 5", "median " + f.Num(med, f.Decimals+1)})
	}
	for _, rl := range refs {
		items = append(items, legendItem{"line", rl.colour, rl.dash, rl.label})
	}
	if len(flagged) > 0 {
		items = append(items, legendItem{"triangle", Vermilion, "", "flagged"})
	}
	c.legend(items)
	return c.done()
}

// pickTails selects at most limit of n ordered points for symbols: the
// lowest and highest quarter of the limit each, and evenly spaced points
// between. It returns nil when every point gets a symbol.
func pickTails(n, limit int) []bool {
	if n <= limit {
		return nil
	}
	keep := make([]bool, n)
	tail := limit / 4
	for i := 0; i < tail; i++ {
		keep[i], keep[n-1-i] = true, true
	}
	mid := limit - 2*tail
	for k := 0; k < mid; k++ {
		keep[tail+(k*(n-2*tail))/mid] = true
	}
	return keep
}

// pickExtremes selects at most limit points of a series for symbols: the
// lowest and highest of each of limit/2 runs in data order, so that no peak
// or dip loses its symbol. It returns nil when every point gets one.
func pickExtremes(pts []stats.SeriesPt, limit int) []bool {
	n := len(pts)
	if n <= limit {
		return nil
	}
	keep := make([]bool, n)
	buckets := limit / 2
	for k := 0; k < buckets; k++ {
		a, b := k*n/buckets, (k+1)*n/buckets
		lo, hi := a, a
		for i := a; i < b; i++ {
			if pts[i].Y < pts[lo].Y {
				lo = i
			}
			if pts[i].Y > pts[hi].Y {
				hi = i
			}
		}
		keep[lo], keep[hi] = true, true
	}
	return keep
}
