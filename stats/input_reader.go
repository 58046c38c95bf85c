package stats

import "lotlens/stats/ingest"

// ReaderDecisions are the reader's decisions about the input: how it was
// decoded and split, where the header is, which decimal mark each number
// column uses, and the first records as split. The page shows its preview
// and offers its choices from these; it never guesses them itself.
type ReaderDecisions struct {
	// Encoding: "utf-8", "utf-8 with BOM", "utf-16le", "utf-16be",
	// "windows-1252" (see ingest.Format).
	Encoding string `json:"encoding"`
	// Separator: "tab", "comma", "semicolon", "pipe", "spaces", "none" (one
	// value a line) or "cells" (Request.Cells).
	Separator string `json:"separator"`
	LineEnds  string `json:"lineEnds,omitempty"`
	// HeaderRow is the row of the column names (0: no header).
	HeaderRow int `json:"headerRow"`
	// Transposed: one line of values was read as one column.
	Transposed bool `json:"transposed,omitempty"`
	// DecimalMarks lists each number column's decimal mark.
	DecimalMarks []ColumnMark `json:"decimalMarks,omitempty"`
	// Head is the first records (up to 40, note lines and header included)
	// as the reader split them into cells.
	Head []ingest.HeadRow `json:"head,omitempty"`
}

// ColumnMark is the decimal mark of one number column.
type ColumnMark struct {
	Column string `json:"column"`
	// Mark is "point" or "comma".
	Mark string `json:"mark"`
	// Ambiguous: every decimal looked like "1,234"; read by the user's
	// choice (Options.DecimalMark), default comma.
	Ambiguous bool `json:"ambiguous,omitempty"`
	// Mixed: both marks occur; cells with the minority mark were left out.
	Mixed bool `json:"mixed,omitempty"`
}

// readerDecisions takes the decisions from a table as read.
func readerDecisions(tab *ingest.Table) *ReaderDecisions {
	d := &ReaderDecisions{
		Encoding:   tab.Format.Encoding,
		Separator:  tab.Format.Separator,
		LineEnds:   tab.Format.LineEnds,
		HeaderRow:  tab.HeaderRow,
		Transposed: tab.Format.Transposed,
		Head:       tab.Head,
	}
	for _, c := range tab.Columns {
		if c.Kind != "number" {
			continue
		}
		m := ColumnMark{Column: c.Name, Mark: "point", Ambiguous: c.AmbiguousDecimal, Mixed: c.MixedDecimal}
		if c.DecimalComma {
			m.Mark = "comma"
		}
		d.DecimalMarks = append(d.DecimalMarks, m)
	}
	return d
}
