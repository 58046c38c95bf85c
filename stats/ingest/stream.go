package ingest

import (
	"bytes"
	"encoding/binary"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"math/bits"
	"strings"
	"unicode/utf8"
	"unsafe"
)

// SniffBytes is how much text the layout is decided from. It is a
// constant so that chunked and whole reads of one input decide the same.
const SniffBytes = 256 << 10

// MaxProblems caps the problem list; the count of the rest is in
// Table.Unlisted and in a last problem saying so.
const MaxProblems = 20000

type encoding uint8

const (
	encUTF8 encoding = iota
	encUTF8BOM
	encUTF16LE
	encUTF16BE
)

// Stream reads an input given in chunks (File.stream() on the page). Write
// chunks split anywhere, watch Progress, then Finish. To cancel, stop
// writing and drop the Stream.
type Stream struct {
	opt    ReadOptions
	sniffN int // SniffBytes; smaller in tests
	total  int64
	err    error
	done   bool

	// before the layout is known
	sniffed    bool
	encKnown   bool
	raw        []byte // bytes before the encoding is known
	ptext      []byte // decoded text before the layout is known
	sawBreak   bool
	secondLine bool

	// decoding
	enc  encoding
	skip int    // BOM bytes still to skip
	half []byte // an odd byte of UTF-16
	hi   rune   // a pending high surrogate
	u16  []byte

	sp  splitter
	lay layout
	row int

	tab     *Table
	cols    []*Column
	rows    []int32
	pend    []int32 // empty rows not yet known to be inside the table
	fields  [][]byte
	scratch []byte
	conv    []byte
	latin1  int
	longest int
	// quoted-record bookkeeping for the unclosed-quote problem
	recStart int
	// decoded text kept for ReadOptions.KeepText
	kept     []byte
	keepOver bool
}

// NewStream starts a chunked read.
func NewStream(opt ReadOptions) *Stream {
	s := &Stream{opt: opt, tab: &Table{}, sniffN: SniffBytes}
	s.sp.emit = s.onRecord
	return s
}

// Progress is the number of bytes written so far.
func (s *Stream) Progress() int64 { return s.total }

// Write feeds the next chunk. It returns an error as soon as the input is
// known to be unreadable (a PDF, a binary file...); the same error is
// returned by Finish.
func (s *Stream) Write(p []byte) (int, error) {
	if s.err != nil {
		return 0, s.err
	}
	if s.done {
		return 0, errors.New("ingest: write after Finish")
	}
	s.total += int64(len(p))
	if s.sniffed {
		s.feed(p)
		return len(p), s.err
	}
	if !s.encKnown {
		// the encoding is decided from the first lim bytes
		if len(s.raw)+len(p) < s.lim() {
			s.raw = append(s.raw, p...)
			return len(p), nil
		}
		if len(s.raw) > 0 {
			s.raw = append(s.raw, p...)
			p = s.raw
		}
		if !s.decideEncoding(p) {
			return 0, s.err
		}
		s.raw = nil
	}
	text := s.decode(p)
	s.watch(text)
	if len(s.ptext) == 0 && len(text) >= s.sniffN/2 && s.secondLine {
		// the whole window is in this chunk: no copy
		s.sniff(text, false)
		if s.err == nil {
			s.sp.feed(text)
		}
		return len(p), s.err
	}
	s.ptext = append(s.ptext, text...)
	if len(s.ptext) >= s.sniffN/2 && s.secondLine {
		s.sniff(s.ptext, false)
		if s.err == nil {
			s.sp.feed(s.ptext)
		}
		s.ptext = nil
		return len(p), s.err
	}
	return len(p), nil
}

// lim is the length of the samples taken before the layout is known: no
// chunking has less than this when the decisions are made.
func (s *Stream) lim() int { return min(4096, s.sniffN/4) }

// decideEncoding looks at the first bytes: file types that are not text,
// byte-order marks, UTF-16 without a mark.
func (s *Stream) decideEncoding(raw []byte) bool {
	s.encKnown = true
	if err := magic(raw); err != nil {
		s.err = err
		return false
	}
	s.enc, s.skip = detectEncoding(raw, s.lim())
	s.tab.Format.Encoding = map[encoding]string{encUTF8: "utf-8", encUTF8BOM: "utf-8 with BOM", encUTF16LE: "utf-16le", encUTF16BE: "utf-16be"}[s.enc]
	return true
}

func (s *Stream) writeString(text string) {
	if len(text) == 0 {
		return
	}
	// The reader never writes to its input: reading the string's bytes in
	// place avoids copying a large paste.
	_, _ = s.Write(unsafe.Slice(unsafe.StringData(text), len(text)))
}

// watch notes whether a second non-empty line has started (in decoded text).
func (s *Stream) watch(p []byte) {
	if s.secondLine {
		return
	}
	for _, c := range p {
		switch c {
		case '\n', '\r':
			s.sawBreak = true
		case ' ', '\t', '\f', '\v':
		default:
			if s.sawBreak {
				s.secondLine = true
				return
			}
		}
	}
}

// Finish ends the input and returns the table.
func (s *Stream) Finish() (*Table, error) {
	if s.err != nil {
		return nil, s.err
	}
	if s.done {
		return nil, errors.New("ingest: Finish called twice")
	}
	s.done = true
	if !s.sniffed {
		if !s.encKnown {
			if !s.decideEncoding(s.raw) {
				return nil, s.err
			}
			s.ptext = append(s.ptext, s.decode(s.raw)...)
			s.raw = nil
		}
		s.ptext = append(s.ptext, s.decodeTail()...)
		s.sniff(s.ptext, true)
		if s.err != nil {
			return nil, s.err
		}
		s.sp.feed(s.ptext)
		s.ptext = nil
	} else {
		s.sp.feed(s.decodeTail())
	}
	s.sp.finish()
	if s.err != nil {
		return nil, s.err
	}
	return s.finishTable()
}

// decodeTail is the end of a UTF-16 input cut inside a character.
func (s *Stream) decodeTail() []byte {
	if len(s.half) > 0 || s.hi != 0 {
		s.half, s.hi = nil, 0
		return s.capture(utf8.AppendRune(nil, utf8.RuneError))
	}
	return nil
}

// capture keeps a copy of decoded text when ReadOptions.KeepText asks for
// it, up to that many bytes; beyond, nothing is kept.
func (s *Stream) capture(text []byte) []byte {
	if s.opt.KeepText > 0 && !s.keepOver {
		if int64(len(s.kept)+len(text)) > s.opt.KeepText {
			s.kept, s.keepOver = nil, true
		} else {
			s.kept = append(s.kept, text...)
		}
	}
	return text
}

// decode turns raw bytes into UTF-8 text (the result may be p itself, or a
// buffer reused by the next call).
func (s *Stream) decode(p []byte) []byte {
	if s.skip > 0 {
		n := min(s.skip, len(p))
		p = p[n:]
		s.skip -= n
	}
	switch s.enc {
	case encUTF16LE, encUTF16BE:
		s.u16 = s.decode16(s.u16[:0], p)
		return s.capture(s.u16)
	}
	return s.capture(p)
}

// feed decodes raw bytes and passes the text to the record splitter.
func (s *Stream) feed(p []byte) { s.sp.feed(s.decode(p)) }

// decode16 appends the UTF-8 form of UTF-16 bytes, keeping an odd byte and
// a high surrogate for the next chunk.
func (s *Stream) decode16(dst, p []byte) []byte {
	if len(s.half) == 1 && len(p) > 0 {
		pair := [2]byte{s.half[0], p[0]}
		s.half = s.half[:0]
		dst = s.unit16(dst, pair[:])
		p = p[1:]
	}
	for len(p) >= 2 {
		dst = s.unit16(dst, p[:2])
		p = p[2:]
	}
	if len(p) == 1 {
		s.half = append(s.half[:0], p[0])
	}
	return dst
}

func (s *Stream) unit16(dst, b []byte) []byte {
	var u rune
	if s.enc == encUTF16LE {
		u = rune(b[0]) | rune(b[1])<<8
	} else {
		u = rune(b[1]) | rune(b[0])<<8
	}
	if s.hi != 0 {
		hi := s.hi
		s.hi = 0
		if u >= 0xDC00 && u <= 0xDFFF {
			return utf8.AppendRune(dst, 0x10000+(hi-0xD800)<<10+(u-0xDC00))
		}
		dst = utf8.AppendRune(dst, utf8.RuneError)
	}
	switch {
	case u >= 0xD800 && u <= 0xDBFF:
		s.hi = u
		return dst
	case u >= 0xDC00 && u <= 0xDFFF:
		return utf8.AppendRune(dst, utf8.RuneError)
	case u < 0x80:
		return append(dst, byte(u))
	}
	return utf8.AppendRune(dst, u)
}

// windows1252 maps 0x80..0x9F; other bytes are Latin-1.
var windows1252 = [32]rune{
	0x20AC, 0xFFFD, 0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021, 0x02C6, 0x2030, 0x0160, 0x2039, 0x0152, 0xFFFD, 0x017D, 0xFFFD,
	0xFFFD, 0x2018, 0x2019, 0x201C, 0x201D, 0x2022, 0x2013, 0x2014, 0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0xFFFD, 0x017E, 0x0178,
}

func fromWindows1252(dst, p []byte) []byte {
	for _, c := range p {
		switch {
		case c < 0x80:
			dst = append(dst, c)
		case c < 0xA0:
			dst = utf8.AppendRune(dst, windows1252[c-0x80])
		default:
			dst = utf8.AppendRune(dst, rune(c))
		}
	}
	return dst
}

// splitter cuts decoded text into records: lines, except that a quoted
// field may hold line breaks. CR, LF and CRLF all end a line.
type splitter struct {
	brk, other byte // the break searched for first, and the other one
	sep        byte
	skipLF     bool
	carry      []byte
	inQ        bool
	rec        []byte
	unclosed   bool
	emit       func(rec []byte, quoted bool)
	// fast, when set, takes plain lines (no quote, CR alone or non-ASCII
	// byte) from the start of data and returns the bytes it consumed.
	fast func(data []byte) int
}

func (sp *splitter) feed(data []byte) {
	for len(data) > 0 {
		if sp.fast != nil && len(sp.carry) == 0 && !sp.inQ && !sp.skipLF {
			data = data[sp.fast(data):]
			if len(data) == 0 {
				return
			}
		}
		if sp.skipLF {
			sp.skipLF = false
			if data[0] == '\n' {
				data = data[1:]
				continue
			}
		}
		i := bytes.IndexByte(data, sp.brk)
		if i < 0 {
			sp.carry = append(sp.carry, data...)
			return
		}
		line := data[:i]
		data = data[i+1:]
		if len(sp.carry) > 0 {
			sp.carry = append(sp.carry, line...)
			line = sp.carry
		}
		if sp.brk == '\r' {
			sp.skipLF = true
		}
		sp.phys(line)
		sp.carry = sp.carry[:0]
	}
}

func (sp *splitter) finish() {
	if len(sp.carry) > 0 {
		sp.phys(sp.carry)
		sp.carry = sp.carry[:0]
	}
	if sp.inQ {
		sp.inQ = false
		sp.unclosed = true
		sp.emit(sp.rec, true)
		sp.unclosed = false
		sp.rec = sp.rec[:0]
	}
}

func (sp *splitter) phys(line []byte) {
	if sp.brk == '\n' && len(line) > 0 && line[len(line)-1] == '\r' {
		line = line[:len(line)-1]
	}
	for {
		k := bytes.IndexByte(line, sp.other)
		if k < 0 {
			sp.line(line)
			return
		}
		sp.line(line[:k])
		line = line[k+1:]
	}
}

func (sp *splitter) line(l []byte) {
	if sp.inQ {
		sp.rec = append(sp.rec, '\n')
		sp.rec = append(sp.rec, l...)
		if !quoteOpen(l, sp.sep, true) {
			sp.inQ = false
			sp.emit(sp.rec, true)
			sp.rec = sp.rec[:0]
		}
		return
	}
	if bytes.IndexByte(l, '"') < 0 {
		sp.emit(l, false)
		return
	}
	if quoteOpen(l, sp.sep, false) {
		sp.inQ = true
		sp.rec = append(sp.rec[:0], l...)
		return
	}
	sp.emit(l, true)
}

func isSep(c, sep byte) bool {
	if sep == ' ' {
		return c == ' ' || c == '\t'
	}
	return c == sep && sep != 0
}

// quoteOpen reports whether a quoted field is still open at the end of l
// (RFC 4180 quoting: a quote opens a field only at its start, after
// optional spaces; "" inside a quoted field is a quote).
func quoteOpen(l []byte, sep byte, inQ bool) bool {
	atStart := !inQ
	for i := 0; i < len(l); i++ {
		c := l[i]
		if inQ {
			if c == '"' {
				if i+1 < len(l) && l[i+1] == '"' {
					i++
				} else {
					inQ = false
				}
			}
			continue
		}
		switch {
		case c == '"' && atStart:
			inQ = true
			atStart = false
		case isSep(c, sep):
			atStart = true
		case c == ' ' && atStart:
		default:
			atStart = false
		}
	}
	return inQ
}

// splitPlain splits an unquoted record into fields.
func splitPlain(rec []byte, sep byte, out [][]byte) [][]byte {
	out = out[:0]
	switch sep {
	case 0:
		return append(out, rec)
	case ' ':
		i := 0
		for {
			for i < len(rec) && (rec[i] == ' ' || rec[i] == '\t') {
				i++
			}
			if i >= len(rec) {
				break
			}
			j := i
			for j < len(rec) && rec[j] != ' ' && rec[j] != '\t' {
				j++
			}
			out = append(out, rec[i:j])
			i = j
		}
		if len(out) == 0 {
			out = append(out, rec[:0])
		}
		return out
	}
	for {
		k := bytes.IndexByte(rec, sep)
		if k < 0 {
			return append(out, rec)
		}
		out = append(out, rec[:k])
		rec = rec[k+1:]
	}
}

// splitQuoted splits a record holding quotes: encoding/csv for character
// separators, the same rules by hand for spaces and for a single column.
func splitQuoted(rec []byte, sep byte, out [][]byte) [][]byte {
	out = out[:0]
	if sep != 0 && sep != ' ' {
		if fs, ok := csvFields(rec, sep); ok {
			for _, f := range fs {
				out = append(out, []byte(f))
			}
			return out
		}
	}
	var cur []byte
	inQ, atStart, quoted := false, true, false
	flush := func() {
		out = append(out, cur)
		cur = nil
		atStart, quoted = true, false
	}
	for i := 0; i < len(rec); i++ {
		c := rec[i]
		if inQ {
			if c == '"' {
				if i+1 < len(rec) && rec[i+1] == '"' {
					cur = append(cur, '"')
					i++
				} else {
					inQ = false
				}
				continue
			}
			cur = append(cur, c)
			continue
		}
		switch {
		case c == '"' && atStart && len(bytes.TrimSpace(cur)) == 0:
			inQ, atStart, quoted = true, false, true
			cur = cur[:0]
		case isSep(c, sep):
			if sep == ' ' && len(cur) == 0 && !quoted {
				continue // a run of spaces
			}
			flush()
		default:
			if c != ' ' {
				atStart = false
			}
			cur = append(cur, c)
		}
	}
	if len(cur) > 0 || quoted || len(out) == 0 || sep != ' ' {
		flush()
	}
	return out
}

// onRecord receives each record from the splitter.
func (s *Stream) onRecord(rec []byte, quoted bool) {
	s.row++
	row := s.row
	if len(rec) > s.longest {
		s.longest = len(rec)
	}
	if !utf8.Valid(rec) {
		s.conv = fromWindows1252(s.conv[:0], rec)
		rec = s.conv
		s.latin1++
		if s.latin1 == 1 {
			s.problem(Problem{Row: row, Kind: KindEncoding, Reason: "text is not valid UTF-8", Action: "read as Windows-1252 (Latin-1); check special characters such as µ or °"})
		}
	}
	if row <= HeadRows {
		s.head(row, rec, quoted)
	}
	if s.sp.unclosed {
		s.problem(Problem{Row: row, Kind: KindQuote, Text: shorten(rec), Reason: "a quote opened in this row is never closed", Action: "the rest of the input was read as this row"})
	}
	if row < s.lay.dataStart {
		if row != s.lay.headerRow && !blank(rec) {
			s.tab.notes++
			s.problem(Problem{Row: row, Kind: KindNote, Text: shorten(rec), Reason: "line above the table", Action: "skipped"})
		}
		return
	}
	if quoted {
		s.fields = splitQuoted(rec, s.lay.sep, s.fields)
	} else {
		s.fields = splitPlain(rec, s.lay.sep, s.fields)
	}
	s.data(row, s.fields)
}

// head keeps record row of the first HeadRows as the reader splits it,
// for the page's preview.
func (s *Stream) head(row int, rec []byte, quoted bool) {
	var fs [][]byte
	if quoted {
		fs = splitQuoted(rec, s.lay.sep, nil)
	} else {
		fs = splitPlain(rec, s.lay.sep, nil)
	}
	cells := make([]string, len(fs))
	for i, f := range fs {
		cells[i] = string(trimASCII(f))
	}
	s.tab.Head = append(s.tab.Head, HeadRow{Row: row, Cells: cells})
}

func blank(b []byte) bool {
	for _, c := range b {
		if c != ' ' && c != '\t' {
			return false
		}
	}
	return true
}

func blankFields(fs [][]byte) bool {
	for _, f := range fs {
		if !blank(f) {
			return false
		}
	}
	return true
}

func shorten(b []byte) string {
	const max = 120
	if len(b) <= max {
		return string(b)
	}
	cut := max
	for cut > 0 && !utf8.RuneStart(b[cut]) {
		cut--
	}
	return string(b[:cut]) + fmt.Sprintf("... (%d bytes)", len(b))
}

func (s *Stream) problem(p Problem) {
	t := s.tab
	if len(t.Problems) >= MaxProblems {
		t.Unlisted++
		return
	}
	t.Problems = append(t.Problems, p)
}

// data adds one record of the table.
func (s *Stream) data(row int, fields [][]byte) {
	if s.lay.transpose {
		s.transposed(row, fields)
		return
	}
	if blankFields(fields) {
		s.pend = append(s.pend, int32(row))
		return
	}
	if len(s.pend) > 0 {
		s.flushEmpty()
	}
	s.rows = append(s.rows, int32(row))
	for j, c := range s.cols {
		if j < len(fields) {
			s.cell(c, fields[j], row)
		} else {
			s.absent(c, row)
		}
	}
	for j := len(s.cols); j < len(fields); j++ {
		if !blank(fields[j]) {
			s.tab.extra++
			s.problem(Problem{Row: row, Col: j + 1, Text: shorten(bytes.TrimSpace(fields[j])), Kind: KindExtra,
				Reason: "cell to the right of the last column", Action: "left out"})
		}
	}
}

// flushEmpty adds the empty rows seen inside the table.
func (s *Stream) flushEmpty() {
	for _, r := range s.pend {
		s.rows = append(s.rows, r)
		for _, c := range s.cols {
			c.appendEmpty()
		}
		if len(s.cols) == 1 {
			c := s.cols[0]
			s.problem(Problem{Row: int(r), Col: c.Position, Column: c.Name, Kind: KindMissing, Reason: "empty cell", Action: "counted as missing"})
		} else {
			s.problem(Problem{Row: int(r), Kind: KindMissing, Reason: "empty row", Action: "counted as missing in every column"})
		}
	}
	s.pend = s.pend[:0]
}

// appendEmpty adds one empty (missing) cell to c.
func (c *Column) appendEmpty() {
	c.Values = append(c.Values, math.NaN())
	c.Dec = append(c.Dec, -1)
	if c.lab != nil {
		c.lab = append(c.lab, -1)
	}
	c.Missing++
	c.Empty++
}

func (s *Stream) absent(c *Column, row int) {
	c.appendEmpty()
	s.problem(Problem{Row: row, Col: c.Position, Column: c.Name, Kind: KindMissing, Reason: "no cell: the row is shorter than the header", Action: "counted as missing"})
}

func trimASCII(b []byte) []byte {
	for len(b) > 0 && (b[0] == ' ' || b[0] == '\t') {
		b = b[1:]
	}
	for len(b) > 0 && (b[len(b)-1] == ' ' || b[len(b)-1] == '\t') {
		b = b[:len(b)-1]
	}
	return b
}

// cell adds one cell to column c.
func (s *Stream) cell(c *Column, b []byte, row int) {
	b = trimASCII(b)
	if c.num {
		if v, d, canon, ok := fastDecimal(b, c.mark); ok {
			if !canon {
				c.keep(len(c.Values), unsafe.String(unsafe.SliceData(b), len(b)))
			}
			c.Values = append(c.Values, v)
			c.Dec = append(c.Dec, d)
			c.Numbers++
			return
		}
	}
	// str aliases the input: clone it before keeping it
	str := trimCell(unsafe.String(unsafe.SliceData(b), len(b)))
	i := len(c.Values)
	if reason, ok := missingToken(str); ok {
		c.Values = append(c.Values, math.NaN())
		c.Dec = append(c.Dec, -1)
		if c.lab != nil {
			c.lab = append(c.lab, -1)
		}
		c.Missing++
		if str == "" {
			c.Empty++
		} else {
			c.keep(i, str)
		}
		s.problem(Problem{Row: row, Col: c.Position, Column: c.Name, Text: strings.Clone(str), Kind: KindMissing, Reason: reason, Action: "counted as missing"})
		return
	}
	switch c.Kind {
	case "text":
		c.Values = append(c.Values, math.NaN())
		c.Dec = append(c.Dec, -1)
		l, ok := c.labMap[str]
		if !ok {
			l = int32(len(c.labels))
			str = strings.Clone(str)
			c.labels = append(c.labels, str)
			c.labMap[str] = l
		}
		c.lab = append(c.lab, l)
		return
	case "time":
		c.keep(i, str)
		if dc, ok := parseDate(str); ok {
			if v, ok := dc.resolve(c.DateOrder != "month-first"); ok {
				c.Values = append(c.Values, v)
				c.Dec = append(c.Dec, -1)
				c.Numbers++
				return
			}
		}
		c.Values = append(c.Values, math.NaN())
		c.Dec = append(c.Dec, -1)
		c.Bad++
		s.problem(Problem{Row: row, Col: c.Position, Column: c.Name, Text: strings.Clone(str), Kind: KindNotTime, Reason: "not a date or time in the column's form", Action: "left out"})
		return
	}
	r := parseNumber(str, c.mark, &s.scratch)
	if r.reason == "" && c.MixedDecimal && strictMixed(str, c.mark) {
		r = numResult{reason: "thousands separator or decimal mark? the column mixes both marks", kind: KindDecimalMark}
	}
	if r.reason == "" && r.unit != "" && c.Unit != "" && !sameUnit(r.unit, c.Unit) {
		r = numResult{reason: "unit " + r.unit + " differs from the column's unit " + c.Unit, kind: KindUnit}
	}
	c.keep(i, str)
	if r.reason != "" {
		c.Values = append(c.Values, math.NaN())
		c.Dec = append(c.Dec, -1)
		c.Bad++
		s.problem(Problem{Row: row, Col: c.Position, Column: c.Name, Text: strings.Clone(str), Kind: r.kind, Reason: r.reason, Action: "left out"})
		return
	}
	c.Values = append(c.Values, r.v)
	c.Dec = append(c.Dec, r.dec)
	c.Numbers++
}

// strictMixed: in a column that mixes marks, a number with the other mark
// as its only separator ("12.345" among decimal commas) is not trusted.
func strictMixed(s string, mark byte) bool {
	other := byte(',')
	if mark == ',' {
		other = '.'
	}
	p, _ := splitNumber(s)
	return bytes.Count([]byte(p.body), []byte{other}) == 1 && bytes.IndexByte([]byte(p.body), mark) < 0
}

func sameUnit(a, b string) bool {
	units := knownUnits()
	la, lb := units[strings.ToLower(a)], units[strings.ToLower(b)]
	return a == b || (la != "" && la == lb)
}

// transposed adds one line of values as cells of the single column.
func (s *Stream) transposed(row int, fields [][]byte) {
	if blankFields(fields) {
		return
	}
	c := s.cols[0]
	for j, f := range fields {
		if j == 0 && s.lay.transposeName {
			continue
		}
		if s.lay.sep == ' ' && blank(f) {
			continue
		}
		s.rows = append(s.rows, int32(row))
		c.Cols = append(c.Cols, int32(j+1))
		save := c.Position
		c.Position = j + 1
		s.cell(c, f, row)
		c.Position = save
	}
}

// csvFields splits one quoted record with encoding/csv (lazy quotes, any
// number of fields). Should csv see more than one record in it, their
// fields are joined so that nothing is lost.
func csvFields(rec []byte, sep byte) ([]string, bool) {
	r := csv.NewReader(bytes.NewReader(rec))
	r.Comma = rune(sep)
	r.LazyQuotes = true
	r.FieldsPerRecord = -1
	var out []string
	for {
		fs, err := r.Read()
		if errors.Is(err, io.EOF) {
			return out, len(out) > 0
		}
		if err != nil {
			return nil, false
		}
		out = append(out, fs...)
	}
}

// fastLines is the splitter's fast path for LF and CRLF text: whole plain
// lines go straight to the table, as onRecord would take them.
func (s *Stream) fastLines(data []byte) int {
	if s.row+1 < s.lay.dataStart || s.lay.transpose {
		return 0
	}
	var one *Column
	if s.lay.sep == 0 && len(s.cols) == 1 {
		one = s.cols[0]
	}
	// several columns of numbers apart by a character: decimalRows
	wide := s.lay.sep != 0 && s.lay.sep != ' ' && len(s.cols) >= 1 && len(s.cols) <= maxWide
	for _, c := range s.cols {
		wide = wide && c.num
	}
	pos := 0
	for {
		if len(s.pend) == 0 && s.row >= HeadRows && !generalPaths {
			if one != nil && one.num {
				pos += s.decimalLines(one, data[pos:])
			} else if wide {
				pos += s.decimalRows(data[pos:])
			}
		}
		rest := data[pos:]
		i := 0
		for i < len(rest) {
			c := rest[i]
			if c == '\n' || c == '"' || c == '\r' || c >= 0x80 {
				break
			}
			i++
		}
		if i == len(rest) {
			return pos
		}
		next := i + 1
		switch rest[i] {
		case '\n':
		case '\r':
			if i+1 == len(rest) || rest[i+1] != '\n' {
				return pos
			}
			next = i + 2
		default:
			return pos
		}
		s.row++
		if i > s.longest {
			s.longest = i
		}
		if s.row <= HeadRows {
			s.head(s.row, rest[:i], false)
		}
		if one != nil && len(s.pend) == 0 && !blank(rest[:i]) {
			// one column: what data would do for a single field
			s.rows = append(s.rows, int32(s.row))
			s.cell(one, rest[:i], s.row)
		} else {
			s.fields = splitPlain(rest[:i], s.lay.sep, s.fields)
			s.data(s.row, s.fields)
		}
		pos += next
	}
}

// decimalLines is fastLines' inner loop for one column of numbers: it takes
// the lines from the start of data that are plain decimals in the column's
// form (what fastDecimal accepts, in canonical form) ended by LF or CRLF,
// parses each in the same pass that finds its end, and returns the bytes
// it consumed. The result is what fastLines would do with each line (no
// head row, no pending empty rows, nothing kept as text).
//
// Go's WebAssembly code spills values to memory and takes every branch
// through a dispatch table, so the loop keeps few values live (the rows
// are appended after it; s.longest is left alone: it only serves inputs of
// one or two rows, and this runs from row HeadRows+1 on lines of at most
// 17 bytes) and reads the digits 8 bytes at a time (digits8) where it can.
func (s *Stream) decimalLines(c *Column, data []byte) int {
	const ones, highs = 0x0101010101010101, 0x8080808080808080
	vals, decs := c.Values, c.Dec
	n0 := len(vals)
	mark := c.mark
	pos := 0
	for pos < len(data) {
		var m uint64
		dec, next := 0, 0
		done := false // the 8-byte step decided the line
		if pos+18 <= len(data) {
			p := pos
			if data[p] == '-' {
				p++
			}
			// x holds digits as 0..9; k counts the leading ones (8: all)
			x := binary.LittleEndian.Uint64(data[p:]) ^ (0x30 * ones)
			k := bits.TrailingZeros64((((x&(0x7f*ones))+(0x76*ones))|x)&highs) >> 3
			if k == 0 || (k > 1 && byte(x) == 0) {
				break // no digit, or a leading zero
			}
			if k < 8 {
				m = digits8(x << (64 - 8*k))
				q := p + k
				fracOK := true
				if data[q] == mark {
					x = binary.LittleEndian.Uint64(data[q+1:]) ^ (0x30 * ones)
					f := bits.TrailingZeros64((((x&(0x7f*ones))+(0x76*ones))|x)&highs) >> 3
					if f == 0 {
						break // a mark without decimals
					}
					fracOK = f < 8
					if fracOK {
						m = m*uint64(pow10[f]) + digits8(x<<(64-8*f))
						dec = f
						q += 1 + f
					}
				}
				if fracOK {
					if data[q] == '\n' {
						next = q + 1
					} else if data[q] == '\r' && data[q+1] == '\n' {
						next = q + 2
					} else {
						break
					}
					done = true
				}
			}
		}
		if !done {
			m = 0
			i := pos
			if data[i] == '-' {
				i++
			}
			start := i
			for i < len(data) {
				d := data[i] - '0'
				if d >= 10 {
					break
				}
				m = m*10 + uint64(d)
				i++
			}
			intDigits := i - start
			// fastDecimal's canonical form: digits, no leading zero
			if intDigits == 0 || (intDigits > 1 && data[start] == '0') {
				break
			}
			if i < len(data) && data[i] == mark {
				i++
				fs := i
				for i < len(data) {
					d := data[i] - '0'
					if d >= 10 {
						break
					}
					m = m*10 + uint64(d)
					i++
				}
				dec = i - fs
				if dec == 0 {
					break
				}
			}
			// fastDecimal's limit (its limit of 17 bytes follows from it)
			if intDigits+dec > 15 || i >= len(data) {
				break
			}
			next = i + 1
			if data[i] != '\n' {
				if data[i] != '\r' || i+1 >= len(data) || data[i+1] != '\n' {
					break
				}
				next = i + 2
			}
		}
		v := float64(m)
		if dec > 0 {
			v /= pow10[dec]
		}
		if data[pos] == '-' {
			v = -v
		}
		vals = append(vals, v)
		decs = append(decs, int8(dec))
		pos = next
	}
	k := len(vals) - n0
	rows := s.rows
	for j := 1; j <= k; j++ {
		rows = append(rows, int32(s.row+j))
	}
	c.Numbers += k
	c.Values, c.Dec, s.rows = vals, decs, rows
	s.row += k
	return pos
}

// digits8 is the number written by the 8 digits (0..9, not ASCII) of x,
// the first digit in the lowest byte (a little-endian load of the text,
// shifted so that missing leading digits are zeros): pairs, then quads,
// then the whole, by multiplications (the SWAR method, as in Lemire 2018,
// "Faster integer parsing", with 64-bit wraparound).
func digits8(x uint64) uint64 {
	x = x*10 + x>>8
	x = ((x&0x000000ff000000ff)*(100+1000000<<32) + (x>>16&0x000000ff000000ff)*(1+10000<<32)) >> 32
	return x & 0xffffffff
}

// generalPaths, set by tests, turns the fast paths off (plainRecords and
// plainCells in the sniffing, decimalLines and decimalRows): the window is
// cut by the splitter and every cell goes through cell, the general path
// they are compared with.
var generalPaths bool

// maxWide is the most columns decimalRows reads.
const maxWide = 16

// decimalRows is decimalLines for the columns of numbers of a table apart
// by a character (tab, comma, semicolon, pipe): it takes the lines from the
// start of data that hold exactly one plain decimal per column, each in its
// column's form (what fastDecimal accepts, in canonical form; a decimal
// comma never in a comma-separated line, where the comma ends the cell),
// ended by LF or CRLF, and returns the bytes it consumed. The result is
// what fastLines, data and cell would do with each line.
func (s *Stream) decimalRows(data []byte) int {
	cols := s.cols
	nc := len(cols)
	if nc > maxWide {
		return 0
	}
	var vs [maxWide]float64
	var ds [maxWide]int8
	sep := s.lay.sep
	rows := 0
	pos := 0
	for pos < len(data) {
		i := pos
		j := 0
		for ; j < nc; j++ {
			mark := cols[j].mark
			neg := i < len(data) && data[i] == '-'
			if neg {
				i++
			}
			start := i
			var m uint64
			for i < len(data) {
				d := data[i] - '0'
				if d >= 10 {
					break
				}
				m = m*10 + uint64(d)
				i++
			}
			intDigits := i - start
			if intDigits == 0 || (intDigits > 1 && data[start] == '0') {
				break
			}
			dec := 0
			if i < len(data) && data[i] == mark && mark != sep {
				i++
				fs := i
				for i < len(data) {
					d := data[i] - '0'
					if d >= 10 {
						break
					}
					m = m*10 + uint64(d)
					i++
				}
				dec = i - fs
				if dec == 0 {
					break
				}
			}
			if intDigits+dec > 15 {
				break
			}
			if j < nc-1 {
				if i >= len(data) || data[i] != sep {
					break
				}
				i++
			}
			v := float64(m)
			if dec > 0 {
				v /= pow10[dec]
			}
			if neg {
				v = -v
			}
			vs[j], ds[j] = v, int8(dec)
		}
		if j < nc || i >= len(data) {
			break
		}
		next := i + 1
		if data[i] != '\n' {
			if data[i] != '\r' || i+1 >= len(data) || data[i+1] != '\n' {
				break
			}
			next = i + 2
		}
		rows++
		s.rows = append(s.rows, int32(s.row+rows))
		for k, c := range cols {
			c.Values = append(c.Values, vs[k])
			c.Dec = append(c.Dec, ds[k])
			c.Numbers++
		}
		pos = next
	}
	s.row += rows
	return pos
}
