package ingest

import (
	"math"
	"reflect"
	"strings"
	"testing"
)

// TestReadCellsLikeText: cells give the column that the same cells written
// one a line give, with the rows as given. Check values from memory (the
// cells' own decimals).
func TestReadCellsLikeText(t *testing.T) {
	texts := []string{"4,12", "4,15", "", "n/a", "4,09 mm", "4.1", "\u22120,5"}
	cells := make([]Cell, len(texts))
	for i, s := range texts {
		cells[i] = Cell{Row: 10 + 2*i, Text: s}
	}
	ct, err := ReadCells("Bore", cells, ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	tt, err := Read(strings.Join(texts, "\n") + "\n")
	if err != nil {
		t.Fatal(err)
	}
	c, x := ct.Columns[0], tt.Columns[0]
	if c.Name != "Bore" || ct.HeaderRow != 0 || ct.Format.Separator != "cells" {
		t.Errorf("name %q header row %d separator %q", c.Name, ct.HeaderRow, ct.Format.Separator)
	}
	if !c.DecimalComma || c.Unit != "mm" || c.Numbers != 4 || c.Missing != 2 || c.Bad != 1 {
		t.Errorf("column %+v", c.ColumnInfo)
	}
	if !c.MixedDecimal {
		t.Error("4.1 among decimal commas: the column mixes marks (and 4.1 is left out)")
	}
	want := []float64{4.12, 4.15, math.NaN(), math.NaN(), 4.09, math.NaN(), -0.5}
	for i, v := range want {
		if got := c.Values[i]; !(got == v || (math.IsNaN(got) && math.IsNaN(v))) {
			t.Errorf("cell %d: %v, want %v", i, got, v)
		}
		if int(c.Rows[i]) != 10+2*i {
			t.Errorf("cell %d: row %d, want %d", i, c.Rows[i], 10+2*i)
		}
		if c.Text(i) != x.Text(i) {
			t.Errorf("cell %d: text %q, text path %q", i, c.Text(i), x.Text(i))
		}
	}
	if !reflect.DeepEqual(c.Dec, x.Dec) {
		t.Errorf("decimals %v, text path %v", c.Dec, x.Dec)
	}
	// rows 0 or less: the position in the list
	t2, err := ReadCells("", []Cell{{Text: "1.5"}, {Row: -3, Text: "2.5"}}, ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got := t2.Columns[0].Rows; got[0] != 1 || got[1] != 2 || t2.Columns[0].Name != "Column 1" {
		t.Errorf("rows %v name %q, want [1 2] and Column 1", got, t2.Columns[0].Name)
	}
	if _, err := ReadCells("x", []Cell{{Text: "NA"}, {Text: ""}}, ReadOptions{}); err == nil {
		t.Error("no number among the cells must be an error")
	}
	if _, err := ReadCells("x", nil, ReadOptions{}); err == nil {
		t.Error("no cells must be an error")
	}
	if _, err := ReadCells("x", []Cell{{Row: math.MaxInt32 + 1, Text: "1"}}, ReadOptions{}); err == nil {
		t.Error("a row beyond int32 must be an error")
	}
}

// TestDecodedTextAndHead: a UTF-16 file and a Windows-1252 file with a
// non-ASCII header and unit give back their text as UTF-8 (read again, the
// same table), and their first records split as the reader split them.
// Check values from memory: "Dicke (µm)" is the header, µm the unit.
func TestDecodedTextAndHead(t *testing.T) {
	plain := "Charge;Dicke (µm)\r\nA;12,5\r\nA;12,7\r\nB;13,1\r\n"
	u16 := []byte{0xFF, 0xFE}
	for _, r := range plain {
		u16 = append(u16, byte(r), byte(r>>8))
	}
	latin := []byte(strings.ReplaceAll(plain, "µ", "\xb5"))
	for _, in := range []struct {
		name string
		b    []byte
	}{{"utf-16le", u16}, {"windows-1252", latin}} {
		s := NewStream(ReadOptions{KeepText: 1 << 20})
		for i := 0; i < len(in.b); i += 7 { // chunks cut anywhere
			if _, err := s.Write(in.b[i:min(i+7, len(in.b))]); err != nil {
				t.Fatal(err)
			}
		}
		tab, err := s.Finish()
		if err != nil {
			t.Fatalf("%s: %v", in.name, err)
		}
		if tab.Format.Encoding != in.name {
			t.Errorf("encoding %q, want %q", tab.Format.Encoding, in.name)
		}
		text, ok := tab.DecodedText()
		if !ok || text != plain {
			t.Errorf("%s: decoded text %q (kept %v), want %q", in.name, text, ok, plain)
		}
		again, err := Read(text)
		if err != nil {
			t.Fatal(err)
		}
		if c := again.Columns[1]; c.Name != "Dicke" || c.Unit != "µm" || c.Values[2] != 13.1 {
			t.Errorf("%s: read again: %+v", in.name, c.ColumnInfo)
		}
		if len(tab.Head) != 4 || tab.Head[0].Row != 1 || !reflect.DeepEqual(tab.Head[0].Cells, []string{"Charge", "Dicke (µm)"}) || !reflect.DeepEqual(tab.Head[3].Cells, []string{"B", "13,1"}) {
			t.Errorf("%s: head %+v", in.name, tab.Head)
		}
	}
	// over the limit: nothing kept
	tab, err := ReadBytes([]byte(plain), ReadOptions{KeepText: 10})
	if err != nil {
		t.Fatal(err)
	}
	if text, ok := tab.DecodedText(); ok || text != "" {
		t.Errorf("text over KeepText kept: %q", text)
	}
	// not asked for: nothing kept
	if _, ok := tab.DecodedText(); ok {
		t.Error("text kept without KeepText")
	}
}
