// Package stats is Lotlens's engine: one request (data as typed + options) in,
// one report out. It has no dependency on the browser; package wasm wraps it.
//
// This is the foundation slice (n, mean, median, SD); the full engine
// replaces the body of Analyze and keeps its signature.
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
	text := req.Text
	if text == "" && len(req.Cells) > 0 {
		var b strings.Builder
		for _, c := range req.Cells {
			b.WriteString(c.Text)
			b.WriteByte('\n')
		}
		text = b.String()
	}
	if strings.TrimSpace(text) == "" {
		return nil, errors.New("no data: paste or drop a column of measurements")
	}
	tab, err := ingest.Read(text)
	if err != nil {
		return nil, err
	}
	sum := sha256.Sum256([]byte(text))
	return AnalyzeTable(tab, hex.EncodeToString(sum[:]), req)
}

// AnalyzeTable analyses a table the caller has already read (the page's
// streaming path reads large files in chunks). fingerprint is the hex SHA-256
// of the input bytes as read. Text and Cells in req are ignored.
func AnalyzeTable(tab *ingest.Table, fingerprint string, req Request) (*Report, error) {
	if tab == nil || len(tab.Columns) == 0 {
		return nil, errors.New("no data: paste or drop a column of measurements")
	}
	col := tab.Columns[0]
	xs := make([]float64, 0, col.Numbers)
	for _, v := range col.Values {
		if !math.IsNaN(v) {
			xs = append(xs, v)
		}
	}
	rep := &Report{
		Schema: ReportSchema,
		Input: Input{
			Fingerprint: fingerprint,
			Column:      col.Name,
			Summary:     tab.Summary(),
			Problems:    tab.Problems,
		},
		Settings: Settings{Confidence: 0.95, Quantile: DefaultQuantile},
		Counts:   Counts{Used: len(xs), Missing: col.Missing, Rejected: col.Bad},
		Verdict:  Verdict{Quote: "mean-sd"},
	}
	n := float64(len(xs))
	var s float64
	for _, x := range xs {
		s += x
	}
	mean := s / n
	var ss float64
	for _, x := range xs {
		ss += (x - mean) * (x - mean)
	}
	sd := 0.0
	if len(xs) > 1 {
		sd = math.Sqrt(ss / (n - 1))
	}
	slices.Sort(xs)
	med := xs[len(xs)/2]
	if len(xs)%2 == 0 {
		med = (xs[len(xs)/2-1] + med) / 2
	}
	rep.Centre = &Centre{Mean: mean, Median: med}
	rep.Spread = &Spread{SD: sd, Variance: sd * sd}
	return rep, nil
}

// AnalyzeJSON is Analyze on JSON bytes: the form the page and automation use.
// It always returns a JSON object: the report, or {"error": "..."}.
func AnalyzeJSON(in []byte) []byte {
	var req Request
	if err := json.Unmarshal(in, &req); err != nil {
		return errorJSON(fmt.Errorf("the request is not valid JSON: %v", err))
	}
	rep, err := Analyze(req)
	if err != nil {
		return errorJSON(err)
	}
	out, err := json.Marshal(rep)
	if err != nil {
		return errorJSON(fmt.Errorf("internal error encoding the report: %v", err))
	}
	return out
}

func errorJSON(err error) []byte {
	b, _ := json.Marshal(map[string]string{"error": err.Error()})
	return b
}
