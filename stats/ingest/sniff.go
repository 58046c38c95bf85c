package ingest

import (
	"bytes"
	"errors"
	"fmt"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"
)

// layout is what the sniffing decided.
type layout struct {
	brk           byte
	sep           byte // '\t', ',', ';', '|', ' ' (runs of spaces), 0 (none)
	headerRow     int
	dataStart     int
	transpose     bool
	transposeName bool
}

// cell classes in the sniffing window
type cls uint8

const (
	cMissing cls = iota
	cNumber
	cTime
	cText
)

type sniffCell struct {
	text string
	cls  cls
	ev   markEvidence
	unit string
	date *dateCell
}

// sniffRec is one record of the window: its cells are
// sniffWin.cells[first:first+n].
type sniffRec struct {
	row      int
	first, n int32
	blank    bool
}

// cellRec is a classified cell of the window kept without pointers (the
// window's records and cells are most of what reading a short paste
// allocates and writes): its text is win[off:off+n], or, when aux > 0,
// the text, unit and date are in sniffWin.extra[aux-1].
type cellRec struct {
	off, n uint32
	aux    int32
	cls    cls
	ev     markEvidence
}

type cellExtra struct {
	text, unit string
	date       *dateCell
}

// sniffWin holds the classified cells of the window's records.
type sniffWin struct {
	win   []byte
	cells []cellRec
	extra []cellExtra
}

// add stores x, its text in extra.
func (w *sniffWin) add(x sniffCell) {
	w.extra = append(w.extra, cellExtra{text: x.text, unit: x.unit, date: x.date})
	w.cells = append(w.cells, cellRec{cls: x.cls, ev: x.ev, aux: int32(len(w.extra))})
}

// of returns the cells of r.
func (w *sniffWin) of(r sniffRec) []cellRec { return w.cells[r.first : r.first+r.n] }

// cell returns c as classify gave it.
func (w *sniffWin) cell(c *cellRec) sniffCell {
	if c.aux > 0 {
		e := &w.extra[c.aux-1]
		return sniffCell{text: e.text, cls: c.cls, ev: c.ev, unit: e.unit, date: e.date}
	}
	return sniffCell{text: w.text(c), cls: c.cls, ev: c.ev}
}

// text returns c's text.
func (w *sniffWin) text(c *cellRec) string {
	if c.aux > 0 {
		return w.extra[c.aux-1].text
	}
	if c.n == 0 {
		return ""
	}
	return unsafe.String(&w.win[c.off], int(c.n))
}

// plainCells classifies the cells of the records spans of a window without
// quotes, as splitCells does, with the records and cells in local slices
// (no write barriers) and the texts as offsets into the window.
func (w *sniffWin) plainCells(spans []span, sep byte) []sniffRec {
	win := w.win
	recs := make([]sniffRec, 0, len(spans))
	cells := make([]cellRec, 0, len(spans))
	extra := w.extra
	valid := utf8.Valid(win) // then so is every record (split at ASCII bytes)
	var fields [][]byte
	var one [1][]byte
	for k, sp := range spans {
		rec := win[sp.start:sp.end]
		inWin := valid || utf8.Valid(rec)
		if !inWin {
			rec = fromWindows1252(nil, rec)
		}
		if sep == 0 {
			one[0] = rec
			fields = one[:]
		} else {
			fields = splitPlain(rec, sep, fields)
		}
		r := sniffRec{row: k + 1, blank: blankFields(fields), first: int32(len(cells))}
		if !r.blank {
			for _, f := range fields {
				t := trimCell(unsafe.String(unsafe.SliceData(f), len(f)))
				var x sniffCell
				if ev, ok := plainDecimal(t); ok {
					x = sniffCell{text: t, cls: cNumber, ev: ev} // classify's shortcut
				} else {
					x = classifyAny(t)
				}
				c := cellRec{cls: x.cls, ev: x.ev}
				if inWin && x.unit == "" && x.date == nil {
					if len(t) > 0 {
						c.off = uint32(sp.start + int(uintptr(unsafe.Pointer(unsafe.StringData(t)))-uintptr(unsafe.Pointer(unsafe.SliceData(rec)))))
						c.n = uint32(len(t))
					}
				} else {
					extra = append(extra, cellExtra{text: x.text, unit: x.unit, date: x.date})
					c.aux = int32(len(extra))
				}
				cells = append(cells, c)
			}
			r.n = int32(len(fields))
		}
		recs = append(recs, r)
	}
	w.cells, w.extra = cells, extra
	return recs
}

// splitCells classifies the cells of the window's records as the splitter
// cuts them (quoted fields may hold separators and line breaks).
func (w *sniffWin) splitCells(brk, other, sep byte, whole bool) []sniffRec {
	recs := make([]sniffRec, 0, bytes.Count(w.win, []byte{brk})+1)
	var fields [][]byte
	row := 0
	tmp := splitter{brk: brk, other: other, sep: sep}
	tmp.emit = func(rec []byte, quoted bool) {
		row++
		if tmp.unclosed && !whole {
			return
		}
		if !utf8.Valid(rec) {
			rec = fromWindows1252(nil, rec)
		}
		if quoted {
			fields = splitQuoted(rec, sep, fields)
		} else {
			fields = splitPlain(rec, sep, fields)
		}
		r := sniffRec{row: row, blank: blankFields(fields), first: int32(len(w.cells))}
		if !r.blank {
			for _, f := range fields {
				w.add(classify(trimCell(unsafe.String(unsafe.SliceData(f), len(f)))))
			}
			r.n = int32(len(fields))
		}
		recs = append(recs, r)
	}
	tmp.feed(w.win)
	tmp.finish()
	return recs
}

// span is a record of the window: win[start:end].
type span struct{ start, end int }

// plainRecords splits a window without quotes into the records the
// splitter gives for it: lines ended by CRLF, LF or CR, the last one only
// when it is not empty. (The splitter strips a CR before its LF and splits
// the rest at CRs; without quotes no record holds a line break.)
func plainRecords(win []byte, out []span) []span {
	start := 0
	for i := 0; i < len(win); i++ {
		c := win[i]
		if c != '\n' && c != '\r' {
			continue
		}
		out = append(out, span{start, i})
		if c == '\r' && i+1 < len(win) && win[i+1] == '\n' {
			i++
		}
		start = i + 1
	}
	if start < len(win) {
		out = append(out, span{start, len(win)})
	}
	return out
}

func classify(s string) sniffCell {
	if ev, ok := plainDecimal(s); ok {
		// what the general path below decides for such a cell: a number
		// without unit, read with the mark it holds
		return sniffCell{text: s, cls: cNumber, ev: ev}
	}
	return classifyAny(s)
}

// classifyAny is classify without the shortcut for plain decimals.
func classifyAny(s string) sniffCell {
	c := sniffCell{text: s}
	if _, ok := missingToken(s); ok {
		c.cls = cMissing
		return c
	}
	if p, ok := splitNumber(s); ok {
		unit, uok := "", true
		if p.suffix != "" {
			unit, uok = unitOf(p.suffix)
		}
		if uok {
			ev := evidence(p.body)
			mark := byte('.')
			if ev == evComma || ev == evAmbig {
				mark = ','
			}
			var buf [64]byte
			if _, _, reason, _ := parseBody(p.body, mark, buf[:0]); reason == "" {
				c.cls, c.ev, c.unit = cNumber, ev, unit
				return c
			}
		}
	}
	if d, ok := parseDate(s); ok {
		c.cls, c.date = cTime, &d
		return c
	}
	c.cls = cText
	return c
}

// plainDecimal reports whether s is digits with an optional leading minus
// and at most one decimal mark ('.' or ',') between digits, the common cell
// of a pasted column, and returns what evidence says of s without its sign.
func plainDecimal(s string) (markEvidence, bool) {
	body := s
	if len(body) > 0 && body[0] == '-' {
		body = body[1:]
	}
	if len(body) == 0 || body[0]-'0' >= 10 || body[len(body)-1]-'0' >= 10 {
		return evNone, false
	}
	k := -1 // the mark's position
	for i := 1; i < len(body)-1; i++ {
		if c := body[i]; c-'0' >= 10 {
			if (c != '.' && c != ',') || k >= 0 {
				return evNone, false
			}
			k = i
		}
	}
	if k < 0 {
		return evNone, true
	}
	// evidence(body) for digits with one mark at k: the integer part is k
	// digits starting with body[0], without group runes
	three := len(body)-k-1 == 3 && k <= 3 && body[0] != '0'
	switch {
	case body[k] == ',' && three:
		return evAmbig, true
	case body[k] == ',':
		return evComma, true
	case three:
		return evAmbigP, true
	}
	return evPoint, true
}

// Errors for inputs that are not tables of text.
func notText(what, todo string) error {
	return fmt.Errorf("this is %s, not text: %s", what, todo)
}

const pasteInstead = "open it, select the cells with the measurements, copy and paste them here, or save the data as CSV or text and drop that file"

func magic(raw []byte) error {
	switch {
	case bytes.HasPrefix(raw, []byte("%PDF-")):
		return notText("a PDF document", "open it, select the table of measurements, copy and paste it here, or ask for the data as CSV")
	case bytes.HasPrefix(raw, []byte("PK\x03\x04")):
		return notText("a spreadsheet file (.xlsx or .ods) or another zip archive", "Lotlens does not open spreadsheet files; "+pasteInstead)
	case bytes.HasPrefix(raw, []byte{0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1}):
		return notText("an older spreadsheet or document file (.xls or .doc)", "Lotlens does not open spreadsheet files; "+pasteInstead)
	case bytes.HasPrefix(raw, []byte("\x89PNG")), bytes.HasPrefix(raw, []byte{0xFF, 0xD8, 0xFF}), bytes.HasPrefix(raw, []byte("GIF8")):
		return notText("an image", "Lotlens reads measurements as text: copy the values from their source and paste them here")
	case bytes.HasPrefix(raw, []byte{0x1F, 0x8B}):
		return notText("a compressed (gzip) file", "unpack it first and drop the text file inside")
	case bytes.HasPrefix(raw, []byte(`{\rtf`)):
		return notText("a rich-text document (RTF)", "open it, copy the measurements and paste them here")
	}
	return nil
}

func markupError(text []byte, lim int) error {
	t := bytes.TrimLeftFunc(text[:min(len(text), 512, lim)], unicode.IsSpace)
	low := bytes.ToLower(t[:min(len(t), 16)])
	for _, p := range []string{"<!doctype html", "<html", "<head", "<body", "<table", "<meta", "<div"} {
		if bytes.HasPrefix(low, []byte(p)) {
			return errors.New("this is a web page (HTML), not a table of data: open it in a browser, select the table, copy it and paste it here")
		}
	}
	if bytes.HasPrefix(low, []byte("<?xml")) {
		return errors.New("this is an XML file, not a table of data: export the measurements as CSV or text, or copy and paste them here")
	}
	return nil
}

// binaryError looks at the first 4 KB of decoded text for control bytes.
func binaryError(text []byte, lim int) error {
	sample := text[:min(len(text), 4096, lim)]
	ctl, nul := 0, 0
	for _, c := range sample {
		switch {
		case c == 0:
			nul++
		case c < 0x20 && c != '\t' && c != '\n' && c != '\r' && c != '\f' && c != '\v' && c != 0x1a, c == 0x7f:
			ctl++
		}
	}
	if nul > 0 || ctl*50 > len(sample) {
		return fmt.Errorf("this does not look like text (%d control bytes in the first %d bytes): it may be a binary file; export the measurements as CSV or text, or copy and paste them here", nul+ctl, len(sample))
	}
	return nil
}

// detectEncoding chooses the encoding from a BOM or the pattern of zero bytes.
func detectEncoding(raw []byte, lim int) (encoding, int) {
	switch {
	case bytes.HasPrefix(raw, []byte{0xEF, 0xBB, 0xBF}):
		return encUTF8BOM, 3
	case bytes.HasPrefix(raw, []byte{0xFF, 0xFE}):
		return encUTF16LE, 2
	case bytes.HasPrefix(raw, []byte{0xFE, 0xFF}):
		return encUTF16BE, 2
	}
	sample := raw[:min(len(raw), 4096, lim)]
	ze, zo := 0, 0
	for i, c := range sample {
		if c == 0 {
			if i%2 == 0 {
				ze++
			} else {
				zo++
			}
		}
	}
	pairs := len(sample) / 2
	if pairs >= 2 {
		if zo*10 >= pairs*3 && ze*10 <= zo {
			return encUTF16LE, 0
		}
		if ze*10 >= pairs*3 && zo*10 <= ze {
			return encUTF16BE, 0
		}
	}
	return encUTF8, 0
}

func isBreak(c byte) bool { return c == '\n' || c == '\r' }

// sniff decides the layout from the start of the decoded text.
func (s *Stream) sniff(text []byte, eof bool) {
	s.sniffed = true
	lim := s.lim()
	if eof && len(bytes.TrimFunc(text, unicode.IsSpace)) == 0 {
		s.err = errors.New("the input is empty: paste a column of measurements, or drop a text file (CSV, tab-separated, or one value per line)")
		return
	}
	if err := markupError(text, lim); err != nil {
		s.err = err
		return
	}
	if err := binaryError(text, lim); err != nil {
		s.err = err
		return
	}
	// the window: whole lines within the first L bytes, or the first line
	L := s.sniffN/2 - 8
	win := text
	whole := eof && len(text) <= L
	if len(text) > L {
		k := bytes.LastIndexFunc(text[:L], func(r rune) bool { return r == '\n' || r == '\r' })
		if k < 0 {
			k = bytes.IndexFunc(text, func(r rune) bool { return r == '\n' || r == '\r' })
		}
		if k >= 0 {
			win = text[:k+1]
		}
		whole = eof && len(bytes.TrimFunc(text[len(win):], unicode.IsSpace)) == 0
	}
	// line ends
	s.lay.brk, s.tab.Format.LineEnds = '\n', "lf"
	if k := bytes.IndexFunc(win, func(r rune) bool { return r == '\n' || r == '\r' }); k >= 0 && win[k] == '\r' {
		s.tab.Format.LineEnds = "cr"
		if k+1 < len(win) && win[k+1] == '\n' {
			s.tab.Format.LineEnds = "crlf"
		} else if bytes.IndexByte(win, '\n') < 0 {
			s.lay.brk = '\r'
		}
	}
	other := byte('\r')
	if s.lay.brk == '\r' {
		other = '\n'
	}
	// Without quotes the records do not depend on the separator: the
	// window is cut into records once, for chooseSep and for the cells.
	var spans []span
	if bytes.IndexByte(win, '"') < 0 && len(win) < 1<<31 && !generalPaths {
		spans = plainRecords(win, make([]span, 0, len(win)/6+16))
	}
	s.lay.sep = chooseSep(win, s.lay.brk, other, spans)
	s.tab.Format.Separator = map[byte]string{'\t': "tab", ',': "comma", ';': "semicolon", '|': "pipe", ' ': "spaces", 0: "none"}[s.lay.sep]

	// records of the window, split as the main pass will split them. The
	// cells' texts alias the window (or buffers made for one record and
	// never reused): plan clones what it keeps.
	w := &sniffWin{win: win}
	var recs []sniffRec
	if spans != nil {
		recs = w.plainCells(spans, s.lay.sep)
	} else {
		recs = w.splitCells(s.lay.brk, other, s.lay.sep, whole)
	}
	s.sp = splitter{brk: s.lay.brk, other: other, sep: s.lay.sep, emit: s.onRecord}
	if s.lay.brk == '\n' {
		s.sp.fast = s.fastLines
	}
	s.plan(w, recs, whole, len(win))
}

// chooseSep picks the separator from the window's lines. spans, when not
// nil, are the records of a window without quotes (plainRecords).
func chooseSep(win []byte, brk, other byte, spans []span) byte {
	// records under a separator (quotes decide where records end)
	records := func(sep byte) (counts []int, lines [][]byte) {
		n := bytes.Count(win, []byte{brk}) + 1
		counts = make([]int, 0, n)
		if sep == 0 {
			lines = make([][]byte, 0, n)
		}
		var fs [][]byte
		sp := splitter{brk: brk, other: other, sep: sep}
		sp.emit = func(rec []byte, quoted bool) {
			if blank(rec) {
				return
			}
			if quoted {
				fs = splitQuoted(rec, sep, fs)
			} else {
				fs = splitPlain(rec, sep, fs)
			}
			counts = append(counts, len(fs))
			if sep == 0 {
				if quoted {
					rec = append([]byte(nil), rec...) // the splitter reuses its buffer
				}
				lines = append(lines, rec) // otherwise a part of win
			}
		}
		sp.feed(win)
		sp.finish()
		return counts, lines
	}
	// Without quotes, a separator absent from the window gives every record
	// one field: not consistent, and no need to split the window again.
	noQuotes := bytes.IndexByte(win, '"') < 0
	// the non-blank records: lines, or the spans that are not blank
	var lines [][]byte
	nLines := 0
	if spans != nil {
		for _, r := range spans {
			if !blank(win[r.start:r.end]) {
				nLines++
			}
		}
	} else {
		_, lines = records(0)
		nLines = len(lines)
	}
	if nLines == 0 {
		return 0
	}
	consistent := func(sep byte) bool {
		if noQuotes && bytes.IndexByte(win, sep) < 0 && (sep != ' ' || bytes.IndexByte(win, '\t') < 0) {
			return false
		}
		var counts []int
		if spans != nil {
			// the records are those of any separator: count the fields
			counts = make([]int, 0, nLines)
			for _, r := range spans {
				if rec := win[r.start:r.end]; !blank(rec) {
					counts = append(counts, countFields(rec, sep))
				}
			}
		} else {
			counts, _ = records(sep)
		}
		if len(counts) == 0 {
			return false
		}
		freq := map[int]int{}
		for _, c := range counts[len(counts)/2:] {
			freq[c]++
		}
		m, best := 0, 0
		for c, f := range freq {
			if f > best || (f == best && c > m) {
				m, best = c, f
			}
		}
		if m < 2 {
			return false
		}
		// the longest block at the end where 80% of lines have m fields
		hit := 0
		for start := len(counts) - 1; start >= 0; start-- {
			if counts[start] == m {
				hit++
			}
			n := len(counts) - start
			if hit*5 >= 4*n && (n >= 2 || len(counts) == 1) && hit*2 >= len(counts) {
				return true
			}
		}
		// small inputs with note lines: at least two consistent lines at the end
		n := 0
		for i := len(counts) - 1; i >= 0 && counts[i] == m; i-- {
			n++
		}
		return n >= 2
	}
	for _, sep := range []byte{'\t', ';', '|'} {
		if consistent(sep) {
			return sep
		}
	}
	// the second half of the lines: one value each?
	single := 0
	if spans != nil {
		k := 0
		for _, r := range spans {
			if rec := win[r.start:r.end]; !blank(rec) {
				if k >= nLines/2 && singleValue(rec) {
					single++
				}
				k++
			}
		}
	} else {
		for _, l := range lines[nLines/2:] {
			if singleValue(l) {
				single++
			}
		}
	}
	if single*5 >= 4*(nLines-nLines/2) {
		return 0
	}
	for _, sep := range []byte{',', ' '} {
		if consistent(sep) {
			return sep
		}
	}
	return 0
}

// singleValue reports whether a line reads as one number or a missing
// marker.
func singleValue(l []byte) bool {
	t := trimCell(unsafe.String(unsafe.SliceData(l), len(l)))
	if spacedIntegers(t) {
		// "412 413 411": whole numbers apart by spaces are values side by
		// side, not one number with thousands separators (that would be a
		// silent wrong number); "12 345,6" keeps its decimal mark and stays one.
		return false
	}
	c := classify(t)
	return c.cls == cNumber || c.cls == cMissing
}

// countFields is len(splitPlain(rec, sep, nil)), without the fields.
func countFields(rec []byte, sep byte) int {
	switch sep {
	case 0:
		return 1
	case ' ':
		n := 0
		in := false
		for _, c := range rec {
			sp := c == ' ' || c == '\t'
			if !sp && !in {
				n++
			}
			in = !sp
		}
		return max(n, 1)
	}
	return bytes.Count(rec, []byte{sep}) + 1
}

// spacedIntegers reports whether s is two or more runs of digits (with an
// optional sign on each) separated by spaces, with no decimal mark.
func spacedIntegers(s string) bool {
	if !hasSpace(s) {
		return false // one part at most: skip the allocation of Fields
	}
	parts := strings.Fields(s)
	if len(parts) < 2 {
		return false
	}
	for _, p := range parts {
		p = strings.TrimLeft(p, "+-")
		if p == "" {
			return false
		}
		for i := 0; i < len(p); i++ {
			if p[i] < '0' || p[i] > '9' {
				return false
			}
		}
	}
	return true
}

// hasSpace is strings.IndexFunc(s, unicode.IsSpace) >= 0, with a loop
// without calls for ASCII text.
func hasSpace(s string) bool {
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c >= 0x80 {
			return strings.IndexFunc(s[i:], unicode.IsSpace) >= 0
		}
		if c == ' ' || c-'\t' <= '\r'-'\t' {
			return true
		}
	}
	return false
}

// colPlan is the decision for one column.
type colPlan struct {
	name, unit, header string
}

// plan decides header, notes, columns and their kinds from the window.
func (s *Stream) plan(w *sniffWin, recs []sniffRec, whole bool, winBytes int) {
	lay := &s.lay
	lay.dataStart = 1
	nonEmpty := make([]int, 0, len(recs)) // indexes into recs
	for i, r := range recs {
		if !r.blank {
			nonEmpty = append(nonEmpty, i)
		}
	}
	hasNumber := func(r sniffRec) bool {
		for _, c := range w.of(r) {
			if c.cls == cNumber {
				return true
			}
		}
		return false
	}
	headerLike := func(r sniffRec) bool {
		text := 0
		for _, c := range w.of(r) {
			switch c.cls {
			case cNumber:
				return false
			case cText:
				text++
			}
		}
		return text > 0
	}
	// one line of values
	if whole && len(nonEmpty) == 1 && lay.sep != 0 {
		r := recs[nonEmpty[0]]
		nums := 0
		for _, c := range w.of(r) {
			if c.cls == cNumber {
				nums++
			}
		}
		if nums >= 2 {
			lay.transpose = true
			s.tab.Format.Transposed = true
			lay.dataStart = r.row
			name, unit, header := "Column 1", "", ""
			cells := w.of(r)
			if cells[0].cls == cText {
				lay.transposeName = true
				header = strings.Clone(w.text(&cells[0]))
				name, unit = headerName(header)
			}
			if lay.transposeName {
				cells = cells[1:]
			}
			tl := make([]colTally, 1)
			for k := range cells {
				x := w.cell(&cells[k])
				tl[0].add(&x)
			}
			c := s.newColumn(colPlan{name: name, unit: unit, header: header}, 1, &tl[0], markHint(lay.sep, tl))
			s.cols = []*Column{c}
			return
		}
	}
	m := 1
	if lay.sep != 0 {
		freq := map[int]int{}
		for _, i := range nonEmpty[len(nonEmpty)/2:] {
			freq[int(recs[i].n)]++
		}
		best := 0
		for c, f := range freq {
			if f > best || (f == best && c > m) {
				m, best = c, f
			}
		}
	}
	first := -1
	for _, i := range nonEmpty {
		r := recs[i]
		if hasNumber(r) && (lay.sep == 0 || int(r.n) == m) {
			first = i
			break
		}
	}
	if first < 0 {
		for _, i := range nonEmpty {
			if hasNumber(recs[i]) {
				first = i
				break
			}
		}
	}
	header := -1
	if first >= 0 {
		for k := len(nonEmpty) - 1; k >= 0; k-- {
			if nonEmpty[k] < first {
				r := recs[nonEmpty[k]]
				if headerLike(r) && (m == 1 || r.n >= 2) {
					header = nonEmpty[k]
				}
				break
			}
		}
	} else if len(nonEmpty) > 0 && headerLike(recs[nonEmpty[0]]) {
		header = nonEmpty[0]
	}
	if header >= 0 && first >= 0 && m == 1 && header == first-1 {
		// One column: the text lines right above the first number may be
		// notes, the header and cells that are not numbers ("Weight", "err",
		// 12.5). The header is the line after the last note-like one.
		start := header
		for start > 0 && !recs[start-1].blank && headerLike(recs[start-1]) {
			start--
		}
		header = start
		for k := start; k < first; k++ {
			if noteLike(w.text(&w.of(recs[k])[0])) {
				header = min(k+1, first-1)
			}
		}
	}
	switch {
	case header >= 0:
		lay.headerRow = recs[header].row
		lay.dataStart = lay.headerRow + 1
		s.tab.HeaderRow = lay.headerRow
	case first >= 0:
		lay.dataStart = recs[first].row
	}
	ncols := m
	if header >= 0 && int(recs[header].n) > ncols {
		ncols = int(recs[header].n)
	}
	if lay.sep == 0 {
		ncols = 1
	}
	// plans: names and units
	plans := make([]colPlan, ncols)
	seen := map[string]bool{}
	for j := range plans {
		p := &plans[j]
		if header >= 0 && j < int(recs[header].n) {
			p.header = strings.Clone(w.text(&w.of(recs[header])[j]))
			p.name, p.unit = headerName(p.header)
		}
		if p.name == "" {
			p.name = fmt.Sprintf("Column %d", j+1)
			if header >= 0 {
				s.problem(Problem{Row: lay.headerRow, Col: j + 1, Kind: KindHeader, Reason: "column without a name", Action: "named " + p.name})
			}
		}
		base := p.name
		for n := 2; seen[p.name]; n++ {
			p.name = fmt.Sprintf("%s %d", base, n)
		}
		if p.name != base {
			s.problem(Problem{Row: lay.headerRow, Col: j + 1, Column: p.name, Text: p.header, Kind: KindHeader, Reason: fmt.Sprintf("duplicate column name %q", base), Action: "renamed " + p.name})
		}
		seen[p.name] = true
	}
	// what the cells of each column in the window say, in cell order
	tallies := make([]colTally, ncols)
	dataRecs := 0
	for _, r := range recs {
		if r.row < lay.dataStart || r.blank {
			continue
		}
		dataRecs++
		cells := w.of(r)
		for j := 0; j < ncols && j < len(cells); j++ {
			if c := &cells[j]; c.aux == 0 && c.cls != cNumber {
				// neither unit nor date nor text: what add counts
				switch c.cls {
				case cTime:
					tallies[j].nTime++
				case cText:
					tallies[j].nText++
				}
			} else if c.aux == 0 && c.ev != evAmbig {
				t := &tallies[j] // a number without unit: what add counts
				t.nNum++
				switch c.ev {
				case evComma:
					t.comma++
				case evPoint:
					t.point++
				case evAmbigP:
					t.ambigP++
				}
			} else {
				x := w.cell(c)
				tallies[j].add(&x)
			}
		}
	}
	s.cols = make([]*Column, ncols)
	hint := markHint(lay.sep, tallies)
	for j := range plans {
		s.cols[j] = s.newColumn(plans[j], j+1, &tallies[j], hint)
	}
	// size the columns once when the input size is known
	if h := s.opt.SizeHint; h > int64(winBytes) && dataRecs >= 64 && winBytes >= 4096 {
		est := h*int64(len(recs))/int64(winBytes) + 64
		est = est + est/16
		est = min(est, h/2+64, 1<<31-1)
		s.rows = make([]int32, 0, est)
		for _, c := range s.cols {
			c.Values = make([]float64, 0, est)
			c.Dec = make([]int8, 0, est)
		}
	}
}

// colTally is what a column's cells in the window say about its kind,
// decimal mark, unit and date order, added up cell by cell in order.
type colTally struct {
	nNum, nTime, nText          int
	comma, point, ambig, ambigP int
	units                       map[string]int
	unitOrder                   []string // in order of first appearance
	dayEv, monthEv              int
	slash                       bool   // a date like 03/04/2026
	firstAmbig                  string // the first cell like "1,234"
}

func (t *colTally) add(x *sniffCell) {
	switch x.cls {
	case cNumber:
		t.nNum++
		switch x.ev {
		case evComma:
			t.comma++
		case evPoint:
			t.point++
		case evAmbig:
			if t.ambig == 0 {
				t.firstAmbig = x.text
			}
			t.ambig++
		case evAmbigP:
			t.ambigP++
		}
		if x.unit != "" {
			if t.units == nil {
				t.units = map[string]int{}
			}
			if t.units[x.unit] == 0 {
				t.unitOrder = append(t.unitOrder, x.unit)
			}
			t.units[x.unit]++
		}
	case cTime:
		t.nTime++
		if x.date.form == dfSlash {
			t.slash = true
			if x.date.a > 12 {
				t.dayEv++
			}
			if x.date.b > 12 {
				t.monthEv++
			}
		}
	case cText:
		t.nText++
	}
}

// newColumn decides a column's kind, decimal mark, unit and date order from
// what its cells in the window say.
func (s *Stream) newColumn(p colPlan, pos int, t *colTally, hint byte) *Column {
	c := &Column{ColumnInfo: ColumnInfo{Name: p.name, Unit: p.unit, Position: pos, Header: p.header}, mark: '.'}
	nNum, nTime, nText := t.nNum, t.nTime, t.nText
	comma, point, ambig, ambigP := t.comma, t.point, t.ambig, t.ambigP
	units, unitOrder := t.units, t.unitOrder
	dayEv, monthEv := t.dayEv, t.monthEv
	nonMissing := nNum + nTime + nText
	switch {
	case nonMissing == 0:
		c.Kind = "empty"
	case nTime*5 >= 4*nonMissing:
		c.Kind = "time"
	case nNum >= nText+nTime:
		c.Kind = "number"
	default:
		c.Kind = "text"
		c.lab = []int32{}
		c.labMap = map[string]int32{}
	}
	c.num = c.Kind == "number" || c.Kind == "empty"
	if c.Kind == "text" || c.Kind == "time" {
		c.Unit = ""
		if p.unit != "" { // "Shift (A)" is a name, not a unit, in a label column
			c.Name = p.name + " (" + p.unit + ")"
		}
	}
	if c.Kind == "number" || c.Kind == "empty" {
		point += ambigP
		switch {
		case comma > 0 && point > 0:
			c.MixedDecimal = true
			if comma > point {
				c.mark = ','
			}
			minority := min(comma, point)
			s.problem(Problem{Column: c.Name, Col: pos, Kind: KindMixed,
				Reason: fmt.Sprintf("column %q mixes decimal marks: %d of the first cells use a point, %d a comma", c.Name, point, comma),
				Action: fmt.Sprintf("read with the decimal %s; cells with the other mark are left out and listed (about %d). Check the export so that one mark is used", markName(c.mark), minority)})
		case comma > 0:
			c.mark = ','
		case point > 0:
		case ambig > 0 && hint != 0 && s.opt.DecimalMark == "":
			// the file's other columns (or its semicolons) show the locale
			c.mark = hint
		case ambig > 0:
			c.AmbiguousDecimal = true
			c.mark = ','
			if s.opt.DecimalMark == "point" {
				c.mark = '.'
			}
			s.problem(Problem{Column: c.Name, Col: pos, Kind: KindAmbiguous,
				Reason: fmt.Sprintf("in column %q a value like %q can mean %s", c.Name, t.firstAmbig, ambigMeaning(t.firstAmbig)),
				Action: "read with the decimal " + markName(c.mark) + "; choose the decimal mark if this is wrong"})
		}
		c.DecimalComma = c.mark == ','
		if c.Unit == "" && len(unitOrder) > 0 {
			best := unitOrder[0]
			for _, u := range unitOrder {
				if units[u] > units[best] {
					best = u
				}
			}
			c.Unit = strings.Clone(best) // cells' texts alias the input
		}
	}
	if c.Kind == "time" && (dayEv > 0 || monthEv > 0 || t.slash) {
		switch {
		case dayEv > 0 && monthEv == 0:
			c.DateOrder = "day-first"
		case monthEv > 0 && dayEv == 0:
			c.DateOrder = "month-first"
		case dayEv > 0 && monthEv > 0:
			c.DateOrder = "day-first"
			if monthEv > dayEv {
				c.DateOrder = "month-first"
			}
			s.problem(Problem{Column: c.Name, Col: pos, Kind: KindAmbiguous, Reason: fmt.Sprintf("column %q has dates in both day-first and month-first order", c.Name), Action: "read as " + c.DateOrder + "; dates that do not fit are left out and listed"})
		default:
			c.DateAmbiguous = true
			c.DateOrder = "day-first"
			if s.opt.DateOrder == "month" {
				c.DateOrder = "month-first"
			}
			s.problem(Problem{Column: c.Name, Col: pos, Kind: KindAmbiguous, Reason: fmt.Sprintf("in column %q no date shows whether the day or the month comes first", c.Name), Action: "read as " + c.DateOrder + "; choose the date order if this is wrong"})
		}
	}
	return c
}

func markName(m byte) string {
	if m == ',' {
		return "comma"
	}
	return "point"
}

func ambigMeaning(s string) string {
	p, _ := splitNumber(s)
	k := strings.IndexByte(p.body, ',')
	if k < 0 {
		return "two things"
	}
	sign := ""
	if p.neg {
		sign = "-"
	}
	return fmt.Sprintf("%s%s.%s (decimal comma) or %s%s%s (thousands separator)", sign, p.body[:k], p.body[k+1:], sign, p.body[:k], p.body[k+1:])
}

// headerName splits a header cell into a name and a unit: "Weight (g)",
// "Weight [g]", "Weight/g", "Weight, g".
func headerName(h string) (name, unit string) {
	h = trimCell(h)
	for _, br := range [][2]byte{{'(', ')'}, {'[', ']'}} {
		if strings.HasSuffix(h, string(br[1])) {
			if k := strings.LastIndexByte(h, br[0]); k > 0 {
				inner := trimCell(h[k+1 : len(h)-1])
				nm := trimCell(h[:k])
				if nm != "" && unitLike(inner) {
					return nm, inner
				}
			}
		}
	}
	for _, sep := range []string{"/", ", ", " in "} {
		if k := strings.LastIndex(h, sep); k > 0 {
			u := trimCell(h[k+len(sep):])
			if _, ok := unitOf(u); ok && trimCell(h[:k]) != "" {
				return trimCell(h[:k]), u
			}
		}
	}
	return h, ""
}

// unitLike accepts a known unit or a short token of letters and unit signs.
func unitLike(s string) bool {
	if _, ok := unitOf(s); ok {
		return true
	}
	if s == "" || utf8.RuneCountInString(s) > 10 {
		return false
	}
	letters := 0
	for _, r := range s {
		switch {
		case unicode.IsLetter(r):
			letters++
		case strings.ContainsRune("%‰°²³/·.'µΩ", r):
		default:
			return false
		}
	}
	return letters > 0 || s == "%" || s == "‰"
}

// finishTable completes the table after the last record.
func (s *Stream) finishTable() (*Table, error) {
	t := s.tab
	s.pend = s.pend[:0] // empty lines after the last data row are not cells
	t.Format.Bytes = s.total
	t.Format.Rows = s.row
	if s.opt.KeepText > 0 && !s.keepOver {
		t.text, t.textKept = string(latin1Lines(s.kept, s.latin1 > 0)), true
		s.kept = nil
	}
	if s.latin1 > 0 {
		t.Format.Encoding = "windows-1252"
		if s.enc != encUTF8 {
			t.Format.Encoding += " (partly)"
		}
	}
	// drop unnamed columns that hold nothing (a trailing separator)
	var keep []*Column
	dropped := map[int]bool{}
	for _, c := range s.cols {
		if len(s.cols) > 1 && c.Header == "" && c.Missing == len(c.Values) {
			dropped[c.Position] = true
			continue
		}
		keep = append(keep, c)
	}
	if len(dropped) > 0 {
		ps := t.Problems[:0]
		for _, p := range t.Problems {
			if !dropped[p.Col] || p.Kind != KindMissing && p.Kind != KindHeader || p.Row == 0 {
				ps = append(ps, p)
			}
		}
		t.Problems = ps
	}
	t.Columns = keep
	for _, c := range keep {
		c.Rows = s.rows
		if c.Kind == "empty" && c.Numbers > 0 {
			c.Kind = "number"
		}
		c.Labels = len(c.labels)
		c.labMap = nil
	}
	if t.Unlisted > 0 {
		t.Problems = append(t.Problems, Problem{Kind: KindMore, Reason: fmt.Sprintf("%d more problems are not listed", t.Unlisted), Action: "the counts include them; fix the first ones and read again"})
	}
	guessRoles(t)
	if err := s.noNumbers(); err != nil {
		return nil, err
	}
	return t, nil
}

// latin1Lines converts, when conv is set, every line of text that is not
// valid UTF-8 from Windows-1252, as the reader does record by record (a
// quoted record over several lines is converted line by line here).
func latin1Lines(text []byte, conv bool) []byte {
	if !conv {
		return text
	}
	out := make([]byte, 0, len(text)+len(text)/8)
	for len(text) > 0 {
		k := bytes.IndexAny(text, "\r\n")
		line, brk := text, []byte(nil)
		if k >= 0 {
			line, brk = text[:k], text[k:k+1]
		}
		if utf8.Valid(line) {
			out = append(out, line...)
		} else {
			out = fromWindows1252(out, line)
		}
		out = append(out, brk...)
		text = text[len(line)+len(brk):]
	}
	return out
}

// noNumbers explains a table without a single number.
func (s *Stream) noNumbers() error {
	t := s.tab
	nums, cells, missing := 0, 0, 0
	for _, c := range t.Columns {
		if c.Kind == "number" {
			nums += c.Numbers
		}
		cells += len(c.Values)
		missing += c.Missing
	}
	if nums > 0 {
		return nil
	}
	if s.row <= 2 && s.longest > 1<<20 {
		return fmt.Errorf("no numbers found in one line of %.1f MB: this does not look like a table of measurements; paste one value per line, or a table with one column per characteristic", float64(s.longest)/(1<<20))
	}
	if t.HeaderRow > 0 && cells == 0 {
		return fmt.Errorf("only a header row was found (row %d: %s) and no data under it: paste the measurements together with the header", t.HeaderRow, headerList(t))
	}
	if cells > 0 && missing == cells {
		return fmt.Errorf("no numbers found: all %d cells are empty or marked missing (such as NA, - or #N/A); paste the measurements themselves", cells)
	}
	for _, p := range t.Problems {
		if p.Kind == KindNotNumber || p.Kind == KindDecimalMark || p.Kind == KindUnit {
			return fmt.Errorf("no numbers found: column %q holds text such as %q in row %d; paste or choose a column of measurements", p.Column, p.Text, p.Row)
		}
	}
	for _, c := range t.Columns {
		if c.Kind == "text" || c.Kind == "time" {
			for i := range c.Values {
				if txt := c.Text(i); txt != "" && classify(txt).cls != cNumber {
					what := "words"
					if c.Kind == "time" {
						what = "dates or times"
					}
					return fmt.Errorf("no numbers found: column %q holds %s, such as %q in row %d; paste or choose a column of measurements", c.Name, what, txt, c.Rows[i])
				}
			}
		}
	}
	return errors.New("no numbers found: paste a column of measurements, one value per line, or a table with a header")
}

func headerList(t *Table) string {
	var names []string
	for _, c := range t.Columns {
		h := c.Header
		if h == "" {
			h = c.Name
		}
		names = append(names, fmt.Sprintf("%q", h))
	}
	if len(names) > 6 {
		names = append(names[:6], "...")
	}
	return strings.Join(names, ", ")
}

// guessRoles suggests what each column is for, and the table's shape.
func guessRoles(t *Table) {
	values, groups := 0, 0
	for _, c := range t.Columns {
		switch c.Kind {
		case "time":
			c.Role = "order"
		case "text":
			n := len(c.Values) - c.Missing
			if c.Labels >= 1 && n >= 2 && c.Labels < n {
				c.Role = "group"
				groups++
			}
		case "number":
			c.Role = numberRole(c)
			if c.Role == "value" {
				values++
			}
		}
	}
	switch {
	case values == 1 && groups > 0:
		t.Shape = "long"
	case values > 1:
		t.Shape = "wide"
	case values == 1:
		t.Shape = "single"
	}
	if values == 0 {
		for _, c := range t.Columns {
			if c.Kind == "number" && c.Numbers > 0 {
				c.Role = "value"
				t.Shape = "single"
				break
			}
		}
	}
}

// numberRole: a whole-number column that rises by one each row is an
// order (sequence number); one in equal runs (1,1,1,2,2,2...) a subgroup.
func numberRole(c *Column) string {
	if c.Numbers < 3 || c.Bad > 0 {
		return "value"
	}
	var xs []float64
	for i, v := range c.Values {
		if v == v {
			if c.Dec[i] != 0 {
				return "value"
			}
			xs = append(xs, v)
		}
	}
	increasing, runs := true, []int{1}
	for i := 1; i < len(xs); i++ {
		switch {
		case xs[i] == xs[i-1]:
			increasing = false
			runs[len(runs)-1]++
		case xs[i] > xs[i-1]:
			runs = append(runs, 1)
		default:
			return "value"
		}
	}
	if increasing {
		return "order"
	}
	if len(runs) >= 2 && runs[0] >= 2 {
		body := runs[:len(runs)-1]
		sort.Ints(body)
		if body[0] == body[len(body)-1] && runs[len(runs)-1] <= runs[0] {
			return "subgroup"
		}
	}
	return "value"
}

// markHint is the decimal mark the whole file shows: semicolon-separated
// files come from decimal-comma locales; otherwise unambiguous cells in any
// column decide, when they agree. 0 when nothing decides.
func markHint(sep byte, cols []colTally) byte {
	if sep == ';' {
		return ','
	}
	comma, point := 0, 0
	for _, t := range cols {
		comma += t.comma
		point += t.point
	}
	switch {
	case comma > 0 && point == 0:
		return ','
	case point > 0 && comma == 0:
		return '.'
	}
	return 0
}

// noteLike: a line that reads like a remark rather than a column name
// ("Station: 4", "Exported by the gauge software on ...").
func noteLike(s string) bool {
	name, _ := headerName(s)
	return strings.ContainsAny(name, ":=") || len(strings.Fields(name)) >= 4
}
