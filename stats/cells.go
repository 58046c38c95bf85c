package stats

import (
	"encoding/hex"

	"lotlens/stats/digest"
	"lotlens/stats/ingest"
)

// analyzeCells analyses Request.Cells: one column of values as typed, each
// with the row the user sees. The cells go through the reader
// (ingest.ReadCells: its number parser, missing markers, units and
// decimal-mark decision), keeping the given rows and never taking the first
// cell for a header; the table is then analysed like any other.
func analyzeCells(req Request) (*Report, error) {
	name := req.Name
	if name == "" {
		name = "value"
	}
	cells := make([]ingest.Cell, len(req.Cells))
	h := digest.New()
	for i, c := range req.Cells {
		cells[i] = ingest.Cell{Row: c.Row, Text: c.Text}
		h.WriteString(c.Text)
		h.WriteString("\n")
	}
	tab, err := ingest.ReadCells(name, cells, ingest.ReadOptions{DecimalMark: req.Options.DecimalMark})
	if err != nil {
		return nil, err
	}
	req.Value = tab.Columns[0].Name
	return AnalyzeTable(tab, hex.EncodeToString(h.Sum(nil)), req)
}
