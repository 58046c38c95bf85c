package chart

import (
	"fmt"
	"math"

	"lotlens/stats"
)

// maxRowLabels bounds the row labels drawn per group.
const maxRowLabels = 12

// groupStyle gives each group a colour and a marker shape, so that no group
// is told from another by colour alone (each row is also labelled).
var groupStyle = []struct{ colour, shape string }{
	{Blue, "circle"}, {Orange, "square"}, {Green, "triangle"}, {Purple, "diamond"},
	{SkyBlue, "square"}, {Vermilion, "circle"}, {Yellow, "diamond"}, {Black, "triangle"},
}

// Groups draws one row per group on one value scale: the box plot (Q1 to
// Q3 with the median, whiskers to the last readings inside the group's
// inner fences; Tukey 1977) above the group's readings as a dot plot, the
// group's centre (mean or median, whichever the section's tests lead with)
// with its interval as a bar, and every suspect reading drawn as an open
// triangle and labelled by its row. Specification limits are drawn as
// labelled lines when given.
func Groups(r *stats.Report) string {
	if r == nil || r.Groups == nil || len(r.Groups.Levels) == 0 {
		return ""
	}
	g := r.Groups
	f := FormatOf(r)
	var vals []float64
	for _, l := range g.Levels {
		if l.N == 0 {
			continue
		}
		vals = append(vals, l.Min, l.Max)
	}
	refs := refLines(r, f)
	for _, rl := range refs {
		vals = append(vals, rl.v)
	}
	lo, hi, ok := padded(0.04, vals...)
	if !ok {
		return ""
	}
	const rowH, left = 80.0, 128.0
	h := marginT + 24 + rowH*float64(len(g.Levels)) + marginB
	xs := scale{lo, hi, left, Width - marginR}
	xt, xdec := Ticks(lo, hi, 7)
	xdec = max(xdec, 0)
	medians := g.Lead == "medians"
	centreWord := "mean"
	if medians {
		centreWord = "median"
	}
	desc := fmt.Sprintf("%d groups on one scale: box plots above dot plots, the %s of each group with its interval; suspect readings labelled by row", len(g.Levels), centreWord)
	c := newCanvas(Width, h, "groups", "Groups of "+valueLabel(r), desc)
	top := marginT + 24
	lanes, _ := markerLanes(refs, xs, 15)
	for i, rl := range refs {
		c.vMarker(xs.at(rl.v), h-marginB, top-4, rl.colour, rl.dash, rl.label, rl.class, top-8-13*float64(lanes[i]))
	}
	for gi, l := range g.Levels {
		st := groupStyle[gi%len(groupStyle)]
		y0 := top + rowH*float64(gi)
		mid := y0 + 18
		dots := y0 + 44
		label := l.Title
		if l.Letters != "" {
			label += " [" + l.Letters + "]"
		}
		c.printf(`<g class="group" data-group="%s">`, esc(l.Name))
		c.text(left-8, mid+4, "end", "group-label", label)
		c.text(left-8, mid+20, "end", "group-n", fmt.Sprintf("n = %d", l.N))
		if gi > 0 {
			c.line(left, y0-2, Width-marginR, y0-2, "#dddddd", 1, "", "grid y")
		}
		if l.N == 0 {
			c.printf(`</g>`)
			continue
		}
		b := l.Box
		if finite(b.Q1, b.Median, b.Q3, b.LoWhisker, b.HiWhisker) {
			c.line(xs.at(b.LoWhisker), mid, xs.at(b.Q1), mid, Black, 1.5, "", "whisker")
			c.line(xs.at(b.Q3), mid, xs.at(b.HiWhisker), mid, Black, 1.5, "", "whisker")
			c.line(xs.at(b.LoWhisker), mid-7, xs.at(b.LoWhisker), mid+7, Black, 1.5, "", "whisker-cap")
			c.line(xs.at(b.HiWhisker), mid-7, xs.at(b.HiWhisker), mid+7, Black, 1.5, "", "whisker-cap")
			c.printf(`<rect class="box" x="%.1f" y="%.1f" width="%.1f" height="20" fill="%s" fill-opacity="0.4" stroke="%s" stroke-width="1.5"><title>%s</title></rect>`,
				xs.at(b.Q1), mid-10, math.Max(xs.at(b.Q3)-xs.at(b.Q1), 1), st.colour, Black,
				esc(fmt.Sprintf("%s: Q1 %s, median %s, Q3 %s", l.Title, f.Num(b.Q1, f.Decimals+1), f.Num(b.Median, f.Decimals+1), f.Num(b.Q3, f.Decimals+1))))
			c.line(xs.at(b.Median), mid-10, xs.at(b.Median), mid+10, Black, 3, "", "median")
		}
		// the centre and its interval, just below the box
		cv, ci := l.Mean, l.MeanCI
		if medians {
			cv, ci = l.Median, l.MedianCI
		}
		cy := mid + 14
		if ci != nil && finite(ci.Lo, ci.Hi) {
			c.line(xs.at(ci.Lo), cy, xs.at(ci.Hi), cy, Black, 2.5, "", "centre-ci")
			c.line(xs.at(ci.Lo), cy-4, xs.at(ci.Lo), cy+4, Black, 2, "", "centre-ci-cap")
			c.line(xs.at(ci.Hi), cy-4, xs.at(ci.Hi), cy+4, Black, 2, "", "centre-ci-cap")
		}
		if finite(cv) {
			title := fmt.Sprintf("%s: %s %s", l.Title, centreWord, f.Value(cv))
			if ci != nil {
				title += fmt.Sprintf(" (%g %% interval %s to %s)", math.Round(ci.Level*1000)/10, f.Num(ci.Lo, f.Decimals+1), f.Num(ci.Hi, f.Decimals+1))
			}
			c.printf(`<path class="centre" d="M%.1f %.1fL%.1f %.1fL%.1f %.1fL%.1f %.1fZ" fill="#ffffff" stroke="%s" stroke-width="2"><title>%s</title></path>`,
				xs.at(cv), cy-6, xs.at(cv)+6, cy, xs.at(cv), cy+6, xs.at(cv)-6, cy, Black, esc(title))
		}
		// dots: a little vertical jitter by position keeps ties visible
		suspect := map[int]bool{}
		for _, s := range l.Suspects {
			suspect[s.Row] = true
		}
		rad := 3.5
		if len(l.Points) > 150 {
			rad = 2.5
		}
		for k, p := range l.Points {
			if suspect[p.Row] {
				continue
			}
			y := dots + float64(k%5-2)*2.5
			c.marker(st.shape, xs.at(p.Y), y, rad, st.colour, p.Row, fmt.Sprintf("%s, row %d: %s", l.Title, p.Row, f.Value(p.Y)), "")
		}
		// row labels in two lanes below the dots, staggered so that
		// neighbours do not overlap; beyond maxRowLabels a suspect keeps
		// its row in its tip only
		lastX := [2]float64{-1e9, -1e9}
		for k, s := range l.Suspects {
			x := xs.at(s.Value)
			c.marker("open-circle", x, dots, 5, Vermilion, s.Row, fmt.Sprintf("%s, row %d: %s (suspect)", l.Title, s.Row, f.Value(s.Value)), "suspect")
			if k >= maxRowLabels {
				continue
			}
			lane := 0
			if x-lastX[0] < 52 {
				lane = 1
				if x-lastX[1] < 52 && lastX[1] < lastX[0] {
					lane = 0
				}
			}
			lastX[lane] = x
			c.text(x, dots+16+float64(lane)*13, "middle", "row-label", fmt.Sprintf("row %d", s.Row))
		}
		c.printf(`</g>`)
	}
	c.xAxis(xs, xt, xdec, f, valueLabel(r), h-marginB)
	items := []legendItem{{"open-circle", Vermilion, "", "suspect (row labelled)"}, {"diamond", "#ffffff", "", centreWord + " and interval"}}
	if len(refs) > 0 {
		items = append(items, legendItem{"line", Vermilion, "10 4 2 4", "spec limits"})
	}
	c.legend(items)
	return c.done()
}
