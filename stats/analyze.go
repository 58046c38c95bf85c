// Package stats is Lotlens's engine: one request (data as typed + options) in,
// one report out. It has no dependency on the browser; package wasm wraps it.
package stats

import (
	"bytes"
	"encoding/hex"
	"encoding/json"
	"errors"
	"io"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"lotlens/stats/digest"
	"lotlens/stats/ingest"
)

// Analyze runs the whole analysis. An error means no report could be made;
// its text says what was wrong and what to do.
func Analyze(req Request) (*Report, error) {
	if err := checkSchema(req.Schema); err != nil {
		return nil, err
	}
	if req.Text != "" && len(req.Cells) > 0 {
		return nil, errorf(CodeBadRequest, "cells", "the request has both text and cells: give one of them")
	}
	if req.Text == "" && len(req.Cells) > 0 {
		return analyzeCells(req)
	}
	if strings.TrimSpace(req.Text) == "" {
		return nil, errNoData
	}
	tab, err := ingest.Read(req.Text)
	if err != nil {
		return nil, readError(err)
	}
	return AnalyzeTable(tab, fingerprintOf(req.Text), req)
}

// fingerprintOf is the hex SHA-256 of text. The text goes through the hash
// as it is (WriteString): []byte(text) would copy the whole input (7 bytes
// per value of one-column data) while the table is already in memory, and
// that copy was the largest part of the engine's peak memory beyond the
// text.
func fingerprintOf(text string) string {
	h := digest.New()
	h.WriteString(text)
	return hex.EncodeToString(h.Sum(nil))
}

// AnalyzeTable analyses a table the caller has already read (the page's
// streaming path reads large files in chunks). fingerprint is the hex SHA-256
// of the input bytes as read. Text and Cells in req are ignored.
func AnalyzeTable(tab *ingest.Table, fingerprint string, req Request) (*Report, error) {
	if err := checkSchema(req.Schema); err != nil {
		return nil, err
	}
	if tab == nil || len(tab.Columns) == 0 {
		return nil, errNoData
	}
	opts, err := checkOptions(req.Options)
	if err != nil {
		return nil, err
	}
	// The user's decision for columns like "1,234" (decimal comma or
	// thousands separator): re-read from the cells as typed, not the file.
	if err := tab.SetDecimalMark(req.Options.DecimalMark); err != nil {
		return nil, errorf(CodeBadOption, "options.decimalMark", "%v", err)
	}
	cols, err := pickColumns(tab, req)
	if err != nil {
		return nil, err
	}
	col := cols.value
	if err := checkWithin(opts, cols.subgroup != nil); err != nil {
		return nil, err
	}
	cv := &colView{
		name: col.Name, unit: col.Unit, rows: col.Rows, vals: col.Values, dec: col.Dec,
		text: col.Text, decimalComma: col.DecimalComma,
		missing: col.Missing, bad: col.Bad,
		order: cols.order, subgroup: cols.subgroup,
		// read by the default mark though "1,234" could mean either
		ambiguous: col.AmbiguousDecimal && req.Options.DecimalMark == "",
	}
	if col.MixedDecimal {
		for _, p := range tab.Problems {
			if p.Kind == ingest.KindDecimalMark && p.Column == col.Name {
				cv.mixedDropped++
			}
		}
	}
	infos := make([]ingest.ColumnInfo, len(tab.Columns))
	for i, c := range tab.Columns {
		infos[i] = c.ColumnInfo
	}
	rep := newReport(fingerprint, cv, opts)
	w := wordsFor(rep)
	rep.Input.Columns = infos
	// The summary speaks for the value column, so that its counts are the
	// report's (counts.used + excluded, rejected, missing); cells of other
	// columns are only counted.
	rep.Input.Summary = tab.ColumnSummary(col)
	if k := otherColumnCells(tab, col.Name); k > 0 {
		rep.Input.Summary += w.otherColumnsCells(k)
	}
	rep.Input.Reader = readerDecisions(tab)
	// clipped: appending to the report's list must never write into the
	// reader's array (the page analyses one table many times)
	rep.Input.Problems = slices.Clip(tab.Problems)
	if probs, counts := cols.incompleteRows(w, maxIncompleteListed); len(counts) > 0 {
		rep.Input.Problems = append(rep.Input.Problems, probs...)
		for _, key := range []string{"order", "subgroup", "group"} {
			if k := counts[key]; k > maxIncompleteListed {
				rep.Notes = append(rep.Notes, Note{Field: "input.problems", Text: w.incompleteMore(k, key, maxIncompleteListed)})
			}
		}
	}
	cv.seq, cv.outOfOrder = cols.orderSequence()
	cv.subgroup = cols.subgroup
	cv.group, cv.wide = cols.group, cols.wide
	if cols.order != nil {
		rep.Input.Order = cols.order.Name
	}
	analyzeColumn(rep, cv, opts)
	if cv.outOfOrder > 0 {
		rep.Notes = append(rep.Notes, Note{Field: "charts.series", Text: w.outOfOrder(cv.outOfOrder, cols.order.Name)})
	}
	return rep, nil
}

// otherColumnCells counts the listed cells of columns other than the value
// column that are empty or not readable.
func otherColumnCells(tab *ingest.Table, value string) int {
	k := 0
	for _, p := range tab.Problems {
		if p.Row <= 0 || p.Column == value {
			continue
		}
		switch p.Kind {
		case ingest.KindMissing, ingest.KindNotNumber, ingest.KindDecimalMark, ingest.KindUnit, ingest.KindNotTime:
			k++
		}
	}
	return k
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
	// ambiguous: the column's decimals all looked like "1,234" and were
	// read by the default mark (no Options.DecimalMark); mixedDropped: the
	// cells left out for the column's other decimal mark.
	ambiguous    bool
	mixedDropped int
	// seq is the order of the cells for the series over time (indices
	// into vals), from the request's order column; nil means row order.
	seq        []int32
	outOfOrder int // rows out of order in the file, by the order column
	// order and subgroup are the request's columns (nil when none);
	// subgroup is aligned with vals.
	order, subgroup *ingest.Column
	// group is the request's group column (cells aligned with vals), wide
	// the side-by-side value columns compared as groups; both nil without
	// a groups section.
	group *ingest.Column
	wide  []*ingest.Column
	// finite is 1 when every cell of vals is a finite number, -1 when
	// not, 0 while not known (analyzeColumn's first pass sets it)
	finite int8
}

// maxIncompleteListed bounds the incomplete rows listed per optional column.
const maxIncompleteListed = 200

// errNoData is the error for input without any cell: a literal, laid out
// by the compiler (errorf would run fmt at start; see "Start-up" in
// DEVELOPERS.md).
var errNoData = &Error{Code: CodeNoData, Field: "text", Msg: "no data: paste or drop a column of measurements"}

func checkSchema(s string) error {
	if s != "" && s != RequestSchema {
		return errorf(CodeSchema, "schema", "request schema %q is not supported: use %q", s, RequestSchema)
	}
	return nil
}

// readError gives the reader's refusal its code.
func readError(err error) error {
	var e *Error
	if errors.As(err, &e) {
		return err
	}
	return &Error{Code: CodeRead, Field: "text", Msg: err.Error()}
}

// pickColumn returns the named column, or the first mostly-numeric one.
func pickColumn(tab *ingest.Table, name string) (*ingest.Column, error) {
	if name != "" {
		return findColumn(tab, name, "value")
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
	return nil, errorf(CodeNoData, "value", "no column holds numbers: paste or drop a column of measurements (one value a line, or a table with a header row)")
}

// MaxReasonChars is the longest reason for a left-out row
// (Options.ExcludeReasons), in characters.
const MaxReasonChars = 2000

// checkOptions fills defaults and rejects impossible settings with a clear
// message.
func checkOptions(o Options) (Options, error) {
	if o.Confidence == 0 {
		o.Confidence = 0.95
	}
	if math.IsNaN(o.Confidence) || o.Confidence <= 0 || o.Confidence >= 1 {
		if o.Confidence > 1 && o.Confidence < 100 {
			return o, errorf(CodeBadOption, "options.confidence", "confidence %s is not between 0 and 1: for %s%% use %s", plainNum(o.Confidence), plainNum(o.Confidence), plainNum(o.Confidence/100))
		}
		return o, errorf(CodeBadOption, "options.confidence", "confidence %s is not between 0 and 1: use e.g. 0.95 for 95%%", plainNum(o.Confidence))
	}
	if o.Confidence < 0.5 {
		return o, errorf(CodeBadOption, "options.confidence", "confidence %s is below 0.5: use a level such as 0.90, 0.95 or 0.99", plainNum(o.Confidence))
	}
	switch o.DecimalMark {
	case "", "comma", "point":
	default:
		return o, errorf(CodeBadOption, "options.decimalMark", "decimal mark %q is not known: use \"comma\", \"point\" or leave it empty to decide from the data", o.DecimalMark)
	}
	if o.Coverage == 0 {
		o.Coverage = DefaultCoverage
	}
	if !(o.Coverage >= 0.5 && o.Coverage < 1) {
		return o, errorf(CodeBadOption, "options.coverage", "coverage %s is not between 0.5 and 1: use e.g. 0.99 for 99 %% of parts", plainNum(o.Coverage))
	}
	if o.CpkGoal == 0 {
		o.CpkGoal = DefaultCpkGoal
	}
	if !(o.CpkGoal > 0 && o.CpkGoal <= 10) {
		return o, errorf(CodeBadOption, "options.cpkGoal", "Cpk goal %s is not between 0 and 10: use e.g. 1.33 or 1.67", plainNum(o.CpkGoal))
	}
	if o.Quantile == "" {
		o.Quantile = DefaultQuantile
	}
	o.Quantile = strings.ToLower(strings.TrimSpace(o.Quantile))
	if hfType(o.Quantile) < 0 {
		return o, errorf(CodeBadOption, "options.quantile", "quantile definition %q is not known: use one of %s", o.Quantile, strings.Join(QuantileMethods, ", "))
	}
	for _, p := range []struct {
		name string
		v    *float64
	}{{"target", o.Target}, {"lsl", o.LSL}, {"usl", o.USL}} {
		if p.v != nil && (math.IsNaN(*p.v) || math.IsInf(*p.v, 0)) {
			return o, errorf(CodeBadOption, "options."+p.name, "%s is not a finite number: give a value such as 12.5", p.name)
		}
	}
	if err := checkStabilityOptions(o); err != nil {
		return o, err
	}
	if len(o.ExcludeReasons) > 0 {
		in := make(map[int]bool, len(o.Exclude))
		for _, r := range o.Exclude {
			in[r] = true
		}
		rows := make([]int, 0, len(o.ExcludeReasons))
		for r := range o.ExcludeReasons {
			rows = append(rows, r)
		}
		slices.Sort(rows) // the first offending row, the same on every run
		for _, r := range rows {
			field := "options.excludeReasons." + strconv.Itoa(r)
			if !in[r] {
				return o, errorf(CodeBadOption, field, "row %d has a reason but is not left out: add it to options.exclude or drop its reason", r)
			}
			if c := utf8.RuneCountInString(o.ExcludeReasons[r]); c > MaxReasonChars {
				return o, errorf(CodeBadOption, field, "the reason for row %d has %d characters: shorten it to at most %d", r, c, MaxReasonChars)
			}
		}
	}
	if o.LSL != nil && o.USL != nil && *o.LSL >= *o.USL {
		return o, errorf(CodeBadOption, "options.lsl", "the lower specification limit %s is not below the upper limit %s: swap them or correct one", plainNum(*o.LSL), plainNum(*o.USL))
	}
	return o, nil
}

func newReport(fingerprint string, cv *colView, opts Options) *Report {
	unit := cv.unit
	if opts.Unit != "" {
		unit = opts.Unit
	}
	rep := &Report{
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
	}
	rep.Verdict.Caution = wordsFor(rep).caution()
	return rep
}

// AnalyzeJSON is Analyze on JSON bytes: the form the page and automation use.
// It always returns a JSON object: the report, or {"error": "..."}.
func AnalyzeJSON(in []byte) []byte {
	req, err := ParseRequest(in)
	if err != nil {
		return ErrorJSON(err)
	}
	return ReportJSON(Analyze(req))
}

// ParseRequest decodes a request strictly: a key the schema does not have
// (a misspelt option such as "lls") and a value of the wrong type are
// refused with CodeBadRequest and the JSON path of the key, and an explicit
// "confidence": 0 is refused (in Go, a zero Confidence means the default;
// in JSON an explicit 0 is a mistake, not a request for the default).
func ParseRequest(in []byte) (Request, error) {
	var req Request
	dec := json.NewDecoder(bytes.NewReader(in))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&req); err != nil {
		return Request{}, requestError(err)
	}
	if dec.More() {
		return Request{}, errorf(CodeBadRequest, "", "the request has more than one JSON value: send one object")
	}
	if req.Options.Confidence == 0 || req.Options.Coverage == 0 || req.Options.CpkGoal == 0 {
		var raw struct {
			Options map[string]json.RawMessage `json:"options"`
		}
		if json.Unmarshal(in, &raw) == nil {
			for _, k := range []struct {
				key  string
				zero bool
				def  string
			}{{"confidence", req.Options.Confidence == 0, "0.95"}, {"coverage", req.Options.Coverage == 0, "0.99"}, {"cpkGoal", req.Options.CpkGoal == 0, "1.33"}} {
				if _, given := raw.Options[k.key]; given && k.zero {
					return Request{}, errorf(CodeBadOption, "options."+k.key, "%s 0 is not a usable setting: leave it out for the default %s", k.key, k.def)
				}
			}
		}
	}
	return req, nil
}

// jsonKeys lists the JSON keys of a struct type, for messages about the
// keys a request and its options may hold (made when a message needs them,
// not at start).
func jsonKeys(t reflect.Type) string {
	var ks []string
	for i := 0; i < t.NumField(); i++ {
		if name, _, _ := strings.Cut(t.Field(i).Tag.Get("json"), ","); name != "" && name != "-" {
			ks = append(ks, name)
		}
	}
	return strings.Join(ks, ", ")
}

// requestError turns a decoding error into a message naming the key.
func requestError(err error) error {
	var te *json.UnmarshalTypeError
	var se *json.SyntaxError
	msg := err.Error()
	switch {
	case errors.As(err, &te):
		field := te.Field
		want := map[string]string{"string": "text", "float64": "a number", "int": "a whole number", "bool": "true or false", "[]int": "a list of row numbers",
			"[]stats.InCell": `a list of {"row": 2, "text": "5.12"}`, "stats.Options": "an object", "stats.Request": "an object"}[te.Type.String()]
		if want == "" {
			want = te.Type.String()
		}
		if field == "" {
			return errorf(CodeBadRequest, "", "the request must be a JSON object, not %s", te.Value)
		}
		return errorf(CodeBadRequest, field, "%s must be %s, not %s", field, want, te.Value)
	case errors.As(err, &se):
		return errorf(CodeBadRequest, "", "the request is not valid JSON (at byte %d): %v", se.Offset, err)
	case strings.HasPrefix(msg, "json: unknown field "):
		key := strings.Trim(strings.TrimPrefix(msg, "json: unknown field "), `"`)
		return errorf(CodeBadRequest, key, "unknown key %q in the request: a request has %s; its options are %s (check the spelling)", key, jsonKeys(reflect.TypeOf(Request{})), jsonKeys(reflect.TypeOf(Options{})))
	case errors.Is(err, io.EOF):
		return errorf(CodeBadRequest, "", "the request is empty: send a JSON object such as {\"text\": \"5.1\\n5.2\"}")
	}
	return errorf(CodeBadRequest, "", "the request is not valid JSON: %v", err)
}

// ReportJSON encodes the result of Analyze or AnalyzeTable: the report, or
// {"error": "..."} when err is set.
func ReportJSON(rep *Report, err error) []byte {
	if err != nil {
		return ErrorJSON(err)
	}
	out, err := marshalReport(rep)
	if err != nil {
		// a value encoding/json refuses (NaN, Inf): let it name the fault
		out, err = json.Marshal(rep)
	}
	if err != nil {
		return ErrorJSON(errorf(CodeInternal, "", "internal error encoding the report: %v", err))
	}
	return out
}
