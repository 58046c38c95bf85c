package stats

// This file is the contract between the engine, the page, the tests and any
// automation: one Request in, one Report out, both JSON with a schema version.
// Add fields freely; rename or remove one only together with the page
// (site/app.js), the help page site/help/automation.md and the schema version.

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
	// DecimalComma forces the decimal mark for ambiguous columns: "" (auto),
	// "comma" or "point".
	DecimalMark string `json:"decimalMark,omitempty"`
	// WithinSigma chooses the estimator of the within-process sigma shared
	// by the spec and stability sections (within.go): "" (by the data),
	// "moving-range", "median-moving-range", "pooled-sd", "mean-range",
	// "mean-sd".
	WithinSigma string `json:"withinSigma,omitempty"`
	// Over time (stability.go). Baseline: the rows whose readings set the
	// control limits ("2-61", "2-61, 80-99" or a list of rows; empty: all).
	// Signals switches checks by code (see stability.go checkOrder).
	// EWMALambda, EWMAL (defaults 0.2, 3), CUSUMK, CUSUMH (0.5, 5), in
	// sigmas of one point. ChartSpread: "auto" (default), "range" or "sd".
	Baseline    RowSpec         `json:"baseline,omitempty"`
	Signals     map[string]bool `json:"signals,omitempty"`
	EWMALambda  float64         `json:"ewmaLambda,omitempty"`
	EWMAL       float64         `json:"ewmaL,omitempty"`
	CUSUMK      float64         `json:"cusumK,omitempty"`
	CUSUMH      float64         `json:"cusumH,omitempty"`
	ChartSpread string          `json:"chartSpread,omitempty"`
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
	// Summary is one line, e.g. "498 values read; 2 cells not numbers (rows 17, 203); 1 empty".
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

// Centre: location statistics.
type Centre struct {
	Mean      float64   `json:"mean"`
	MeanCI    *Interval `json:"meanCI,omitempty"`
	Median    float64   `json:"median"`
	MedianCI  *Interval `json:"medianCI,omitempty"`
	Trimmed10 float64   `json:"trimmed10"`
	// Modes are the most repeated values with their count; empty with
	// ModeNote "no repeated value" when all values are unique.
	Modes      []Mode     `json:"modes,omitempty"`
	ModeNote   string     `json:"modeNote,omitempty"`
	ModalClass [2]float64 `json:"modalClass"` // histogram bin with the most values
}

// Mode is a repeated value and how often it occurs.
type Mode struct {
	Value float64 `json:"value"`
	Text  string  `json:"text"`
	Count int     `json:"count"`
}

// Spread: dispersion statistics.
type Spread struct {
	Range    float64   `json:"range"`
	Variance *float64  `json:"variance,omitempty"` // divisor n-1; omitted (with a Note) only when it exceeds the float64 range
	SD       float64   `json:"sd"`                 // divisor n-1
	SDCI     *Interval `json:"sdCI,omitempty"`
	PopSD    *float64  `json:"popSD,omitempty"` // divisor n, on request
	CV       *float64  `json:"cv,omitempty"`    // SD / |mean|, omitted when the mean is 0 or values change sign
	IQR      float64   `json:"iqr"`
	MAD      float64   `json:"mad"` // scaled by 1.4826
	SEM      float64   `json:"sem"`
}

// Quantiles under the chosen definition, and the quartiles under all of them.
type Quantiles struct {
	Method      string        `json:"method"`
	Name        string        `json:"name"` // the definition in words
	Min         float64       `json:"min"`
	Q1          float64       `json:"q1"`
	Median      float64       `json:"median"`
	Q3          float64       `json:"q3"`
	Max         float64       `json:"max"`
	Percentiles []Percentile  `json:"percentiles"` // 0.135, 1, 5, 95, 99, 99.865
	All         []QuartileSet `json:"all"`         // hf1..hf9 and tukey
	// Sensitive is set when another definition would flag different readings
	// by Tukey's fences; Note says which rows.
	Sensitive bool   `json:"sensitive,omitempty"`
	Note      string `json:"note,omitempty"`
}

// Percentile is one named percentile.
type Percentile struct {
	P     float64 `json:"p"` // in percent, e.g. 99.865
	Value float64 `json:"value"`
}

// QuartileSet is Q1, median and Q3 under one definition.
type QuartileSet struct {
	Method string  `json:"method"`
	Q1     float64 `json:"q1"`
	Median float64 `json:"median"`
	Q3     float64 `json:"q3"`
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

// Moment is a shape statistic with its standard error and test.
type Moment struct {
	Value float64 `json:"value"`
	SE    float64 `json:"se"`
	Test  *Test   `json:"test,omitempty"`
}

// Shape of the distribution.
type Shape struct {
	Skewness *Moment `json:"skewness,omitempty"` // G1, adjusted
	Kurtosis *Moment `json:"kurtosis,omitempty"` // G2, adjusted excess
	Omnibus  *Test   `json:"omnibus,omitempty"`  // D'Agostino-Pearson K2
	Shapiro  *Test   `json:"shapiroWilk,omitempty"`
	Anderson *Test   `json:"andersonDarling,omitempty"`
	// Large is the normality test used above n = 5000 (named in Test.Name).
	Large *Test `json:"large,omitempty"`
}

// Suspects: readings flagged by standard rules. Nothing is removed.
type Suspects struct {
	Rules    []Rule    `json:"rules"`
	Readings []Suspect `json:"readings"`
}

// Rule is one outlier rule as applied.
type Rule struct {
	Code  string   `json:"code"` // "tukey-inner", "tukey-outer", "adjusted-box", "modified-z", "gesd"
	Name  string   `json:"name"`
	Lo    *float64 `json:"lo,omitempty"` // lower limit, where the rule has one
	Hi    *float64 `json:"hi,omitempty"`
	Count int      `json:"count"`
	Note  string   `json:"note,omitempty"`
}

// Suspect is a flagged reading with every rule that flags it.
type Suspect struct {
	Reading
	Flags []Flag `json:"flags"`
}

// Flag says which rule flags a reading and by how much.
type Flag struct {
	Rule  string  `json:"rule"`
	Score float64 `json:"score"` // rule's own measure: distance beyond the fence, |Mi|, R_i...
	Text  string  `json:"text"`
}

// Target: tests of the centre against the target value.
type Target struct {
	Value     float64 `json:"value"`
	T         *Test   `json:"t,omitempty"`
	Wilcoxon  *Test   `json:"wilcoxon,omitempty"`
	Inside    bool    `json:"inside"` // target inside the CI of the quoted centre
	Statement string  `json:"statement"`
}

// Charts carries what the chart package draws. Long series are thinned
// (Thinned says so) so that the report stays small for any n.
type Charts struct {
	Histogram Histogram  `json:"histogram"`
	Box       Box        `json:"box"`
	ProbPlot  ProbPlot   `json:"probPlot"`
	Series    []SeriesPt `json:"series"`
	Thinned   bool       `json:"thinned,omitempty"`
}

// Histogram bins: Edges has len(Counts)+1 entries.
type Histogram struct {
	Rule   string    `json:"rule"` // "freedman-diaconis" or "sturges"
	Edges  []float64 `json:"edges"`
	Counts []int     `json:"counts"`
}

// Box is the box-plot elements under the chosen quantile definition.
type Box struct {
	Q1        float64 `json:"q1"`
	Median    float64 `json:"median"`
	Q3        float64 `json:"q3"`
	LoWhisker float64 `json:"loWhisker"`
	HiWhisker float64 `json:"hiWhisker"`
	InnerLo   float64 `json:"innerLo"`
	InnerHi   float64 `json:"innerHi"`
	OuterLo   float64 `json:"outerLo"`
	OuterHi   float64 `json:"outerHi"`
}

// ProbPlot is a normal probability plot: theoretical quantile Z against the
// ordered value Y, with a pointwise confidence band around the fitted line.
type ProbPlot struct {
	Positions string     `json:"positions"` // plotting positions, e.g. "Blom (i-3/8)/(n+1/4)"
	Points    []ProbPt   `json:"points"`
	Band      []BandPt   `json:"band"`
	Line      [2]float64 `json:"line"` // intercept, slope (mean, SD)
}

// ProbPt is one point of the probability plot.
type ProbPt struct {
	Z   float64 `json:"z"`
	Y   float64 `json:"y"`
	Row int     `json:"row"`
}

// BandPt is the band at one theoretical quantile.
type BandPt struct {
	Z  float64 `json:"z"`
	Lo float64 `json:"lo"`
	Hi float64 `json:"hi"`
}

// SeriesPt is one value in data order.
type SeriesPt struct {
	I   int     `json:"i"` // position in data order (0-based)
	Row int     `json:"row"`
	Y   float64 `json:"y"`
}
