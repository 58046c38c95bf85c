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
	"bytes"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"unsafe"

	"lotlens/stats/decimal"
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
	var buf [32]byte
	return string(f.appendNum(buf[:0], v, d))
}

// appendNum appends Num(v, d).
func (f Format) appendNum(b []byte, v float64, d int) []byte {
	if d < 0 {
		d = 0
	}
	if d > 12 {
		d = 12
	}
	start := len(b)
	b = appendFixed(b, v, d)
	if s := b[start:]; len(s) > 1 && s[0] == '-' && s[1] == '0' && (len(s) == 2 || s[2] == '.' && allZeros(s[3:])) {
		// -0 and -0.00 lose their sign
		b = append(b[:start], s[1:]...)
	}
	if f.DecimalComma {
		if i := bytes.IndexByte(b[start:], '.'); i >= 0 {
			b[start+i] = ','
		}
	}
	return b
}

// appendFixed appends v with d decimals (0 to 12) as
// strconv.AppendFloat(b, v, 'f', d, 64) does. A value that is the double
// nearest to a decimal of at most d <= 6 places (a reading as typed, at
// the data's decimals) is that decimal rounded to d places: it is written
// from its digits, without the general conversion.
func appendFixed(b []byte, v float64, d int) []byte {
	abs := math.Abs(v)
	if d > 6 || !(abs < 1e9) {
		return strconv.AppendFloat(b, v, 'f', d, 64)
	}
	p := decimal.Pow10(d)
	n := math.Round(abs * p)
	if n/p != abs {
		return strconv.AppendFloat(b, v, 'f', d, 64)
	}
	if math.Signbit(v) {
		b = append(b, '-')
	}
	return decimal.AppendPlaces(b, uint64(n), d)
}

func allZeros(s []byte) bool {
	for _, c := range s {
		if c != '0' {
			return false
		}
	}
	return true
}

// Value writes a data value at the data's resolution with its unit.
func (f Format) Value(v float64) string {
	s := f.Num(v, f.Decimals)
	if f.Unit != "" {
		s += " " + f.Unit
	}
	return s
}

// appendValue appends Value(v) escaped for XML.
func (f Format) appendValue(b []byte, v float64) []byte {
	b = f.appendNum(b, v, f.Decimals)
	if f.Unit != "" {
		b = append(b, ' ')
		b = appendEsc(b, f.Unit)
	}
	return b
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
	b := append(c.b, `<text x="`...)
	b = appendFixed1(b, x)
	b = append(b, `" y="`...)
	b = appendFixed1(b, y)
	b = append(b, `" text-anchor="`...)
	b = append(b, anchor...)
	b = append(b, `" class="`...)
	b = append(b, class...)
	b = append(b, `">`...)
	b = appendEsc(b, s)
	c.b = append(b, `</text>`...)
}

func (c *canvas) line(x1, y1, x2, y2 float64, stroke string, width float64, dash, class string) {
	b := append(c.b, `<line x1="`...)
	b = appendFixed1(b, x1)
	b = append(b, `" y1="`...)
	b = appendFixed1(b, y1)
	b = append(b, `" x2="`...)
	b = appendFixed1(b, x2)
	b = append(b, `" y2="`...)
	b = appendFixed1(b, y2)
	b = append(b, `" stroke="`...)
	b = append(b, stroke...)
	b = append(b, `" stroke-width="`...)
	b = strconv.AppendFloat(b, width, 'g', -1, 64) // as %g: the widths are small constants
	b = append(b, '"')
	if dash != "" {
		b = append(b, ` stroke-dasharray="`...)
		b = append(b, dash...)
		b = append(b, '"')
	}
	b = append(b, ` class="`...)
	b = append(b, class...)
	c.b = append(b, `"/>`...)
}

// appendFixed1 appends v as fmt's %.1f writes it.
func appendFixed1(b []byte, v float64) []byte { return strconv.AppendFloat(b, v, 'f', 1, 64) }

// grow makes room for about n more bytes at once (a long chart would
// otherwise copy its text a dozen times while it grows).
func (c *canvas) grow(n int) { c.b = slices.Grow(c.b, n) }

// done closes the SVG and returns its text. The text is the canvas's own
// buffer, not a copy (a long chart's text is a few hundred kB): the canvas
// must not be used after done.
func (c *canvas) done() string {
	b := append(c.b, `</svg>`...)
	c.b = nil
	return unsafe.String(unsafe.SliceData(b), len(b))
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
// appends rather than formats; the long charts write the title themselves
// between markerStart and markerEnd.
func (c *canvas) marker(shape string, x, y, r float64, colour string, row int, title string, class string) {
	c.markerStart(shape, x, y, r, colour, row, class)
	c.b = appendEsc(c.b, title)
	c.markerEnd(shape)
}

// markerStart writes a marker up to its title's text, which the caller
// appends escaped (appendEsc) before markerEnd.
func (c *canvas) markerStart(shape string, x, y, r float64, colour string, row int, class string) {
	b := c.b
	switch shape {
	case "triangle":
		b = append(b, `<path d="M`...)
		b = appendPt(b, x, y-r*1.2)
		b = append(b, 'L')
		b = appendPt(b, x+r*1.1, y+r*0.8)
		b = append(b, 'L')
		b = appendPt(b, x-r*1.1, y+r*0.8)
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
		b = appendPt(b, x, y-r*1.3)
		b = append(b, 'L')
		b = appendPt(b, x+r*1.3, y)
		b = append(b, 'L')
		b = appendPt(b, x, y+r*1.3)
		b = append(b, 'L')
		b = appendPt(b, x-r*1.3, y)
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
	c.b = append(b, `"><title>`...)
}

// markerEnd closes what markerStart opened.
func (c *canvas) markerEnd(shape string) {
	switch shape {
	case "triangle", "diamond":
		c.b = append(c.b, "</title></path>"...)
	case "square":
		c.b = append(c.b, "</title></rect>"...)
	default:
		c.b = append(c.b, "</title></circle>"...)
	}
}

// appendPt appends "x y", each rounded to 0.1 px.
func appendPt(b []byte, x, y float64) []byte {
	b = appendF(b, x)
	b = append(b, ' ')
	return appendF(b, y)
}

// pointGroup opens a group whose plain circles (marker with colour "")
// inherit one style, which keeps long charts small.
func (c *canvas) pointGroup(colour string) {
	c.printf(`<g class="points" fill="%s" fill-opacity="0.85" stroke="%s" stroke-width="0.5">`, colour, Black)
}

// appendF appends v rounded to 0.1 px.
func appendF(b []byte, v float64) []byte {
	t := math.Round(v * 10)
	if !(math.Abs(t) < 1e10) || (t == 0 && math.Signbit(t)) {
		return strconv.AppendFloat(b, t/10, 'f', -1, 64)
	}
	// the same text without the general shortest-form search: t/10 is a
	// whole number of tenths well inside the exact range of float64
	n := int64(t)
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	switch w := n / 10; {
	case w < 10:
		b = append(b, byte('0'+w))
	case w < 100:
		b = append(b, byte('0'+w/10), byte('0'+w%10))
	case w < 1000:
		b = append(b, byte('0'+w/100), byte('0'+w/10%10), byte('0'+w%10))
	default:
		b = strconv.AppendInt(b, w, 10)
	}
	if d := n % 10; d != 0 {
		b = append(b, '.', byte('0'+d))
	}
	return b
}

// appendEsc appends s escaped for XML (as esc).
func appendEsc(b []byte, s string) []byte {
	for i := 0; i < len(s); i++ {
		switch s[i] {
		case '&', '<', '>', '"', '\'':
			return appendEscFrom(b, s, i)
		}
	}
	return append(b, s...)
}

// appendEscFrom appends s, escaping from byte i on.
func appendEscFrom(b []byte, s string, i int) []byte {
	b = append(b, s[:i]...)
	for ; i < len(s); i++ {
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
		c.b = appendPt(c.b, x, y)
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
