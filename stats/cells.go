package stats

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"strconv"
	"strings"

	"lotlens/stats/ingest"
)

// analyzeCells analyses Request.Cells: one column of values as typed, each
// with the row the user sees. The cells are parsed here (not by the reader,
// which would renumber rows and might take the first cell for a header).
func analyzeCells(req Request) (*Report, error) {
	opts, err := checkOptions(req.Options)
	if err != nil {
		return nil, err
	}
	name := req.Name
	if name == "" {
		name = "value"
	}
	n := len(req.Cells)
	cv := &colView{name: name, rows: make([]int32, n), vals: make([]float64, n), dec: make([]int8, n)}
	texts := make([]string, n)
	h := sha256.New()
	comma := opts.DecimalMark == "comma"
	if opts.DecimalMark == "" {
		// auto: a decimal comma when some cell has one comma and no point,
		// and no cell has a point
		var anyComma, anyPoint bool
		for _, c := range req.Cells {
			s := strings.TrimSpace(c.Text)
			if strings.Count(s, ",") == 1 && !strings.Contains(s, ".") {
				anyComma = true
			}
			if strings.Contains(s, ".") {
				anyPoint = true
			}
		}
		comma = anyComma && !anyPoint
	}
	cv.decimalComma = comma
	numbers := 0
	for i, c := range req.Cells {
		h.Write([]byte(c.Text))
		h.Write([]byte{'\n'})
		s := strings.TrimSpace(c.Text)
		texts[i] = s
		row := c.Row
		if row <= 0 {
			row = i + 1
		}
		if row > math.MaxInt32 {
			return nil, fmt.Errorf("cell %d has row %d, beyond the largest row number supported (%d)", i+1, c.Row, math.MaxInt32)
		}
		cv.rows[i] = int32(row)
		v, d, why := parseCell(s, comma)
		cv.vals[i] = v
		cv.dec[i] = d
		switch {
		case s == "":
			cv.missing++
			cv.extraProblems = append(cv.extraProblems, ingest.Problem{Row: row, Column: name, Kind: "missing", Reason: "empty cell", Action: "counted as missing"})
		case why != "":
			cv.bad++
			cv.extraProblems = append(cv.extraProblems, ingest.Problem{Row: row, Column: name, Text: s, Kind: "not-a-number", Reason: why, Action: "left out"})
		default:
			numbers++
		}
	}
	if numbers == 0 {
		return nil, fmt.Errorf("none of the %d cells is a number: give values such as 12.5 (decimal point) or 12,5 (decimal comma)", n)
	}
	cv.text = func(i int) string { return texts[i] }
	rep := newReport(hex.EncodeToString(h.Sum(nil)), cv, opts)
	rep.Input.Columns = []ingest.ColumnInfo{{Name: name, Unit: opts.Unit, Numbers: numbers, Missing: cv.missing, Bad: cv.bad, DecimalComma: comma}}
	rep.Input.Summary = fmt.Sprintf("%d values read; %d cells not numbers; %d empty", numbers, cv.bad, cv.missing)
	rep.Input.Problems = cv.extraProblems
	cv.extraProblems = nil
	analyzeColumn(rep, cv, opts)
	return rep, nil
}

// parseCell reads one cell as a decimal number. It returns NaN and a reason
// when the cell is not a finite number, and the decimals as typed (-1 for
// exponent form).
func parseCell(s string, comma bool) (float64, int8, string) {
	if s == "" {
		return math.NaN(), -1, "empty cell"
	}
	t := s
	if comma {
		if strings.Contains(t, ".") {
			return math.NaN(), -1, "a decimal point where the column uses a decimal comma"
		}
		t = strings.Replace(t, ",", ".", 1)
	}
	if strings.ContainsAny(t, "_xXpP") { // Go's ParseFloat accepts hex floats and underscores
		return math.NaN(), -1, "not a number"
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange && !math.IsInf(v, 0) {
			// underflow to zero or a subnormal: keep it (it is what was typed, rounded)
		} else if ok && ne.Err == strconv.ErrRange {
			return math.NaN(), -1, "too large for a double-precision number (beyond 1.8e308)"
		} else {
			return math.NaN(), -1, "not a number"
		}
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return math.NaN(), -1, "not a finite number"
	}
	d := int8(-1)
	if !strings.ContainsAny(t, "eE") {
		if j := strings.IndexByte(t, '.'); j >= 0 {
			if k := len(t) - j - 1; k <= 127 {
				d = int8(k)
			}
		} else {
			d = 0
		}
	}
	return v, d, ""
}
