package stats

// This file is the contract between the engine, the page, the tests and any
// automation: one Request in, one Report out, both JSON with a schema version.
// Each section's own types live beside its builder (Centre in centre.go,
// Spec in spec.go, ...), so adding a statistic to a section touches its
// builder file, not this one. Add fields freely; rename or remove one only
// together with the page (site/*.js), the help page site/help/automation.md
// and the schema version.

import "lotlens/stats/ingest"

// Schema versions. Bump the major number on any incompatible change.
const (
	RequestSchema = "lotlens.request/1"
	ReportSchema  = "lotlens.report/1"
)

// Request is everything the engine needs: the data as typed and the options.
// Give either Text (anything the reader accepts: pasted cells, CSV, one value a
// line...) or Cells (values as typed, with their spreadsheet row).
type Request struct {
	Schema string `json:"schema"`

	// Text is the input as pasted or read from a file (decoded to UTF-8).
	Text string `json:"text,omitempty"`
	// Cells is the alternative to Text for automation: one column of
	// values as typed, each with its row as the user sees it.
	Cells []InCell `json:"cells,omitempty"`
	// Name and Unit describe Cells (ignored with Text: the reader finds them).
	Name string `json:"name,omitempty"`

	// Column choices for tabular Text: the column names as the reader reports
	// them. Value defaults to the first mostly-numeric column.
	Value    string `json:"value,omitempty"`
	Group    string `json:"group,omitempty"`
	Order    string `json:"order,omitempty"`
	Subgroup string `json:"subgroup,omitempty"`
	// Groups names several value columns side by side, one per group
	// ("wide" data), to compare as groups; the alternative to Group. The
	// single-column sections read Value (default: the first of these).
	Groups []string `json:"groups,omitempty"`

	Options Options `json:"options"`
}

// InCell is one value as typed, with its row (1-based, header row counted).
type InCell struct {
	Row  int    `json:"row"`
	Text string `json:"text"`
}

// Options are the user's settings. Zero values mean the documented default.
type Options struct {
	Unit       string   `json:"unit,omitempty"`       // overrides the unit found by the reader
	Target     *float64 `json:"target,omitempty"`     // nominal / target value
	LSL        *float64 `json:"lsl,omitempty"`        // lower specification limit
	USL        *float64 `json:"usl,omitempty"`        // upper specification limit
	Confidence float64  `json:"confidence,omitempty"` // default 0.95
	// Quantile names the quantile definition: "hf1".."hf9" (Hyndman and Fan
	// 1996) or "tukey" (hinges). Default DefaultQuantile.
	Quantile     string `json:"quantile,omitempty"`
	PopulationSD bool   `json:"populationSD,omitempty"` // also report the divisor-n SD
	// Exclude lists rows (as in Cell.Row) the user chose to leave out. They
	// are listed in the report; nothing is ever deleted.
	Exclude []int `json:"exclude,omitempty"`
	// ExcludeReasons holds the user's reason for leaving a row out (row ->
	// text, at most MaxReasonChars characters); every row must also be in
	// Exclude. Echoed in Settings.Excluded[].Reason.
	ExcludeReasons map[int]string `json:"excludeReasons,omitempty"`
	// DecimalComma forces the decimal mark for ambiguous columns: "" (auto),
	// "comma" or "point".
	DecimalMark string `json:"decimalMark,omitempty"`
	// WithinSigma chooses the estimator of the within-process sigma shared
	// by the spec and stability sections (within.go): "" (by the data),
	// "moving-range", "median-moving-range", "pooled-sd", "mean-range",
	// "mean-sd".
	WithinSigma string `json:"withinSigma,omitempty"`
	// Over time (stability.go). Baseline: the rows whose readings set the
	// control limits ("2-61", "2-61, 80-99" or "2, 3, 4"; empty: all).
	// Signals switches checks by code (see stability.go checkOrder).
	// EWMALambda, EWMAL (defaults 0.2, 3), CUSUMK, CUSUMH (0.5, 5), in
	// sigmas of one point. ChartSpread: "auto" (default), "range" or "sd".
	Baseline    string          `json:"baseline,omitempty"`
	Signals     map[string]bool `json:"signals,omitempty"`
	EWMALambda  float64         `json:"ewmaLambda,omitempty"`
	EWMAL       float64         `json:"ewmaL,omitempty"`
	CUSUMK      float64         `json:"cusumK,omitempty"`
	CUSUMH      float64         `json:"cusumH,omitempty"`
	ChartSpread string          `json:"chartSpread,omitempty"`
	// Coverage is the fraction of parts a tolerance interval claims
	// (default DefaultCoverage, 0.99); CpkGoal the level the spec section
	// compares Cpk's lower bound with (default DefaultCpkGoal, 1.33).
	Coverage float64 `json:"coverage,omitempty"`
	CpkGoal  float64 `json:"cpkGoal,omitempty"`
}

// DefaultQuantile is the quantile definition used when the request names none.
const DefaultQuantile = "hf7"

// Report is the whole analysis of one characteristic. Every float is finite:
// where a figure cannot be computed it is omitted (pointer nil or slice
// empty) and a Note says why.
type Report struct {
	Schema    string     `json:"schema"`
	Input     Input      `json:"input"`
	Settings  Settings   `json:"settings"`
	Counts    Counts     `json:"counts"`
	Verdict   Verdict    `json:"verdict"`
	Centre    *Centre    `json:"centre,omitempty"`
	Spread    *Spread    `json:"spread,omitempty"`
	Quantile  *Quantiles `json:"quantiles,omitempty"`
	Shape     *Shape     `json:"shape,omitempty"`
	Suspects  *Suspects  `json:"suspects,omitempty"`
	Target    *Target    `json:"target,omitempty"`
	Spec      *Spec      `json:"spec,omitempty"`
	Groups    *Groups    `json:"groups,omitempty"`
	Charts    *Charts    `json:"charts,omitempty"`
	Stability *Stability `json:"stability,omitempty"`
	Notes     []Note     `json:"notes,omitempty"`
}

// Input says what was read and what was not.
type Input struct {
	// Fingerprint is the SHA-256 (hex) of the input text as read.
	Fingerprint string `json:"fingerprint"`
	Column      string `json:"column"`
	// Order is the order (or time) column the series over time follows;
	// empty when the rows' own order is used.
	Order string `json:"order,omitempty"`
	Unit  string `json:"unit,omitempty"`
	// Columns are all columns the reader found, for the page's pickers.
	Columns []ingest.ColumnInfo `json:"columns,omitempty"`
	// Summary is one line about the value column, e.g. "498 values read; 2
	// cells not numbers (rows 17, 203); 1 empty": its counts are Counts'
	// (values read = used + excluded; not numbers = rejected; empty +
	// marked missing = missing); cells of other columns are only counted
	// at the end ("; other columns: 3 cells empty or not readable").
	Summary  string           `json:"summary"`
	Problems []ingest.Problem `json:"problems,omitempty"`
	// DecimalComma is true when the value column used a decimal comma: the
	// page shows numbers the same way.
	DecimalComma bool `json:"decimalComma,omitempty"`
	// Reader holds the reader's decisions (input_reader.go).
	Reader *ReaderDecisions `json:"reader,omitempty"`
}

// Settings echoes the options as applied (defaults filled in).
type Settings struct {
	Confidence float64   `json:"confidence"`
	Quantile   string    `json:"quantile"`
	Target     *float64  `json:"target,omitempty"`
	LSL        *float64  `json:"lsl,omitempty"`
	USL        *float64  `json:"usl,omitempty"`
	Excluded   []Reading `json:"excluded,omitempty"` // the user's exclusions, listed
	// Coverage and CpkGoal as applied (with a specification limit).
	Coverage float64 `json:"coverage,omitempty"`
	CpkGoal  float64 `json:"cpkGoal,omitempty"`
}

// Counts of the value column.
type Counts struct {
	Used     int `json:"used"`
	Missing  int `json:"missing"`
	Rejected int `json:"rejected"`
	Excluded int `json:"excluded"`
	Distinct int `json:"distinct"`
	// Resolution is the smallest decimal step as typed (0.01 for "12.31").
	Resolution float64 `json:"resolution,omitempty"`
	// Decimals is the largest number of decimals as typed; -1 when some
	// value was not plain decimal text (exponent form).
	Decimals int `json:"decimals"`
	// Step is the step the values actually move in: the greatest common
	// divisor of their differences as typed (0.5 for data typed to 0.1 but
	// recorded in half units). 0 when unknown (exponent form, one distinct value).
	Step float64 `json:"step,omitempty"`
}

// Reading identifies one value: where it is and how it was typed.
type Reading struct {
	Row    int     `json:"row"`
	Column string  `json:"column"`
	Text   string  `json:"text"`
	Value  float64 `json:"value"`
	// Reason is the user's reason for leaving the reading out
	// (Options.ExcludeReasons); only in Settings.Excluded.
	Reason string `json:"reason,omitempty"`
}

// Interval is a two-sided confidence interval.
type Interval struct {
	Lo     float64 `json:"lo"`
	Hi     float64 `json:"hi"`
	Level  float64 `json:"level"`  // the confidence actually achieved (order-statistic intervals may exceed the nominal)
	Method string  `json:"method"` // e.g. "student-t", "chi-square", "order-statistics"
}

// Verdict is the plain-language lead of the report, as data.
type Verdict struct {
	// Quote is "mean-sd" or "median-iqr": the pair of figures to quote.
	Quote    string   `json:"quote"`
	Reasons  []Reason `json:"reasons"`
	Warnings []Reason `json:"warnings,omitempty"`
	// Caution is the standing caution for safety-critical, legal or medical use.
	Caution string `json:"caution"`
}

// Reason is one machine-readable reason with its sentence.
type Reason struct {
	Code string             `json:"code"` // stable identifier, e.g. "right-skewed", "beyond-outer-fence"
	Text string             `json:"text"` // the sentence the page shows
	Vals map[string]float64 `json:"vals,omitempty"`
}

// Note explains an omitted or approximate figure.
type Note struct {
	Field string `json:"field"`
	Text  string `json:"text"`
}

// Test is the result of a hypothesis test.
type Test struct {
	Name      string    `json:"name"`
	Statistic float64   `json:"statistic"`
	DF        *float64  `json:"df,omitempty"`
	P         float64   `json:"p"`
	Estimate  *float64  `json:"estimate,omitempty"`
	CI        *Interval `json:"ci,omitempty"`
	Method    string    `json:"method,omitempty"` // e.g. "exact", "normal approximation with continuity correction"
}
