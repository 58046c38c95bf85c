// Package ingest turns text or file bytes into a table of columns, keeping
// every cell's identity (row as the user sees it in a spreadsheet, column)
// and listing every cell that is not a usable number, with the reason.
//
// What it reads:
//
//   - Separators: tab (spreadsheet clipboard, TSV), comma, semicolon, pipe,
//     runs of spaces, or none (one value per line). One line of values
//     ("12.1 12.3 12.2") is read as one column.
//   - Quoted fields (RFC 4180) with separators and line breaks inside; quoted
//     records are split by encoding/csv.
//   - UTF-8 with or without BOM, UTF-16 LE/BE (with BOM, or detected from its
//     zero bytes), and a Windows-1252 (Latin-1) fallback for lines that are
//     not valid UTF-8; LF, CRLF and CR line ends.
//   - Numbers with a decimal point or comma, decided per column from the
//     cells (a lone "1,234" is ambiguous: the column is flagged and read by
//     ReadOptions.DecimalMark, default decimal comma); a single "1.234" is
//     taken as a decimal point unless the column uses decimal commas.
//     Thousands separators: space, no-break and thin spaces, apostrophe, and
//     the other mark when the grouping is valid. Leading plus, the Unicode
//     minus sign, exponents, a trailing % or known unit ("12.31 g", "0.5mm").
//   - Missing markers: empty, NA, N/A, n/a, -, --, ?, #N/A, #VALUE! and the
//     other spreadsheet errors, NaN, null.
//   - A header row (detected), units in it ("Weight (g)", "Weight [g]",
//     "Weight/g"), note lines above it (skipped and reported).
//   - Date/time columns (see timefmt.go) and text (group label) columns.
//
// Rows are numbered as a spreadsheet shows the file: 1-based, every line
// counted (note lines, the header, empty lines), and a quoted field holding
// line breaks keeps its record in one row, so rows after it follow the record
// count, not the physical line count.
//
// The reader streams: NewStream, Write chunks (split anywhere), Finish. The
// layout (encoding, separator, header, column kinds, decimal marks) is decided
// from the first SniffBytes of text, so a chunked read gives the same table
// as a whole one.
package ingest

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// Problem is one cell (or line) that was not used as a number, or a remark
// about the whole input (Row 0).
type Problem struct {
	Row    int    `json:"row"`              // 1-based, header row counted; 0 = the whole input
	Col    int    `json:"col,omitempty"`    // 1-based column position as in a spreadsheet; 0 = whole row
	Column string `json:"column,omitempty"` // column name as reported
	Text   string `json:"text,omitempty"`   // the cell as typed (long lines are shortened)
	Kind   string `json:"kind"`             // see the Kind* constants
	Reason string `json:"reason"`           // plain words
	Action string `json:"action"`           // what was done, e.g. "counted as missing"
}

// Problem kinds.
const (
	KindMissing     = "missing"        // empty or marked missing
	KindNotNumber   = "not-a-number"   // text in a number column
	KindDecimalMark = "decimal-mark"   // the other decimal mark than the column's
	KindUnit        = "unit"           // a unit that differs from the column's
	KindNotTime     = "not-a-time"     // a cell in a date/time column that is not one
	KindExtra       = "extra-cell"     // a cell to the right of the last column
	KindNote        = "note-line"      // a line above the header, skipped
	KindHeader      = "header"         // a column name made unique or given
	KindEncoding    = "encoding"       // text decoded with the fallback
	KindQuote       = "unclosed-quote" // a quoted field never closed
	KindAmbiguous   = "ambiguous"      // decimal mark or date order unclear (Row 0)
	KindMixed       = "mixed-marks"    // a column with both decimal marks (Row 0)
	KindMore        = "more-problems"  // the list was capped (Row 0)
)

// ColumnInfo describes one column for pickers and the report.
type ColumnInfo struct {
	Name     string `json:"name"`
	Unit     string `json:"unit,omitempty"`
	Position int    `json:"position"`         // 1-based column number in the input
	Header   string `json:"header,omitempty"` // the header cell as typed
	// Kind is "number", "text" (labels), "time" (dates/times; Values are
	// seconds since 1970-01-01, or since midnight for times of day) or
	// "empty".
	Kind string `json:"kind"`
	// Role is the reader's guess: "value", "group", "order" or "subgroup"
	// ("" when none fits). The user decides.
	Role    string `json:"role,omitempty"`
	Numbers int    `json:"numbers"` // cells read as numbers (or times)
	Missing int    `json:"missing"` // empty or marked missing
	Empty   int    `json:"empty"`   // of Missing: empty cells
	Bad     int    `json:"bad"`     // cells neither numbers nor missing
	Labels  int    `json:"labels,omitempty"`
	// DecimalComma is set when the column's numbers use a decimal comma.
	DecimalComma bool `json:"decimalComma,omitempty"`
	// AmbiguousDecimal: every decimal in the column looks like "1,234", which
	// is 1.234 with a decimal comma or 1234 with a thousands comma. The
	// column was read by ReadOptions.DecimalMark (default: decimal comma);
	// the page asks the user.
	AmbiguousDecimal bool `json:"ambiguousDecimal,omitempty"`
	// MixedDecimal: the column uses both marks; cells with the minority mark
	// were left out and listed.
	MixedDecimal bool `json:"mixedDecimal,omitempty"`
	// DateOrder is "day-first" or "month-first" for time columns with dates
	// like 03/04/2026; DateAmbiguous when no cell decided it.
	DateOrder     string `json:"dateOrder,omitempty"`
	DateAmbiguous bool   `json:"dateAmbiguous,omitempty"`
}

// Column holds one column's cells in input order. Values is NaN where the
// cell is not a number. Dec is the number of decimals as typed (-1 when the
// value was not plain fixed-point decimal text, e.g. with an exponent).
type Column struct {
	ColumnInfo
	Rows   []int32 // spreadsheet row of each cell; shared by the table's columns
	Values []float64
	Dec    []int8
	// Cols is the 1-based spreadsheet column of each cell; nil except when
	// one line of values was read as a column.
	Cols []int32

	mark byte // '.' or ','
	num  bool // parsed as numbers (kind number or empty)
	// sparse texts: cells whose typed form is not the canonical form of
	// their value (or that are not numbers), in cell order
	spIdx []int32
	spOff []uint32
	spBuf []byte
	// text columns: label index per cell (-1 = missing), interned labels
	lab    []int32
	labels []string
	labMap map[string]int32
}

// Text returns cell i as typed (trimmed of surrounding spaces).
func (c *Column) Text(i int) string {
	if k, ok := c.sparse(i); ok {
		return string(c.spBuf[c.spOff[k]:c.spOff[k+1]])
	}
	if c.lab != nil {
		if l := c.lab[i]; l >= 0 {
			return c.labels[l]
		}
		return ""
	}
	v := c.Values[i]
	if math.IsNaN(v) {
		return ""
	}
	var buf [32]byte
	return string(formatValue(buf[:0], v, c.Dec[i], c.mark))
}

// Label returns the label index of cell i in a text column (-1 when the
// cell is missing or the column is not a text column), and Labels the
// labels in order of first appearance.
func (c *Column) Label(i int) int {
	if c.lab == nil {
		return -1
	}
	return int(c.lab[i])
}

// LabelNames returns the distinct labels of a text column in order of first appearance.
func (c *Column) LabelNames() []string { return c.labels }

func (c *Column) sparse(i int) (int, bool) {
	return slices.BinarySearch(c.spIdx, int32(i))
}

func (c *Column) keep(i int, b string) {
	if len(c.spOff) == 0 {
		c.spOff = append(c.spOff, 0)
	}
	c.spIdx = append(c.spIdx, int32(i))
	c.spBuf = append(c.spBuf, b...)
	c.spOff = append(c.spOff, uint32(len(c.spBuf)))
}

// Len is the number of cells.
func (c *Column) Len() int { return len(c.Values) }

// Format says how the input was written, as detected.
type Format struct {
	Encoding  string `json:"encoding"`  // "utf-8", "utf-8 with BOM", "utf-16le", "utf-16be", "windows-1252"
	Separator string `json:"separator"` // "tab", "comma", "semicolon", "pipe", "spaces", "none"
	LineEnds  string `json:"lineEnds"`  // "lf", "crlf", "cr" (the first seen)
	Bytes     int64  `json:"bytes"`
	Rows      int    `json:"rows"` // the last row number as a spreadsheet shows it
	// Transposed is set when one line of values was read as one column.
	Transposed bool `json:"transposed,omitempty"`
}

// Table is what the reader found.
type Table struct {
	Columns   []*Column `json:"-"`
	HeaderRow int       // 0 when there is no header
	Problems  []Problem
	// Unlisted counts problems beyond the listing cap (MaxProblems); the
	// last listed problem says so.
	Unlisted int
	Format   Format
	// Shape is the reader's guess: "single" (one value column), "wide"
	// (several value columns), "long" (a group column and one value column).
	Shape string
	// Head is the first HeadRows records (note lines and the header
	// included) as the reader split them into cells, for a preview.
	Head  []HeadRow
	notes int
	extra int
	// text is the decoded input when ReadOptions.KeepText asked for it
	text     string
	textKept bool
}

// HeadRows is how many records Table.Head keeps.
const HeadRows = 40

// HeadRow is one record of the input as the reader split it.
type HeadRow struct {
	Row   int      `json:"row"`
	Cells []string `json:"cells"`
}

// DecodedText returns the input as UTF-8 text, as the reader decoded it
// (byte-order mark removed, UTF-16 and Windows-1252 lines converted), when
// ReadOptions.KeepText asked for it and the text was not longer. Reading
// the text again gives the same table (with encoding "utf-8").
func (t *Table) DecodedText() (string, bool) { return t.text, t.textKept }

// Infos returns the columns' descriptions.
func (t *Table) Infos() []ColumnInfo {
	out := make([]ColumnInfo, len(t.Columns))
	for i, c := range t.Columns {
		out[i] = c.ColumnInfo
	}
	return out
}

// Column returns the column with this name, or nil.
func (t *Table) Column(name string) *Column {
	for _, c := range t.Columns {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// ValueColumn returns the first column with the role "value" (the default
// for the analysis), or nil when there is none.
func (t *Table) ValueColumn() *Column {
	for _, c := range t.Columns {
		if c.Role == "value" {
			return c
		}
	}
	for _, c := range t.Columns {
		if c.Kind == "number" && c.Numbers > 0 {
			return c
		}
	}
	return nil
}

// Summary is the one-line account of what was read, over the number
// columns, e.g. "498 values read; 2 cells not numbers (rows 17, 203); 1 empty".
func (t *Table) Summary() string {
	var cols []*Column
	for _, c := range t.Columns {
		if c.Kind == "number" || c.Kind == "empty" {
			cols = append(cols, c)
		}
	}
	if len(cols) == 0 {
		return "no data read"
	}
	return t.summary(cols)
}

// ColumnSummary is Summary for one column.
func (t *Table) ColumnSummary(c *Column) string { return t.summary([]*Column{c}) }

func (t *Table) summary(cols []*Column) string {
	var nums, bad, empty, marked int
	for _, c := range cols {
		nums += c.Numbers
		bad += c.Bad
		empty += c.Empty
		marked += c.Missing - c.Empty
	}
	var b strings.Builder
	fmt.Fprintf(&b, "%d %s read", nums, plural(nums, "value", "values"))
	if len(cols) > 1 {
		fmt.Fprintf(&b, " in %d columns", len(cols))
	}
	if bad > 0 {
		fmt.Fprintf(&b, "; %d %s (%s)", bad, plural(bad, "cell not a number", "cells not numbers"), t.badRows(cols, bad))
	}
	if empty > 0 {
		fmt.Fprintf(&b, "; %d empty", empty)
	}
	if marked > 0 {
		fmt.Fprintf(&b, "; %d marked missing", marked)
	}
	if t.notes > 0 {
		fmt.Fprintf(&b, "; %d note %s above the table skipped", t.notes, plural(t.notes, "line", "lines"))
	}
	if t.extra > 0 {
		fmt.Fprintf(&b, "; %d %s beyond the last column left out", t.extra, plural(t.extra, "cell", "cells"))
	}
	for _, c := range cols {
		if c.AmbiguousDecimal {
			mark := "decimal comma"
			if !c.DecimalComma {
				mark = "decimal point (comma as thousands separator)"
			}
			fmt.Fprintf(&b, "; decimal mark unclear in %q, read as %s", c.Name, mark)
		}
		if c.MixedDecimal {
			fmt.Fprintf(&b, "; %q mixes decimal points and commas", c.Name)
		}
	}
	return b.String()
}

// badRows lists the rows of cells not used as numbers, capped.
func (t *Table) badRows(cols []*Column, total int) string {
	const show = 5
	var rows []string
	in := map[string]bool{}
	for _, c := range cols {
		in[c.Name] = true
	}
	for _, p := range t.Problems {
		if len(rows) == show {
			break
		}
		if p.Row > 0 && in[p.Column] && p.Kind != KindMissing && p.Kind != KindExtra {
			rows = append(rows, fmt.Sprint(p.Row))
		}
	}
	s := plural(len(rows), "row ", "rows ") + strings.Join(rows, ", ")
	if total > len(rows) {
		s += fmt.Sprintf(" ... and %d more", total-len(rows))
	}
	return s
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// ReadOptions are the user's decisions about the input.
type ReadOptions struct {
	// DecimalMark decides columns whose decimal mark is ambiguous ("1,234"):
	// "" (default: decimal comma), "comma" or "point".
	DecimalMark string `json:"decimalMark,omitempty"`
	// DateOrder decides dates like 03/04/2026 when no cell shows the order:
	// "" (default: day-first), "day" or "month".
	DateOrder string `json:"dateOrder,omitempty"`
	// SizeHint is the expected input size in bytes (e.g. File.size), used to
	// size the columns once and keep peak memory near the parsed data.
	SizeHint int64 `json:"sizeHint,omitempty"`
	// KeepText, when above 0, keeps the decoded text up to that many bytes
	// for Table.DecodedText (the page's share link of a dropped file).
	KeepText int64 `json:"-"`
}

// Read reads a whole text with the default options.
func Read(text string) (*Table, error) { return ReadWith(text, ReadOptions{}) }

// ReadWith reads a whole text.
func ReadWith(text string, opt ReadOptions) (*Table, error) {
	if opt.SizeHint == 0 {
		opt.SizeHint = int64(len(text))
	}
	s := NewStream(opt)
	s.writeString(text)
	return s.Finish()
}

// ReadBytes reads file bytes.
func ReadBytes(b []byte, opt ReadOptions) (*Table, error) {
	if opt.SizeHint == 0 {
		opt.SizeHint = int64(len(b))
	}
	s := NewStream(opt)
	_, _ = s.Write(b)
	return s.Finish()
}

// SetDecimalMark re-reads the columns flagged AmbiguousDecimal with the
// user's choice, "comma" or "point" ("" changes nothing), from their cells as
// typed: a large file need not be read again when the user decides.
func (t *Table) SetDecimalMark(mark string) error {
	var m byte
	switch mark {
	case "":
		return nil
	case "comma":
		m = ','
	case "point":
		m = '.'
	default:
		return fmt.Errorf("decimal mark %q is not known: use \"comma\" or \"point\"", mark)
	}
	var scratch []byte
	for _, c := range t.Columns {
		if !c.AmbiguousDecimal || c.mark == m {
			continue
		}
		n := len(c.Values)
		vals := make([]float64, n)
		decs := make([]int8, n)
		nc := &Column{mark: m}
		for i := 0; i < n; i++ {
			txt := c.Text(i)
			v, d := c.Values[i], c.Dec[i]
			if !math.IsNaN(v) {
				if r := parseNumber(txt, m, &scratch); r.reason == "" {
					v, d = r.v, r.dec
				}
			}
			vals[i], decs[i] = v, d
			if _, kept := c.sparse(i); kept || (!math.IsNaN(v) && string(formatValue(scratch[:0], v, d, m)) != txt) {
				nc.keep(i, txt)
			}
		}
		c.Values, c.Dec = vals, decs
		c.spIdx, c.spOff, c.spBuf = nc.spIdx, nc.spOff, nc.spBuf
		c.mark = m
		c.DecimalComma = m == ','
		for k, p := range t.Problems {
			if p.Row == 0 && p.Kind == KindAmbiguous && p.Col == c.Position {
				t.Problems[k].Action = "read with the decimal " + markName(m) + " as chosen"
			}
		}
	}
	return nil
}
