// Package stats is Lotlens's engine: one request (data as typed + options) in,
// one report out. It has no dependency on the browser; package wasm wraps it.
package stats

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"lotlens/stats/ingest"
)

// Analyze runs the whole analysis. An error means no report could be made;
// its text says what was wrong and what to do.
func Analyze(req Request) (*Report, error) {
	if req.Schema != "" && req.Schema != RequestSchema {
		return nil, fmt.Errorf("request schema %q is not supported: use %q", req.Schema, RequestSchema)
	}
	if req.Text == "" && len(req.Cells) > 0 {
		return analyzeCells(req)
	}
	if strings.TrimSpace(req.Text) == "" {
		return nil, errors.New("no data: paste or drop a column of measurements")
	}
	tab, err := ingest.Read(req.Text)
	if err != nil {
		return nil, err
	}
	return AnalyzeTable(tab, fingerprintOf(req.Text), req)
}

// fingerprintOf is the hex SHA-256 of text. The text goes through the hash
// in small pieces: []byte(text) would copy the whole input (7 bytes per
// value of one-column data) while the table is already in memory, and that
// copy was the largest part of the engine's peak memory beyond the text.
func fingerprintOf(text string) string {
	h := sha256.New()
	var buf [64 << 10]byte
	for len(text) > 0 {
		k := copy(buf[:], text)
		h.Write(buf[:k])
		text = text[k:]
	}
	return hex.EncodeToString(h.Sum(nil))
}

// AnalyzeTable analyses a table the caller has already read (the page's
// streaming path reads large files in chunks). fingerprint is the hex SHA-256
// of the input bytes as read. Text and Cells in req are ignored.
func AnalyzeTable(tab *ingest.Table, fingerprint string, req Request) (*Report, error) {
	if req.Schema != "" && req.Schema != RequestSchema {
		return nil, fmt.Errorf("request schema %q is not supported: use %q", req.Schema, RequestSchema)
	}
	if tab == nil || len(tab.Columns) == 0 {
		return nil, errors.New("no data: paste or drop a column of measurements")
	}
	opts, err := checkOptions(req.Options)
	if err != nil {
		return nil, err
	}
	// The user's decision for columns like "1,234" (decimal comma or
	// thousands separator): re-read from the cells as typed, not the file.
	if err := tab.SetDecimalMark(req.Options.DecimalMark); err != nil {
		return nil, err
	}
	col, err := pickColumn(tab, req.Value)
	if err != nil {
		return nil, err
	}
	cv := &colView{
		name: col.Name, unit: col.Unit, rows: col.Rows, vals: col.Values, dec: col.Dec,
		text: col.Text, decimalComma: col.DecimalComma,
		missing: col.Missing, bad: col.Bad,
	}
	infos := make([]ingest.ColumnInfo, len(tab.Columns))
	for i, c := range tab.Columns {
		infos[i] = c.ColumnInfo
	}
	rep := newReport(fingerprint, cv, opts)
	rep.Input.Columns = infos
	rep.Input.Summary = tab.Summary()
	rep.Input.Reader = readerDecisions(tab)
	// clipped: appending to the report's list must never write into the
	// reader's array (the page analyses one table many times)
	rep.Input.Problems = slices.Clip(tab.Problems)
	analyzeColumn(rep, cv, opts)
	return rep, nil
}

// colView is the value column as the engine sees it, whichever way it came.
type colView struct {
	name, unit     string
	rows           []int32
	vals           []float64
	dec            []int8
	text           func(i int) string
	decimalComma   bool
	missing, bad   int
	extraProblems  []ingest.Problem
	excludedByUser map[int32]bool
}

// pickColumn returns the named column, or the first mostly-numeric one.
func pickColumn(tab *ingest.Table, name string) (*ingest.Column, error) {
	if name != "" {
		for _, c := range tab.Columns {
			if c.Name == name {
				return c, nil
			}
		}
		for _, c := range tab.Columns {
			if strings.EqualFold(strings.TrimSpace(c.Name), strings.TrimSpace(name)) || (c.Header != "" && c.Header == name) {
				return c, nil
			}
		}
		names := make([]string, len(tab.Columns))
		for i, c := range tab.Columns {
			names[i] = fmt.Sprintf("%q", c.Name)
		}
		return nil, fmt.Errorf("no column named %q: the data have %s; choose one of those", name, strings.Join(names, ", "))
	}
	for _, c := range tab.Columns {
		if c.Role == "value" && c.Numbers > 0 {
			return c, nil
		}
	}
	for _, c := range tab.Columns {
		if c.Kind == "number" && c.Numbers > 0 && c.Numbers >= c.Bad {
			return c, nil
		}
	}
	for _, c := range tab.Columns {
		if c.Numbers > 0 {
			return c, nil
		}
	}
	return nil, errors.New("no column holds numbers: paste or drop a column of measurements (one value a line, or a table with a header row)")
}

// checkOptions fills defaults and rejects impossible settings with a clear
// message.
func checkOptions(o Options) (Options, error) {
	if o.Confidence == 0 {
		o.Confidence = 0.95
	}
	if math.IsNaN(o.Confidence) || o.Confidence <= 0 || o.Confidence >= 1 {
		if o.Confidence > 1 && o.Confidence < 100 {
			return o, fmt.Errorf("confidence %g is not between 0 and 1: for %g%% use %g", o.Confidence, o.Confidence, o.Confidence/100)
		}
		return o, fmt.Errorf("confidence %g is not between 0 and 1: use e.g. 0.95 for 95%%", o.Confidence)
	}
	if o.Confidence < 0.5 {
		return o, fmt.Errorf("confidence %g is below 0.5: use a level such as 0.90, 0.95 or 0.99", o.Confidence)
	}
	if o.Quantile == "" {
		o.Quantile = DefaultQuantile
	}
	o.Quantile = strings.ToLower(strings.TrimSpace(o.Quantile))
	if hfType(o.Quantile) < 0 {
		return o, fmt.Errorf("quantile definition %q is not known: use one of %s", o.Quantile, strings.Join(QuantileMethods, ", "))
	}
	for _, p := range []struct {
		name string
		v    *float64
	}{{"target", o.Target}, {"lsl", o.LSL}, {"usl", o.USL}} {
		if p.v != nil && (math.IsNaN(*p.v) || math.IsInf(*p.v, 0)) {
			return o, fmt.Errorf("%s is not a finite number: give a value such as 12.5", p.name)
		}
	}
	if o.LSL != nil && o.USL != nil && *o.LSL >= *o.USL {
		return o, fmt.Errorf("the lower specification limit %g is not below the upper limit %g: swap them or correct one", *o.LSL, *o.USL)
	}
	return o, nil
}

func newReport(fingerprint string, cv *colView, opts Options) *Report {
	unit := cv.unit
	if opts.Unit != "" {
		unit = opts.Unit
	}
	return &Report{
		Schema: ReportSchema,
		Input: Input{
			Fingerprint:  fingerprint,
			Column:       cv.name,
			Unit:         unit,
			DecimalComma: cv.decimalComma,
		},
		Settings: Settings{
			Confidence: opts.Confidence,
			Quantile:   opts.Quantile,
			Target:     opts.Target,
			LSL:        opts.LSL,
			USL:        opts.USL,
		},
		Verdict: Verdict{Caution: standingCaution},
	}
}

// standingCaution is shown with every verdict.
const standingCaution = "These figures describe the data as entered. Where a decision " +
	"affects safety-critical parts, legal net quantity or medical products, follow the " +
	"applicable local regulations, codes and licensed professional practice; this report " +
	"does not replace them."

// AnalyzeJSON is Analyze on JSON bytes: the form the page and automation use.
// It always returns a JSON object: the report, or {"error": "..."}.
func AnalyzeJSON(in []byte) []byte {
	req, err := ParseRequest(in)
	if err != nil {
		return ErrorJSON(err)
	}
	return ReportJSON(Analyze(req))
}

// ParseRequest decodes a request, with an error the user can act on.
func ParseRequest(in []byte) (Request, error) {
	var req Request
	if err := json.Unmarshal(in, &req); err != nil {
		return req, fmt.Errorf("the request is not valid JSON: %v", err)
	}
	return req, nil
}

// ReportJSON encodes the result of Analyze or AnalyzeTable: the report, or
// {"error": "..."} when err is set.
func ReportJSON(rep *Report, err error) []byte {
	if err != nil {
		return ErrorJSON(err)
	}
	out, err := json.Marshal(rep)
	if err != nil {
		return ErrorJSON(fmt.Errorf("internal error encoding the report: %v", err))
	}
	return out
}

// ErrorJSON is the error object every JSON entry point returns: {"error": "..."}.
func ErrorJSON(err error) []byte {
	b, _ := json.Marshal(map[string]string{"error": err.Error()})
	return b
}
