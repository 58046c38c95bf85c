package chart

import (
	"fmt"
	"math"
	"strconv"
	"time"

	"lotlens/stats"
)

// Control draws the control chart of the report's "Over time" section: the
// values (or subgroup means) with the centre line, the control limits and
// lightly shaded zones at 1 and 2 sigma, and below them the spread chart
// (moving range, range or SD) with its limits. Points that make a signal
// are drawn with their own shape and labelled by row (or subgroup):
// a triangle for a point beyond a limit, a diamond for a run or pattern,
// a square for an EWMA or CUSUM alarm alone; readings the user left out
// are open circles. Points outside the baseline sit right of a dashed
// line. Long charts come thinned from the engine (every signal kept).
func Control(r *stats.Report) string {
	if r == nil || r.Stability == nil || r.Stability.Chart == nil || len(r.Stability.Chart.Points) == 0 || len(r.Stability.Chart.Limits) == 0 {
		return ""
	}
	ch := r.Stability.Chart
	f := FormatOf(r)
	pts := ch.Points
	const h = 430.0
	top0, top1 := marginT+22, 262.0 // values panel (pixels, top to bottom)
	bot0, bot1 := 292.0, h-marginB  // spread panel
	// ranges
	ys := make([]float64, 0, len(pts)+2*len(ch.Limits))
	ss := make([]float64, 0, len(pts)+2*len(ch.Limits))
	for i := range pts {
		ys = append(ys, pts[i].Y)
		if s := pts[i].S; s != nil {
			ss = append(ss, *s)
		}
	}
	for _, l := range ch.Limits {
		ys = append(ys, l.Lower, l.Upper)
		ss = append(ss, l.SpreadUpper, l.SpreadLower)
	}
	ylo, yhi, ok := padded(0.05, ys...)
	if !ok {
		return ""
	}
	slo, shi := span(ss...)
	hasSpread := finite(slo, shi) && len(ss) > 0
	if hasSpread {
		slo, shi = 0, shi*1.08
		if shi == 0 {
			shi = 1
		}
	}
	// the names and values of the limits and the centre go right of the
	// plot (never over a point, as on the run chart): room for the longest
	l0 := ch.Limits[len(ch.Limits)-1]
	lineTags := []struct {
		v           float64
		name, class string
	}{{l0.Upper, "UCL", "limit"}, {ch.Centre, "centre", "centre"}, {l0.Lower, "LCL", "limit"}}
	marginR := runMarginR
	for _, lt := range lineTags {
		marginR = math.Max(marginR, 9*float64(len(f.Num(lt.v, f.Decimals+1)))+10)
	}
	x0, x1 := 0.5, float64(ch.Count)+0.5
	xs := scale{x0, x1, marginL, Width - marginR}
	yv := scale{ylo, yhi, top1, top0}
	ysp := scale{slo, shi, bot1, bot0}
	what := map[string]string{"individuals": "Individuals and moving range chart", "mean-range": "Mean and range chart", "mean-sd": "Mean and standard deviation chart"}[ch.Kind]
	nsig := len(r.Stability.Signals)
	desc := fmt.Sprintf("%d points; centre %s, limits %s to %s; %d signals listed", ch.Count, f.Num(ch.Centre, f.Decimals+2),
		f.Num(ch.Limits[0].Lower, f.Decimals+2), f.Num(ch.Limits[0].Upper, f.Decimals+2), nsig)
	if ch.Thinned {
		desc += " (thinned for drawing; every signal kept)"
	}
	c := newCanvas(Width, h, "control", what+" of "+valueLabel(r), desc)
	marks := min(len(pts), MaxMarkers) // symbols: a selection, and every signal
	for i := range pts {
		if len(pts[i].Flags) > 0 || pts[i].LeftOut {
			marks++
		}
	}
	c.grow(4096 + 50*len(pts) + 240*marks)
	yt, ydec := Ticks(ylo, yhi, 6)
	c.yAxis(yv, yt, ydec, f, valueLabel(r), marginL, Width-marginR)
	// zones: lightly shaded bands between 1 and 2 sigma and 2 and 3 sigma
	c.printf(`<g class="zones">`)
	for _, l := range ch.Limits {
		xa, xb := xs.at(float64(l.From)-0.5), xs.at(float64(l.To)+0.5)
		sg := (l.Upper - ch.Centre) / ch.Width
		for _, z := range []struct {
			a, b    float64
			opacity string
		}{{2, 3, "0.16"}, {1, 2, "0.08"}} {
			for _, sgn := range []float64{1, -1} {
				ya, yb := yv.at(ch.Centre+sgn*z.a*sg), yv.at(ch.Centre+sgn*z.b*sg)
				c.printf(`<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s" fill-opacity="%s" class="zone"/>`,
					xa, math.Min(ya, yb), math.Max(xb-xa, 0.5), math.Abs(ya-yb), Orange, z.opacity)
			}
		}
	}
	c.printf(`</g>`)
	// limits and centre
	for _, l := range ch.Limits {
		xa, xb := xs.at(float64(l.From)-0.5), xs.at(float64(l.To)+0.5)
		c.line(xa, yv.at(l.Upper), xb, yv.at(l.Upper), Vermilion, 2, "8 4", "limit upper")
		c.line(xa, yv.at(l.Lower), xb, yv.at(l.Lower), Vermilion, 2, "8 4", "limit lower")
	}
	c.line(xs.p0, yv.at(ch.Centre), xs.p1, yv.at(ch.Centre), Green, 2, "", "centre")
	// each tag is two lines, the name over the value, kept 30 apart
	var tags []tag
	values := map[string]string{}
	for _, lt := range lineTags {
		tags = append(tags, tag{y: yv.at(lt.v), text: lt.name, class: lt.class})
		values[lt.name] = f.Num(lt.v, f.Decimals+1)
	}
	for _, t := range spreadTags(tags, top0, top1, 30) {
		c.text(Width-marginR+6, t.y-2, "start", "marker-label "+t.class, t.text)
		c.text(Width-marginR+6, t.y+13, "start", "marker-label "+t.class, values[t.text])
	}
	// baseline: a dashed line where the readings that set the limits end
	if b := r.Stability.Baseline; b != nil {
		for _, x := range []float64{float64(b.First) - 0.5, float64(b.Last) + 0.5} {
			if x > x0 && x < x1 {
				c.line(xs.at(x), top0, xs.at(x), bot1, Black, 1, "3 3", "baseline-edge")
			}
		}
		if float64(b.Last)+0.5 < x1 {
			c.text(xs.at(float64(b.Last)+0.5)-4, top1+18, "end", "baseline-label", "← limits set here")
		}
	}
	// the trace and points
	c.path(len(pts), func(i int) (float64, float64) { return xs.at(float64(pts[i].I)), yv.at(pts[i].Y) },
		`class="trace" stroke="#888888" stroke-width="1"`)
	rad := 3.5
	if len(pts) > 300 {
		rad = 2
	}
	labelled := 0
	var lastLabelX float64 = -1e9
	c.pointGroup(Blue)
	for i := range pts {
		p := &pts[i]
		shape, colour, class := controlMark(p)
		if shape == "circle" && len(pts) > MaxMarkers && i%(len(pts)/MaxMarkers+1) != 0 {
			continue
		}
		x, y := xs.at(float64(p.I)), yv.at(p.Y)
		if shape == "circle" {
			c.markerStart("circle", x, y, rad, "", p.Row, "")
		} else {
			c.markerStart(shape, x, y, 5.5, colour, p.Row, class)
		}
		c.b = appendPointTitle(c.b, r, p, f)
		c.markerEnd(shape)
		if shape == "circle" {
			continue
		}
		if class != "left-out" && labelled < 40 && x-lastLabelX > 30 {
			c.text(x, math.Max(y-10, top0+10), "middle", "row-label", pointName(p))
			labelled++
			lastLabelX = x
		}
	}
	c.printf(`</g>`)
	// spread panel
	if hasSpread {
		st, sdec := Ticks(slo, shi, 4)
		c.line(marginL, bot0, marginL, bot1, Black, 1, "", "axis y spread")
		for _, t := range st {
			y := ysp.at(t)
			c.line(marginL+1, y, Width-marginR, y, "#dddddd", 1, "", "grid y")
			c.line(marginL-5, y, marginL, y, Black, 1, "", "tick y")
			c.text(marginL-8, y+4, "end", "tick-label y", f.Num(t, sdec))
		}
		for _, l := range ch.Limits {
			xa, xb := xs.at(float64(l.From)-0.5), xs.at(float64(l.To)+0.5)
			c.line(xa, ysp.at(l.SpreadUpper), xb, ysp.at(l.SpreadUpper), Vermilion, 2, "8 4", "limit spread-upper")
			if l.SpreadLower > 0 {
				c.line(xa, ysp.at(l.SpreadLower), xb, ysp.at(l.SpreadLower), Vermilion, 2, "8 4", "limit spread-lower")
			}
			c.line(xa, ysp.at(l.SpreadCentre), xb, ysp.at(l.SpreadCentre), Green, 1.5, "", "centre spread")
		}
		sp := make([]*stats.CtlPoint, 0, len(pts)) // the points with a spread
		for i := range pts {
			if pts[i].S != nil {
				sp = append(sp, &pts[i])
			}
		}
		if len(sp) > 1 {
			c.path(len(sp), func(i int) (float64, float64) { return xs.at(float64(sp[i].I)), ysp.at(*sp[i].S) },
				`class="trace spread" stroke="#888888" stroke-width="1"`)
		}
		for _, p := range sp {
			if l := limitsAt(ch.Limits, p.I); l != nil && (*p.S > l.SpreadUpper || *p.S < l.SpreadLower) {
				c.marker("triangle", xs.at(float64(p.I)), ysp.at(*p.S), 5.5, Vermilion, p.Row,
					pointName(p)+": spread "+f.Num(*p.S, f.Decimals+1)+" beyond its limit", "signal spread")
			}
		}
		c.printf(`<text x="14" y="%.1f" text-anchor="middle" transform="rotate(-90 14 %.1f)" class="axis-label y">%s</text>`,
			(bot0+bot1)/2, (bot0+bot1)/2, esc(map[string]string{"moving-range": "moving range", "range": "range", "sd": "SD"}[ch.Spread]))
	}
	// x axis: positions, or times
	c.line(xs.p0, bot1, xs.p1, bot1, Black, 1, "", "axis x")
	label := "reading in time order"
	if ch.Kind != "individuals" {
		label = "subgroup in time order"
	}
	if ch.TimeAxis {
		label = "time (" + r.Input.Order + ")"
		k := max(1, len(pts)/6)
		lastX := -1e9
		oneDay := false
		if a, b := pts[0].T, pts[len(pts)-1].T; a != nil && b != nil {
			oneDay = math.Floor(*a/86400) == math.Floor(*b/86400) || *b < 86400*2
		}
		for i := 0; i < len(pts); i += k {
			p := pts[i]
			if p.T == nil {
				continue
			}
			x := xs.at(float64(p.I))
			if x-lastX < 110 {
				continue
			}
			lastX = x
			c.line(x, bot1, x, bot1+5, Black, 1, "", "tick x")
			lb := timeLabel(*p.T)
			if oneDay {
				lb = lb[max(0, len(lb)-5):]
			}
			c.text(x, bot1+19, "middle", "tick-label x", lb)
		}
	} else {
		xt, _ := Ticks(1, float64(ch.Count), 7)
		for _, t := range xt {
			if t != math.Trunc(t) || t < 1 {
				continue
			}
			x := xs.at(t)
			c.line(x, bot1, x, bot1+5, Black, 1, "", "tick x")
			c.text(x, bot1+19, "middle", "tick-label x", f.Num(t, 0))
		}
	}
	c.text((xs.p0+xs.p1)/2, h-8, "middle", "axis-label x", label)
	items := []legendItem{{"circle", Blue, "", "point"}, {"line", Green, "", "centre"}, {"line", Vermilion, "8 4", "limits"}}
	kinds := map[string]bool{}
	for i := range pts {
		_, _, class := controlMark(&pts[i])
		kinds[class] = true
	}
	c.legend(markKey(items, kinds, []markEntry{
		{"signal beyond", legendItem{"triangle", Vermilion, "", "beyond a limit"}},
		{"signal pattern", legendItem{"diamond", Orange, "", "run or pattern"}},
		{"signal drift", legendItem{"square", Purple, "", "EWMA/CUSUM"}},
		{"left-out", legendItem{"open-circle", Black, "", "left out"}},
	}))
	return c.done()
}

// limitsAt returns the limits of position i.
func limitsAt(ls []stats.CtlLimits, i int) *stats.CtlLimits {
	for k := range ls {
		if ls[k].From <= i && i <= ls[k].To {
			return &ls[k]
		}
	}
	return nil
}

// controlMark chooses a point's symbol: colour is never the only cue.
func controlMark(p *stats.CtlPoint) (shape, colour, class string) {
	switch {
	case p.LeftOut && len(p.Flags) == 0:
		return "open-circle", Black, "left-out"
	case hasFlag(p, "beyond-limits"):
		return "triangle", Vermilion, "signal beyond"
	}
	for _, fl := range p.Flags {
		if fl != stats.SignalEWMA && fl != stats.SignalCUSUM && fl != stats.SignalSpreadBeyond {
			return "diamond", Orange, "signal pattern"
		}
	}
	if hasFlag(p, stats.SignalEWMA) || hasFlag(p, stats.SignalCUSUM) {
		return "square", Purple, "signal drift"
	}
	if p.LeftOut {
		return "open-circle", Black, "left-out"
	}
	return "circle", Blue, ""
}

func hasFlag(p *stats.CtlPoint, code string) bool {
	for _, f := range p.Flags {
		if f == code {
			return true
		}
	}
	return false
}

func pointName(p *stats.CtlPoint) string {
	if p.Label != "" {
		return p.Label
	}
	return "row " + strconv.Itoa(p.Row)
}

// appendPointTitle appends a point's title, escaped for XML: its name, its
// value, its position, its time and its signals.
func appendPointTitle(b []byte, r *stats.Report, p *stats.CtlPoint, f Format) []byte {
	if p.Label != "" {
		b = appendEsc(b, p.Label)
		b = append(b, " ("...)
		b = strconv.AppendInt(b, int64(p.N), 10)
		b = append(b, " readings, mean "...)
		b = f.appendNum(b, p.Y, f.Decimals+1)
		b = append(b, ')')
	} else {
		b = append(b, "row "...)
		b = strconv.AppendInt(b, int64(p.Row), 10)
		b = append(b, ": "...)
		b = f.appendValue(b, p.Y)
	}
	b = append(b, ", position "...)
	b = strconv.AppendInt(b, int64(p.I), 10)
	if p.T != nil && r.Stability.Chart.TimeAxis {
		b = append(b, ", "...)
		b = appendEsc(b, timeLabel(*p.T))
	}
	if p.LeftOut {
		b = append(b, "; left out by you"...)
	}
	for _, fl := range p.Flags {
		b = append(b, "; signal "...)
		b = appendEsc(b, fl)
	}
	return b
}

// timeLabel writes a time of the reader (seconds since 1970-01-01 UTC, or
// since midnight for a time of day).
func timeLabel(t float64) string {
	if t >= 0 && t < 86400*2 {
		d := time.Duration(t * float64(time.Second))
		return fmt.Sprintf("%02d:%02d", int(d.Hours()), int(d.Minutes())%60)
	}
	tm := time.Unix(int64(math.Floor(t)), 0).UTC()
	if tm.Hour() == 0 && tm.Minute() == 0 && tm.Second() == 0 {
		return tm.Format("2006-01-02")
	}
	return tm.Format("01-02 15:04")
}
