package stats

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// The "Over time" section: is the process stable, and since when has it
// changed. The numbers come from stats/method (control.go, runs.go,
// ewma.go, cusum.go, trend.go, changepoint.go); this file chooses the
// chart, applies the user's baseline and switches, maps every point to its
// spreadsheet row and writes the verdict.
//
// Choices, in order:
//
//   - Order: the request's order (or time) column when given, else the
//     rows. With a time column the steps between readings are checked:
//     a step more than gapFactor times the median step is a gap.
//   - Chart: no subgroup column, individuals and moving range; with one,
//     mean and range when the largest subgroup has fewer than 10 readings,
//     else mean and SD (Options.ChartSpread overrides). If every subgroup
//     holds one reading the readings are charted as individuals.
//   - Sigma: the within-process sigma shared with the spec section
//     (within.go). With a baseline the same estimator is applied to the
//     baseline only; the centre is the mean of the baseline readings,
//     summed on the decimals as typed.
//   - Readings the user left out (Options.Exclude) stay on the chart,
//     marked, and are listed; they set no limit and are not judged.
//   - Checks: the switched-on special-cause checks on the values or means;
//     the spread chart is judged by its limits only (its points are
//     correlated, so run checks do not apply); EWMA and CUSUM on the same
//     points; drift tests and the change point on the readings in order.
//   - Stable: no signal on either chart, no EWMA or CUSUM alarm, no trend
//     (Mann-Kendall p < driftAlpha) and no change point (Pettitt p <
//     driftAlpha). A strong lag-1 autocorrelation is a warning.

// Stability is the report's "Over time" section.
type Stability struct {
	// Verdict is the plain-language lead, e.g. "Stable over the 120
	// readings: no signal".
	Verdict string `json:"verdict"`
	// Stable is true when the process was judged and nothing signalled.
	Stable bool `json:"stable"`
	// Judged is false when there were too few readings or no spread.
	Judged bool `json:"judged"`
	// Reasons are the machine-readable grounds of the verdict (codes in
	// stabilityCodes); Warnings do not change Stable.
	Reasons  []Reason `json:"reasons"`
	Warnings []Reason `json:"warnings,omitempty"`

	Order    StabilityOrder `json:"order"`
	Baseline *BaselineInfo  `json:"baseline,omitempty"`
	// LeftOut lists the readings the user left out: they stay on the
	// chart, marked, and set no limits.
	LeftOut []Reading `json:"leftOut,omitempty"`

	Chart  *ControlChart `json:"chart,omitempty"`
	Checks []CheckInfo   `json:"checks"`
	// Signals lists at most maxSignalsListed (200) signals, check by
	// check in the order of Checks, each check's in time order;
	// SignalsCut is true when more were found: Checks hold the full
	// counts, and the verdict and Reasons name the earliest signal of
	// all, listed or not.
	Signals    []SignalInfo `json:"signals"`
	SignalsCut bool         `json:"signalsCut,omitempty"`

	EWMA   *EWMAInfo   `json:"ewma,omitempty"`
	CUSUM  *CUSUMInfo  `json:"cusum,omitempty"`
	Drift  *DriftInfo  `json:"drift,omitempty"`
	Change *ChangeInfo `json:"changePoint,omitempty"`
}

// StabilityOrder says which order the readings were taken in.
type StabilityOrder struct {
	// Source is "column" (the request's order column) or "rows".
	Source string `json:"source"`
	Column string `json:"column,omitempty"`
	// Kind is "number" or "time" (seconds) for an order column.
	Kind       string `json:"kind,omitempty"`
	OutOfOrder int    `json:"outOfOrder"` // rows not in the column's order in the file
	Duplicates int    `json:"duplicates"` // readings sharing their order key with the one before
	// MedianStep is the median step between consecutive keys (seconds
	// for a time column); Gaps are steps more than gapFactor times it.
	MedianStep float64   `json:"medianStep,omitempty"`
	Gaps       []GapInfo `json:"gaps,omitempty"`
	GapCount   int       `json:"gapCount,omitempty"`
	Text       string    `json:"text"`
}

// GapInfo is one large step in the order column.
type GapInfo struct {
	AfterRow  int     `json:"afterRow"`
	BeforeRow int     `json:"beforeRow"`
	Step      float64 `json:"step"`
}

// BaselineInfo describes the readings that set the limits.
type BaselineInfo struct {
	Rows   string `json:"rows"`   // as given, e.g. "2-61"
	Points int    `json:"points"` // readings (or subgroups) in the baseline
	First  int    `json:"first"`  // first and last position in time order (1-based)
	Last   int    `json:"last"`
	Text   string `json:"text"`
}

// ControlChart is the chart of the values (or subgroup means) with its
// spread chart.
type ControlChart struct {
	// Kind is "individuals", "mean-range" or "mean-sd"; KindRule says why.
	Kind     string `json:"kind"`
	KindRule string `json:"kindRule"`
	// Spread names the lower chart: "moving-range", "range" or "sd".
	Spread string  `json:"spread"`
	Centre float64 `json:"centre"`
	// Sigma is the within-process sigma the limits use, by SigmaMethod
	// (within.go's names) with SigmaDF effective degrees of freedom;
	// SigmaShared is true when it is the one the spec section uses (no
	// baseline).
	Sigma       float64 `json:"sigma"`
	SigmaMethod string  `json:"sigmaMethod"`
	SigmaDF     float64 `json:"sigmaDF"`
	SigmaShared bool    `json:"sigmaShared"`
	Width       float64 `json:"width"` // limits at centre ± width·sigma of a point
	// Count is the number of points (readings or subgroups) on the chart;
	// Points holds all of them, or a thinned selection (Thinned) that
	// keeps every point with a signal and every reading left out.
	Count   int         `json:"count"`
	Points  []CtlPoint  `json:"points"`
	Limits  []CtlLimits `json:"limits"`
	Thinned bool        `json:"thinned,omitempty"`
	// TimeAxis is set when Points carry times (seconds) from a time column.
	TimeAxis bool `json:"timeAxis,omitempty"`
}

// CtlPoint is one point of the control chart.
type CtlPoint struct {
	I     int      `json:"i"`   // position in time order, 1-based
	Row   int      `json:"row"` // spreadsheet row (a subgroup's first reading)
	Label string   `json:"label,omitempty"`
	N     int      `json:"n,omitempty"` // readings in the subgroup
	Y     float64  `json:"y"`
	S     *float64 `json:"s,omitempty"` // moving range, range or SD
	T     *float64 `json:"t,omitempty"` // order key (seconds with a time column)
	// LeftOut: the user left this reading out (shown, not judged);
	// Outside: not in the baseline (judged against its limits).
	LeftOut bool     `json:"leftOut,omitempty"`
	Outside bool     `json:"outside,omitempty"`
	Flags   []string `json:"flags,omitempty"` // codes of the signals it is part of
}

// CtlLimits holds the limits for positions From..To (1-based, inclusive);
// they change only where subgroup sizes change.
type CtlLimits struct {
	From         int     `json:"from"`
	To           int     `json:"to"`
	Lower        float64 `json:"lower"`
	Upper        float64 `json:"upper"`
	SpreadCentre float64 `json:"spreadCentre"`
	SpreadLower  float64 `json:"spreadLower"`
	SpreadUpper  float64 `json:"spreadUpper"`
}

// CheckInfo is one special-cause check as applied.
type CheckInfo struct {
	Code  string `json:"code"`
	Name  string `json:"name"`
	On    bool   `json:"on"`
	Count int    `json:"count"` // signals it gave
	Text  string `json:"text"`  // what it looks for
}

// SignalInfo is one signal with the rows or subgroups that make it.
type SignalInfo struct {
	Code  string `json:"code"`
	Chart string `json:"chart"` // "values", "spread", "ewma", "cusum"
	Side  int    `json:"side,omitempty"`
	First int    `json:"first"` // positions in time order, 1-based
	Last  int    `json:"last"`
	// Points counts the points that make it; Rows (spreadsheet rows) or
	// Subgroups (labels as typed) list them, at most maxSignalRows.
	Points    int      `json:"points"`
	Rows      []int    `json:"rows,omitempty"`
	Subgroups []string `json:"subgroups,omitempty"`
	Text      string   `json:"text"`
}

// EWMAInfo is the exponentially weighted moving average chart.
type EWMAInfo struct {
	Lambda float64 `json:"lambda"`
	L      float64 `json:"l"`
	// Scale is "data" (units of the data) or "standardized" (subgroup
	// means of unequal sizes, each in units of its own sigma/√n).
	Scale  string  `json:"scale"`
	Centre float64 `json:"centre"`
	Sigma  float64 `json:"sigma"` // of one plotted point
	// ARL0 and ARL1: average run lengths in control and after a shift of
	// one sigma of a point (Markov chain, Lucas and Saccucci 1990).
	ARL0   *float64 `json:"arl0,omitempty"`
	ARL1   *float64 `json:"arl1,omitempty"`
	Beyond int      `json:"beyond"`
	Points []EWMAPt `json:"points"`
}

// EWMAPt is the average after one point, with its limits.
type EWMAPt struct {
	I  int     `json:"i"`
	Z  float64 `json:"z"`
	Lo float64 `json:"lo"`
	Hi float64 `json:"hi"`
}

// CUSUMInfo is the tabular CUSUM.
type CUSUMInfo struct {
	K        float64   `json:"k"`
	H        float64   `json:"h"`
	Scale    string    `json:"scale"`
	Centre   float64   `json:"centre"`
	Sigma    float64   `json:"sigma"`
	Decision float64   `json:"decision"` // H·sigma
	ARL0     *float64  `json:"arl0,omitempty"`
	ARL1     *float64  `json:"arl1,omitempty"`
	Beyond   int       `json:"beyond"`
	Points   []CUSUMPt `json:"points"`
}

// CUSUMPt holds the upper and lower sums after one point.
type CUSUMPt struct {
	I    int     `json:"i"`
	Up   float64 `json:"up"`
	Down float64 `json:"down"`
}

// DriftInfo holds the tests for drift on the readings in time order.
type DriftInfo struct {
	Readings int `json:"readings"`
	// Exact: ties and sides were decided on the decimals as typed.
	Exact bool `json:"exact"`
	// Blocks and BlockSize: above driftMax readings the runs test, the
	// trend test, Sen's slope and the change point use the means of Blocks
	// blocks of BlockSize consecutive readings (the last readings, fewer
	// than BlockSize, in none); 0 when they use every reading.
	Blocks          int           `json:"blocks,omitempty"`
	BlockSize       int           `json:"blockSize,omitempty"`
	Autocorrelation *AutocorrInfo `json:"autocorrelation,omitempty"`
	Runs            *RunsInfo     `json:"runs,omitempty"`
	Trend           *TrendInfo    `json:"trend,omitempty"`
	Slope           *SlopeInfo    `json:"slope,omitempty"`
}

// AutocorrInfo is the lag-1 autocorrelation with the Ljung-Box test.
type AutocorrInfo struct {
	R1 float64 `json:"r1"`
	Q  float64 `json:"q"`
	P  float64 `json:"p"`
	// Strong: r1 > strongAutocorr with p < driftAlpha; limits from moving
	// ranges are then too narrow.
	Strong bool `json:"strong"`
}

// RunsInfo is the runs test about the median.
type RunsInfo struct {
	Median       float64 `json:"median"`
	Above        int     `json:"above"`
	Below        int     `json:"below"`
	OnMedian     int     `json:"onMedian"`
	Runs         int     `json:"runs"`
	Expected     float64 `json:"expected"`
	Z            float64 `json:"z"`
	P            float64 `json:"p"`
	Exact        bool    `json:"exact"`
	Longest      int     `json:"longest"`
	LongestSide  int     `json:"longestSide"`
	LongestFirst int     `json:"longestFirstRow"`
	LongestLast  int     `json:"longestLastRow"`
}

// TrendInfo is the Mann-Kendall trend test.
type TrendInfo struct {
	S         int64   `json:"s"`
	VarS      float64 `json:"varS"`
	Z         float64 `json:"z"`
	P         float64 `json:"p"`
	Tau       float64 `json:"tau"`
	TieGroups int     `json:"tieGroups"`
}

// SlopeInfo is Sen's slope per reading with its interval.
type SlopeInfo struct {
	Slope      float64 `json:"slope"`
	Lower      float64 `json:"lower"`
	Upper      float64 `json:"upper"`
	Confidence float64 `json:"confidence"`
	Intercept  float64 `json:"intercept"`
	// Every is 1, or k when the slope was computed from every k-th
	// reading (above senMax readings), Used readings in all.
	Every int `json:"every"`
	Used  int `json:"used"`
}

// ChangeInfo is the most likely single change in level (Pettitt 1979).
type ChangeInfo struct {
	Position   int     `json:"position"` // first reading after the change, 1-based in time order
	Row        int     `json:"row"`
	Subgroup   string  `json:"subgroup,omitempty"`
	Statistic  float64 `json:"statistic"`
	P          float64 `json:"p"`
	MeanBefore float64 `json:"meanBefore"`
	MeanAfter  float64 `json:"meanAfter"`
	Shift      float64 `json:"shift"`
	Found      bool    `json:"found"` // P < driftAlpha
}

// Caution is what the spec section says when capability figures rest on
// a process not shown stable: code "not-stable" (Text the verdict) or
// "stability-not-judged" (Text why); nil when the process was judged
// stable.
func (s *Stability) Caution() *Reason {
	if s == nil || s.Stable {
		return nil
	}
	if !s.Judged {
		return &Reason{Code: "stability-not-judged", Text: s.Verdict}
	}
	return &Reason{Code: "not-stable", Text: s.Verdict}
}

// Section constants.
const (
	// driftAlpha: the level at which the trend test, the change point and
	// the autocorrelation count (common practice, stricter than 5 % since
	// several tests run on the same readings).
	driftAlpha = 0.01
	// strongAutocorr: a lag-1 autocorrelation above this makes limits
	// from moving ranges noticeably too narrow (common practice).
	strongAutocorr = 0.3
	// gapFactor: a step in the order column this many times the median
	// step is a gap (common practice).
	gapFactor = 5
	// senMax: Sen's slope forms every pairwise slope; above this many
	// readings (stats/method limits it to 2000) it is computed from every
	// k-th reading (or block mean), k chosen so that at most senSub remain
	// (the sorting of their 45,000 slopes takes a few milliseconds).
	senMax = 2000
	senSub = 300
	// driftMax: above this many readings the runs test, Mann-Kendall,
	// Sen's slope and the change point run on the means of blocks of
	// ceil(n/driftMax) consecutive readings (at most driftMax blocks), so
	// the section stays quick on a million readings (ranking 100,000 block
	// sums took a fifth of the section there); the autocorrelation, the
	// charts, their checks, EWMA and CUSUM use every reading. 20,000 block
	// means still find a drift of a small fraction of a standard deviation
	// over the series, and place a change within one block (50 readings
	// of a million).
	driftMax = 20_000
	// maxSignalsListed and maxSignalRows bound the listing; the checks
	// count every signal.
	maxSignalsListed = 200
	maxSignalRows    = 50
	maxGapsListed    = 50
	maxLeftOutListed = 1000
	// defaults of the EWMA and CUSUM (common practice: Montgomery 2009,
	// §9.1-9.2; NIST/SEMATECH e-Handbook 6.3.2.3-6.3.2.4)
	defaultLambda = 0.2
	defaultL      = 3
	defaultK      = 0.5
	defaultH      = 5
)

// Codes of the section's own signals (besides method.Signal*).
const (
	SignalSpreadBeyond = "spread-beyond" // a moving range, range or SD beyond its limits
	SignalEWMA         = "ewma"          // the EWMA beyond its limits
	SignalCUSUM        = "cusum"         // a CUSUM sum beyond the decision interval
)

// checkOrder is the order the checks are listed in; defaultOn are the
// checks on when the request switches none (the zone checks of the Western
// Electric handbook, the trend check, EWMA and CUSUM; the three others
// point mostly to how the samples were taken and are off by default).
var (
	checkOrder = []string{method.SignalBeyondLimits, method.SignalTwoOfThree, method.SignalFourOfFive,
		method.SignalRunSameSide, method.SignalTrend, method.SignalAlternating, method.SignalHuggingCentre,
		method.SignalAvoidCentre, SignalEWMA, SignalCUSUM}
)

// defaultOn says whether check c is on when the request switches none (a
// switch, not a map: nothing to build at start).
func defaultOn(c string) bool {
	switch c {
	case method.SignalBeyondLimits, method.SignalTwoOfThree, method.SignalFourOfFive,
		method.SignalRunSameSide, method.SignalTrend, SignalEWMA, SignalCUSUM:
		return true
	}
	return false
}

// rowRanges parses Options.Baseline ("2-61, 80, 90-99") into sorted
// inclusive ranges of spreadsheet rows.
func rowRanges(spec string) ([][2]int, error) {
	var out [][2]int
	for _, part := range strings.FieldsFunc(spec, func(c rune) bool { return c == ',' || c == ';' || c == ' ' }) {
		a, b, isRange := strings.Cut(part, "-")
		lo, err1 := strconv.Atoi(strings.TrimSpace(a))
		hi := lo
		var err2 error
		if isRange {
			hi, err2 = strconv.Atoi(strings.TrimSpace(b))
		}
		if err1 != nil || err2 != nil || lo < 1 || hi < lo {
			return nil, fmt.Errorf("%q", part)
		}
		out = append(out, [2]int{lo, hi})
	}
	sort.Slice(out, func(i, j int) bool { return out[i][0] < out[j][0] })
	return out, nil
}

func inRanges(rr [][2]int, row int) bool {
	i := sort.Search(len(rr), func(i int) bool { return rr[i][0] > row })
	for j := i - 1; j >= 0; j-- {
		if rr[j][1] >= row {
			return true
		}
		if j < i-1 {
			break
		}
	}
	// ranges may overlap: check every range starting at or before row
	for j := 0; j < i; j++ {
		if rr[j][1] >= row {
			return true
		}
	}
	return false
}

// checkStabilityOptions refuses impossible settings of the section.
func checkStabilityOptions(o Options) error {
	if o.Baseline != "" {
		if _, err := rowRanges(o.Baseline); err != nil {
			return errorf(CodeBadOption, "options.baseline", "baseline rows: %v is not a row number or a range such as 2-61; give rows like \"2-61, 80-99\"", err)
		}
	}
	for code := range o.Signals {
		if !slices.Contains(checkOrder, code) {
			return errorf(CodeBadOption, "options.signals", "check %q is not known: use %s", code, strings.Join(checkOrder, ", "))
		}
	}
	if o.EWMALambda != 0 && !(o.EWMALambda > 0 && o.EWMALambda <= 1) {
		return errorf(CodeBadOption, "options.ewmaLambda", "EWMA weight %g: it must be above 0 and at most 1 (0.2 is usual)", o.EWMALambda)
	}
	if o.EWMAL != 0 && !(o.EWMAL > 0 && o.EWMAL <= 10) {
		return errorf(CodeBadOption, "options.ewmaL", "EWMA limit width %g: it must be above 0 and at most 10 (3 is usual)", o.EWMAL)
	}
	if o.CUSUMK != 0 && !(o.CUSUMK > 0 && o.CUSUMK <= 10) {
		return errorf(CodeBadOption, "options.cusumK", "CUSUM reference value %g: it must be above 0 and at most 10 (0.5 is usual)", o.CUSUMK)
	}
	if o.CUSUMH != 0 && !(o.CUSUMH > 0 && o.CUSUMH <= 50) {
		return errorf(CodeBadOption, "options.cusumH", "CUSUM decision interval %g: it must be above 0 and at most 50 (4 or 5 are usual)", o.CUSUMH)
	}
	switch o.ChartSpread {
	case "", "auto", "range", "sd":
	default:
		return errorf(CodeBadOption, "options.chartSpread", "chart spread %q is not known: use \"auto\", \"range\" or \"sd\"", o.ChartSpread)
	}
	return nil
}

func orDefault(v, d float64) float64 {
	if v == 0 {
		return d
	}
	return v
}

// buildStability fills the "Over time" section from the used readings in
// time order (ws, from estimateWithin, shared with the spec section) and
// the subgroup column (cv.subgroup; nil for individual readings). smp is
// the sorted sample: its grid decides whether the readings are held as
// typed, its mean is the centre without a baseline.
func buildStability(w words, cv *colView, ws *withinSigma, smp *sample, opts Options) (*Stability, []Note) {
	st := &Stability{Reasons: []Reason{}, Checks: []CheckInfo{}, Signals: []SignalInfo{}}
	var notes []Note
	st.Order = orderInfo(w, cv)
	sub := cv.subgroup
	if sub != nil && ws.singles {
		// every subgroup holds one reading: ws is already the individuals'
		// estimate (within.go), shared with the spec section
		notes = append(notes, Note{Field: "stability.chart", Text: w.stabAllSingles()})
		sub = nil
	}
	ranges, _ := rowRanges(opts.Baseline)
	inBase := func(row int32) bool { return opts.Baseline == "" || inRanges(ranges, int(row)) }

	// the readings left out by the user, listed
	for i := range cv.inOrder() {
		if len(cv.excludedByUser) == 0 {
			break
		}
		x := cv.vals[i]
		if x == x && !math.IsInf(x, 0) && cv.excludedByUser[cv.rows[i]] && len(st.LeftOut) < maxLeftOutListed {
			st.LeftOut = append(st.LeftOut, Reading{Row: int(cv.rows[i]), Column: cv.name, Text: cv.text(i), Value: x})
		}
	}

	n := len(ws.series)
	if n < 3 {
		st.Verdict = w.stabTooFew(n)
		st.Reasons = append(st.Reasons, Reason{Code: "too-few", Text: st.Verdict, Vals: map[string]float64{"n": float64(n)}})
		return st, notes
	}
	if ws.err != nil {
		st.Verdict = w.stabNoSpread(ws.err.Error())
		st.Reasons = append(st.Reasons, Reason{Code: "no-spread", Text: st.Verdict})
		return st, notes
	}
	st.Judged = true

	settings, on := signalSwitches(opts.Signals)
	b := &stabBuild{st: st, w: w, cv: cv, ws: ws, smp: smp, on: on, opts: opts, inBase: inBase}
	if smp.exact {
		b.grid, b.exact = smp.grid, true
	}
	var err error
	if sub == nil {
		err = b.individuals(settings)
	} else {
		err = b.subgroups(settings)
	}
	if err != nil {
		// no drift tests either (their notes are the only ones so far)
		st.Judged = false
		st.Chart, st.Drift, st.Change = nil, nil, nil
		st.Verdict = w.stabNoSpread(err.Error())
		st.Reasons = append(st.Reasons, Reason{Code: "no-spread", Text: st.Verdict})
		return st, notes
	}
	b.finishChart()
	b.verdict()
	return st, append(notes, b.notes...)
}

type stabBuild struct {
	st     *Stability
	w      words
	cv     *colView
	ws     *withinSigma
	smp    *sample
	on     map[string]bool
	opts   Options
	inBase func(int32) bool
	// grid holds the readings as typed when exact (every used reading a
	// plain decimal): means, ranks and sides of the median are exact
	grid  decimal.Grid
	exact bool
	notes []Note

	// The plotted points are the judged points (readings, or subgroup
	// means) and, for individuals, the readings left out, in time order;
	// nothing is kept per reading beyond the shared series (ws): a point's
	// figures are computed when it is drawn or listed.
	subgroup bool
	judged   []float64 // the judged points in order
	nPlot    int       // plotted points
	// individuals: the readings left out, by cell, with their plotted
	// positions (ascending)
	leftCell []int32
	leftPos  []int32
	// subgroups: the spread (range or SD) of each, and its marks
	gSpread     []float64
	gLeft, gOut []bool
	// sigs holds the signals by code (sigCodes), each list in the order
	// found; pts the points of the windowed checks' signals
	sigs      [len(sigCodes)]sigList
	pts       []int32
	keep      []int32 // plotted positions drawn (ascending); nil: all
	extra     []int32 // positions of EWMA and CUSUM alarms drawn too
	blockKeep []int32 // the lowest and highest of thin's blocks, when found early
	flagged   int     // points of signals chosen for drawing
	firsts    map[string]firstSig
}

// stabSig is one signal while the section is built, kept small (a long
// in-control series gives tens of thousands by chance): the judged points
// first..last, or for a windowed check the np points b.pts[off:off+np].
type stabSig struct {
	first, last int32
	off, np     int32
	side        int8
	code        uint8 // index in sigCodes
}

// sigList holds signals in chunks of fixed size: no copy, and little
// unused room, as the list grows.
type sigList struct {
	chunks [][]stabSig
	n      int
}

const sigChunk = 1024

func (l *sigList) add(g stabSig) {
	if k := len(l.chunks); k == 0 || len(l.chunks[k-1]) == sigChunk {
		l.chunks = append(l.chunks, make([]stabSig, 0, sigChunk))
	}
	k := len(l.chunks) - 1
	l.chunks[k] = append(l.chunks[k], g)
	l.n++
}

// sigCodes are the signal codes in the order signals are listed, drawn
// and counted: the checks of the values chart in the method's order, the
// spread chart's, then the EWMA's and the CUSUM's.
var sigCodes = [...]string{method.SignalBeyondLimits, method.SignalTwoOfThree, method.SignalFourOfFive,
	method.SignalRunSameSide, method.SignalTrend, method.SignalAlternating, method.SignalHuggingCentre,
	method.SignalAvoidCentre, SignalSpreadBeyond, SignalEWMA, SignalCUSUM}

const (
	sigSpread = 8
	sigEWMA   = 9
	sigCUSUM  = 10
)

func sigCode(code string) uint8 {
	for k, c := range sigCodes {
		if c == code {
			return uint8(k)
		}
	}
	return 0
}

// chart names the chart a signal belongs to.
func (g stabSig) chart() string {
	switch g.code {
	case sigSpread:
		return "spread"
	case sigEWMA:
		return "ewma"
	case sigCUSUM:
		return "cusum"
	}
	return "values"
}

func (b *stabBuild) count(g stabSig) int {
	if g.np > 0 {
		return int(g.np)
	}
	return int(g.last - g.first + 1)
}

// each calls f for the first up to limit points of the signal.
func (b *stabBuild) each(g stabSig, limit int, f func(j int)) {
	if g.np > 0 {
		for _, j := range b.pts[g.off : g.off+min(g.np, int32(limit))] {
			f(int(j))
		}
		return
	}
	for j := int(g.first); j <= int(g.last) && j-int(g.first) < limit; j++ {
		f(j)
	}
}

// addSignal keeps one signal of a check (the method's Points are copied).
func (b *stabBuild) addSignal(code uint8, side, first, last int, points []int) {
	g := stabSig{first: int32(first), last: int32(last), side: int8(side), code: code}
	if len(points) > 1 || (len(points) == 1 && (first != last || points[0] != first)) {
		g.off, g.np = int32(len(b.pts)), int32(len(points))
		for _, j := range points {
			b.pts = append(b.pts, int32(j))
		}
	}
	b.sigs[code].add(g)
}

// scanSignals runs the switched-on checks of the values chart in one pass
// (method.ScanSignals) and keeps their signals.
func (b *stabBuild) scanSignals(x []float64, centre float64, sigma []float64, settings method.SignalSettings) error {
	return method.ScanSignals(x, centre, sigma, settings, func(s method.Signal) {
		b.addSignal(sigCode(s.Rule), s.Side, s.First, s.Last, s.Points)
	})
}

// eachSignal calls f for every signal in listing order until f returns
// false.
func (b *stabBuild) eachSignal(f func(g stabSig) bool) {
	for _, l := range b.sigs {
		for _, c := range l.chunks {
			for _, g := range c {
				if !f(g) {
					return
				}
			}
		}
	}
}

func allSingles(groups [][]float64) bool {
	for _, g := range groups {
		if len(g) > 1 {
			return false
		}
	}
	return true
}

// signalSwitches turns the request's switches into the method's settings.
func signalSwitches(sw map[string]bool) (method.SignalSettings, map[string]bool) {
	on := map[string]bool{}
	for _, c := range checkOrder {
		v, given := sw[c]
		on[c] = defaultOn(c)
		if given {
			on[c] = v
		}
	}
	s := method.DefaultSignalSettings()
	s.BeyondLimits = on[method.SignalBeyondLimits]
	s.TwoOfThree = on[method.SignalTwoOfThree]
	s.FourOfFive = on[method.SignalFourOfFive]
	s.RunSameSide = on[method.SignalRunSameSide]
	s.Trend = on[method.SignalTrend]
	s.Alternating = on[method.SignalAlternating]
	s.HuggingCentre = on[method.SignalHuggingCentre]
	s.AvoidCentre = on[method.SignalAvoidCentre]
	return s, on
}

// mean is the mean of the used readings in time order selected by keep
// (nil: all, the sample's mean): on the decimals as typed when exact (an
// integer sum, one rounding), else a float sum.
func (b *stabBuild) mean(keep func(k int) bool) float64 {
	if keep == nil {
		return b.smp.mo.mean
	}
	var sel []float64
	for k, x := range b.ws.series {
		if keep(k) {
			sel = append(sel, x)
		}
	}
	if b.exact {
		r := new(big.Rat).SetFrac(b.grid.Sum(sel), new(big.Int).Mul(b.grid.Denom(), big.NewInt(int64(len(sel)))))
		return decimal.Float64(r)
	}
	sum := 0.0
	for _, x := range sel {
		sum += x
	}
	return sum / float64(len(sel))
}

// diff is |reading j − reading k|, on the decimals as typed when exact.
func (b *stabBuild) diff(j, k int) float64 {
	x, y := b.ws.series[j], b.ws.series[k]
	if b.exact {
		d := b.grid.M(x) - b.grid.M(y)
		if d < 0 {
			d = -d
		}
		return b.grid.Float(d)
	}
	return math.Abs(x - y)
}

// posOf is the plotted position (0-based) of judged point j.
func (b *stabBuild) posOf(j int) int {
	if b.subgroup || len(b.leftPos) == 0 {
		return j
	}
	// left-out readings plotted before j: those with fewer than j+1
	// judged readings before them, i.e. leftPos[i] - i <= j
	return j + sort.Search(len(b.leftPos), func(i int) bool { return int(b.leftPos[i])-i > j })
}

// atPos says what is plotted at position p: judged point j (left < 0) or
// the left-out reading left (j < 0).
func (b *stabBuild) atPos(p int) (j, left int) {
	if b.subgroup || len(b.leftPos) == 0 {
		return p, -1
	}
	i, found := slices.BinarySearch(b.leftPos, int32(p))
	if found {
		return -1, i
	}
	return p - i, -1
}

// individuals builds the individuals and moving range chart.
func (b *stabBuild) individuals(settings method.SignalSettings) error {
	cv, ws, st := b.cv, b.ws, b.st
	n := len(ws.series)
	// readings left out stay on the chart: their cells and positions
	if len(cv.excludedByUser) > 0 {
		k := 0
		for i := range cv.inOrder() {
			x := cv.vals[i]
			if x != x || math.IsInf(x, 0) {
				continue
			}
			if cv.excludedByUser[cv.rows[i]] {
				b.leftPos = append(b.leftPos, int32(k+len(b.leftCell)))
				b.leftCell = append(b.leftCell, int32(i))
			} else {
				k++
			}
		}
	}
	b.nPlot = n + len(b.leftCell)
	b.judged = ws.series
	var base []int
	if b.opts.Baseline != "" {
		for j := range n {
			if b.inBase(cv.rows[ws.cell(j)]) {
				base = append(base, j)
			}
		}
		if len(base) < 2 {
			return errors.New(b.w.stabBaselineFew(b.opts.Baseline, len(base)))
		}
	}
	// without a baseline the limits rest on the shared estimate (the same
	// computation as method.Individuals, which is run only for a baseline)
	est := ws.est
	centre := b.mean(nil)
	if base != nil {
		ch, err := method.Individuals(ws.series, method.IndividualsOptions{Median: ws.method == WithinMedianMovingRange, Baseline: base})
		if err != nil {
			return err
		}
		est = ch.Sigma
		keep := make([]bool, n)
		for _, j := range base {
			keep[j] = true
		}
		centre = b.mean(func(k int) bool { return keep[k] })
	}
	sigma := est.Sigma
	if !(sigma > 0) {
		return errors.New(b.w.stabBaselineFlat(false))
	}
	c2 := roundedConstants(2)
	st.Chart = &ControlChart{Kind: "individuals", KindRule: b.w.stabRuleIndividuals(), Spread: "moving-range",
		Centre: centre, Sigma: sigma, SigmaMethod: ws.method, SigmaDF: est.DF, SigmaShared: base == nil, Width: 3}
	lim := CtlLimits{From: 1, To: b.nPlot, Lower: centre - 3*sigma, Upper: centre + 3*sigma,
		SpreadCentre: c2.SmallD2 * sigma, SpreadLower: math.Max(0, c2.SmallD2-3*c2.SmallD3) * sigma, SpreadUpper: (c2.SmallD2 + 3*c2.SmallD3) * sigma}
	st.Chart.Limits = []CtlLimits{lim}
	// the drift tests before the checks: their working memory (block
	// sums, ranks) is freed before the signals are kept
	b.drift()
	if err := b.scanSignals(ws.series, centre, []float64{sigma}, settings); err != nil {
		return err
	}
	// moving ranges between consecutive used readings, judged by their
	// upper limit (a moving range is made by two readings)
	// (in the same pass, on a long series without readings left out, the
	// lowest and highest of each block thin keeps)
	spreadOn := b.on[method.SignalBeyondLimits]
	if spreadOn || (b.nPlot > maxChartPoints && len(b.leftPos) == 0) {
		b.spreadAndBlocks(ws.series, lim.SpreadUpper, spreadOn)
	}
	b.baselineInfo(base, n)
	b.ewmaCusum(ws.series, centre, sigma, "data")
	return nil
}

// subgroups builds the mean chart with its range or SD chart.
func (b *stabBuild) subgroups(settings method.SignalSettings) error {
	cv, ws, st := b.cv, b.ws, b.st
	b.subgroup = true
	k := len(ws.groups)
	b.nPlot = k
	maxn := 0
	for _, g := range ws.groups {
		maxn = max(maxn, len(g))
	}
	spread := b.opts.ChartSpread
	rule := b.w.stabRuleChosen(spread)
	if spread == "" || spread == "auto" {
		spread = "range"
		if maxn >= 10 {
			spread = "sd"
		}
		rule = b.w.stabRuleAuto(maxn)
	}
	// the subgroups wholly in the baseline, and those holding a reading
	// the user left out
	var base []int
	b.gOut = make([]bool, k)
	for g := range k {
		inAll := true
		for _, c := range ws.gcells[g] {
			if !b.inBase(cv.rows[c]) {
				inAll = false
			}
		}
		b.gOut[g] = !inAll
		if inAll {
			base = append(base, g)
		}
	}
	if len(cv.excludedByUser) > 0 && cv.subgroup != nil {
		b.gLeft = make([]bool, k)
		idx := map[string]int{}
		for g, l := range ws.labels {
			idx[l] = g
		}
		for i := range cv.inOrder() {
			if cv.excludedByUser[cv.rows[i]] && !partnerMissing(cv.subgroup, i) {
				if g, ok := idx[cv.subgroup.Text(i)]; ok {
					b.gLeft[g] = true
				}
			}
		}
	}
	if b.opts.Baseline == "" {
		base = nil
	} else if len(base) == 0 {
		return errors.New(b.w.stabBaselineNoSubgroup(b.opts.Baseline))
	}
	sigma, df := ws.est.Sigma, ws.est.DF
	if base != nil {
		sel := make([][]float64, len(base))
		for i, g := range base {
			sel[i] = ws.groups[g]
		}
		est, err := sigmaOf(ws.method, sel)
		if err != nil {
			return err
		}
		sigma, df = est.Sigma, est.DF
	}
	if !(sigma > 0) {
		return errors.New(b.w.stabBaselineFlat(true))
	}
	// centre: the grand mean of the baseline readings, exact when typed as decimals
	centre := b.mean(nil)
	if base != nil {
		member := make([]bool, len(ws.series))
		pos := map[int32]int{}
		for kk := range ws.series {
			pos[ws.cell(kk)] = kk
		}
		for _, g := range base {
			for _, c := range ws.gcells[g] {
				member[pos[c]] = true
			}
		}
		centre = b.mean(func(kk int) bool { return member[kk] })
	}
	st.Chart = &ControlChart{Kind: "mean-" + spread, KindRule: rule, Spread: spread, Centre: centre,
		Sigma: sigma, SigmaMethod: ws.method, SigmaDF: df, SigmaShared: base == nil, Width: 3}
	means := make([]float64, k)
	sig := make([]float64, k)
	z := make([]float64, k)
	b.gSpread = make([]float64, k)
	equal := true
	var spreadOut []int
	for g, grp := range ws.groups {
		n := len(grp)
		if n != len(ws.groups[0]) {
			equal = false
		}
		mean, r, sd := groupStats(grp)
		means[g] = mean
		sig[g] = sigma / math.Sqrt(float64(n))
		z[g] = (mean - centre) / sig[g]
		lim := subgroupLimits(n, centre, sigma, spread)
		if n >= 2 {
			v := r
			if spread == "sd" {
				v = sd
			}
			b.gSpread[g] = v
			if b.on[method.SignalBeyondLimits] && (v > lim.SpreadUpper || v < lim.SpreadLower) {
				spreadOut = append(spreadOut, g)
			}
		}
		if last := len(st.Chart.Limits) - 1; last >= 0 && sameLimits(st.Chart.Limits[last], lim) {
			st.Chart.Limits[last].To = g + 1
		} else {
			lim.From, lim.To = g+1, g+1
			st.Chart.Limits = append(st.Chart.Limits, lim)
		}
	}
	b.judged = means
	b.drift()
	if err := b.scanSignals(means, centre, sig, settings); err != nil {
		return err
	}
	for _, g := range spreadOut {
		b.addSignal(sigSpread, 0, g, g, nil)
	}
	b.baselineInfo(base, k)
	if equal {
		b.ewmaCusum(means, centre, sig[0], "data")
	} else {
		b.ewmaCusum(z, 0, 1, "standardized")
	}
	return nil
}

func sameLimits(a, b CtlLimits) bool {
	return a.Lower == b.Lower && a.Upper == b.Upper && a.SpreadCentre == b.SpreadCentre && a.SpreadLower == b.SpreadLower && a.SpreadUpper == b.SpreadUpper
}

// sigmaOf applies the shared estimator to the baseline subgroups.
func sigmaOf(m string, groups [][]float64) (method.SigmaEstimate, error) {
	switch m {
	case WithinMeanRange:
		return method.SigmaRangeBar(groups)
	case WithinMeanSD:
		return method.SigmaSBar(groups)
	}
	return method.SigmaPooled(groups)
}

// subgroupLimits are the limits of a subgroup of n readings: the mean at
// centre ± 3σ/√n; the range at (d2 ∓ 3d3)σ, the SD at (c4 ∓ 3c5)σ, lower
// limits not below 0 (ASTM E2587; the constants from method.Constants).
func subgroupLimits(n int, centre, sigma float64, spread string) CtlLimits {
	hw := 3 * sigma / math.Sqrt(float64(n))
	l := CtlLimits{Lower: centre - hw, Upper: centre + hw}
	if n < 2 { // a subgroup of one reading has no spread point
		return l
	}
	c := roundedConstants(n)
	if spread == "sd" {
		l.SpreadCentre, l.SpreadLower, l.SpreadUpper = c.C4*sigma, math.Max(0, c.C4-3*c.C5)*sigma, (c.C4+3*c.C5)*sigma
	} else {
		l.SpreadCentre, l.SpreadLower, l.SpreadUpper = c.SmallD2*sigma, math.Max(0, c.SmallD2-3*c.SmallD3)*sigma, (c.SmallD2+3*c.SmallD3)*sigma
	}
	return l
}

// groupStats returns the mean, range and SD (n − 1) of one subgroup.
func groupStats(g []float64) (mean, r, sd float64) {
	lo, hi, sum := g[0], g[0], 0.0
	for _, v := range g {
		sum += v
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	mean = sum / float64(len(g))
	if len(g) > 1 {
		ss := 0.0
		for _, v := range g {
			ss += (v - mean) * (v - mean)
		}
		sd = math.Sqrt(ss / float64(len(g)-1))
	}
	return mean, hi - lo, sd
}

func (b *stabBuild) baselineInfo(base []int, total int) {
	if b.opts.Baseline == "" {
		return
	}
	first, last := b.posOf(base[0])+1, b.posOf(base[len(base)-1])+1
	b.st.Baseline = &BaselineInfo{Rows: b.opts.Baseline, Points: len(base), First: first, Last: last,
		Text: b.w.stabBaseline(len(base), total, first, last, b.subgroup)}
}

// ewmaCusum runs the EWMA and CUSUM on the judged points x, once each:
// their alarms become signals (a run of points beyond, for the CUSUM from
// the point after its sum last left zero), and the values are kept only
// for the points drawn: those thin chose from the values chart, and the
// points of the alarms themselves (a long run by its ends).
func (b *stabBuild) ewmaCusum(x []float64, centre, sigma float64, scale string) {
	lam, L := orDefault(b.opts.EWMALambda, defaultLambda), orDefault(b.opts.EWMAL, defaultL)
	k, h := orDefault(b.opts.CUSUMK, defaultK), orDefault(b.opts.CUSUMH, defaultH)
	b.thin(maxChartPoints)
	var keepJ []int // judged points drawn, ascending (nil with b.keep nil: all)
	if b.keep != nil {
		for _, p := range b.keep {
			if j, _ := b.atPos(int(p)); j >= 0 {
				keepJ = append(keepJ, j)
			}
		}
	}
	// room for the points drawn and some alarms' points
	ewma := make([]EWMAPt, 0, len(keepJ)+64)
	lims := method.EWMAChart{Lambda: lam, L: L, Centre: centre, Sigma: sigma}
	sc := newAlarmScan(b, b.on[SignalEWMA], SignalEWMA, "ewma", keepJ, len(x), func(v alarmPt) {
		lo, hi := lims.Limits(v.j)
		ewma = append(ewma, EWMAPt{I: b.posOf(v.j) + 1, Z: v.a, Lo: lo, Hi: hi})
	})
	cusum := make([]CUSUMPt, 0, len(keepJ)+64)
	decision := h * sigma
	scC := newAlarmScan(b, b.on[SignalCUSUM], SignalCUSUM, "cusum", keepJ, len(x), func(v alarmPt) {
		cusum = append(cusum, CUSUMPt{I: b.posOf(v.j) + 1, Up: v.a, Down: v.b})
	})
	visitE := func(j int, z float64, out bool) {
		if out {
			sc.beyond++
		}
		if out || j == sc.nextJ || sc.start >= 0 { // else nothing to do here
			side := 1
			if z < centre {
				side = -1
			}
			sc.step(alarmPt{j: j, a: z}, out, side, j)
		}
	}
	visitC := func(j int, up, lo float64, nu, nl int32, out bool) {
		if out {
			scC.beyond++
		}
		if out || j == scC.nextJ || scC.start >= 0 {
			// the shift began about the point after the sum was last zero
			side, start := 1, j-int(nu)+1
			if up <= decision {
				side, start = -1, j-int(nl)+1
			}
			scC.step(alarmPt{j: j, a: up, b: lo}, out, side, max(0, start))
		}
	}
	// one pass for both; thinned, it visits only the points drawn, the
	// alarms and the points ending them, and the CUSUM's alarms join the
	// drawing after the EWMA's, as when each had its own pass
	scC.deferred = true
	var errE, errC error
	if b.keep != nil {
		errE, errC = method.EWMACUSUMScanAt(x, centre, sigma, lam, L, k, h, keepJ, visitE, visitC)
	} else {
		errE, errC = method.EWMACUSUMScan(x, centre, sigma, lam, L, k, h, visitE, visitC)
	}
	scC.replay()
	if errE == nil {
		b.st.EWMA = &EWMAInfo{Lambda: lam, L: L, Scale: scale, Centre: centre, Sigma: sigma, Beyond: sc.beyond, Points: sortedPts(ewma, func(p EWMAPt) int { return p.I }),
			ARL0: cachedARL("ewma", lam, L, 0), ARL1: cachedARL("ewma", lam, L, 1)}
	}
	if errC == nil {
		b.st.CUSUM = &CUSUMInfo{K: k, H: h, Scale: scale, Centre: centre, Sigma: sigma, Decision: decision, Beyond: scC.beyond, Points: sortedPts(cusum, func(p CUSUMPt) int { return p.I }),
			ARL0: cachedARL("cusum", k, h, 0), ARL1: cachedARL("cusum", k, h, 1)}
	}
}

// alarmPt is one point of an EWMA or CUSUM scan: its judged index and
// values (the average, or the upper and lower sums).
type alarmPt struct {
	j    int
	a, b float64
}

// alarmScan follows one EWMA or CUSUM scan: it records the points drawn
// (keepJ, or every point when b.keep is nil) and turns each run of alarms
// into a signal, whose first points (up to maxSignalRows + 1) wait in buf.
type alarmScan struct {
	b           *stabBuild
	on          bool
	code, chart string
	keepJ       []int
	next        int // into keepJ
	nextJ       int // the next judged point to record, -1 for none
	n           int
	start, side int // the run of alarms open while start >= 0
	buf         []alarmPt
	last        alarmPt
	beyond      int
	out         func(v alarmPt)
	// deferred: the alarms' points wait in pending (at most
	// maxChartPoints of them) and join the drawing at replay
	deferred bool
	pending  [][]alarmPt
	npending int
}

func newAlarmScan(b *stabBuild, on bool, code, chart string, keepJ []int, n int, out func(v alarmPt)) *alarmScan {
	sc := &alarmScan{b: b, on: on, code: code, chart: chart, keepJ: keepJ, n: n, start: -1, out: out, nextJ: -1}
	switch {
	case b.keep == nil:
		sc.nextJ = 0 // every point
	case len(keepJ) > 0:
		sc.nextJ = keepJ[0]
	}
	return sc
}

func (sc *alarmScan) step(v alarmPt, beyond bool, side, start int) {
	b, j := sc.b, v.j
	if j == sc.nextJ {
		sc.out(v)
		if b.keep == nil {
			sc.nextJ = j + 1
		} else if sc.next++; sc.next < len(sc.keepJ) {
			sc.nextJ = sc.keepJ[sc.next]
		} else {
			sc.nextJ = -1
		}
	}
	if beyond {
		if sc.start < 0 {
			sc.start, sc.side = start, side
		}
		if len(sc.buf) <= maxSignalRows {
			sc.buf = append(sc.buf, v)
		}
		sc.last = v
	}
	if sc.start < 0 || (beyond && j < sc.n-1) {
		return
	}
	// the run closes at the point before (or at the last point)
	lastJ := j - 1
	if beyond {
		lastJ = j
	}
	if sc.on {
		b.addSignal(sigCode(sc.code), sc.side, sc.start, lastJ, nil)
	}
	if b.keep != nil {
		pts := sc.buf
		if lastJ-sc.start+1 > maxSignalRows {
			pts = []alarmPt{sc.buf[0], sc.last}
		}
		if !sc.deferred {
			sc.draw(pts)
		} else if sc.npending < maxChartPoints {
			// beyond that many points none could join (the budget is
			// spent by then)
			sc.pending = append(sc.pending, slices.Clone(pts))
			sc.npending += len(pts)
		}
	}
	sc.start, sc.buf = -1, sc.buf[:0]
}

// draw adds the points of one run of alarms to the drawing while the
// budget for signals' points lasts.
func (sc *alarmScan) draw(pts []alarmPt) {
	b := sc.b
	if b.flagged >= maxChartPoints {
		return
	}
	for _, p := range pts {
		sc.out(p)
		b.extra = append(b.extra, int32(b.posOf(p.j)))
	}
	b.flagged += len(pts)
}

// replay draws the deferred runs of alarms in order.
func (sc *alarmScan) replay() {
	for _, pts := range sc.pending {
		sc.draw(pts)
	}
	sc.pending = nil
}

// sortedPts orders points by position, one per position.
func sortedPts[P any](pts []P, at func(P) int) []P {
	if pts == nil {
		return []P{}
	}
	slices.SortStableFunc(pts, func(a, b P) int { return at(a) - at(b) })
	return slices.CompactFunc(pts, func(a, b P) bool { return at(a) == at(b) })
}

// orderKey returns the order column's key of cell i.
func orderKey(cv *colView, i int) (float64, bool) {
	if cv.order == nil || partnerMissing(cv.order, i) {
		return 0, false
	}
	return cv.order.Values[i], true
}

// orderInfo says which order was used, and checks the order column's
// steps: duplicates, gaps, rows out of order.
func orderInfo(w words, cv *colView) StabilityOrder {
	o := StabilityOrder{Source: "rows"}
	if cv.order == nil {
		o.Text = w.stabOrderRows()
		return o
	}
	o.Source, o.Column, o.Kind, o.OutOfOrder = "column", cv.order.Name, cv.order.Kind, cv.outOfOrder
	var keys []float64
	var rows []int32
	for i := range cv.inOrder() {
		x := cv.vals[i]
		if x != x || math.IsInf(x, 0) {
			continue
		}
		if t, ok := orderKey(cv, i); ok {
			keys = append(keys, t)
			rows = append(rows, cv.rows[i])
		}
	}
	var steps []float64
	for i := 1; i < len(keys); i++ {
		d := keys[i] - keys[i-1]
		if d == 0 {
			o.Duplicates++
		} else {
			steps = append(steps, d)
		}
	}
	if len(steps) >= 2 {
		s := slices.Clone(steps)
		med := quickMedian(s)
		o.MedianStep = med
		for i := 1; i < len(keys); i++ {
			if d := keys[i] - keys[i-1]; d > gapFactor*med {
				o.GapCount++
				if len(o.Gaps) < maxGapsListed {
					o.Gaps = append(o.Gaps, GapInfo{AfterRow: int(rows[i-1]), BeforeRow: int(rows[i]), Step: d})
				}
			}
		}
	}
	o.Text = w.stabOrderColumn(o)
	return o
}

// quickMedian returns the median of s (reordered), by selection.
func quickMedian(s []float64) float64 {
	n := len(s)
	slices.Sort(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// drift runs the drift tests and the change point on the readings in
// time order: every reading up to driftMax, above that the means of
// blocks of consecutive readings (block sums on the decimals as typed, so
// ties and order among them stay exact). The ranks are computed once and
// shared by the runs test, Mann-Kendall and Pettitt.
func (b *stabBuild) drift() {
	ws := b.ws
	n := len(ws.series)
	d := &DriftInfo{Readings: n, Exact: b.exact}
	if !b.exact {
		b.notes = append(b.notes, Note{Field: "stability.drift", Text: b.w.stabNotExact()})
	}
	if a, err := method.Lag1Autocorrelation(ws.series); err == nil {
		d.Autocorrelation = &AutocorrInfo{R1: a.R1, Q: a.Q, P: a.P, Strong: a.R1 > strongAutocorr && a.P < driftAlpha}
	} else {
		b.notes = append(b.notes, Note{Field: "stability.drift.autocorrelation", Text: b.w.stabTestFailed("lag-1 autocorrelation", err)})
	}
	size := 1
	if n > driftMax {
		size = (n + driftMax - 1) / driftMax
	}
	blocks := n / size
	if size > 1 {
		d.BlockSize, d.Blocks = size, blocks
		b.notes = append(b.notes, Note{Field: "stability.drift", Text: b.w.stabDriftBlocks(n, driftMax, size, blocks)})
	}
	// keys: mantissas (or their block sums) on the exact path, else the
	// readings (or block means); toValue turns a key into a data value
	if b.exact && size < 1024 { // block sums below 2^61
		driftOn(b, d, blockSums(b.grid, ws.series, size), b.grid.Float(1)/float64(size), size)
		return
	}
	d.Exact = false
	keys := ws.series
	if size > 1 {
		keys = make([]float64, blocks)
		for k := range keys {
			sum := 0.0
			for _, x := range ws.series[k*size : (k+1)*size] {
				sum += x
			}
			keys[k] = sum / float64(size)
		}
	}
	driftOn(b, d, keys, 1, size)
}

// blockSums returns the sums of the mantissas on g of the blocks of size
// consecutive readings of x (a last partial block left out), in a small
// function of its own (WebAssembly runs such a loop faster).
func blockSums(g decimal.Grid, x []float64, size int) []int64 {
	keys := make([]int64, len(x)/size)
	for k := range keys {
		var sum int64
		for _, v := range x[k*size : (k+1)*size] {
			sum += g.M(v)
		}
		keys[k] = sum
	}
	return keys
}

// driftOn runs the rank tests and Sen's slope on keys (one a block of size
// readings; a key times toValue is the block's mean) and fills d.
func driftOn[T int64 | float64](b *stabBuild, d *DriftInfo, keys []T, toValue float64, size int) {
	ws, cv := b.ws, b.cv
	row := func(j int) int { return int(cv.rows[ws.cell(j)]) }
	// value of a key median (a half-integer of keys on the exact path)
	value := func(m float64) float64 {
		if _, ok := any(keys).([]int64); ok {
			return decimal.Float64(new(big.Rat).SetFrac(big.NewInt(int64(m*2)), new(big.Int).Mul(big.NewInt(int64(2*size)), b.grid.Denom())))
		}
		return m * toValue
	}
	ranks, err := method.RankSeries(keys)
	if err != nil {
		b.notes = append(b.notes, Note{Field: "stability.drift", Text: b.w.stabTestFailed("drift tests", err)})
		b.st.Drift = d
		return
	}
	if rt, err := method.RunsRanked(ranks); err == nil {
		d.Runs = &RunsInfo{Median: value(rt.Median), Above: rt.Above, Below: rt.Below, OnMedian: rt.OnMedian, Runs: rt.Runs,
			Expected: rt.Expected, Z: rt.Z, P: rt.P, Exact: rt.Exact, Longest: rt.Longest, LongestSide: rt.LongestSide,
			LongestFirst: row(rt.LongestFirst * size), LongestLast: row(rt.LongestLast*size + size - 1)}
	} else {
		b.notes = append(b.notes, Note{Field: "stability.drift.runs", Text: b.w.stabTestFailed("runs test", err)})
	}
	if mk, err := method.MannKendallRanked(ranks); err == nil {
		d.Trend = &TrendInfo{S: mk.S, VarS: mk.VarS, Z: mk.Z, P: mk.P, Tau: mk.Tau, TieGroups: mk.TieGroups}
	} else {
		b.notes = append(b.notes, Note{Field: "stability.drift.trend", Text: b.w.stabTestFailed("Mann-Kendall trend test", err)})
	}
	m := len(keys)
	every := 1
	if m > senMax {
		every = (m + senSub - 1) / senSub
	}
	if sen, err := method.SenSlopeEstimate(everyKth(keys, every), b.opts.Confidence); err == nil {
		// a key step is every·size readings
		f := toValue / float64(every*size)
		slope := sen.Slope * f
		d.Slope = &SlopeInfo{Slope: slope, Lower: sen.Lower * f, Upper: sen.Upper * f, Confidence: sen.Confidence,
			Intercept: sen.Intercept*toValue - slope*float64(size-1)/2, Every: every * size, Used: sen.N}
		if every*size > 1 {
			b.notes = append(b.notes, Note{Field: "stability.drift.slope", Text: b.w.stabSenThinned(m, every, sen.N)})
		}
	} else {
		b.notes = append(b.notes, Note{Field: "stability.drift.slope", Text: b.w.stabTestFailed("Sen's slope", err)})
	}
	b.st.Drift = d
	cp, err := method.PettittRanked(ranks, keys)
	if err != nil {
		b.notes = append(b.notes, Note{Field: "stability.changePoint", Text: b.w.stabTestFailed("change point", err)})
		return
	}
	c := &ChangeInfo{Statistic: cp.Statistic, P: cp.P, MeanBefore: cp.MeanBefore * toValue, MeanAfter: cp.MeanAfter * toValue, Found: cp.P < driftAlpha}
	c.Shift = c.MeanAfter - c.MeanBefore
	j := cp.Index * size // the first reading after the change
	cell := ws.cell(j)
	c.Row = int(cv.rows[cell])
	if b.subgroup {
		for g, cs := range ws.gcells {
			if slices.Contains(cs, cell) {
				c.Position, c.Subgroup = g+1, ws.labels[g]
				break
			}
		}
	} else {
		c.Position = b.posOf(j) + 1
	}
	if c.Position > 0 {
		b.st.Change = c
	}
}

func everyKth[T int64 | float64](x []T, k int) []T {
	if k <= 1 {
		return x
	}
	out := make([]T, 0, len(x)/k+1)
	for i := 0; i < len(x); i += k {
		out = append(out, x[i])
	}
	return out
}

// finishChart lists the signals with their rows, chooses the points to
// draw (all, or a thinned selection keeping every signal and every
// reading left out) and fills them.
func (b *stabBuild) finishChart() {
	st := b.st
	counts := map[string]int{}
	total := 0
	for code, l := range b.sigs {
		counts[sigCodes[code]] = l.n
		total += l.n
	}
	b.eachSignal(func(g stabSig) bool {
		if len(st.Signals) >= maxSignalsListed {
			st.SignalsCut = true
			return false
		}
		st.Signals = append(st.Signals, b.signalInfo(g))
		return true
	})
	for _, c := range checkOrder {
		cnt := counts[c]
		if c == method.SignalBeyondLimits {
			cnt += counts[SignalSpreadBeyond]
		}
		st.Checks = append(st.Checks, CheckInfo{Code: c, Name: b.w.stabCheckName(c), On: b.on[c], Count: cnt, Text: b.w.stabCheckText(c)})
	}
	if st.SignalsCut {
		b.notes = append(b.notes, Note{Field: "stability.signals", Text: b.w.stabSignalsCut(total, maxSignalsListed)})
	}
	ch := st.Chart
	ch.Count = b.nPlot
	ch.TimeAxis = b.cv.order != nil && b.cv.order.Kind == "time"
	if b.keep != nil && len(b.extra) > 0 {
		// the EWMA and CUSUM alarms' points join the drawing
		b.keep = append(b.keep, b.extra...)
		slices.Sort(b.keep)
		b.keep = slices.Compact(b.keep)
	}
	ch.Thinned = b.keep != nil
	b.drawPoints()
}

// signalInfo lists one signal with its rows or subgroups.
func (b *stabBuild) signalInfo(g stabSig) SignalInfo {
	si := SignalInfo{Code: sigCodes[g.code], Chart: g.chart(), Side: int(g.side), Points: b.count(g)}
	first, last := int(g.first), int(g.last)
	if g.np > 0 {
		first, last = int(b.pts[g.off]), int(b.pts[g.off+g.np-1])
	}
	si.First, si.Last = b.posOf(first)+1, b.posOf(last)+1
	b.each(g, maxSignalRows, func(j int) {
		if b.subgroup {
			si.Subgroups = append(si.Subgroups, b.ws.labels[j])
		} else {
			si.Rows = append(si.Rows, int(b.cv.rows[b.ws.cell(j)]))
		}
	})
	si.Text = b.w.stabSignal(si, b.subgroup)
	return si
}

// y is the plotted value at position p.
func (b *stabBuild) y(p int) float64 {
	j, left := b.atPos(p)
	if left >= 0 {
		return b.cv.vals[b.leftCell[left]]
	}
	return b.judged[j]
}

// thin chooses the points to draw when there are more than limit: the
// lowest and highest of each of limit/2 blocks, the points of every
// signal (a long run by its ends) and every reading left out, each up to
// limit more. b.keep stays nil when every point is drawn.
func (b *stabBuild) thin(limit int) {
	n := b.nPlot
	if n <= limit {
		return
	}
	keep := make([]int32, 0, 3*limit)
	blocks := limit / 2
	if b.blockKeep != nil && limit == maxChartPoints {
		keep = append(keep, b.blockKeep...)
		blocks = 0
	}
	for k := range blocks {
		a, e := k*n/blocks, (k+1)*n/blocks
		var lo, hi int
		if b.subgroup || len(b.leftPos) == 0 {
			// every plotted point is judged: the values directly
			lo, hi = blockMinMax(b.judged[a:e])
			lo, hi = lo+a, hi+a
		} else {
			lo, hi = a, a
			ylo, yhi := b.y(a), b.y(a)
			for p := a + 1; p < e; p++ {
				v := b.y(p)
				if v < ylo {
					lo, ylo = p, v
				}
				if v > yhi {
					hi, yhi = p, v
				}
			}
		}
		keep = append(keep, int32(lo), int32(hi))
	}
	b.eachSignal(func(g stabSig) bool {
		if b.flagged >= limit {
			return false
		}
		if c := b.count(g); c <= maxSignalRows {
			b.each(g, maxSignalRows, func(j int) { keep = append(keep, int32(b.posOf(j))) })
			b.flagged += c
		} else {
			keep = append(keep, int32(b.posOf(int(g.first))), int32(b.posOf(int(g.last))))
			b.flagged += 2
		}
		return true
	})
	keep = append(keep, b.leftPos[:min(limit, len(b.leftPos))]...)
	if b.subgroup && b.gLeft != nil {
		left := 0
		for g, l := range b.gLeft {
			if l && left < limit {
				keep = append(keep, int32(g))
				left++
			}
		}
	}
	slices.Sort(keep)
	b.keep = slices.Compact(keep)
}

// spreadAndBlocks judges the moving ranges of x (individuals, judged by
// their upper limit up when on) and, when the chart will be thinned and
// every plotted point is judged, keeps the positions of the lowest and
// highest of each of thin's blocks (b.blockKeep), in one pass.
func (b *stabBuild) spreadAndBlocks(x []float64, up float64, on bool) {
	n := len(x)
	blocks, thin := 1, n > maxChartPoints && len(b.leftPos) == 0
	if thin {
		blocks = maxChartPoints / 2
		b.blockKeep = make([]int32, 0, 2*blocks)
	}
	cut := math.Inf(1) // no moving range is judged when off
	if on {
		cut = up * (1 - 1e-12) // a cheap test before the exact one
	}
	var wide []int32
	for k := range blocks {
		a, e := k*n/blocks, (k+1)*n/blocks
		var lo, hi int
		lo, hi, wide = minMaxWide(x, a, e, cut, wide[:0])
		for _, j := range wide {
			if b.diff(int(j), int(j)-1) > up {
				b.addSignal(sigSpread, 0, int(j)-1, int(j), nil)
			}
		}
		if thin {
			b.blockKeep = append(b.blockKeep, int32(lo), int32(hi))
		}
	}
}

// minMaxWide goes once through the points a..e−1 of x (a < e): it returns
// the positions of the first lowest and the first highest, and appends to
// wide the points j ≥ 1 whose moving range |x[j] − x[j−1]| is above cut.
// It and blockMinMax are kept out of line: in WebAssembly a loop in a
// small function of its own runs faster than the same loop inlined into a
// long function that calls.
//
//go:noinline
func minMaxWide(x []float64, a, e int, cut float64, wide []int32) (lo, hi int, _ []int32) {
	lo, hi = a, a
	ylo, yhi := x[a], x[a]
	x = x[:e]
	for j := max(a, 1); j < len(x); j++ {
		v := x[j]
		if math.Abs(v-x[j-1]) > cut {
			wide = append(wide, int32(j))
		}
		if v < ylo {
			lo, ylo = j, v
		}
		if v > yhi {
			hi, yhi = j, v
		}
	}
	return lo, hi, wide
}

// blockMinMax gives the positions of the first lowest and the first
// highest of ys (not empty).
//
//go:noinline
func blockMinMax(ys []float64) (lo, hi int) {
	ylo, yhi := ys[0], ys[0]
	for p, v := range ys {
		if v < ylo {
			lo, ylo = p, v
		}
		if v > yhi {
			hi, yhi = p, v
		}
	}
	return lo, hi
}

// drawPoints fills the chart's points (and the EWMA and CUSUM values) at
// the positions drawn, with the codes of the signals each is part of.
func (b *stabBuild) drawPoints() {
	st, cv, ws := b.st, b.cv, b.ws
	ch := st.Chart
	kept := func(p int) bool {
		if b.keep == nil {
			return true
		}
		_, ok := slices.BinarySearch(b.keep, int32(p))
		return ok
	}
	// flags by drawn position: index p, or p's index in b.keep
	count := b.nPlot
	if b.keep != nil {
		count = len(b.keep)
	}
	flags := make([][]string, count)
	slot := func(p int) int {
		if b.keep == nil {
			return p
		}
		k, _ := slices.BinarySearch(b.keep, int32(p))
		return k
	}
	mark := func(p int, code string) {
		if k := slot(p); !slices.Contains(flags[k], code) {
			flags[k] = append(flags[k], code)
		}
	}
	b.eachSignal(func(g stabSig) bool {
		code := sigCodes[g.code]
		if g.np > 0 {
			for _, j := range b.pts[g.off : g.off+g.np] {
				if p := b.posOf(int(j)); kept(p) {
					mark(p, code)
				}
			}
			return true
		}
		lo, hi := b.posOf(int(g.first)), b.posOf(int(g.last))
		if b.keep == nil {
			for p := lo; p <= hi; p++ {
				if j, _ := b.atPos(p); j >= 0 {
					mark(p, code)
				}
			}
			return true
		}
		i, _ := slices.BinarySearch(b.keep, int32(lo))
		for ; i < len(b.keep) && int(b.keep[i]) <= hi; i++ {
			if j, _ := b.atPos(int(b.keep[i])); j >= 0 {
				mark(int(b.keep[i]), code)
			}
		}
		return true
	})
	ch.Points = make([]CtlPoint, 0, count)
	point := func(p int) {
		j, left := b.atPos(p)
		cp := CtlPoint{I: p + 1, Flags: flags[slot(p)]}
		var cell int32
		switch {
		case left >= 0:
			cell = b.leftCell[left]
			cp.Y, cp.LeftOut = cv.vals[cell], true
		case b.subgroup:
			cell = ws.gcells[j][0]
			cp.Y, cp.Label, cp.N = b.judged[j], ws.labels[j], len(ws.groups[j])
			cp.LeftOut = b.gLeft != nil && b.gLeft[j]
			cp.Outside = b.gOut[j]
			if cp.N >= 2 {
				v := b.gSpread[j]
				cp.S = &v
			}
		default:
			cell = ws.cell(j)
			cp.Y = b.judged[j]
			cp.Outside = b.opts.Baseline != "" && !b.inBase(cv.rows[cell])
			if j >= 1 {
				v := b.diff(j, j-1)
				cp.S = &v
			}
		}
		cp.Row = int(cv.rows[cell])
		if t, ok := orderKey(cv, int(cell)); ok {
			cp.T = &t
		}
		ch.Points = append(ch.Points, cp)
	}
	if b.keep == nil {
		for p := range b.nPlot {
			point(p)
		}
	} else {
		for _, p := range b.keep {
			point(int(p))
		}
	}
}

// verdict decides Stable and writes the lead sentence.
func (b *stabBuild) verdict() {
	st := b.st
	nSig := len(st.Signals)
	if st.SignalsCut {
		nSig = 0
		for _, c := range st.Checks {
			nSig += c.Count
		}
	}
	var chartN, ewmaN, cusumN int
	for _, c := range st.Checks {
		switch c.Code {
		case SignalEWMA:
			ewmaN = c.Count
		case SignalCUSUM:
			cusumN = c.Count
		default:
			chartN += c.Count
		}
	}
	trend := st.Drift != nil && st.Drift.Trend != nil && st.Drift.Trend.P < driftAlpha
	change := st.Change != nil && st.Change.Found
	st.Stable = chartN == 0 && ewmaN == 0 && cusumN == 0 && !trend && !change
	w, dec, unit := b.w, b.dataDecimals(), b.cv.unit
	if chartN > 0 {
		first := b.firstSignal("values", "spread")
		st.Reasons = append(st.Reasons, Reason{Code: "signals", Text: w.stabReasonSignals(chartN, first), Vals: map[string]float64{"count": float64(chartN)}})
	}
	if ewmaN > 0 {
		st.Reasons = append(st.Reasons, Reason{Code: "ewma", Text: w.stabReasonEWMA(ewmaN, b.firstSignal("ewma")), Vals: map[string]float64{"count": float64(ewmaN)}})
	}
	if cusumN > 0 {
		st.Reasons = append(st.Reasons, Reason{Code: "cusum", Text: w.stabReasonCUSUM(cusumN, b.firstSignal("cusum")), Vals: map[string]float64{"count": float64(cusumN)}})
	}
	if trend {
		t := st.Drift.Trend
		st.Reasons = append(st.Reasons, Reason{Code: "trend", Text: w.stabReasonTrend(t.S, t.P, st.Drift.Slope, dec, unit), Vals: map[string]float64{"p": t.P, "tau": t.Tau}})
	}
	if change {
		c := st.Change
		st.Reasons = append(st.Reasons, Reason{Code: "change-point", Text: w.stabReasonChange(c, b.subgroup, dec), Vals: map[string]float64{"p": c.P, "shift": c.Shift}})
	}
	if st.Stable {
		st.Reasons = append(st.Reasons, Reason{Code: "no-signal", Text: w.stabReasonNoSignal(), Vals: map[string]float64{"points": float64(st.Chart.Count)}})
	}
	if a := st.Drift.Autocorrelation; a != nil && a.Strong {
		st.Warnings = append(st.Warnings, Reason{Code: "autocorrelation", Text: w.stabWarnAutocorr(a.R1, a.P), Vals: map[string]float64{"r1": a.R1, "p": a.P}})
	}
	if st.Order.GapCount > 0 {
		st.Warnings = append(st.Warnings, Reason{Code: "gaps", Text: w.stabWarnGaps(st.Order), Vals: map[string]float64{"count": float64(st.Order.GapCount)}})
	}
	if st.Order.OutOfOrder > 0 {
		st.Warnings = append(st.Warnings, Reason{Code: "out-of-order", Text: w.stabWarnOutOfOrder(st.Order), Vals: map[string]float64{"count": float64(st.Order.OutOfOrder)}})
	}
	var lead string
	switch {
	case st.Stable:
		lead = w.stabLeadStable(len(b.judged), len(b.ws.series), b.subgroup)
	case change && (chartN > 0 || ewmaN > 0 || cusumN > 0 || !trend):
		lead = w.stabLeadShift(st.Change, b.subgroup, dec, unit)
	case trend && st.Drift.Slope != nil:
		lead = w.stabLeadDrift(st.Drift.Slope.Slope, dec, unit)
	default:
		lead = w.stabLeadSignals(nSig, b.firstSignal("values", "spread", "ewma", "cusum"))
	}
	if st.Baseline != nil {
		lead = w.stabLeadBaseline(lead, st.Baseline.Text)
	}
	st.Verdict = lead
}

// dataDecimals is the number of decimals data values are written with in
// sentences: as typed, 3 when some reading was not a plain decimal.
func (b *stabBuild) dataDecimals() int {
	if b.exact {
		return b.grid.Scale
	}
	return 3
}

// firstSignal is the earliest signal on the charts named (the first in
// listing order among those starting at the same point), from every
// signal found, listed or not; nil when there is none.
func (b *stabBuild) firstSignal(charts ...string) *SignalInfo {
	if b.firsts == nil {
		// once: the earliest signal of each chart, with its place in the
		// listing order for ties
		b.firsts = map[string]firstSig{}
		seq := 0
		b.eachSignal(func(g stabSig) bool {
			start := g.first
			if g.np > 0 {
				start = b.pts[g.off]
			}
			if f, ok := b.firsts[g.chart()]; !ok || start < f.start {
				b.firsts[g.chart()] = firstSig{g: g, start: start, seq: seq}
			}
			seq++
			return true
		})
	}
	var best firstSig
	found := false
	for _, c := range charts {
		if f, ok := b.firsts[c]; ok && (!found || f.start < best.start || f.start == best.start && f.seq < best.seq) {
			best, found = f, true
		}
	}
	if !found {
		return nil
	}
	si := b.signalInfo(best.g)
	return &si
}

// firstSig is the earliest signal of a chart (firstSignal).
type firstSig struct {
	g     stabSig
	start int32
	seq   int
}

// roundedConstants are the chart constants rounded to 12 significant
// digits (they are computed to about 1e-14 by integration): the engine's
// native and WebAssembly builds differ in the last bits of their
// exponential and logarithm, and the report must be the same in both.
func roundedConstants(n int) method.ChartConstants {
	c, err := method.Constants(n)
	if err != nil {
		return c
	}
	for _, p := range []*float64{&c.SmallD2, &c.SmallD3, &c.C4, &c.C5} {
		*p = roundSig(*p, 12)
	}
	return c
}

// arlCache keeps the run lengths by chart and settings: each is a linear
// solve of 301 states (tens of milliseconds), and the page re-runs the
// analysis on every change of a setting; it starts with the default
// settings' figures (arlSeed), made on first use rather than at start.
var (
	arlMu    sync.Mutex
	arlCache map[[4]float64]*float64
)

func cachedARL(chart string, a, b, shift float64) *float64 {
	key := [4]float64{a, b, shift, 0}
	if chart == "cusum" {
		key[3] = 1
	}
	arlMu.Lock()
	if arlCache == nil {
		arlCache = seededARLCache()
	}
	v, ok := arlCache[key]
	arlMu.Unlock()
	if ok {
		if v == nil {
			return nil
		}
		c := *v
		return &c
	}
	var r float64
	var err error
	if chart == "cusum" {
		var c method.CUSUMRunLength
		c, err = method.CUSUMARL(a, b, shift)
		r = c.TwoSided
	} else {
		r, err = method.EWMAARL(a, b, shift)
	}
	if err != nil || math.IsInf(r, 0) || r != r {
		v = nil
	} else {
		// 6 significant digits: the Markov chain is good to about that, and
		// the native and WebAssembly linear algebra differ in the last bits
		r = roundSig(r, 6)
		v = &r
	}
	arlMu.Lock()
	arlCache[key] = v
	arlMu.Unlock()
	if v == nil {
		return nil
	}
	c := *v
	return &c
}
