package chart

import (
	"math"
	"sort"
	"strconv"
	"strings"

	"lotlens/stats"
)

// rowLabelFont is the font size of the box plot's row labels.
const rowLabelFont = 13.0

// textWidth estimates the drawn width of s at font size px: 0.62 em a
// character (digits and lower-case letters of the usual sans-serif faces
// are 0.5-0.6 em) plus a little room.
func textWidth(s string, px float64) float64 {
	return 0.62*px*float64(len([]rune(s))) + 4
}

// markerLanes puts the labels of vertical reference lines (target and
// limits; each centred on its line at x, at font size px) on lanes: each
// label on the first lane where it clears those already there, so labels
// stagger only where they would collide. It gives each label's lane, in
// the order given, and the number of lanes used (0 for no labels).
func markerLanes(refs []refLine, xs scale, px float64) (lanes []int, used int) {
	const gap = 6.0
	order := make([]int, len(refs))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return refs[order[a]].v < refs[order[b]].v })
	lanes = make([]int, len(refs))
	var ends []float64 // the right end of the last label on each lane
	for _, i := range order {
		x, w := xs.at(refs[i].v), textWidth(refs[i].label, px)
		lane := 0
		for lane < len(ends) && x-w/2 < ends[lane]+gap {
			lane++
		}
		if lane == len(ends) {
			ends = append(ends, 0)
		}
		ends[lane] = x + w/2
		lanes[i] = lane
	}
	return lanes, len(ends)
}

// labelPoint is a flagged reading to label: its x on the chart and its row.
type labelPoint struct {
	x   float64
	row int
}

// rowLabel is one placed label: the rows it names, its text, its centre and
// baseline.
type rowLabel struct {
	rows   []int
	x0, x1 float64 // the x range of its readings
	text   string
	cx, y  float64
	w      float64
}

// layoutRowLabels places one label per reading, or per group of readings
// where labels would otherwise collide: each label goes on the first lane
// (baselines in the order given) where it clears the labels already there;
// when no lane has room, the reading joins its nearest neighbour's label
// ("rows 12, 14 +3") and the layout starts again. Labels stay within
// [xmin, xmax]. pts must be sorted by x.
func layoutRowLabels(pts []labelPoint, lanes []float64, xmin, xmax float64) []rowLabel {
	if len(pts) == 0 || len(lanes) == 0 {
		return nil
	}
	const gap = 6.0
	var groups []rowLabel
	for _, p := range pts {
		if n := len(groups); n > 0 && p.x-groups[n-1].x1 < 1 { // the same place: one label
			groups[n-1].rows = append(groups[n-1].rows, p.row)
			groups[n-1].x1 = p.x
			continue
		}
		groups = append(groups, rowLabel{rows: []int{p.row}, x0: p.x, x1: p.x})
	}
	for {
		ends := make([]float64, len(lanes))
		for i := range ends {
			ends[i] = math.Inf(-1)
		}
		failed := -1
		for i := range groups {
			g := &groups[i]
			g.text = rowsText(g.rows)
			g.w = textWidth(g.text, rowLabelFont)
			g.cx = math.Min(math.Max((g.x0+g.x1)/2, xmin+g.w/2), xmax-g.w/2)
			placed := false
			for l := range lanes {
				if g.cx-g.w/2 >= ends[l]+gap {
					g.y = lanes[l]
					ends[l] = g.cx + g.w/2
					placed = true
					break
				}
			}
			if !placed {
				failed = i
				break
			}
		}
		if failed < 0 || len(groups) == 1 {
			return groups
		}
		// join the label that found no room with its nearer neighbour
		j := failed - 1
		if failed+1 < len(groups) && (failed == 0 || groups[failed+1].x0-groups[failed].x1 < groups[failed].x0-groups[failed-1].x1) {
			j = failed
		}
		a, b := groups[j], groups[j+1]
		a.rows = append(append([]int{}, a.rows...), b.rows...)
		a.x1 = b.x1
		groups = append(append(groups[:j:j], a), groups[j+2:]...)
	}
}

// rowsText names rows in a label: "row 12", "rows 12, 14, 15", or, for more
// than three, the first two and how many more: "rows 12, 14 +3".
func rowsText(rows []int) string {
	rs := append([]int{}, rows...)
	sort.Ints(rs)
	switch {
	case len(rs) == 1:
		return "row " + strconv.Itoa(rs[0])
	case len(rs) <= 3:
		return "rows " + joinInts(rs, ", ")
	default:
		return "rows " + joinInts(rs[:2], ", ") + " +" + strconv.Itoa(len(rs)-2)
	}
}

// rowsTitle lists every row of a label, for its tooltip.
func rowsTitle(rows []int) string {
	rs := append([]int{}, rows...)
	sort.Ints(rs)
	if len(rs) == 1 {
		return "row " + strconv.Itoa(rs[0])
	}
	return "rows " + joinInts(rs, ", ")
}

func joinInts(v []int, sep string) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.Itoa(x)
	}
	return strings.Join(s, sep)
}

// pctLabel writes a confidence level as "95 %" (0 means the default 95 %).
func pctLabel(level float64) string {
	if !(level > 0 && level < 1) {
		level = 0.95
	}
	return strconv.FormatFloat(math.Round(level*1000)/10, 'f', -1, 64) + " %"
}

// markEntry is the key entry of one class of marks.
type markEntry struct {
	class string
	item  legendItem
}

// markKey appends to items the entry of each class of marks that was drawn
// (drawn[class]), in the order of marks: a key lists only what the chart
// shows.
func markKey(items []legendItem, drawn map[string]bool, marks []markEntry) []legendItem {
	for _, m := range marks {
		if drawn[m.class] {
			items = append(items, m.item)
		}
	}
	return items
}

// runMarginR is the run chart's right margin: room for the names of its
// reference lines beside the plot.
const runMarginR = 62.0

// tag is the name of a horizontal reference line, written beside the plot.
type tag struct {
	y     float64
	text  string
	class string
}

// spreadTags moves tags apart vertically so that no two are closer than
// step, keeping them within [top, bottom] and in their order.
func spreadTags(ts []tag, top, bottom, step float64) []tag {
	out := append([]tag{}, ts...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].y < out[j].y })
	for i := range out {
		out[i].y = math.Max(out[i].y, top+step/2)
		if i > 0 && out[i].y-out[i-1].y < step {
			out[i].y = out[i-1].y + step
		}
	}
	// pushed past the bottom: move back up, keeping the spacing
	for i := len(out) - 1; i >= 0; i-- {
		limit := bottom - step/2
		if i+1 < len(out) {
			limit = math.Min(limit, out[i+1].y-step)
		}
		out[i].y = math.Min(out[i].y, limit)
	}
	return out
}

// rowTick is an x-axis tick of the run chart: a position in the series and
// the row it stands for.
type rowTick struct {
	pos float64
	row int
}

// rowTicks returns about n ticks labelled with spreadsheet rows. When the
// rows rise with the position (data order), the ticks are round row numbers
// placed where those rows are (between two readings when a row has no
// reading); otherwise (an order column), round positions labelled with the
// row found there.
func rowTicks(pts []stats.SeriesPt, n int) []rowTick {
	if len(pts) == 0 {
		return nil
	}
	rising := true
	for i := 1; i < len(pts); i++ {
		if pts[i].Row <= pts[i-1].Row || pts[i].I <= pts[i-1].I {
			rising = false
			break
		}
	}
	var out []rowTick
	if rising {
		ts, _ := Ticks(float64(pts[0].Row), float64(pts[len(pts)-1].Row), n)
		for _, t := range ts {
			if t != math.Trunc(t) || t < float64(pts[0].Row) || t > float64(pts[len(pts)-1].Row) {
				continue
			}
			row := int(t)
			k := sort.Search(len(pts), func(i int) bool { return pts[i].Row >= row })
			p := pts[k]
			pos := float64(p.I)
			if p.Row != row && k > 0 { // between two readings
				q := pts[k-1]
				pos = float64(q.I) + float64(row-q.Row)/float64(p.Row-q.Row)*float64(p.I-q.I)
			}
			out = append(out, rowTick{pos: pos, row: row})
		}
		return out
	}
	ts, _ := Ticks(float64(pts[0].I), float64(pts[len(pts)-1].I), n)
	for _, t := range ts {
		k := sort.Search(len(pts), func(i int) bool { return float64(pts[i].I) >= t })
		if k == len(pts) {
			continue
		}
		out = append(out, rowTick{pos: float64(pts[k].I), row: pts[k].Row})
	}
	return out
}

// keyBox draws a legend as a column of entries on a white panel whose
// lower right corner is (x1, y1).
func (c *canvas) keyBox(items []legendItem, x1, y1 float64) {
	const lh, fs = 17.0, 13.0
	w := 0.0
	for _, it := range items {
		w = math.Max(w, 30+textWidth(it.label, fs))
	}
	h := lh*float64(len(items)) + 8
	x0, y0 := x1-w-8, y1-h
	c.printf(`<g class="legend key" font-size="%g"><rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="#ffffff" fill-opacity="0.9" stroke="#bbbbbb" rx="4"/>`, fs, x0, y0, w+8, h)
	for i, it := range items {
		x, y := x0+6, y0+4+lh*float64(i)+lh-4
		switch it.kind {
		case "line":
			c.line(x, y-4, x+22, y-4, it.colour, 2.5, it.dash, "legend-line")
		case "bar":
			c.printf(`<rect x="%.1f" y="%.1f" width="14" height="10" fill="%s" stroke="%s"/>`, x+4, y-9, it.colour, Black)
		case "band":
			c.printf(`<rect x="%.1f" y="%.1f" width="22" height="12" fill="%s" fill-opacity="0.28" class="legend-band"/>`, x, y-10, it.colour)
		default:
			c.markerPlain(it.kind, x+11, y-4, 5, it.colour)
		}
		c.text(x+28, y, "start", "legend-label", it.label)
	}
	c.printf(`</g>`)
}
