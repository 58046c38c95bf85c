package stats

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestCellsAndTextAgree: the same cells sent as Request.Cells and as Text
// (one a line) go through one reader and give the same report. The cells are
// the outside check's list (NA, a unit, a Unicode minus, a space as
// thousands separator, a spreadsheet error, a decimal comma among points)
// with ordinary readings around them (invented). The expected counts follow
// the reader's documented rules (stats/ingest/ingest.go): NA and #N/A are
// missing; "12.31 g" is 12.31 in the column's unit; "\u221212.28" is -12.28;
// "1 234.5" is 1234.5; "5,3" has the other decimal mark than the column's
// points, so it is left out and listed.
func TestCellsAndTextAgree(t *testing.T) {
	texts := []string{"12.30", "12.35", "NA", "12.31 g", "\u221212.28", "1 234.5", "#N/A", "5,3", "12.33", "12.29", "12.32"}
	cells := make([]InCell, len(texts))
	for i, s := range texts {
		cells[i] = InCell{Row: i + 1, Text: s}
	}
	opts := Options{Confidence: 0.95}
	fromCells, err := Analyze(Request{Cells: cells, Name: "Column 1", Options: opts})
	if err != nil {
		t.Fatal(err)
	}
	fromText, err := Analyze(Request{Text: strings.Join(texts, "\n") + "\n", Options: opts})
	if err != nil {
		t.Fatal(err)
	}
	if c := fromCells.Counts; c.Used != 8 || c.Missing != 2 || c.Rejected != 1 {
		t.Errorf("cells: used %d, missing %d, rejected %d; want 8, 2, 1", c.Used, c.Missing, c.Rejected)
	}
	if fromCells.Input.Unit != "g" {
		t.Errorf("cells: unit %q, want g (from \"12.31 g\")", fromCells.Input.Unit)
	}
	for _, part := range []struct {
		name string
		a, b any
	}{
		{"counts", fromCells.Counts, fromText.Counts},
		{"centre", fromCells.Centre, fromText.Centre},
		{"spread", fromCells.Spread, fromText.Spread},
		{"quantiles", fromCells.Quantile, fromText.Quantile},
		{"suspects", fromCells.Suspects, fromText.Suspects},
		{"shape", fromCells.Shape, fromText.Shape},
		{"problems", fromCells.Input.Problems, fromText.Input.Problems},
		{"columns", fromCells.Input.Columns, fromText.Input.Columns},
		{"unit", fromCells.Input.Unit, fromText.Input.Unit},
		{"decimal comma", fromCells.Input.DecimalComma, fromText.Input.DecimalComma},
		{"fingerprint", fromCells.Input.Fingerprint, fromText.Input.Fingerprint},
		{"verdict", fromCells.Verdict, fromText.Verdict},
	} {
		a, _ := json.Marshal(part.a)
		b, _ := json.Marshal(part.b)
		if string(a) != string(b) {
			t.Errorf("%s differ:\ncells %s\ntext  %s", part.name, a, b)
		}
	}
	// the rows are the ones given: a row number the text path cannot have
	cells[7].Row = 40
	rep, err := Analyze(Request{Cells: cells, Options: opts})
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, p := range rep.Input.Problems {
		if p.Text == "5,3" {
			found = p.Row == 40
		}
	}
	if !found {
		t.Errorf("the cell given as row 40 is not listed at row 40: %+v", rep.Input.Problems)
	}
}

// TestCellsFirstCellNotHeader: a first cell that is text is a cell, never a
// header (the text path would take it for one).
func TestCellsFirstCellNotHeader(t *testing.T) {
	rep, err := Analyze(Request{Cells: []InCell{{Row: 2, Text: "Weight"}, {Row: 3, Text: "5.1"}, {Row: 4, Text: "5.2"}, {Row: 5, Text: "5.3"}}, Name: "w"})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Counts.Used != 3 || rep.Counts.Rejected != 1 || rep.Input.Column != "w" {
		t.Errorf("used %d rejected %d column %q; want 3, 1, w", rep.Counts.Used, rep.Counts.Rejected, rep.Input.Column)
	}
	if len(rep.Input.Problems) == 0 || rep.Input.Problems[0].Row != 2 || rep.Input.Problems[0].Text != "Weight" {
		t.Errorf("problems %+v, want row 2 \"Weight\" first", rep.Input.Problems)
	}
}
