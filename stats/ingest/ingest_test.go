package ingest

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The sample files in testdata/ingest are hand-made format samples shaped
// like real exports (see testdata/ingest/README.md). Their check values are
// the decimal numbers the typed text denotes ("12,5" with a decimal comma
// is 12.5): definition of the notation, common practice.

func readFile(t *testing.T, name string, opt ReadOptions) *Table {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "ingest", name))
	if err != nil {
		t.Fatal(err)
	}
	tab, err := ReadBytes(b, opt)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return tab
}

// colWant is what one column must hold.
type colWant struct {
	name, unit, kind, role string
	rows                   []int32
	vals                   []float64 // NaN where not a number
	texts                  []string  // as typed; nil to skip
	comma                  bool
}

type fileWant struct {
	file      string
	opt       ReadOptions
	sep, enc  string
	header    int
	shape     string
	cols      []colWant
	problems  []string // "row:kind" that must be listed
	summary   string   // substring of Summary()
	transpose bool
}

var nan = math.NaN()

func TestSampleFiles(t *testing.T) {
	cases := []fileWant{
		{file: "clipboard-header.tsv", sep: "tab", enc: "utf-8", header: 1, shape: "long",
			cols: []colWant{
				{name: "Fill weight", unit: "g", kind: "number", role: "value", rows: []int32{2, 3, 4, 5, 6, 7},
					vals: []float64{502.3, 501.8, nan, 503.1, nan, 500.9}, texts: []string{"502.3", "501.8", "", "503.1", "#N/A", "500.9"}},
				{name: "Line", kind: "text", role: "group", texts: []string{"L1", "L2", "L1", "L2", "L1", "L2"}},
			},
			problems: []string{"4:missing", "6:missing"}, summary: "4 values read; 1 empty; 1 marked missing"},
		{file: "clipboard-column.txt", sep: "none", shape: "single",
			cols: []colWant{{name: "Column 1", kind: "number", rows: []int32{1, 2, 3, 4, 5, 6},
				vals: []float64{12.31, 12.29, 12.35, nan, 12.30, 12.33}, texts: []string{"12.31", "12.29", "12.35", "", "12.30", "12.33"}}},
			problems: []string{"4:missing"}, summary: "5 values read; 1 empty"},
		{file: "quoted.csv", sep: "comma", header: 1,
			cols: []colWant{
				{name: "Part", kind: "text", texts: []string{"P-001", "P-002", "P-003"}},
				{name: "Remark", kind: "text", texts: []string{"ok, checked", "re-torqued\nafter check", `said "tight"`}},
				// the quoted line break keeps P-002 in row 3; P-003 is row 4 as a spreadsheet shows it
				{name: "Torque", unit: "Nm", kind: "number", role: "value", rows: []int32{2, 3, 4}, vals: []float64{12.4, 12.9, 12.6}},
			}},
		{file: "semicolon-comma.csv", sep: "semicolon", enc: "utf-8 with BOM", header: 1, shape: "long",
			cols: []colWant{
				{name: "Probe", kind: "number", role: "order", vals: []float64{1, 2, 3, 4}},
				{name: "Durchmesser", unit: "mm", kind: "number", role: "value", comma: true,
					vals: []float64{25.012, 25.008, 24.997, 25.003}, texts: []string{"25,012", "25,008", "24,997", "25,003"}},
				{name: "Prüfer", kind: "text", role: "group"},
			}},
		{file: "pipe.txt", sep: "pipe", header: 1, shape: "long",
			cols: []colWant{{name: "Seal strength", unit: "N", vals: []float64{41.2, 39.8, 40.5}}, {name: "Shift", kind: "text", role: "group"}}},
		{file: "instrument-spaces.txt", sep: "spaces", header: 5, shape: "wide",
			cols: []colWant{
				{name: "No", role: "order", rows: []int32{6, 7, 8, 9}, vals: []float64{1, 2, 3, 4}},
				{name: "Bore", unit: "mm", role: "value", vals: []float64{25.002, 24.998, 25.001, 25.004}},
				{name: "Temp", unit: "°C", vals: []float64{21.4, 21.5, 21.5, 21.6}},
			},
			problems: []string{"1:note-line", "2:note-line", "3:note-line"}, summary: "3 note lines above the table skipped"},
		{file: "one-line.txt", sep: "spaces", transpose: true,
			cols: []colWant{{name: "Column 1", rows: []int32{1, 1, 1, 1, 1, 1}, vals: []float64{0.51, 0.49, 0.52, 0.50, 0.48, 0.53}}}},
		{file: "one-line-named.csv", sep: "semicolon", transpose: true,
			cols: []colWant{{name: "Gap", unit: "mm", comma: true, vals: []float64{0.51, 0.49, 0.52, 0.50}, texts: []string{"0,51", "0,49", "0,52", "0,50"}}}},
		{file: "utf16le.txt", sep: "tab", enc: "utf-16le", header: 1,
			cols: []colWant{{name: "Diameter µm", vals: []float64{12.5, 12.7, 12.6}}, {name: "Lot", kind: "text", texts: []string{"A", "B", "A"}}}},
		{file: "utf16be.txt", sep: "tab", enc: "utf-16be", header: 1,
			cols: []colWant{{name: "Diameter µm", vals: []float64{12.5, 12.7, 12.6}}, {name: "Lot", kind: "text", texts: []string{"A", "B", "A"}}}},
		{file: "latin1.csv", sep: "semicolon", enc: "windows-1252", header: 1,
			cols:     []colWant{{name: "Temperatur", unit: "°C", comma: true, vals: []float64{21.5, 22.1}}, {name: "Prüfer", kind: "text", texts: []string{"Müller", "Jäger"}}},
			problems: []string{"1:encoding"}},
		{file: "cr.txt", sep: "none", header: 1, cols: []colWant{{name: "Torque", rows: []int32{2, 3, 4}, vals: []float64{4.41, 4.38, 4.40}}}},
		{file: "units-in-cells.txt", cols: []colWant{{name: "Column 1", unit: "g", vals: []float64{12.31, 12.29, 12.35, 12.30}, texts: []string{"12.31 g", "12.29 g", "12.35g", "12.30 g"}}}},
		{file: "percent.txt", header: 1, cols: []colWant{{name: "Moisture", unit: "%", vals: []float64{12.5, 11.9, 12.1}}}},
		{file: "signs-exponents.txt", header: 1, cols: []colWant{{name: "Offset", vals: []float64{0.012, -0.008, -0.011, 0.0012, -0.0045},
			texts: []string{"+0.012", "−0.008", "-0.011", "1.2e-3", "-4.5E-03"}}}},
		{file: "thousands.txt", header: 1, cols: []colWant{{name: "Count", comma: true, vals: []float64{1234.5, 2345.0, 1999.9}}}},
		{file: "thousands-apostrophe.txt", header: 1, cols: []colWant{{name: "Load", vals: []float64{1234.5, 2345.0, 999.5}}}},
		{file: "thousands-nbsp.txt", header: 1, cols: []colWant{{name: "Load", comma: true, vals: []float64{1234.5, 2345.0, 3100.25}}}},
		{file: "ambiguous-comma.txt", header: 1, cols: []colWant{{name: "Thickness", comma: true, vals: []float64{1.234, 1.198, 1.305}}},
			problems: []string{"0:ambiguous"}, summary: `decimal mark unclear in "Thickness", read as decimal comma`},
		{file: "ambiguous-comma.txt", opt: ReadOptions{DecimalMark: "point"}, header: 1,
			cols:    []colWant{{name: "Thickness", vals: []float64{1234, 1198, 1305}, texts: []string{"1,234", "1,198", "1,305"}}},
			summary: "read as decimal point (comma as thousands separator)"},
		{file: "missing.txt", header: 1, cols: []colWant{{name: "Weight",
			vals:  []float64{12.1, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, nan, 12.4},
			texts: []string{"12.1", "", "NA", "N/A", "n/a", "-", "--", "?", "#N/A", "#VALUE!", "NaN", "null", "12.4"}}},
			problems: []string{"3:missing", "4:missing", "13:missing"}, summary: "2 values read; 1 empty; 10 marked missing"},
		{file: "header-names.csv", sep: "comma", header: 1, shape: "wide", cols: []colWant{
			{name: "Weight", unit: "g"}, {name: "Weight 2", unit: "g"}, {name: "Torque", unit: "Nm"},
			{name: "Column 4", vals: []float64{7, 8}}, {name: "Length", unit: "mm", vals: []float64{10.1, 10.2}}},
			problems: []string{"1:header"}},
		{file: "long.csv", header: 1, shape: "long", cols: []colWant{{name: "Supplier", kind: "text", role: "group"}, {name: "Wall thickness", unit: "mm", role: "value"}}},
		{file: "wide.tsv", header: 1, shape: "wide", cols: []colWant{
			{name: "Early", vals: []float64{9.81, 9.83, 9.82, 9.80}},
			{name: "Late", vals: []float64{9.79, 9.80, nan, nan}},
			{name: "Night", vals: []float64{9.85, 9.84, 9.86, nan}}},
			summary: "9 values read in 3 columns; 3 empty"},
		// day numbers since 1970-01-01 from Python 3.11 datetime: 2026-03-02 is day 20514,
		// 2026-03-13 day 20525, 2026-02-03 day 20487, 2026-04-02 day 20545, 2026-05-02 day 20575
		{file: "time-iso.csv", header: 1, cols: []colWant{{name: "Timestamp", kind: "time", role: "order",
			vals: []float64{20514*86400 + 8*3600, 20514*86400 + 8*3600 + 900, 20514*86400 + 8*3600 + 1800}}, {name: "Pressure", unit: "bar"}}},
		{file: "time-dayfirst.csv", header: 1, cols: []colWant{{name: "Datum", kind: "time",
			vals: []float64{20514*86400 + 8*3600, 20514*86400 + 9*3600, 20525*86400 + 10*3600}}, {name: "Gewicht", unit: "g", comma: true}}},
		{file: "time-monthfirst.csv", header: 1, cols: []colWant{{name: "Date", kind: "time",
			vals: []float64{20514*86400 + 8*3600, 20525*86400 + 13*3600 + 1800, 20526*86400 + 9*3600 + 300}}, {name: "Cycle time", unit: "s"}}},
		{file: "time-ambiguous.csv", header: 1, cols: []colWant{{name: "Date", kind: "time",
			vals: []float64{20487 * 86400, 20488 * 86400, 20489 * 86400}}, {name: "Gap", unit: "mm", vals: []float64{0.51, 0.49, 0.50}}}, // day-first: 3, 4, 5 February 2026
			problems: []string{"0:ambiguous"}},
		{file: "time-ambiguous.csv", opt: ReadOptions{DateOrder: "month"}, header: 1, cols: []colWant{{name: "Date", kind: "time",
			vals: []float64{20514 * 86400, 20545 * 86400, 20575 * 86400}}, {name: "Gap", unit: "mm"}}}, // month-first: 2 March, 2 April, 2 May 2026
		{file: "subgroups.csv", header: 1, cols: []colWant{{name: "Sample", role: "order"}, {name: "Subgroup", role: "subgroup"}, {name: "Width", unit: "mm", role: "value"}}},
	}
	for _, w := range cases {
		t.Run(w.file+w.opt.DecimalMark+w.opt.DateOrder, func(t *testing.T) {
			tab := readFile(t, w.file, w.opt)
			if w.sep != "" && tab.Format.Separator != w.sep {
				t.Errorf("separator %q, want %q", tab.Format.Separator, w.sep)
			}
			if w.enc != "" && tab.Format.Encoding != w.enc {
				t.Errorf("encoding %q, want %q", tab.Format.Encoding, w.enc)
			}
			if tab.HeaderRow != w.header {
				t.Errorf("header row %d, want %d", tab.HeaderRow, w.header)
			}
			if w.shape != "" && tab.Shape != w.shape {
				t.Errorf("shape %q, want %q", tab.Shape, w.shape)
			}
			if tab.Format.Transposed != w.transpose {
				t.Errorf("transposed %v", tab.Format.Transposed)
			}
			if len(tab.Columns) != len(w.cols) {
				t.Fatalf("%d columns, want %d: %+v", len(tab.Columns), len(w.cols), tab.Infos())
			}
			for j, cw := range w.cols {
				c := tab.Columns[j]
				checkColumn(t, c, cw)
			}
			for _, p := range w.problems {
				if !hasProblem(tab, p) {
					t.Errorf("problem %s not listed: %+v", p, tab.Problems)
				}
			}
			if w.summary != "" && !strings.Contains(tab.Summary(), w.summary) {
				t.Errorf("summary %q lacks %q", tab.Summary(), w.summary)
			}
			checkInvariants(t, tab)
		})
	}
}

func checkColumn(t *testing.T, c *Column, w colWant) {
	t.Helper()
	if c.Name != w.name || c.Unit != w.unit {
		t.Errorf("column %q unit %q, want %q unit %q", c.Name, c.Unit, w.name, w.unit)
	}
	kind := w.kind
	if kind == "" {
		kind = "number"
	}
	if c.Kind != kind {
		t.Errorf("%s: kind %q, want %q", c.Name, c.Kind, kind)
	}
	if w.role != "" && c.Role != w.role {
		t.Errorf("%s: role %q, want %q", c.Name, c.Role, w.role)
	}
	if c.DecimalComma != w.comma {
		t.Errorf("%s: decimal comma %v", c.Name, c.DecimalComma)
	}
	if w.rows != nil && !equalRows(c.Rows, w.rows) {
		t.Errorf("%s: rows %v, want %v", c.Name, c.Rows, w.rows)
	}
	if w.vals != nil {
		if len(c.Values) != len(w.vals) {
			t.Fatalf("%s: %d values %v, want %v", c.Name, len(c.Values), c.Values, w.vals)
		}
		for i, v := range w.vals {
			if !sameFloat(c.Values[i], v) {
				t.Errorf("%s[%d]: %v, want %v", c.Name, i, c.Values[i], v)
			}
		}
	}
	for i, s := range w.texts {
		if got := c.Text(i); got != s {
			t.Errorf("%s: Text(%d) = %q, want %q", c.Name, i, got, s)
		}
	}
}

func equalRows(a, b []int32) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func sameFloat(a, b float64) bool {
	return a == b || (math.IsNaN(a) && math.IsNaN(b))
}

func hasProblem(tab *Table, rowKind string) bool {
	for _, p := range tab.Problems {
		if rowKind == itoa(p.Row)+":"+p.Kind {
			return true
		}
	}
	return false
}

func itoa(n int) string {
	if n == 0 {
		return "0"
	}
	s := ""
	neg := n < 0
	if neg {
		n = -n
	}
	for n > 0 {
		s = string(rune('0'+n%10)) + s
		n /= 10
	}
	if neg {
		s = "-" + s
	}
	return s
}

// checkInvariants holds for every table the reader returns.
func checkInvariants(t testing.TB, tab *Table) {
	t.Helper()
	nums := 0
	for _, c := range tab.Columns {
		n := len(c.Values)
		if len(c.Dec) != n || len(c.Rows) != n {
			t.Fatalf("%s: %d values, %d decimals, %d rows", c.Name, n, len(c.Dec), len(c.Rows))
		}
		if c.Cols != nil && len(c.Cols) != n {
			t.Fatalf("%s: %d cols for %d values", c.Name, len(c.Cols), n)
		}
		good := 0
		for i, v := range c.Values {
			if math.IsInf(v, 0) {
				t.Fatalf("%s[%d]: infinite value", c.Name, i)
			}
			if !math.IsNaN(v) {
				good++
			}
			if i > 0 && c.Rows[i] < c.Rows[i-1] {
				t.Fatalf("%s: rows not in order at %d", c.Name, i)
			}
			_ = c.Text(i)
		}
		switch c.Kind {
		case "number", "time":
			if good != c.Numbers {
				t.Fatalf("%s: %d finite values, Numbers %d", c.Name, good, c.Numbers)
			}
			if c.Numbers+c.Missing+c.Bad != n {
				t.Fatalf("%s: numbers %d + missing %d + bad %d != %d cells", c.Name, c.Numbers, c.Missing, c.Bad, n)
			}
			if c.Kind == "number" {
				nums += c.Numbers
			}
		}
	}
	if nums == 0 {
		t.Fatalf("a table without numbers was returned without an error")
	}
	if tab.Summary() == "" {
		t.Fatal("empty summary")
	}
}

func TestHeaderAndNotesOneColumn(t *testing.T) {
	// the header row expected for each shape: common practice of instrument
	// exports (remarks with a colon or in a sentence above the column name)
	cases := []struct {
		in       string
		header   int
		name     string
		problems []string
	}{
		{"Weight\nerr\n12.5\n", 1, "Weight", []string{"2:not-a-number"}},
		{"Gauge export v2.1\nStation: 4\nWeight (g)\nerr\n12.5\n", 3, "Weight", []string{"1:note-line", "2:note-line", "4:not-a-number"}},
		{"Gauge export of the fill line\nWeight (g)\n12.5\n", 2, "Weight", []string{"1:note-line"}},
		{"Balance export\n\nWeight (g)\n12.5\n12.7\n", 3, "Weight", []string{"1:note-line"}},
		{"12.5\n12.7\n", 0, "Column 1", nil},
	}
	for _, c := range cases {
		tab, err := Read(c.in)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		if tab.HeaderRow != c.header || tab.Columns[0].Name != c.name {
			t.Errorf("%q: header row %d %q, want %d %q", c.in, tab.HeaderRow, tab.Columns[0].Name, c.header, c.name)
		}
		for _, p := range c.problems {
			if !hasProblem(tab, p) {
				t.Errorf("%q: problem %s not listed: %+v", c.in, p, tab.Problems)
			}
		}
	}
}
