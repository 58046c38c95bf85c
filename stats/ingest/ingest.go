// Package ingest turns text or file bytes into a table of columns, keeping
// every cell's identity (row as the user sees it in a spreadsheet, column)
// and listing every cell that is not a usable number, with the reason.
//
// This is the foundation slice: one value per line, decimal point only. The
// full reader (separators, encodings, headers, units, decimal commas,
// streaming) replaces the body of Read, keeping these types.
package ingest

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Problem is one cell (or line) that was not used as a number.
type Problem struct {
	Row    int    `json:"row"`              // 1-based, header row counted; 0 = the whole input
	Column string `json:"column,omitempty"` // column name as reported
	Text   string `json:"text,omitempty"`   // the cell as typed
	Kind   string `json:"kind"`             // "missing", "not-a-number", ...
	Reason string `json:"reason"`           // plain words
	Action string `json:"action"`           // what was done, e.g. "counted as missing"
}

// ColumnInfo describes one column for pickers and the report.
type ColumnInfo struct {
	Name    string `json:"name"`
	Unit    string `json:"unit,omitempty"`
	Numbers int    `json:"numbers"` // cells read as numbers
	Missing int    `json:"missing"`
	Bad     int    `json:"bad"` // cells neither numbers nor missing
	// DecimalComma is set when the column's numbers use a decimal comma.
	DecimalComma bool `json:"decimalComma,omitempty"`
}

// Column holds one column's cells in input order. Values is NaN where the
// cell is not a number. Dec is the number of decimals as typed (-1 when the
// value was not plain fixed-point decimal text, e.g. with an exponent).
type Column struct {
	ColumnInfo
	Rows   []int32
	Values []float64
	Dec    []int8
	texts  []string
}

// Text returns cell i as typed.
func (c *Column) Text(i int) string { return c.texts[i] }

// Table is what the reader found.
type Table struct {
	Columns   []*Column `json:"-"`
	HeaderRow int       // 0 when there is no header
	Problems  []Problem
}

// Summary is the one-line account of what was read.
func (t *Table) Summary() string {
	if len(t.Columns) == 0 {
		return "no data read"
	}
	c := t.Columns[0]
	return fmt.Sprintf("%d values read; %d cells not numbers; %d empty", c.Numbers, c.Bad, c.Missing)
}

// Read reads text with one value per line.
func Read(text string) (*Table, error) {
	t := &Table{}
	c := &Column{ColumnInfo: ColumnInfo{Name: "value"}}
	lines := strings.Split(strings.ReplaceAll(text, "\r\n", "\n"), "\n")
	if n := len(lines); n > 0 && strings.TrimSpace(lines[n-1]) == "" {
		lines = lines[:n-1]
	}
	for i, ln := range lines {
		row := i + 1
		s := ln
		if j := strings.LastIndexByte(s, '\t'); j >= 0 { // slice: last column of tab-separated text
			s = s[j+1:]
		}
		s = strings.TrimSpace(s)
		v, err := strconv.ParseFloat(s, 64)
		switch {
		case s == "":
			c.Missing++
			t.Problems = append(t.Problems, Problem{Row: row, Column: c.Name, Kind: "missing", Reason: "empty cell", Action: "counted as missing"})
			v = math.NaN()
		case err != nil || math.IsInf(v, 0) || math.IsNaN(v):
			c.Bad++
			t.Problems = append(t.Problems, Problem{Row: row, Column: c.Name, Text: s, Kind: "not-a-number", Reason: "not a number", Action: "left out"})
			v = math.NaN()
		default:
			c.Numbers++
		}
		dec := int8(-1)
		if j := strings.IndexByte(s, '.'); j >= 0 && !strings.ContainsAny(s, "eE") {
			dec = int8(len(s) - j - 1)
		} else if err == nil && !strings.ContainsAny(s, "eE") {
			dec = 0
		}
		c.Rows = append(c.Rows, int32(row))
		c.Values = append(c.Values, v)
		c.Dec = append(c.Dec, dec)
		c.texts = append(c.texts, s)
	}
	if c.Numbers == 0 {
		return nil, fmt.Errorf("no numbers found: paste one value per line")
	}
	t.Columns = []*Column{c}
	return t, nil
}
