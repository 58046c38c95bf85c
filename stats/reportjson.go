package stats

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"strconv"
	"unicode/utf8"

	"lotlens/stats/decimal"
)

// The report's JSON is encoding/json's, byte for byte; only the long point
// lists (the charts' and the over-time section's, nine tenths of a
// 10,000-reading report) are written by the appenders below. encoding/json
// spends most of its time there on reflection per field, and a
// json.Marshaler would not help: encoding/json checks and compacts whatever
// a MarshalJSON returns. For a 10,000-reading report in Node as js/wasm,
// json.Compact of its JSON alone takes 7.7 ms, about as long as
// json.Marshal of the whole report (8.2 ms); the report written here takes
// 3.8 ms (natively 2.2, 2.0 and 1.2 ms).
//
// marshalReport encodes a shallow copy of the report in which each long
// list is replaced by one marker element whose position (or row, or first
// position) is math.MinInt64 plus the list's number: no real position or
// row is negative, so the marker's JSON ("[{"i":-9223372036854775808,...}]")
// occurs nowhere else. The markers are then replaced by the lists as
// written here. Every other part of the report, and any list added later,
// is encoding/json's own. TestReportJSONSame compares whole reports with
// json.Marshal; a field added to one of the point types below needs its
// appender changed too (TestReportJSONListFields fails until it is).

// errSplice: a marker was not found or a value is not finite; ReportJSON
// then lets json.Marshal encode the report (and name a bad value).
var errSplice = errors.New("report JSON: a long list could not be written directly")

// holes are the long lists taken out of the report: for each, the JSON of
// its marker, its length and how to write its element i.
type holes struct {
	list []hole
}

type hole struct {
	marker []byte
	n      int
	elem   func(b []byte, i int) ([]byte, bool)
}

// mark is the position (or row) of the next marker.
func (h *holes) mark() int { return math.MinInt64 + len(h.list) }

// add records a list of n elements written by elem, whose place in the
// report now holds marker (a one-element list made with mark).
func (h *holes) add(marker any, n int, elem func(b []byte, i int) ([]byte, bool)) {
	m, err := json.Marshal(marker)
	if err != nil {
		panic(err) // a marker holds only zeros and one integer
	}
	h.list = append(h.list, hole{marker: m, n: n, elem: elem})
}

// marshalReport encodes rep exactly as json.Marshal(rep) does (see above).
// It does not change rep.
func marshalReport(rep *Report) ([]byte, error) {
	r := *rep
	var h holes
	// in JSON order: charts, then stability
	if rep.Charts != nil {
		c := *rep.Charts
		if pts := c.ProbPlot.Points; len(pts) > 0 {
			c.ProbPlot.Points = []ProbPt{{Row: h.mark()}}
			h.add(c.ProbPlot.Points, len(pts), func(b []byte, i int) ([]byte, bool) { return appendProbPt(b, &pts[i]) })
		}
		if pts := c.Series; len(pts) > 0 {
			c.Series = []SeriesPt{{I: h.mark()}}
			h.add(c.Series, len(pts), func(b []byte, i int) ([]byte, bool) { return appendSeriesPt(b, &pts[i]) })
		}
		r.Charts = &c
	}
	if rep.Stability != nil {
		s := *rep.Stability
		if s.Chart != nil && len(s.Chart.Points) > 0 {
			ch := *s.Chart
			pts := ch.Points
			ch.Points = []CtlPoint{{I: h.mark()}}
			h.add(ch.Points, len(pts), func(b []byte, i int) ([]byte, bool) { return appendCtlPoint(b, &pts[i]) })
			s.Chart = &ch
		}
		if sig := s.Signals; len(sig) > 0 {
			s.Signals = []SignalInfo{{First: h.mark()}}
			h.add(s.Signals, len(sig), func(b []byte, i int) ([]byte, bool) { return appendSignal(b, &sig[i]) })
		}
		if s.EWMA != nil && len(s.EWMA.Points) > 0 {
			e := *s.EWMA
			pts := e.Points
			e.Points = []EWMAPt{{I: h.mark()}}
			h.add(e.Points, len(pts), ewmaWriter(pts))
			s.EWMA = &e
		}
		if s.CUSUM != nil && len(s.CUSUM.Points) > 0 {
			cu := *s.CUSUM
			pts := cu.Points
			cu.Points = []CUSUMPt{{I: h.mark()}}
			h.add(cu.Points, len(pts), func(b []byte, i int) ([]byte, bool) { return appendCUSUMPt(b, &pts[i]) })
			s.CUSUM = &cu
		}
		r.Stability = &s
	}
	rest, err := json.Marshal(&r)
	if err != nil || len(h.list) == 0 {
		return rest, err
	}
	out := make([]byte, 0, len(rest)+outSize(rep))
	for _, l := range h.list {
		at := bytes.Index(rest, l.marker)
		if at < 0 {
			return nil, errSplice
		}
		out = append(out, rest[:at]...)
		out = append(out, '[')
		for i := 0; i < l.n; i++ {
			if i > 0 {
				out = append(out, ',')
			}
			var ok bool
			if out, ok = l.elem(out, i); !ok {
				return nil, errSplice
			}
		}
		out = append(out, ']')
		rest = rest[at+len(l.marker):]
	}
	return append(out, rest...), nil
}

// outSize guesses the bytes of the long lists (a little over, from
// reports of 1,000 and 10,000 readings), to allocate once.
func outSize(rep *Report) int {
	n := 0
	if c := rep.Charts; c != nil {
		n += 48*len(c.ProbPlot.Points) + 34*len(c.Series)
	}
	if s := rep.Stability; s != nil {
		if s.Chart != nil {
			n += 64 * len(s.Chart.Points)
			for i := range s.Chart.Points {
				n += 16 * len(s.Chart.Points[i].Flags)
			}
		}
		n += 260 * len(s.Signals)
		if s.EWMA != nil {
			n += 82 * len(s.EWMA.Points)
		}
		if s.CUSUM != nil {
			n += 52 * len(s.CUSUM.Points)
		}
	}
	return n
}

// The appenders write one element as encoding/json does: fields in
// declaration order under their JSON names, omitempty fields left out when
// zero. Each returns false if a number is not finite (encoding/json
// refuses those).

func appendProbPt(b []byte, p *ProbPt) ([]byte, bool) {
	b = append(b, `{"z":`...)
	b, ok1 := appendJSONFloat(b, p.Z)
	b = append(b, `,"y":`...)
	b, ok2 := appendTypedFloat(b, p.Y)
	b = append(b, `,"row":`...)
	b = strconv.AppendInt(b, int64(p.Row), 10)
	return append(b, '}'), ok1 && ok2
}

func appendSeriesPt(b []byte, p *SeriesPt) ([]byte, bool) {
	b = append(b, `{"i":`...)
	b = strconv.AppendInt(b, int64(p.I), 10)
	b = append(b, `,"row":`...)
	b = strconv.AppendInt(b, int64(p.Row), 10)
	b = append(b, `,"y":`...)
	b, ok := appendTypedFloat(b, p.Y)
	return append(b, '}'), ok
}

func appendCtlPoint(b []byte, p *CtlPoint) ([]byte, bool) {
	b = append(b, `{"i":`...)
	b = strconv.AppendInt(b, int64(p.I), 10)
	b = append(b, `,"row":`...)
	b = strconv.AppendInt(b, int64(p.Row), 10)
	if p.Label != "" {
		b = append(b, `,"label":`...)
		b = appendJSONString(b, p.Label)
	}
	if p.N != 0 {
		b = append(b, `,"n":`...)
		b = strconv.AppendInt(b, int64(p.N), 10)
	}
	b = append(b, `,"y":`...)
	b, ok := appendTypedFloat(b, p.Y)
	if p.S != nil {
		b = append(b, `,"s":`...)
		var good bool
		b, good = appendJSONFloat(b, *p.S)
		ok = ok && good
	}
	if p.T != nil {
		b = append(b, `,"t":`...)
		var good bool
		b, good = appendJSONFloat(b, *p.T)
		ok = ok && good
	}
	if p.LeftOut {
		b = append(b, `,"leftOut":true`...)
	}
	if p.Outside {
		b = append(b, `,"outside":true`...)
	}
	if len(p.Flags) > 0 {
		b = append(b, `,"flags":`...)
		b = appendJSONStrings(b, p.Flags)
	}
	return append(b, '}'), ok
}

func appendSignal(b []byte, s *SignalInfo) ([]byte, bool) {
	b = append(b, `{"code":`...)
	b = appendJSONString(b, s.Code)
	b = append(b, `,"chart":`...)
	b = appendJSONString(b, s.Chart)
	if s.Side != 0 {
		b = append(b, `,"side":`...)
		b = strconv.AppendInt(b, int64(s.Side), 10)
	}
	b = append(b, `,"first":`...)
	b = strconv.AppendInt(b, int64(s.First), 10)
	b = append(b, `,"last":`...)
	b = strconv.AppendInt(b, int64(s.Last), 10)
	b = append(b, `,"points":`...)
	b = strconv.AppendInt(b, int64(s.Points), 10)
	if len(s.Rows) > 0 {
		b = append(b, `,"rows":[`...)
		for i, r := range s.Rows {
			if i > 0 {
				b = append(b, ',')
			}
			b = strconv.AppendInt(b, int64(r), 10)
		}
		b = append(b, ']')
	}
	if len(s.Subgroups) > 0 {
		b = append(b, `,"subgroups":`...)
		b = appendJSONStrings(b, s.Subgroups)
	}
	b = append(b, `,"text":`...)
	b = appendJSONString(b, s.Text)
	return append(b, '}'), true
}

// ewmaWriter writes EWMA points; the limits, constant after the first
// few dozen points, are copied from the point before when they are the same.
func ewmaWriter(pts []EWMAPt) func(b []byte, i int) ([]byte, bool) {
	var lo, hi floatMemo
	return func(b []byte, i int) ([]byte, bool) {
		p := &pts[i]
		b = append(b, `{"i":`...)
		b = strconv.AppendInt(b, int64(p.I), 10)
		b = append(b, `,"z":`...)
		b, ok1 := appendJSONFloat(b, p.Z)
		b = append(b, `,"lo":`...)
		b, ok2 := lo.append(b, p.Lo)
		b = append(b, `,"hi":`...)
		b, ok3 := hi.append(b, p.Hi)
		return append(b, '}'), ok1 && ok2 && ok3
	}
}

// floatMemo writes a number by copying the text it wrote last when the
// number is the same (bit for bit).
type floatMemo struct {
	bits       uint64
	start, end int // the text in the output
	set        bool
}

func (m *floatMemo) append(b []byte, f float64) ([]byte, bool) {
	if m.set && math.Float64bits(f) == m.bits {
		return append(b, b[m.start:m.end]...), true
	}
	start := len(b)
	b, ok := appendJSONFloat(b, f)
	*m = floatMemo{bits: math.Float64bits(f), start: start, end: len(b), set: ok}
	return b, ok
}

func appendCUSUMPt(b []byte, p *CUSUMPt) ([]byte, bool) {
	b = append(b, `{"i":`...)
	b = strconv.AppendInt(b, int64(p.I), 10)
	b = append(b, `,"up":`...)
	b, ok1 := appendJSONFloat(b, p.Up)
	b = append(b, `,"down":`...)
	b, ok2 := appendJSONFloat(b, p.Down)
	return append(b, '}'), ok1 && ok2
}

// appendJSONFloat writes f as encoding/json writes a float64 (shortest
// form; exponent form below 1e-6 and from 1e21, without a leading zero in
// the exponent); false for NaN and Inf.
func appendJSONFloat(b []byte, f float64) ([]byte, bool) {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return b, false
	}
	if f == 0 && !math.Signbit(f) {
		return append(b, '0'), true
	}
	abs := math.Abs(f)
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		b = strconv.AppendFloat(b, f, 'e', -1, 64)
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
		return b, true
	}
	return strconv.AppendFloat(b, f, 'f', -1, 64), true
}

// appendTypedFloat is appendJSONFloat for a reading as typed (a chart's
// values): a number within [1e-6, 1e9) that is the double nearest to a
// decimal of at most 6 places is written from that decimal, without the
// general shortest-form search. That decimal is the shortest form: with d
// the fewest places that give f back, a decimal of fewer places would have
// been found first (f·10^d' lies within 0.2 of it), and decimals of d places
// are more than 4 units in the last place of f apart, so only one gives f.
func appendTypedFloat(b []byte, f float64) ([]byte, bool) {
	abs := math.Abs(f)
	if !(abs >= 1e-6 && abs < 1e9) {
		return appendJSONFloat(b, f)
	}
	for d := 0; d <= 6; d++ {
		p := decimal.Pow10(d)
		n := math.Round(abs * p)
		if n/p != abs {
			continue
		}
		if f < 0 {
			b = append(b, '-')
		}
		return decimal.AppendPlaces(b, uint64(n), d), true
	}
	return appendJSONFloat(b, f)
}

// appendJSONString writes s as encoding/json writes a string (with its
// HTML-safe escapes). Text that needs no escape is copied; anything else
// (rare in these lists) goes through encoding/json.
func appendJSONString(b []byte, s string) []byte {
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c < 0x20 || c == '"' || c == '\\' || c == '<' || c == '>' || c == '&' {
				return appendMarshalled(b, s)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 || r == '\u2028' || r == '\u2029' {
			return appendMarshalled(b, s)
		}
		i += size
	}
	b = append(b, '"')
	b = append(b, s...)
	return append(b, '"')
}

func appendMarshalled(b []byte, s string) []byte {
	q, _ := json.Marshal(s) // a string always encodes
	return append(b, q...)
}

func appendJSONStrings(b []byte, ss []string) []byte {
	b = append(b, '[')
	for i, s := range ss {
		if i > 0 {
			b = append(b, ',')
		}
		b = appendJSONString(b, s)
	}
	return append(b, ']')
}
