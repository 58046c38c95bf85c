package ingest

import (
	"slices"
	"testing"
)

// TestSpacedIntegersAreValues: whole numbers apart by single spaces are read
// as separate values, never as one number with space thousands separators
// (which gave 4.12e17 for a line of torques). Check values: the typed numbers
// themselves (from memory).
func TestSpacedIntegersAreValues(t *testing.T) {
	cases := []struct {
		in   string
		cols [][]float64
	}{
		{"412 413 412 411 412 414\n", [][]float64{{412, 413, 412, 411, 412, 414}}},
		{"412 413\n411 412\n", [][]float64{{412, 411}, {413, 412}}},
		{"12 345,6\n12 346,1\n", [][]float64{{12345.6, 12346.1}}}, // a decimal mark keeps the space a thousands separator
	}
	for _, c := range cases {
		tab, err := Read(c.in)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		var got [][]float64
		for _, col := range tab.Columns {
			got = append(got, col.Values)
		}
		if !slices.EqualFunc(got, c.cols, slices.Equal) {
			t.Errorf("%q read as %v, want %v", c.in, got, c.cols)
		}
	}
}
