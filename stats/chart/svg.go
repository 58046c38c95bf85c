// Package chart draws the report's charts as SVG text. It is pure Go (no
// syscall/js): the page gets the same figures on screen and in print, and the
// tests parse the output as XML.
//
// Every point carries a data-row attribute (the spreadsheet row) and a <title>
// with its row and value, so the page can show them on tap or hover. Colours
// are the Okabe-Ito palette (Okabe and Ito 2008, "Color Universal Design"),
// and no meaning rests on colour alone: each series also has its own marker
// shape or dash pattern and a text label. All text is escaped.
package chart

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Okabe-Ito colours (Okabe and Ito 2008).
const (
	Black     = "#000000"
	Orange    = "#E69F00"
	SkyBlue   = "#56B4E9"
	Green     = "#009E73"
	Yellow    = "#F0E442"
	Blue      = "#0072B2"
	Vermilion = "#D55E00"
	Purple    = "#CC79A7"
)

// Format controls how numbers are written on axes and in titles.
type Format struct {
	Decimals     int    // decimals of the data as typed; ticks may use more
	DecimalComma bool   // write 5,12 instead of 5.12
	Unit         string // appended to values in titles
}

// Num writes v with d decimals, honouring the decimal comma.
func (f Format) Num(v float64, d int) string {
	if d < 0 {
		d = 0
	}
	if d > 12 {
		d = 12
	}
	s := strconv.FormatFloat(v, 'f', d, 64)
	if s == "-0" || strings.HasPrefix(s, "-0.") && strings.Trim(s[3:], "0") == "" {
		s = s[1:]
	}
	if f.DecimalComma {
		s = strings.Replace(s, ".", ",", 1)
	}
	return s
}

// Value writes a data value at the data's resolution with its unit.
func (f Format) Value(v float64) string {
	s := f.Num(v, f.Decimals)
	if f.Unit != "" {
		s += " " + f.Unit
	}
	return s
}

var escaper = strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&quot;", "'", "&#39;")

// esc escapes text for SVG element content and attribute values.
func esc(s string) string { return escaper.Replace(s) }

// Ticks returns about n "nice" tick positions covering [lo, hi] (steps of
// 1, 2 or 5 times a power of ten; Heckbert 1990, "Nice numbers for graph
// labels", Graphics Gems) and the decimals needed to write them.
func Ticks(lo, hi float64, n int) ([]float64, int) {
	if !(hi > lo) || math.IsInf(hi-lo, 0) {
		if math.IsNaN(lo) || math.IsInf(lo, 0) {
			return nil, 0
		}
		d := math.Abs(lo) * 0.05
		if d == 0 {
			d = 1
		}
		lo, hi = lo-d, lo+d
	}
	if n < 2 {
		n = 2
	}
	step := nice((hi-lo)/float64(n-1), true)
	start := math.Ceil(lo/step-1e-9) * step
	dec := int(math.Max(0, -math.Floor(math.Log10(step)+1e-9)))
	var ts []float64
	for i := 0; i < 100; i++ {
		v := start + float64(i)*step
		if v > hi+step*1e-9 {
			break
		}
		// round away accumulated error
		v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'f', dec, 64), 64)
		ts = append(ts, v)
	}
	return ts, dec
}

func nice(x float64, round bool) float64 {
	e := math.Floor(math.Log10(x))
	f := x / math.Pow(10, e)
	var nf float64
	switch {
	case round && f < 1.5, !round && f <= 1:
		nf = 1
	case round && f < 3, !round && f <= 2:
		nf = 2
	case round && f < 7, !round && f <= 5:
		nf = 5
	default:
		nf = 10
	}
	return nf * math.Pow(10, e)
}

// scale maps a data interval onto a pixel interval.
type scale struct{ d0, d1, p0, p1 float64 }

func (s scale) at(v float64) float64 {
	if s.d1 == s.d0 {
		return (s.p0 + s.p1) / 2
	}
	return s.p0 + (v-s.d0)/(s.d1-s.d0)*(s.p1-s.p0)
}

// canvas accumulates SVG text.
type canvas struct {
	b    []byte
	w, h float64
}

// Plot area margins.
const (
	marginL = 64.0
	marginR = 16.0
	marginT = 28.0
	marginB = 48.0
)

func newCanvas(w, h float64, id, title, desc string) *canvas {
	c := &canvas{w: w, h: h}
	c.printf(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %g %g" width="%g" height="%g" role="img" aria-labelledby="%s-t %s-d" class="chart" data-chart="%s" font-family="system-ui, sans-serif" font-size="15">`,
		w, h, w, h, id, id, id)
	c.printf(`<title id="%s-t">%s</title><desc id="%s-d">%s</desc>`, id, esc(title), id, esc(desc))
	c.printf(`<rect x="0" y="0" width="%g" height="%g" fill="#ffffff"/>`, w, h)
	return c
}

func (c *canvas) printf(format string, a ...any) { c.b = fmt.Appendf(c.b, format, a...) }

func (c *canvas) text(x, y float64, anchor, class, s string) {
	c.printf(`<text x="%.1f" y="%.1f" text-anchor="%s" class="%s">%s</text>`, x, y, anchor, class, esc(s))
}

func (c *canvas) line(x1, y1, x2, y2 float64, stroke string, width float64, dash, class string) {
	d := ""
	if dash != "" {
		d = ` stroke-dasharray="` + dash + `"`
	}
	c.printf(`<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="%g"%s class="%s"/>`, x1, y1, x2, y2, stroke, width, d, class)
}

func (c *canvas) done() string {
	c.b = append(c.b, `</svg>`...)
	return string(c.b)
}

// xAxis draws ticks and labels along the bottom of the plot area.
func (c *canvas) xAxis(s scale, ticks []float64, dec int, f Format, label string, y float64) {
	c.line(s.p0, y, s.p1, y, Black, 1, "", "axis x")
	for _, t := range ticks {
		x := s.at(t)
		c.line(x, y, x, y+5, Black, 1, "", "tick x")
		c.text(x, y+19, "middle", "tick-label x", f.Num(t, dec))
	}
	c.text((s.p0+s.p1)/2, c.h-8, "middle", "axis-label x", label)
}

// yAxis draws ticks, labels and light grid lines on the left.
func (c *canvas) yAxis(s scale, ticks []float64, dec int, f Format, label string, x0, x1 float64) {
	c.line(x0, s.p0, x0, s.p1, Black, 1, "", "axis y")
	for _, t := range ticks {
		y := s.at(t)
		c.line(x0+1, y, x1, y, "#dddddd", 1, "", "grid y")
		c.line(x0-5, y, x0, y, Black, 1, "", "tick y")
		c.text(x0-8, y+4, "end", "tick-label y", f.Num(t, dec))
	}
	c.printf(`<text x="14" y="%.1f" text-anchor="middle" transform="rotate(-90 14 %.1f)" class="axis-label y">%s</text>`,
		(s.p0+s.p1)/2, (s.p0+s.p1)/2, esc(label))
}

// vMarker is a labelled vertical reference line (target, limits, fences).
func (c *canvas) vMarker(x, y0, y1 float64, stroke, dash, label, class string, labelY float64) {
	c.line(x, y0, x, y1, stroke, 2, dash, "marker "+class)
	c.text(x, labelY, "middle", "marker-label "+class, label)
}

// marker draws a point symbol. Shapes: "circle", "open-circle", "triangle",
// "square", "diamond". It is on the hot path (hundreds of points), so it
// appends rather than formats.
func (c *canvas) marker(shape string, x, y, r float64, colour string, row int, title string, class string) {
	b := c.b
	pt := func(px, py float64) {
		b = appendF(b, px)
		b = append(b, ' ')
		b = appendF(b, py)
	}
	switch shape {
	case "triangle":
		b = append(b, `<path d="M`...)
		pt(x, y-r*1.2)
		b = append(b, 'L')
		pt(x+r*1.1, y+r*0.8)
		b = append(b, 'L')
		pt(x-r*1.1, y+r*0.8)
		b = append(b, `Z" stroke="#000000" stroke-width="1" fill="`...)
	case "square":
		b = append(b, `<rect x="`...)
		b = appendF(b, x-r)
		b = append(b, `" y="`...)
		b = appendF(b, y-r)
		b = append(b, `" width="`...)
		b = appendF(b, 2*r)
		b = append(b, `" height="`...)
		b = appendF(b, 2*r)
		b = append(b, `" stroke="#000000" stroke-width="1" fill="`...)
	case "diamond":
		b = append(b, `<path d="M`...)
		pt(x, y-r*1.3)
		b = append(b, 'L')
		pt(x+r*1.3, y)
		b = append(b, 'L')
		pt(x, y+r*1.3)
		b = append(b, 'L')
		pt(x-r*1.3, y)
		b = append(b, `Z" stroke="#000000" stroke-width="1" fill="`...)
	default: // "circle" and "open-circle"
		b = append(b, `<circle cx="`...)
		b = appendF(b, x)
		b = append(b, `" cy="`...)
		b = appendF(b, y)
		b = append(b, `" r="`...)
		b = appendF(b, r)
		if shape == "open-circle" {
			b = append(b, `" fill="#ffffff" stroke-width="2" stroke="`...)
		} else if colour != "" {
			b = append(b, `" fill-opacity="0.85" stroke="#000000" stroke-width="0.5" fill="`...)
		}
	}
	// an empty colour inherits the style of the enclosing group (pointGroup)
	b = append(b, colour...)
	b = append(b, `" data-row="`...)
	b = strconv.AppendInt(b, int64(row), 10)
	b = append(b, `" class="pt`...)
	if class != "" {
		b = append(b, ' ')
		b = append(b, class...)
	}
	b = append(b, `"><title>`...)
	b = appendEsc(b, title)
	b = append(b, `</title></`...)
	switch shape {
	case "triangle", "diamond":
		b = append(b, "path>"...)
	case "square":
		b = append(b, "rect>"...)
	default:
		b = append(b, "circle>"...)
	}
	c.b = b
}

// pointGroup opens a group whose plain circles (marker with colour "")
// inherit one style, which keeps long charts small.
func (c *canvas) pointGroup(colour string) {
	c.printf(`<g class="points" fill="%s" fill-opacity="0.85" stroke="%s" stroke-width="0.5">`, colour, Black)
}

// appendF appends v rounded to 0.1 px.
func appendF(b []byte, v float64) []byte {
	r := math.Round(v*10) / 10
	if !(math.Abs(r) < 1e9) || (r == 0 && math.Signbit(r)) {
		return strconv.AppendFloat(b, r, 'f', -1, 64)
	}
	// the same text without the general shortest-form search: r is a whole
	// number of tenths well inside the exact range of float64
	n := int64(math.Round(v * 10))
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	b = strconv.AppendInt(b, n/10, 10)
	if d := n % 10; d != 0 {
		b = append(b, '.', byte('0'+d))
	}
	return b
}

// appendEsc appends s escaped for XML.
func appendEsc(b []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		switch ch := s[i]; ch {
		case '&':
			b = append(b, "&amp;"...)
		case '<':
			b = append(b, "&lt;"...)
		case '>':
			b = append(b, "&gt;"...)
		case '"':
			b = append(b, "&quot;"...)
		case '\'':
			b = append(b, "&#39;"...)
		default:
			b = append(b, ch)
		}
	}
	return b
}

// path appends an open polyline through the points as an SVG path element.
func (c *canvas) path(n int, at func(i int) (x, y float64), attrs string) {
	c.b = append(c.b, `<path `...)
	c.b = append(c.b, attrs...)
	c.b = append(c.b, ` fill="none" d="`...)
	for i := 0; i < n; i++ {
		x, y := at(i)
		if i == 0 {
			c.b = append(c.b, 'M')
		} else {
			c.b = append(c.b, 'L')
		}
		c.b = appendF(c.b, x)
		c.b = append(c.b, ' ')
		c.b = appendF(c.b, y)
	}
	c.b = append(c.b, `"/>`...)
}

// MaxMarkers caps the point symbols per chart: beyond it a chart draws every
// point in its line and a symbol (with its row on tap) only for a selection.
const MaxMarkers = 400

// legend draws a row of legend entries at the top of the chart.
type legendItem struct {
	kind   string // "line", "bar", or a marker shape
	colour string
	dash   string
	label  string
}

func (c *canvas) legend(items []legendItem) {
	x := marginL
	y := 14.0
	c.printf(`<g class="legend">`)
	for _, it := range items {
		switch it.kind {
		case "line":
			c.line(x, y-4, x+22, y-4, it.colour, 2.5, it.dash, "legend-line")
		case "bar":
			c.printf(`<rect x="%.1f" y="%.1f" width="14" height="10" fill="%s" stroke="%s"/>`, x+4, y-9, it.colour, Black)
		default:
			c.markerPlain(it.kind, x+11, y-4, 5, it.colour)
		}
		c.text(x+27, y, "start", "legend-label", it.label)
		x += 27 + 8*float64(len([]rune(it.label))) + 18
		if x > c.w-150 {
			// next entry on a second line, inside the top margin
			x, y = marginL, y+17
		}
	}
	c.printf(`</g>`)
}

func (c *canvas) markerPlain(shape string, x, y, r float64, colour string) {
	switch shape {
	case "triangle":
		c.printf(`<path d="M%.1f %.1fL%.1f %.1fL%.1f %.1fZ" fill="%s" stroke="%s"/>`, x, y-r*1.2, x+r*1.1, y+r*0.8, x-r*1.1, y+r*0.8, colour, Black)
	case "open-circle":
		c.printf(`<circle cx="%.1f" cy="%.1f" r="%.1f" fill="#ffffff" stroke="%s" stroke-width="2"/>`, x, y, r, colour)
	case "diamond":
		c.printf(`<path d="M%.1f %.1fL%.1f %.1fL%.1f %.1fL%.1f %.1fZ" fill="%s" stroke="%s"/>`, x, y-r*1.3, x+r*1.3, y, x, y+r*1.3, x-r*1.3, y, colour, Black)
	default:
		c.printf(`<circle cx="%.1f" cy="%.1f" r="%.1f" fill="%s" stroke="%s" stroke-width="0.5"/>`, x, y, r, colour, Black)
	}
}

// finite reports whether every value is a finite number.
func finite(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}
