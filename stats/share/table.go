package share

import (
	"encoding/binary"
	"errors"
	"math"
	"strconv"
	"strings"
)

// The table form: the text cut into lines and cells, each column's plain
// decimals coded as fixed-point integers, every other cell kept as its
// bytes. It gives back the text byte for byte by construction (cutting and
// joining on the same separators); encodeTable's caller checks that anyway.

// maxColumns bounds the columns of the table form (more: raw form), so that
// a hand-made body cannot make the decoder allocate per column without end.
const maxColumns = 10000

// maxDigits is the most digits a plain decimal may have to be coded as a
// number (its mantissa then fits an int64 with room for differences).
const maxDigits = 18

// valueLimit bounds scaled values so that any difference of two fits an int64.
const valueLimit = 1 << 62

// pow10 holds 10^0 .. 10^maxDigits, written out so that the compiler lays
// it out and nothing runs at start.
var pow10 = [maxDigits + 1]int64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18}

// Line ends.
const (
	eolLF   = 0
	eolCRLF = 1
	eolCR   = 2
)

var eolText = [3]string{"\n", "\r\n", "\r"}

// eachLine calls f for each line of text (without its line end) until f
// returns false. The line end is "\r\n" when every '\n' follows a '\r',
// else "\n"; "\r" when the text has no '\n' but has a '\r'. final is whether
// the text ends with a line end. Cutting the text (less a final line end)
// at every line end gives the lines: "" is one empty line.
func eachLine(text string, f func(string) bool) (eol byte, final bool) {
	switch {
	case strings.IndexByte(text, '\n') >= 0:
		eol = eolCRLF
		for i, s := 0, text; ; {
			k := strings.IndexByte(s, '\n')
			if k < 0 {
				break
			}
			if i+k == 0 || text[i+k-1] != '\r' {
				eol = eolLF
				break
			}
			i, s = i+k+1, s[k+1:]
		}
	case strings.IndexByte(text, '\r') >= 0:
		eol = eolCR
	default:
		eol = eolLF
	}
	end := eolText[eol]
	rest := text
	if final = strings.HasSuffix(text, end); final {
		rest = text[:len(text)-len(end)]
	}
	for {
		k := strings.Index(rest, end)
		if k < 0 {
			f(rest)
			return
		}
		if !f(rest[:k]) {
			return
		}
		rest = rest[k+len(end):]
	}
}

// eachField calls f for each field of line cut at sep (0: the whole line).
func eachField(line string, sep byte, f func(j int, cell string)) int {
	if sep == 0 {
		f(0, line)
		return 1
	}
	j := 0
	for {
		k := strings.IndexByte(line, sep)
		if k < 0 {
			f(j, line)
			return j + 1
		}
		f(j, line[:k])
		line = line[k+1:]
		j++
	}
}

// parseDec reads a plain decimal as typed: an optional '-', an integer part
// ("0" or not starting with 0), then optionally mark and at least one digit;
// at most maxDigits digits; no "-0". m is the value times 10^d.
func parseDec(s string, mark byte) (m int64, d int, ok bool) {
	i := 0
	neg := len(s) > 0 && s[0] == '-'
	if neg {
		i = 1
	}
	start := i
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		m = m*10 + int64(s[i]-'0')
		i++
		if i-start > maxDigits {
			return 0, 0, false
		}
	}
	nint := i - start
	if nint == 0 || nint > 1 && s[start] == '0' {
		return 0, 0, false
	}
	if i < len(s) {
		if s[i] != mark || i+1 == len(s) {
			return 0, 0, false
		}
		i++
		for ; i < len(s); i++ {
			c := s[i]
			if c < '0' || c > '9' || nint+d >= maxDigits {
				return 0, 0, false
			}
			m = m*10 + int64(c-'0')
			d++
		}
	}
	if neg {
		if m == 0 {
			return 0, 0, false
		}
		m = -m
	}
	return m, d, true
}

// appendDec writes m/10^d as typed by parseDec.
func appendDec(b []byte, m int64, d int, mark byte) []byte {
	u := uint64(m)
	if m < 0 {
		b = append(b, '-')
		u = -u
	}
	var buf [24]byte
	s := strconv.AppendUint(buf[:0], u, 10)
	if d == 0 {
		return append(b, s...)
	}
	for len(s) <= d {
		s = append(s, 0)
		copy(s[1:], s)
		s[0] = '0'
	}
	b = append(b, s[:len(s)-d]...)
	b = append(b, mark)
	return append(b, s[len(s)-d:]...)
}

// chooseSep picks the cell separator that codes the first lines cheapest
// (numbers count one byte and a half, other cells their length and one).
func chooseSep(text string) byte {
	sample := text[:min(len(text), 64<<10)]
	best, bestCost := byte(0), math.Inf(1)
	for _, sep := range []byte{0, '\t', ';', ',', '|', ' '} {
		if sep != 0 && strings.IndexByte(sample, sep) < 0 {
			continue
		}
		cost, lines := 0.0, 0
		eachLine(sample, func(line string) bool {
			eachField(line, sep, func(_ int, cell string) {
				if _, _, ok := parseDec(cell, '.'); ok {
					cost += 1.5
				} else if _, _, ok := parseDec(cell, ','); ok && sep != ',' {
					cost += 1.5
				} else {
					cost += float64(len(cell) + 1)
				}
			})
			lines++
			return lines < 2000
		})
		if cost < bestCost {
			best, bestCost = sep, cost
		}
	}
	return best
}

// column gathers one column's cells while encoding.
type column struct {
	point, comma int // cells read as numbers with each mark (pass 1)
	mark         byte
	dmax         int // most decimals of its numbers (pass 1)

	runs    []uint64 // alternate text, number runs; the first is text
	num     bool     // the current run's kind
	texts   []byte   // the text section
	last    string   // the previous text cell
	decRuns []uint64 // pairs (decimals, run)
	vals    []int64  // scaled to dmax decimals
}

func (c *column) add(num bool) {
	if len(c.runs) == 0 {
		c.runs = append(c.runs, 0)
	}
	if num != c.num {
		c.runs = append(c.runs, 0)
		c.num = num
	}
	c.runs[len(c.runs)-1]++
}

// encodeTable codes text in the table form; ok is false when the text does
// not suit it (too many columns). The columns' value sections come last, in
// column order; streams gives their lengths (for the compressor).
func encodeTable(text string) (out []byte, ok bool) {
	out, _, ok = encodeTableStreams(text)
	return out, ok
}

func encodeTableStreams(text string) (out []byte, streams []int, ok bool) {
	if text == "" {
		return nil, nil, false
	}
	sep := chooseSep(text)
	var cols []*column
	var fieldRuns []uint64 // pairs (fields, run)
	tooWide := false
	// Pass 1: line shape, each column's decimal mark and decimals.
	eol, final := eachLine(text, func(line string) bool {
		f := eachField(line, sep, func(j int, cell string) {
			if j >= maxColumns {
				return
			}
			if j == len(cols) {
				cols = append(cols, &column{})
			}
			c := cols[j]
			if _, d, ok := parseDec(cell, '.'); ok {
				c.point++
				if d > 0 {
					c.point++
				}
			}
			if sep != ',' {
				if _, d, ok := parseDec(cell, ','); ok && d > 0 {
					c.comma += 2
				}
			}
		})
		if f > maxColumns {
			tooWide = true
			return false
		}
		if n := len(fieldRuns); n > 0 && fieldRuns[n-2] == uint64(f) {
			fieldRuns[n-1]++
		} else {
			fieldRuns = append(fieldRuns, uint64(f), 1)
		}
		return true
	})
	if tooWide {
		return nil, nil, false
	}
	for _, c := range cols {
		c.mark = '.'
		if c.comma > c.point {
			c.mark = ','
		}
	}
	// Each column's decimals count (the most of its numbers).
	eachLine(text, func(line string) bool {
		eachField(line, sep, func(j int, cell string) {
			c := cols[j]
			if _, d, ok := parseDec(cell, c.mark); ok && d > c.dmax {
				c.dmax = d
			}
		})
		return true
	})
	// Pass 2: cells.
	nlines := 0
	eachLine(text, func(line string) bool {
		nlines++
		eachField(line, sep, func(j int, cell string) {
			c := cols[j]
			m, d, ok := parseDec(cell, c.mark)
			if ok {
				k := c.dmax - d
				if m >= valueLimit/pow10[k] || m <= -valueLimit/pow10[k] {
					ok = false
				} else {
					m *= pow10[k]
				}
			}
			c.add(ok)
			if !ok {
				// Front coding: the bytes shared with the column's
				// previous text cell, then the rest (times, codes).
				k := 0
				for k < len(cell) && k < len(c.last) && cell[k] == c.last[k] {
					k++
				}
				c.texts = binary.AppendUvarint(c.texts, uint64(k))
				c.texts = appendString(c.texts, cell[k:])
				c.last = cell
				return
			}
			c.vals = append(c.vals, m)
			if n := len(c.decRuns); n > 0 && c.decRuns[n-2] == uint64(d) {
				c.decRuns[n-1]++
			} else {
				c.decRuns = append(c.decRuns, uint64(d), 1)
			}
		})
		return true
	})
	var sepByte byte = sep
	out = append(out, eol, b2u(final), sepByte)
	out = binary.AppendUvarint(out, uint64(nlines))
	out = binary.AppendUvarint(out, uint64(len(fieldRuns)/2))
	for _, v := range fieldRuns {
		out = binary.AppendUvarint(out, v)
	}
	var vals [][]byte
	for _, c := range cols {
		out = append(out, c.mark)
		out = binary.AppendUvarint(out, uint64(len(c.runs)))
		for _, v := range c.runs {
			out = binary.AppendUvarint(out, v)
		}
		out = binary.AppendUvarint(out, uint64(len(c.texts)))
		if len(c.vals) > 0 {
			out = binary.AppendUvarint(out, uint64(len(c.decRuns)/2))
			for _, v := range c.decRuns {
				out = binary.AppendUvarint(out, v)
			}
			mode, base, v := codeValues(c.vals)
			out = append(out, mode)
			if mode == modeBase {
				out = binary.AppendVarint(out, base)
			}
			vals = append(vals, v)
			out = binary.AppendUvarint(out, uint64(len(v)))
		}
		out = append(out, c.texts...)
	}
	for _, v := range vals {
		out = append(out, v...)
		streams = append(streams, len(v))
	}
	return out, streams, true
}

func b2u(b bool) byte {
	if b {
		return 1
	}
	return 0
}

// Value codings: differences from the previous value (good for trends,
// counters and data on a coarse grid), or offsets from a base (the
// midrange; good for readings scattered about a centre, where differences
// spread twice as wide).
const (
	modeDelta = 0
	modeBase  = 1
)

// codeValues codes vals both ways as zig-zag varints and keeps the one with
// the lower order-0 entropy of its bytes (what the Huffman stage of flate
// sees), with ties to differences.
func codeValues(vals []int64) (mode byte, base int64, out []byte) {
	delta := make([]byte, 0, len(vals))
	prev := int64(0)
	lo, hi := vals[0], vals[0]
	for _, v := range vals {
		delta = binary.AppendVarint(delta, v-prev)
		prev = v
		lo, hi = min(lo, v), max(hi, v)
	}
	base = lo + (hi-lo)/2
	off := make([]byte, 0, len(vals))
	for _, v := range vals {
		off = binary.AppendVarint(off, v-base)
	}
	if entropyBits(off) < entropyBits(delta) {
		return modeBase, base, off
	}
	return modeDelta, 0, delta
}

func entropyBits(b []byte) float64 {
	var h [256]int
	for _, c := range b {
		h[c]++
	}
	n := float64(len(b))
	bits := 0.0
	for _, k := range h {
		if k > 0 {
			bits -= float64(k) * math.Log2(float64(k)/n)
		}
	}
	return bits
}

// colReader gives one column's cells back while decoding.
type colReader struct {
	mark    byte
	runs    reader // run lengths
	left    uint64 // cells left in the current run
	num     bool
	texts   reader
	last    []byte // the previous text cell
	decRuns reader
	decLeft uint64
	dec     int
	dmax    int
	mode    byte
	prev    int64 // previous value (modeDelta) or the base (modeBase)
	vals    reader
}

var errTable = errors.New("its table of data is not in order")

// next appends the column's next cell to b.
func (c *colReader) next(b []byte) ([]byte, bool) {
	for c.left == 0 {
		if len(c.runs.b) == 0 {
			return b, false
		}
		c.left = c.runs.uvarint()
		c.num = !c.num
	}
	c.left--
	if !c.num {
		k := c.texts.count(len(c.last))
		s := c.texts.bytes(c.texts.count(len(c.texts.b)))
		c.last = append(c.last[:k], s...)
		return append(b, c.last...), !c.texts.bad
	}
	for c.decLeft == 0 {
		if len(c.decRuns.b) == 0 {
			return b, false
		}
		c.dec = int(c.decRuns.byte())
		c.decLeft = c.decRuns.uvarint()
		if c.dec > c.dmax {
			return b, false
		}
	}
	c.decLeft--
	v := c.vals.varint()
	if c.mode == modeDelta {
		c.prev += v
		v = c.prev
	} else {
		v += c.prev
	}
	p := pow10[c.dmax-c.dec]
	if v%p != 0 || c.vals.bad {
		return b, false
	}
	return appendDec(b, v/p, c.dec, c.mark), true
}

// decodeTable gives back the text of a table form of tlen bytes.
func decodeTable(body []byte, tlen int) (string, error) {
	r := &reader{b: body}
	eol := r.byte()
	final := r.byte()
	sep := r.byte()
	nlines := r.count(tlen + 1)
	nruns := r.count(len(r.b))
	if r.bad || eol > eolCR || final > 1 || nlines == 0 {
		return "", errTable
	}
	runs := make([]int, 2*nruns)
	ncols, lines, seps := 0, 0, 0
	for i := 0; i < nruns; i++ {
		f, n := r.count(maxColumns), r.count(nlines)
		if f == 0 || n == 0 {
			return "", errTable
		}
		runs[2*i], runs[2*i+1] = f, n
		ncols = max(ncols, f)
		lines += n
		seps += (f - 1) * n
		if lines > nlines || seps > tlen {
			return "", errTable
		}
	}
	if lines != nlines || (sep == 0) != (ncols == 1) || r.bad {
		return "", errTable
	}
	// Cells per column: lines with more than j fields.
	cells := make([]int, ncols+1)
	for i := 0; i < nruns; i++ {
		cells[runs[2*i]-1] += runs[2*i+1]
	}
	for j := ncols - 1; j > 0; j-- {
		cells[j-1] += cells[j]
	}
	cols := make([]colReader, ncols)
	nv := make([]int, ncols) // bytes of each column's values
	for j := range cols {
		c := &cols[j]
		c.mark = r.byte()
		if c.mark != '.' && c.mark != ',' || c.mark == sep {
			return "", errTable
		}
		nr := r.count(len(r.b))
		start := r.b
		sum := [2]int{}
		for i := 0; i < nr; i++ {
			v := r.count(cells[j])
			if v == 0 && i > 0 {
				return "", errTable
			}
			sum[i%2] += v
		}
		if r.bad || sum[0]+sum[1] != cells[j] {
			return "", errTable
		}
		c.runs = reader{b: start[:len(start)-len(r.b)]}
		c.num = true // flipped to text by the first run
		ntext := r.count(len(r.b))
		nvals := 0
		if sum[1] > 0 {
			nd := r.count(len(r.b))
			start := r.b
			total := 0
			for i := 0; i < nd; i++ {
				d := r.byte()
				n := r.count(sum[1])
				if d > maxDigits || n == 0 {
					return "", errTable
				}
				c.dmax = max(c.dmax, int(d))
				total += n
			}
			if total != sum[1] {
				return "", errTable
			}
			c.decRuns = reader{b: start[:len(start)-len(r.b)]}
			c.mode = r.byte()
			switch c.mode {
			case modeBase:
				c.prev = r.varint()
			case modeDelta:
			default:
				return "", errTable
			}
			nvals = r.count(len(r.b))
		}
		c.texts = reader{b: r.bytes(ntext)}
		nv[j] = nvals
		if r.bad {
			return "", errTable
		}
	}
	for j := range cols {
		c := &cols[j]
		c.vals = reader{b: r.bytes(nv[j])}
		if r.bad {
			return "", errTable
		}
	}
	if len(r.b) != 0 {
		return "", errTable
	}
	out := make([]byte, 0, tlen)
	eolb := eolText[eol]
	line := 0
	for i := 0; i < nruns; i++ {
		f, n := runs[2*i], runs[2*i+1]
		for ; n > 0; n-- {
			for j := 0; j < f; j++ {
				if j > 0 {
					out = append(out, sep)
				}
				var ok bool
				if out, ok = cols[j].next(out); !ok || len(out) > tlen {
					return "", errTable
				}
			}
			line++
			if line < nlines || final == 1 {
				out = append(out, eolb...)
			}
			if len(out) > tlen {
				return "", errTable
			}
		}
	}
	for j := range cols {
		c := &cols[j]
		if c.left != 0 || len(c.runs.b) != 0 || len(c.texts.b) != 0 || len(c.vals.b) != 0 || c.decLeft != 0 || len(c.decRuns.b) != 0 {
			return "", errTable
		}
	}
	if len(out) != tlen {
		return "", errTable
	}
	return string(out), nil
}
