package ingest

import (
	"bytes"
	"fmt"
	"math"
	"math/rand"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"
)

// readChunks reads b in the given chunk sizes (cycled), with a sniffing
// window of sniffN bytes (0 = SniffBytes).
func readChunks(b []byte, sizes []int, sniffN int, opt ReadOptions) (*Table, error) {
	s := NewStream(opt)
	if sniffN > 0 {
		s.sniffN = sniffN
	}
	for i := 0; len(b) > 0; i++ {
		n := min(max(sizes[i%len(sizes)], 1), len(b))
		if _, err := s.Write(b[:n]); err != nil {
			if _, err2 := s.Finish(); err2 == nil || err2.Error() != err.Error() {
				return nil, fmt.Errorf("Write said %v, Finish said %v", err, err2)
			}
			return nil, err
		}
		b = b[n:]
	}
	return s.Finish()
}

// diffTables describes the first difference between two tables, "" if none.
func diffTables(a, b *Table) string {
	if a.HeaderRow != b.HeaderRow || a.Format != b.Format || a.Shape != b.Shape || a.Unlisted != b.Unlisted {
		return fmt.Sprintf("table: %d %+v %s %d vs %d %+v %s %d", a.HeaderRow, a.Format, a.Shape, a.Unlisted, b.HeaderRow, b.Format, b.Shape, b.Unlisted)
	}
	if !reflect.DeepEqual(a.Problems, b.Problems) {
		for i := range min(len(a.Problems), len(b.Problems)) {
			if a.Problems[i] != b.Problems[i] {
				return fmt.Sprintf("problem %d: %+v vs %+v", i, a.Problems[i], b.Problems[i])
			}
		}
		return fmt.Sprintf("%d problems vs %d", len(a.Problems), len(b.Problems))
	}
	if a.Summary() != b.Summary() {
		return "summary: " + a.Summary() + " vs " + b.Summary()
	}
	if len(a.Columns) != len(b.Columns) {
		return fmt.Sprintf("%d columns vs %d", len(a.Columns), len(b.Columns))
	}
	for j, ca := range a.Columns {
		cb := b.Columns[j]
		if ca.ColumnInfo != cb.ColumnInfo {
			return fmt.Sprintf("column %d: %+v vs %+v", j, ca.ColumnInfo, cb.ColumnInfo)
		}
		if len(ca.Values) != len(cb.Values) || !equalRows(ca.Rows, cb.Rows) || !equalRows(ca.Cols, cb.Cols) || !bytes.Equal(int8s(ca.Dec), int8s(cb.Dec)) {
			return fmt.Sprintf("column %s: cells differ", ca.Name)
		}
		for i := range ca.Values {
			if math.Float64bits(ca.Values[i]) != math.Float64bits(cb.Values[i]) && !(math.IsNaN(ca.Values[i]) && math.IsNaN(cb.Values[i])) {
				return fmt.Sprintf("column %s value %d: %v vs %v", ca.Name, i, ca.Values[i], cb.Values[i])
			}
			if ca.Text(i) != cb.Text(i) {
				return fmt.Sprintf("column %s text %d: %q vs %q", ca.Name, i, ca.Text(i), cb.Text(i))
			}
		}
	}
	return ""
}

func int8s(x []int8) []byte {
	b := make([]byte, len(x))
	for i, v := range x {
		b[i] = byte(v)
	}
	return b
}

func toUTF16(s string, le bool) []byte {
	u := utf16.Encode([]rune("\ufeff" + s))
	b := make([]byte, 2*len(u))
	for i, x := range u {
		if le {
			b[2*i], b[2*i+1] = byte(x), byte(x>>8)
		} else {
			b[2*i], b[2*i+1] = byte(x>>8), byte(x)
		}
	}
	return b
}

// bigInput is a table larger than the sniffing window with quotes holding
// separators and line breaks, notes, CRLF, missing cells and bad cells.
func bigInput(rows int) string {
	r := rand.New(rand.NewSource(7))
	var b strings.Builder
	b.WriteString("Export of station 3\r\nOperator: Ana Müller\r\n\r\n")
	b.WriteString("Seq;Line;Remark;Weight (g);Time\r\n")
	for i := 1; i <= rows; i++ {
		rem := "ok"
		switch r.Intn(40) {
		case 0:
			rem = `"two\r\nlines; ""quoted"""`
		case 1:
			rem = `"a;b"`
		}
		w := fmt.Sprintf("%d,%03d", 500+r.Intn(5), r.Intn(1000))
		switch r.Intn(200) {
		case 0:
			w = ""
		case 1:
			w = "NA"
		case 2:
			w = "err"
		case 3:
			w = "1.234,5"
		}
		fmt.Fprintf(&b, "%d;L%d;%s;%s;2026-03-%02dT%02d:%02d\r\n", i, 1+r.Intn(3), rem, w, 1+i%28, i%24, i%60)
	}
	return b.String()
}

func TestChunkedEqualsWhole(t *testing.T) {
	inputs := map[string][]byte{}
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "ingest", "*.*"))
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		inputs[filepath.Base(f)] = b
	}
	n := 8000
	if testing.Short() || runtime.GOOS == "js" {
		n = 3000
	}
	big := bigInput(n)
	inputs["big-crlf"] = []byte(big)
	inputs["big-cr"] = []byte(strings.ReplaceAll(big, "\r\n", "\r"))
	inputs["big-utf16le"] = toUTF16(big, true)
	inputs["big-utf16be"] = toUTF16(big, false)
	inputs["one-long-line"] = []byte(strings.Repeat("12.5 13.25 -7 ", 30000) + "\n\n")
	r := rand.New(rand.NewSource(1))
	for name, b := range inputs {
		windows := []int{0, 64}
		if len(b) > 4000 {
			windows = windows[:1]
		}
		for _, sniffN := range windows {
			// the whole input in one write
			want, werr := readChunks(b, []int{len(b) + 1}, sniffN, ReadOptions{})
			for trial := 0; trial < 5; trial++ {
				var sizes []int
				switch trial {
				case 0:
					if len(b) > 4000 {
						continue // byte by byte only for the small files
					}
					sizes = []int{1}
				case 1:
					sizes = []int{2, 3, 5, 7}
				default:
					if len(b) > 4000 && trial > 2 {
						continue
					}
					for k := 0; k < 50; k++ {
						sizes = append(sizes, 1+r.Intn([]int{16, 1000, 70000}[k%3]))
					}
				}
				got, gerr := readChunks(b, sizes, sniffN, ReadOptions{})
				if (werr == nil) != (gerr == nil) || (werr != nil && werr.Error() != gerr.Error()) {
					t.Fatalf("%s trial %d sniff %d: errors %v vs %v", name, trial, sniffN, werr, gerr)
				}
				if werr != nil {
					continue
				}
				if d := diffTables(want, got); d != "" {
					t.Fatalf("%s trial %d sniff %d: %s", name, trial, sniffN, d)
				}
			}
		}
	}
	// the big table is read as intended
	tab, err := Read(big)
	if err != nil {
		t.Fatal(err)
	}
	checkInvariants(t, tab)
	w := tab.Column("Weight")
	if tab.HeaderRow != 4 || tab.Format.Separator != "semicolon" || w == nil || !w.DecimalComma || w.Unit != "g" || tab.Column("Time").Kind != "time" {
		t.Fatalf("big table: header %d %+v %+v", tab.HeaderRow, tab.Format, tab.Infos())
	}
	if w.Len() != n || int(w.Rows[n-1]) != 4+n {
		t.Fatalf("big table: %d cells, last row %d", w.Len(), w.Rows[len(w.Rows)-1])
	}
}

// Values and texts of random decimals: the value is the correctly rounded
// double of the text (strconv.ParseFloat is the reference: Go's standard
// library, correctly rounded per its documentation), and Text gives back
// the text as typed.
func TestRandomDecimalsRoundTrip(t *testing.T) {
	r := rand.New(rand.NewSource(3))
	for _, mark := range []string{".", ","} {
		var in []string
		var want []float64
		for i := 0; i < 20000; i++ {
			digits := 1 + r.Intn(17)
			dec := r.Intn(min(digits, 9) + 1)
			var s strings.Builder
			if r.Intn(3) == 0 {
				s.WriteByte('-')
			}
			for k := 0; k < digits; k++ {
				d := byte('0' + r.Intn(10))
				if k == 0 && digits-dec > 1 && d == '0' {
					d = '1'
				}
				if k == digits-dec && dec > 0 {
					if k == 0 {
						s.WriteByte('0')
					}
					s.WriteString(mark)
				}
				s.WriteByte(d)
			}
			switch r.Intn(30) {
			case 0:
				s.WriteString("e-3")
			case 1:
				if strings.HasPrefix(s.String(), "-") {
					break
				}
				in = append(in, "+"+s.String())
				v, _ := strconv.ParseFloat(strings.Replace(s.String(), ",", ".", 1), 64)
				want = append(want, v)
				continue
			}
			txt := s.String()
			v, err := strconv.ParseFloat(strings.Replace(txt, ",", ".", 1), 64)
			if err != nil {
				t.Fatal(err)
			}
			in = append(in, txt)
			want = append(want, v)
		}
		text := "Value\n" + strings.Join(in, "\n") + "\n"
		// make the column's mark unambiguous for the comma case
		if mark == "," {
			text = "Value\n12,5\n" + strings.Join(in, "\n") + "\n"
			in = append([]string{"12,5"}, in...)
			want = append([]float64{12.5}, want...)
		}
		tab, err := Read(text)
		if err != nil {
			t.Fatal(err)
		}
		c := tab.Columns[0]
		if c.Bad != 0 || c.Len() != len(in) {
			t.Log(tab.Problems[:min(3, len(tab.Problems))])
			t.Fatalf("mark %s: %d bad, %d cells: %s", mark, c.Bad, c.Len(), tab.Summary())
		}
		for i := range in {
			if c.Values[i] != want[i] {
				t.Fatalf("%q: %v, want %v", in[i], c.Values[i], want[i])
			}
			if c.Text(i) != in[i] {
				t.Fatalf("Text(%d) = %q, want %q", i, c.Text(i), in[i])
			}
		}
	}
}

func TestFastDecimalAgreesWithParseFloat(t *testing.T) {
	// reference: strconv.ParseFloat (Go standard library, correctly rounded)
	r := rand.New(rand.NewSource(5))
	for i := 0; i < 200000; i++ {
		n := 1 + r.Intn(16)
		b := make([]byte, 0, 20)
		if r.Intn(2) == 0 {
			b = append(b, '-')
		}
		for k := 0; k < n; k++ {
			b = append(b, byte('0'+r.Intn(10)))
		}
		if r.Intn(4) > 0 {
			p := len(b) - r.Intn(n)
			if p > 0 && b[p-1] != '-' {
				b = append(b[:p], append([]byte{'.'}, b[p:]...)...)
			}
		}
		v, _, _, ok := fastDecimal(b, '.')
		if !ok {
			continue
		}
		w, err := strconv.ParseFloat(string(b), 64)
		if err != nil || v != w {
			t.Fatalf("%s: %v, want %v (%v)", b, v, w, err)
		}
	}
}

// The catalogue of bad inputs: each gets a message naming the problem and
// what to do, and nothing panics.
func TestBadInputCatalogue(t *testing.T) {
	cases := []struct {
		file    string
		input   func() []byte
		problem string // in the error
		todo    string // in the error: what to do
	}{
		{file: "junk.bin", problem: "does not look like text", todo: "export the measurements as CSV"},
		{file: "report.pdf", problem: "this is a PDF document", todo: "copy and paste"},
		{file: "page.html", problem: "this is a web page (HTML)", todo: "copy it and paste it here"},
		{file: "sheet.xlsx", problem: "spreadsheet file (.xlsx", todo: "save the data as CSV"},
		{file: "empty.txt", problem: "the input is empty", todo: "paste a column of measurements"},
		{file: "header-only.csv", problem: `only a header row was found (row 1: "Weight (g)", "Line", "Operator")`, todo: "paste the measurements"},
		{file: "words.txt", problem: `column "Supplier" holds words, such as "North" in row 2`, todo: "choose a column of measurements"},
		{file: "all-missing.csv", problem: "all 8 cells are empty or marked missing", todo: "paste the measurements themselves"},
		{file: "10 MB single line", input: func() []byte {
			b := bytes.Repeat([]byte("QmFzZTY0IGJsb2Igb2YgYSBzY2FubmVkIGZpbGU"), 10<<20/39+1)
			return b[:10<<20]
		}, problem: "no numbers found in one line of 10.0 MB", todo: "paste one value per line"},
		{file: "spaces only", input: func() []byte { return []byte(" \n\t\r\n ") }, problem: "the input is empty", todo: "paste"},
		{file: "utf-16 junk", input: func() []byte { return toUTF16("\x00\x01\x02\x03\x04 junk", true) }, problem: "does not look like text", todo: "export"},
	}
	for _, c := range cases {
		var b []byte
		if c.input != nil {
			b = c.input()
		} else {
			var err error
			b, err = os.ReadFile(filepath.Join("..", "..", "testdata", "ingest", "bad", c.file))
			if err != nil {
				t.Fatal(err)
			}
		}
		_, err := ReadBytes(b, ReadOptions{})
		if err == nil {
			t.Errorf("%s: no error", c.file)
			continue
		}
		if !strings.Contains(err.Error(), c.problem) || !strings.Contains(err.Error(), c.todo) {
			t.Errorf("%s: message %q lacks %q or %q", c.file, err, c.problem, c.todo)
		}
		// and the same in chunks
		if _, err2 := readChunks(b, []int{1000, 3, 65536}, 0, ReadOptions{}); err2 == nil || err2.Error() != err.Error() {
			t.Errorf("%s: chunked read said %v", c.file, err2)
		}
	}
	// mixed decimal marks: read, with each cell of the other mark listed
	tab := readFile(t, filepath.Join("bad", "mixed-marks.txt"), ReadOptions{})
	c := tab.Columns[0]
	if !c.MixedDecimal || c.Bad != 3 || c.Numbers != 3 {
		t.Fatalf("mixed marks: %+v", c.ColumnInfo)
	}
	if !strings.Contains(tab.Summary(), `3 cells not numbers (rows 4, 5, 7); "Weight" mixes decimal points and commas`) {
		t.Errorf("summary %q", tab.Summary())
	}
	found := false
	for _, p := range tab.Problems {
		if p.Kind == KindMixed && strings.Contains(p.Reason, `column "Weight" mixes decimal marks`) && strings.Contains(p.Action, "Check the export") {
			found = true
		}
	}
	if !found || !hasProblem(tab, "4:decimal-mark") || !hasProblem(tab, "7:decimal-mark") {
		t.Errorf("mixed marks problems: %+v", tab.Problems)
	}
}

func TestSummaryFormat(t *testing.T) {
	// the example: 498 values, bad cells in rows 17 and 203, one empty
	var b strings.Builder
	for row := 1; row <= 501; row++ {
		switch row {
		case 17:
			b.WriteString("12.3.4\n")
		case 203:
			b.WriteString("twelve\n")
		case 300:
			b.WriteString("\n")
		default:
			fmt.Fprintf(&b, "%d.%d\n", 10+row%7, row%10)
		}
	}
	tab, err := Read(b.String())
	if err != nil {
		t.Fatal(err)
	}
	if got, want := tab.Summary(), "498 values read; 2 cells not numbers (rows 17, 203); 1 empty"; got != want {
		t.Errorf("summary %q, want %q", got, want)
	}
	// capped row list
	b.Reset()
	b.WriteString("W\n1.5\n")
	for i := 0; i < 12; i++ {
		b.WriteString("x\n1.5\n")
	}
	tab, err = Read(b.String())
	if err != nil {
		t.Fatal(err)
	}
	if got, want := tab.Summary(), "13 values read; 12 cells not numbers (rows 3, 5, 7, 9, 11 ... and 7 more)"; got != want {
		t.Errorf("summary %q, want %q", got, want)
	}
}

func TestProblemListCapped(t *testing.T) {
	var b strings.Builder
	b.WriteString("W\n1.5\n")
	n := MaxProblems + 500
	for i := 0; i < n; i++ {
		b.WriteString("bad\n2.5\n")
	}
	tab, err := Read(b.String())
	if err != nil {
		t.Fatal(err)
	}
	c := tab.Columns[0]
	if c.Bad != n || tab.Unlisted != 500 || len(tab.Problems) != MaxProblems+1 || tab.Problems[MaxProblems].Kind != KindMore {
		t.Fatalf("bad %d unlisted %d problems %d", c.Bad, tab.Unlisted, len(tab.Problems))
	}
	if !strings.Contains(tab.Problems[MaxProblems].Reason, "500 more problems") {
		t.Errorf("last problem %+v", tab.Problems[MaxProblems])
	}
}

func TestStreamProgressAndMisuse(t *testing.T) {
	s := NewStream(ReadOptions{})
	for i := 0; i < 10; i++ {
		if _, err := s.Write([]byte("1.5\n2.5\n")); err != nil {
			t.Fatal(err)
		}
	}
	if s.Progress() != 80 {
		t.Errorf("progress %d", s.Progress())
	}
	tab, err := s.Finish()
	if err != nil || tab.Columns[0].Numbers != 20 {
		t.Fatalf("%v %v", tab, err)
	}
	if _, err := s.Write([]byte("1")); err == nil {
		t.Error("write after Finish accepted")
	}
	if _, err := s.Finish(); err == nil {
		t.Error("second Finish accepted")
	}
	// an early error stops the writes: a PDF larger than the window
	s = NewStream(ReadOptions{})
	pdf := append([]byte("%PDF-1.7\n"), bytes.Repeat([]byte("stream junk\n"), 40000)...)
	if _, err := s.Write(pdf); err == nil || !strings.Contains(err.Error(), "PDF") {
		t.Errorf("write of a PDF: %v", err)
	}
}

func TestCellForms(t *testing.T) {
	// each form and the value its notation denotes (common practice)
	cases := []struct {
		in   string
		mark byte
		v    float64
		ok   bool
		unit string
	}{
		{"12.31 g", '.', 12.31, true, "g"},
		{"0.5mm", '.', 0.5, true, "mm"},
		{"+5.0", '.', 5, true, ""},
		{"\u22123.5", '.', -3.5, true, ""},
		{"1,234.5", '.', 1234.5, true, ""},
		{"1.234,5", ',', 1234.5, true, ""},
		{"1 234 567,25", ',', 1234567.25, true, ""},
		{"1'234.5", '.', 1234.5, true, ""},
		{"12,5", '.', 0, false, ""},
		{"12.5", ',', 0, false, ""},
		{"1,23,456", '.', 0, false, ""},
		{"5 apples", '.', 0, false, ""},
		{"1e400", '.', 0, false, ""},
		{"2.5E+2", '.', 250, true, ""},
		{"7%", '.', 7, true, "%"},
		{".5", '.', 0.5, true, ""},
		{"-.5", '.', -0.5, true, ""},
		{"5.", '.', 5, true, ""},
		{"1.2.3", '.', 0, false, ""},
	}
	var scratch []byte
	for _, c := range cases {
		r := parseNumber(c.in, c.mark, &scratch)
		if (r.reason == "") != c.ok || (c.ok && (r.v != c.v || r.unit != c.unit)) {
			t.Errorf("%q mark %c: %+v", c.in, c.mark, r)
		}
	}
}

func TestWholeTextIsNotCopiedOrChanged(t *testing.T) {
	text := "W\n1.5\n2.5\n"
	tab, err := Read(text)
	if err != nil || text != "W\n1.5\n2.5\n" || tab.Columns[0].Text(1) != "2.5" {
		t.Fatal(err)
	}
}

func TestSetDecimalMark(t *testing.T) {
	// "1,234" read with a decimal comma is 1.234; with a decimal point (comma
	// as thousands separator) it is 1234: the notation's definition.
	text := "Thickness\tLot\n1,234\tA\n1,198\tB\nNA\tA\n2\tB\n"
	tab, err := Read(text)
	if err != nil {
		t.Fatal(err)
	}
	c := tab.Columns[0]
	if !c.AmbiguousDecimal || !c.DecimalComma || c.Values[0] != 1.234 {
		t.Fatalf("%+v %v", c.ColumnInfo, c.Values)
	}
	if err := tab.SetDecimalMark("point"); err != nil {
		t.Fatal(err)
	}
	want, err := ReadWith(text, ReadOptions{DecimalMark: "point"})
	if err != nil {
		t.Fatal(err)
	}
	for i, v := range []float64{1234, 1198, nan, 2} {
		if !sameFloat(c.Values[i], v) || c.Text(i) != want.Columns[0].Text(i) || c.Dec[i] != want.Columns[0].Dec[i] {
			t.Errorf("cell %d: %v %q %d", i, c.Values[i], c.Text(i), c.Dec[i])
		}
	}
	if c.DecimalComma || tab.Summary() != want.Summary() {
		t.Errorf("summary %q, want %q", tab.Summary(), want.Summary())
	}
	if err := tab.SetDecimalMark("comma"); err != nil || c.Values[0] != 1.234 || c.Text(0) != "1,234" {
		t.Errorf("back to comma: %v %v %q", err, c.Values[0], c.Text(0))
	}
	if tab.SetDecimalMark("dot") == nil {
		t.Error("unknown mark accepted")
	}
}
