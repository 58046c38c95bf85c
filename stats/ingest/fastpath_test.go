package ingest

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"math"
	"math/rand"
	"reflect"
	"strconv"
	"strings"
	"testing"
	"unicode"
)

// nearDecimal draws a cell that is a plain decimal or close to one: signs,
// leading zeros, both marks, up to 19 digits, spaces, exponents, units and
// missing markers, so that every limit of the fast paths is crossed.
func nearDecimal(r *rand.Rand, mark byte, odd bool) string {
	var b strings.Builder
	switch r.Intn(40) {
	case 0:
		if !odd {
			return "NA"
		}
		return []string{"NA", "-", "", "12.5 g", "1e3", "+4", "abc", "1,234", "1.234", "1 234,5", "−2"}[r.Intn(11)]
	case 1:
		b.WriteByte(' ')
	}
	if r.Intn(4) == 0 {
		b.WriteByte('-')
	}
	digits := r.Intn(20)
	if r.Intn(3) > 0 {
		digits = 1 + r.Intn(7)
	}
	frac := -1
	if r.Intn(3) > 0 {
		frac = r.Intn(digits + 1)
	}
	for k := 0; k < digits; k++ {
		if k == frac && k > 0 {
			m := mark
			if odd && r.Intn(25) == 0 {
				m = '.' + ',' - mark
			}
			b.WriteByte(m)
		}
		d := byte('0' + r.Intn(10))
		if k == 0 && r.Intn(6) > 0 && d == '0' {
			d = '1'
		}
		b.WriteByte(d)
	}
	if digits > 0 && frac == digits && r.Intn(8) == 0 {
		b.WriteByte(mark) // a mark without decimals
	}
	if r.Intn(40) == 0 {
		b.WriteByte('\t')
	}
	return b.String()
}

// TestTextColumnLikeCells: one column of text lines (read by the fast
// paths for plain lines and plain decimals) gives the column that the same
// cells read one by one give (ReadCells: the general path of every cell).
// Check values: the general path (parseNumber, strconv.ParseFloat).
func TestTextColumnLikeCells(t *testing.T) {
	r := rand.New(rand.NewSource(17))
	for round := 0; round < 60; round++ {
		mark := byte('.')
		if round%3 == 2 {
			mark = ','
		}
		n := 50 + r.Intn(3000)
		var text strings.Builder
		text.WriteString("Value\n")
		crlf := round%4 == 1
		var cells []Cell
		for i := 0; i < n; i++ {
			s := nearDecimal(r, mark, round%2 == 0)
			if i == 0 || (i == n-1 && strings.TrimSpace(s) == "") {
				s = "1" // a number under the header; no empty line at the end
			}
			text.WriteString(s)
			if crlf {
				text.WriteByte('\r')
			}
			text.WriteByte('\n')
			cells = append(cells, Cell{Row: i + 2, Text: s})
		}
		tt, err := Read(text.String())
		if err != nil {
			t.Fatalf("round %d: %v", round, err)
		}
		ct, err := ReadCells("Value", cells, ReadOptions{})
		if err != nil {
			t.Fatalf("round %d cells: %v", round, err)
		}
		x, c := tt.Columns[0], ct.Columns[0]
		ci := c.ColumnInfo
		ci.Header = "Value" // cells have no header
		if tt.HeaderRow != 1 || x.ColumnInfo != ci {
			t.Fatalf("round %d: header row %d, %+v, cells %+v", round, tt.HeaderRow, x.ColumnInfo, c.ColumnInfo)
		}
		if !reflect.DeepEqual(x.Rows, c.Rows) || !reflect.DeepEqual(x.Dec, c.Dec) || !reflect.DeepEqual(tt.Problems, ct.Problems) {
			t.Fatalf("round %d: rows, decimals or problems differ", round)
		}
		for i := range c.Values {
			if math.Float64bits(x.Values[i]) != math.Float64bits(c.Values[i]) || x.Text(i) != c.Text(i) {
				t.Fatalf("round %d cell %q: %v %q, general path %v %q", round, cells[i].Text, x.Values[i], x.Text(i), c.Values[i], c.Text(i))
			}
		}
		if testing.Verbose() && round < 4 {
			fmt.Println(tt.Summary())
		}
	}
}

// trimCell's shortcut for cells that start and end with printable ASCII
// trims as strings.TrimFunc with isSpaceRune does.
func TestTrimCellShortcut(t *testing.T) {
	r := rand.New(rand.NewSource(23))
	atoms := []string{"1", ".", "a", " ", "\t", "\v", "\f", "\u00a0", "\u2009", "\u3000", "\x7f", "\x01", "~", "!", "µ", "\xff", "\xc2", "\x80"}
	for i := 0; i < 200000; i++ {
		var b strings.Builder
		for k := r.Intn(6); k >= 0; k-- {
			b.WriteString(atoms[r.Intn(len(atoms))])
		}
		s := b.String()
		if got, want := trimCell(s), strings.TrimFunc(s, isSpaceRune); got != want {
			t.Fatalf("trimCell(%q) = %q, want %q", s, got, want)
		}
	}
}

// The sniffing pass's shortcuts for a window without quotes cut and count
// as the splitter and splitPlain do: plainRecords gives the splitter's
// records (LF, CRLF and CR texts, mixed), countFields the number of fields.
func TestPlainRecordsLikeSplitter(t *testing.T) {
	r := rand.New(rand.NewSource(29))
	atoms := []string{"1", "a", ",", ";", " ", "\t", "\r", "\n", "\r\n", "\n\r", "\r\r\n", "|", "\xb5"}
	for i := 0; i < 100000; i++ {
		var b []byte
		for k := r.Intn(12); k >= 0; k-- {
			b = append(b, atoms[r.Intn(len(atoms))]...)
		}
		brk, other := byte('\n'), byte('\r')
		if bytes.IndexByte(b, '\n') < 0 {
			brk, other = '\r', '\n'
		}
		for _, sep := range []byte{0, '\t', ',', ';', '|', ' '} {
			var want [][]byte
			sp := splitter{brk: brk, other: other, sep: sep}
			sp.emit = func(rec []byte, quoted bool) { want = append(want, append([]byte{}, rec...)) }
			sp.feed(b)
			sp.finish()
			got := plainRecords(b, nil)
			if len(got) != len(want) {
				t.Fatalf("%q: %d records, splitter %d", b, len(got), len(want))
			}
			for k, g := range got {
				rec := b[g.start:g.end]
				if !bytes.Equal(rec, want[k]) {
					t.Fatalf("%q: record %d %q, splitter %q", b, k, rec, want[k])
				}
				if n := len(splitPlain(rec, sep, nil)); countFields(rec, sep) != n {
					t.Fatalf("%q separator %q: %d fields, splitPlain %d", rec, sep, countFields(rec, sep), n)
				}
			}
		}
		if s := string(b); hasSpace(s) != (strings.IndexFunc(s, unicode.IsSpace) >= 0) {
			t.Fatalf("hasSpace(%q) = %v", s, hasSpace(s))
		}
	}
	for _, s := range []string{"1\u00a02", "1\u20002", "µ 2", "\x85", "1\u3000"} {
		if hasSpace(s) != (strings.IndexFunc(s, unicode.IsSpace) >= 0) {
			t.Fatalf("hasSpace(%q) = %v", s, hasSpace(s))
		}
	}
}

// digits8 gives the number of 1 to 8 digits as strconv.ParseUint does
// (Go standard library), for every length and random digits.
func TestDigits8(t *testing.T) {
	r := rand.New(rand.NewSource(31))
	for i := 0; i < 200000; i++ {
		k := 1 + r.Intn(8)
		b := make([]byte, 8)
		for j := range b {
			b[j] = byte(r.Intn(256)) // beyond k: anything
		}
		for j := 0; j < k; j++ {
			b[j] = byte('0' + r.Intn(10))
		}
		if i%7 == 0 {
			for j := 0; j < k; j++ {
				b[j] = '9'
			}
		}
		x := binary.LittleEndian.Uint64(b) ^ 0x3030303030303030
		want, _ := strconv.ParseUint(string(b[:k]), 10, 64)
		if got := digits8(x << (64 - 8*k)); got != want {
			t.Fatalf("%q: %d, want %d", b[:k], got, want)
		}
	}
}

// TestFastCellsLikeGeneral: tables of one or several columns of numbers
// (plain decimals and cells near them, both marks, LF and CRLF, notes, a
// header) read with the fast paths give the table that the general path
// (the splitter for the sniffing window, splitPlain, data and cell for
// every line) gives.
func TestFastCellsLikeGeneral(t *testing.T) {
	r := rand.New(rand.NewSource(37))
	for round := 0; round < 300; round++ {
		seps := []string{"\n", ",", ";", "\t", "|"}
		sep := seps[round%len(seps)]
		nc := 1
		if sep != "\n" {
			nc = 1 + r.Intn(5)
			if round%23 == 0 {
				nc = maxWide + 1 - r.Intn(2)
			}
		}
		marks := make([]byte, nc)
		for j := range marks {
			marks[j] = ".,"[r.Intn(2)]
		}
		brk := []string{"\n", "\r\n"}[r.Intn(2)]
		var b strings.Builder
		if r.Intn(3) == 0 {
			b.WriteString("Note: line 4" + brk)
		}
		for j := 0; j < nc; j++ {
			if j > 0 {
				b.WriteString(sep)
			}
			fmt.Fprintf(&b, "X%d", j)
		}
		b.WriteString(brk)
		rows := 40 + r.Intn(400)
		for i := 0; i < rows; i++ {
			for j := 0; j < nc; j++ {
				if j > 0 {
					b.WriteString(sep)
				}
				cell := nearDecimal(r, marks[j], round%2 == 0)
				if i%97 == 5 && j == 0 {
					cell = "1.234.567" // a decimal comma for sure, also in a comma-separated table
				}
				if i == 0 || (i == rows-1 && strings.TrimSpace(cell) == "") {
					cell = "1"
				}
				b.WriteString(cell)
			}
			if r.Intn(60) == 0 {
				b.WriteString(sep + "7") // a cell beyond the last column
			}
			b.WriteString(brk)
		}
		in := []byte(b.String())
		for _, chunk := range []int{len(in) + 1, 64, 1 + r.Intn(500)} {
			fast, err1 := readChunks(in, []int{chunk}, 0, ReadOptions{})
			generalPaths = true
			slow, err2 := readChunks(in, []int{chunk}, 0, ReadOptions{})
			generalPaths = false
			if (err1 == nil) != (err2 == nil) {
				t.Fatalf("round %d: %v vs %v", round, err1, err2)
			}
			if err1 != nil {
				continue
			}
			if d := diffTables(fast, slow); d != "" || !reflect.DeepEqual(fast.Head, slow.Head) {
				t.Fatalf("round %d (separator %q, %d columns, chunks of %d): %s", round, sep, nc, chunk, d)
			}
		}
	}
}

// TestFastPathsLikeGeneralNoise: short texts of random pieces (numbers,
// marks, separators, spaces, CR, LF, quotes, Latin-1 bytes, dates, units,
// missing markers) give the same table or error with and without the fast
// paths, read whole and in chunks, with a small sniffing window too.
func TestFastPathsLikeGeneralNoise(t *testing.T) {
	r := rand.New(rand.NewSource(41))
	atoms := []string{"1", "2", "0", "5", ".", ",", ";", "\t", " ", "\r", "\n", "\n", "\n", "\r\n", "a", "\xb5", "-", "NA",
		"g", "12.5", "3,25", "|", "\"", "1,234", "1.234", "01/02/2026", "13/02/2026", "08:15", "x y", "12.5 mm", "Weight (g)", "#N/A"}
	n := 6000
	if testing.Short() {
		n = 1500
	}
	for k := 0; k < n; k++ {
		var b []byte
		m := r.Intn(80)
		if k%40 == 0 {
			m = r.Intn(6000)
		}
		quotes := r.Intn(4) == 0
		for i := 0; i < m; i++ {
			a := atoms[r.Intn(len(atoms))]
			if a == "\"" && !quotes {
				continue
			}
			b = append(b, a...)
		}
		sizes := []int{len(b) + 1, 1 + r.Intn(300)}
		window := []int{0, 64, 4096}[r.Intn(3)]
		for _, size := range sizes {
			fast, err1 := readChunks(b, []int{size}, window, ReadOptions{})
			generalPaths = true
			slow, err2 := readChunks(b, []int{size}, window, ReadOptions{})
			generalPaths = false
			if (err1 == nil) != (err2 == nil) || (err1 != nil && err1.Error() != err2.Error()) {
				t.Fatalf("%q: errors %v vs %v", b, err1, err2)
			}
			if err1 != nil {
				continue
			}
			if d := diffTables(fast, slow); d != "" || !reflect.DeepEqual(fast.Head, slow.Head) {
				t.Fatalf("%q (chunks of %d, window %d): %s", b, size, window, d)
			}
		}
	}
}
