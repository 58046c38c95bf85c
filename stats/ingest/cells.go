package ingest

import (
	"fmt"
	"math"
	"unsafe"
)

// Cell is one value as typed, with its spreadsheet row (1-based; 0 or less
// means "the cell's position in the list").
type Cell struct {
	Row  int    `json:"row"`
	Text string `json:"text"`
}

// ReadCells reads one column of cells as typed (the automation form of the
// input): the same number parser, missing markers, units and decimal-mark
// decision as Read, but the rows are the ones given and the first cell is
// never taken for a header. name is the column's name ("Column 1" when
// empty); it is used as given, not split into a name and a unit.
//
// The decisions (kind, decimal mark, unit) are made from the cells within
// the same window of text as Read makes them from (SniffBytes/2), so the
// cells and the same cells written one a line give the same table.
func ReadCells(name string, cells []Cell, opt ReadOptions) (*Table, error) {
	if len(cells) == 0 {
		return nil, fmt.Errorf("no cells: give at least one value such as 12.5")
	}
	if name == "" {
		name = "Column 1"
	}
	s := NewStream(opt)
	s.sniffed, s.encKnown, s.done = true, true, true
	s.tab.Format = Format{Encoding: "utf-8", Separator: "cells"}
	s.lay = layout{dataStart: 1}
	win := make([]colTally, 1)
	budget := s.sniffN/2 - 8
	for i, c := range cells {
		if i > 0 && budget < len(c.Text)+1 {
			break
		}
		budget -= len(c.Text) + 1
		x := classify(trimCell(c.Text))
		win[0].add(&x)
	}
	col := s.newColumn(colPlan{name: name}, 1, &win[0], markHint(0, win))
	s.cols = []*Column{col}
	s.rows = make([]int32, 0, len(cells))
	col.Values = make([]float64, 0, len(cells))
	col.Dec = make([]int8, 0, len(cells))
	last := 0
	for i, c := range cells {
		row := c.Row
		if row <= 0 {
			row = i + 1
		}
		if row > math.MaxInt32 {
			return nil, fmt.Errorf("cell %d has row %d, beyond the largest row number supported (%d)", i+1, c.Row, math.MaxInt32)
		}
		last = max(last, row)
		if i < HeadRows {
			s.tab.Head = append(s.tab.Head, HeadRow{Row: row, Cells: []string{trimCell(c.Text)}})
		}
		s.total += int64(len(c.Text)) + 1
		s.rows = append(s.rows, int32(row))
		// the reader never writes to its input and clones what it keeps
		s.cell(col, unsafe.Slice(unsafe.StringData(c.Text), len(c.Text)), row)
	}
	s.row = last
	return s.finishTable()
}
