package stats

import (
	"math"
	"math/big"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// Spec is the batch against its specification limits: what is outside
// now, what the process is expected to put outside, how capable it is and
// how sure those figures are. Present when the request gives LSL or USL.
type Spec struct {
	// Sides: "both", "lower" (LSL only) or "upper" (USL only).
	Sides string `json:"sides"`
	// Tolerance is USL − LSL, exact on the limits as given.
	Tolerance *float64 `json:"tolerance,omitempty"`
	// Observed: readings outside, counted on the values as typed.
	Observed SpecObserved `json:"observed"`
	// Sigma: the within-process sigma (shared with the stability section)
	// and the overall SD.
	Sigma SpecSigma `json:"sigma"`
	// Lead says which model the statement and the leading figures rest on:
	// "normal", a fitted family ("lognormal", "weibull-3", ... see
	// Model.Candidates) or "empirical" (the data's own percentiles).
	Lead string `json:"lead"`
	// LeadReason is a code: "normal-not-rejected", "too-few-to-judge",
	// "not-normal-fitted", "not-normal-no-fit".
	LeadReason string `json:"leadReason"`
	// Expected fraction outside under each model, in ppm.
	Expected []SpecExpected `json:"expected"`
	// Indices: Cp, CPL, CPU, Cpk (within), Pp, PPL, PPU, Ppk (overall),
	// Cpm (target), each with its interval and one-sided lower bound;
	// and, when the data are not normal, the percentile indices of
	// ISO 22514-2 (basis "percentile").
	Indices []SpecIndex `json:"indices"`
	// Model: the distributions fitted by maximum likelihood and the one
	// chosen (present when the normal is rejected).
	Model *SpecModel `json:"model,omitempty"`
	// Tolerance intervals: normal and distribution-free.
	Intervals []SpecTolerance `json:"toleranceIntervals,omitempty"`
	// SampleSize: readings needed for the claims a customer may ask for.
	SampleSize *SpecSampleSize `json:"sampleSize,omitempty"`
	// Statement: the verdict in plain words.
	Statement string `json:"statement"`
	// Cautions: what limits the figures (few readings, an unstable
	// process, non-normal data, coarse resolution, safety).
	Cautions []Reason `json:"cautions"`
	// Curves: the fitted densities for the chart, one per model of
	// Expected ("normal-within", "normal-overall", the chosen family),
	// each at specCurvePoints evenly spaced values.
	Curves []SpecCurve `json:"curves,omitempty"`
}

// SpecCurve is one fitted density sampled for drawing: Density[i] is the
// density (per unit of the value) at X[i].
type SpecCurve struct {
	Model   string    `json:"model"`
	X       []float64 `json:"x"`
	Density []float64 `json:"density"`
}

// SpecObserved counts the readings outside the limits with exact binomial
// (Clopper-Pearson 1934) intervals.
type SpecObserved struct {
	N     int        `json:"n"`
	Below *SpecCount `json:"below,omitempty"` // under LSL (with an LSL)
	Above *SpecCount `json:"above,omitempty"` // over USL (with a USL)
	Total SpecCount  `json:"total"`
}

// SpecCount is a count of readings with its fraction in ppm, the
// two-sided interval (in ppm) and the one-sided upper bound (in ppm) at the
// report's confidence.
type SpecCount struct {
	Count      int      `json:"count"`
	PPM        float64  `json:"ppm"`
	CI         Interval `json:"ci"`
	UpperBound float64  `json:"upperBound"`
}

// SpecSigma: the two sigmas the indices use.
type SpecSigma struct {
	Within  *SpecSigmaFigure `json:"within,omitempty"`
	Overall SpecSigmaFigure  `json:"overall"`
}

// SpecSigmaFigure is one sigma estimate: the method (within.go's codes, or
// "sample-sd"), its effective degrees of freedom and how many moving ranges
// or subgroups went into it.
type SpecSigmaFigure struct {
	Value  float64 `json:"value"`
	Method string  `json:"method"`
	DF     float64 `json:"df"`
	Count  int     `json:"count,omitempty"`
}

// SpecExpected is the fraction outside expected under one model, in ppm;
// UpperBound (normal models) is its one-sided upper confidence bound, the
// sum of the two sides' bounds (Owen 1963; see
// method.ConformNormalUpperBound).
type SpecExpected struct {
	Model      string   `json:"model"` // "normal-within", "normal-overall", or a fitted family
	Below      *float64 `json:"below,omitempty"`
	Above      *float64 `json:"above,omitempty"`
	Total      float64  `json:"total"`
	UpperBound *float64 `json:"upperBound,omitempty"`
}

// SpecIndex is one capability index.
type SpecIndex struct {
	Name       string    `json:"name"`  // "Cp", "CPL", "CPU", "Cpk", "Pp", "PPL", "PPU", "Ppk", "Cpm"
	Basis      string    `json:"basis"` // "within", "overall", "percentile"
	Value      float64   `json:"value"`
	CI         *Interval `json:"ci,omitempty"`
	LowerBound *float64  `json:"lowerBound,omitempty"` // one-sided, at the report's confidence
}

// SpecModel lists the candidate distributions and the choice.
type SpecModel struct {
	Chosen     string          `json:"chosen"` // a family, or "empirical"
	Reason     string          `json:"reason"` // method.FitReason* code
	Candidates []SpecCandidate `json:"candidates"`
	// Percentiles 0.135 %, 50 %, 99.865 % of the chosen model (or the
	// data's own, with their order-statistic intervals when empirical).
	Percentiles []SpecPercentile `json:"percentiles"`
}

// SpecCandidate is one fitted distribution with its fit figures.
type SpecCandidate struct {
	Family   string             `json:"family"`
	Fitted   bool               `json:"fitted"`
	Reason   string             `json:"reason,omitempty"` // why not fitted
	Params   map[string]float64 `json:"params,omitempty"`
	LogLik   *float64           `json:"logLik,omitempty"`
	AIC      *float64           `json:"aic,omitempty"`
	AD       *float64           `json:"ad,omitempty"`
	ADP      *float64           `json:"adP,omitempty"`
	Rule     string             `json:"rule,omitempty"` // the adequacy rule applied
	Adequate bool               `json:"adequate"`
}

// SpecPercentile is one percentile of the leading model.
type SpecPercentile struct {
	P     float64   `json:"p"` // percent: 0.135, 50, 99.865
	Value float64   `json:"value"`
	CI    *Interval `json:"ci,omitempty"` // empirical only
}

// SpecTolerance is a tolerance interval: with Confidence, at least Coverage
// of the parts lie in [Lo, Hi] (one side open for one-sided intervals).
type SpecTolerance struct {
	Kind       string   `json:"kind"` // "normal", "normal-lower", "normal-upper", "distribution-free"
	Coverage   float64  `json:"coverage"`
	Confidence float64  `json:"confidence"` // achieved (distribution-free: at least the asked one)
	Lo         *float64 `json:"lo,omitempty"`
	Hi         *float64 `json:"hi,omitempty"`
	Factor     *float64 `json:"factor,omitempty"` // k of x̄ ± k·s
	// FactorHowe is Howe's (1969) approximate two-sided factor, for
	// comparison with the exact one.
	FactorHowe *float64 `json:"factorHowe,omitempty"`
	Method     string   `json:"method"`          // "odeh-owen-exact", "noncentral-t", "wilks-1941"
	Ranks      []int    `json:"ranks,omitempty"` // distribution-free: r-th smallest, s-th largest
	InsideSpec *bool    `json:"insideSpec,omitempty"`
	// MinN: the fewest readings that support this claim (distribution-free).
	MinN int `json:"minN,omitempty"`
	// Supported is false when these readings cannot support the claim
	// (distribution-free with too few readings): see MinN.
	Supported bool `json:"supported"`
}

// SpecSampleSize: readings needed.
type SpecSampleSize struct {
	CpkGoal float64 `json:"cpkGoal"`
	// ForCpkBound: readings for the Cpk lower bound to exceed CpkGoal if
	// the estimate stays as it is (absent when the estimate is not above
	// the goal: no number of readings is enough).
	ForCpkBound *int `json:"forCpkBound,omitempty"`
	// DistributionFree: readings for the distribution-free claim at the
	// asked coverage and confidence, two-sided (min to max) and one-sided.
	DistributionFree  int `json:"distributionFree"`
	DistributionFree1 int `json:"distributionFreeOneSided"`
}

// Defaults of the spec settings.
const (
	DefaultCoverage = 0.99
	DefaultCpkGoal  = 1.33
	// specFewReadings: below this, capability figures are rough (common
	// practice: many customers ask for at least 30, often 50 or 125).
	specFewReadings = 30
	// specResolutionSteps: at least ten resolution steps across the
	// tolerance (common practice).
	specResolutionSteps = 10
	// specFitMax bounds the values the distributions are fitted to (see
	// thinSorted): 1M distinct values took seconds to fit natively.
	specFitMax = 20_000
	// specCurvePoints: points per drawn density curve.
	specCurvePoints = 101
)

// thinSorted returns m evenly spaced order statistics of sorted (the
// ⌊(i + ½)·n/m⌋-th for i = 0..m−1): a sample that keeps the empirical
// distribution to within 1/m at every point.
func thinSorted(sorted []float64, m int) []float64 {
	n := len(sorted)
	if n <= m {
		return sorted
	}
	out := make([]float64, m)
	for i := range out {
		out[i] = sorted[int((int64(2*i+1)*int64(n))/int64(2*m))]
	}
	return out
}

// specInput is what the spec section needs from the rest of the report.
type specInput struct {
	sorted      []float64 // used values, ascending
	mean, sd    float64   // overall mean and SD (n−1)
	within      *withinSigma
	normalP     *float64 // the shape section's normality test p-value
	normalTest  string
	step        float64 // the step the values move in (counts.step), 0 unknown
	distinct    int     // distinct values (counts.distinct)
	stability   *Reason // the stability section's caution, nil when stable or not assessed
	stableKnown bool
}

// buildSpec makes the spec section. It returns nil (with notes) when no
// limit is given or too few readings vary.
func buildSpec(w words, in specInput, opts Options) (*Spec, []Note) {
	if opts.LSL == nil && opts.USL == nil {
		return nil, nil
	}
	n := len(in.sorted)
	conf := opts.Confidence
	lsl, usl := math.NaN(), math.NaN()
	sp := &Spec{Sides: "both", Cautions: []Reason{}}
	if opts.LSL != nil {
		lsl = *opts.LSL
	}
	if opts.USL != nil {
		usl = *opts.USL
	}
	switch {
	case opts.LSL == nil:
		sp.Sides = "upper"
	case opts.USL == nil:
		sp.Sides = "lower"
	default:
		tol := exactDifference(usl, lsl)
		sp.Tolerance = &tol
	}
	var notes []Note

	// Observed: the limits are numbers as the user typed them and the
	// readings were parsed from their decimals; rounding to the nearest
	// double is monotone and maps distinct short decimals to distinct
	// doubles, so comparing the doubles decides exactly as the decimals
	// would (a reading typed 5.10 against a limit 5.1 is equal, not out).
	below, above := specCounts(in.sorted, lsl, usl)
	cf, err := method.ConformanceFromCounts(n, below, above, !math.IsNaN(lsl), !math.IsNaN(usl), conf)
	if err != nil {
		return nil, []Note{{Field: "spec", Text: w.specFailed(err)}}
	}
	sp.Observed = SpecObserved{N: n, Total: specCount(cf.Outside)}
	if cf.HasLSL {
		c := specCount(cf.Below)
		sp.Observed.Below = &c
	}
	if cf.HasUSL {
		c := specCount(cf.Above)
		sp.Observed.Above = &c
	}

	// Sigmas.
	sp.Sigma.Overall = SpecSigmaFigure{Value: in.sd, Method: "sample-sd", DF: float64(n - 1)}
	sigW, dfW := math.NaN(), math.NaN()
	if ws := in.within; ws != nil && ws.err == nil {
		sp.Sigma.Within = &SpecSigmaFigure{Value: ws.est.Sigma, Method: ws.method, DF: ws.est.DF, Count: ws.est.Count}
		sigW, dfW = ws.est.Sigma, ws.est.DF
		if ws.singles {
			notes = append(notes, Note{Field: "spec.sigma.within", Text: w.withinSingles()})
		}
	} else if ws != nil {
		notes = append(notes, Note{Field: "spec.sigma.within", Text: w.noWithin(ws.err)})
	}
	if n < 2 || !(in.sd > 0) {
		notes = append(notes, Note{Field: "spec.indices", Text: w.specIndicesFew()})
		sp.Indices = []SpecIndex{}
		sp.Expected = []SpecExpected{}
		sp.Lead, sp.LeadReason = "empirical", "too-few-to-judge"
		sp.Statement = specStatement(w, sp, opts)
		return sp, notes
	}

	// Which model leads: the normal unless the shape section's normality
	// test rejects it at 5 %; then the distribution chosen by
	// method.FitDistributions, or the data's own percentiles.
	sp.Lead, sp.LeadReason = "normal", "normal-not-rejected"
	if in.normalP == nil {
		sp.LeadReason = "too-few-to-judge"
	}
	var fit *method.FitResult
	if in.normalP != nil && *in.normalP < 0.05 {
		data := in.sorted
		if in.distinct > specFitMax {
			// the likelihood and Anderson-Darling passes cost one
			// distribution-function call per distinct value and family
			data = thinSorted(in.sorted, specFitMax)
			notes = append(notes, Note{Field: "spec.model", Text: w.specThinned(len(data), n, in.distinct, specFitMax)})
		}
		fr := method.FitDistributions(data, conf)
		fit = &fr
		sp.Model = specModel(fr, conf)
		sp.Lead = sp.Model.Chosen
		if fr.Chosen >= 0 && fr.Candidates[fr.Chosen].Family == method.FitNormal {
			sp.LeadReason = "normal-not-rejected-by-fit"
		} else if fr.Chosen >= 0 {
			sp.LeadReason = "not-normal-fitted"
		} else {
			sp.LeadReason = "not-normal-no-fit"
		}
	}

	// Expected fraction outside.
	sp.Expected = []SpecExpected{}
	if !math.IsNaN(sigW) {
		sp.Expected = append(sp.Expected, specExpectedNormal("normal-within", in.mean, sigW, n, dfW, lsl, usl, conf))
	}
	sp.Expected = append(sp.Expected, specExpectedNormal("normal-overall", in.mean, in.sd, n, float64(n-1), lsl, usl, conf))
	if fit != nil && fit.Chosen >= 0 && fit.Candidates[fit.Chosen].Family != method.FitNormal {
		c := fit.Candidates[fit.Chosen]
		if e, err := c.ExpectedOutside(lsl, usl); err == nil {
			sp.Expected = append(sp.Expected, specExpected(c.Family, e, lsl, usl))
		}
	}

	// Indices.
	sp.Indices = []SpecIndex{}
	target := math.NaN()
	if opts.Target != nil {
		target = *opts.Target
	}
	ci, err := method.Capability(method.CapabilityInput{Mean: in.mean, SigmaWithin: sigW, DFWithin: dfW, SigmaOverall: in.sd, N: n, LSL: lsl, USL: usl, Target: target}, conf)
	if err == nil {
		for _, x := range []struct {
			name, basis string
			ix          method.CapIndex
		}{
			{"Cp", "within", ci.Cp}, {"CPL", "within", ci.CPL}, {"CPU", "within", ci.CPU}, {"Cpk", "within", ci.Cpk},
			{"Pp", "overall", ci.Pp}, {"PPL", "overall", ci.PPL}, {"PPU", "overall", ci.PPU}, {"Ppk", "overall", ci.Ppk},
			{"Cpm", "overall", ci.Cpm},
		} {
			if !x.ix.Valid {
				continue
			}
			lb := x.ix.LowerBound
			sp.Indices = append(sp.Indices, SpecIndex{Name: x.name, Basis: x.basis, Value: x.ix.Value,
				CI: &Interval{Lo: x.ix.Lower, Hi: x.ix.Upper, Level: conf, Method: x.ix.Method}, LowerBound: &lb})
		}
	} else {
		notes = append(notes, Note{Field: "spec.indices", Text: w.specIndicesFailed(err)})
	}
	if sp.Model != nil {
		q := sp.Model.Percentiles
		// the data's own 0.135 % and 99.865 % points mean something only
		// when the readings can bound them (about 2,200 readings at 95 %)
		tailsKnown := sp.Model.Chosen != "empirical" || (len(q) == 3 && q[0].CI != nil && q[2].CI != nil)
		if !tailsKnown {
			notes = append(notes, Note{Field: "spec.indices", Text: w.specNoPercentileIndices(n)})
		}
		if len(q) == 3 && tailsKnown {
			if pc, err := method.PercentileCapability(q[0].Value, q[1].Value, q[2].Value, lsl, usl); err == nil {
				notes = append(notes, Note{Field: "spec.indices", Text: w.specPercentileNoInterval()})
				for _, x := range []struct {
					name string
					v    float64
					ok   bool
				}{{"Pp", pc.Pp, pc.HasPp}, {"PPL", pc.PPL, pc.HasPPL}, {"PPU", pc.PPU, pc.HasPPU}, {"Ppk", pc.Ppk, pc.HasPpk}} {
					if x.ok {
						sp.Indices = append(sp.Indices, SpecIndex{Name: x.name, Basis: "percentile", Value: x.v})
					}
				}
			}
		}
	}

	// Tolerance intervals.
	coverage := opts.Coverage
	if coverage == 0 {
		coverage = DefaultCoverage
	}
	sp.Intervals = specTolerances(in, n, coverage, conf, lsl, usl)

	// Sample sizes.
	goal := opts.CpkGoal
	if goal == 0 {
		goal = DefaultCpkGoal
	}
	ss := &SpecSampleSize{CpkGoal: goal}
	if k := sp.index("Cpk", "within"); k != nil {
		if m, err := method.CpkSampleSize(k.Value, goal, conf); err == nil {
			ss.ForCpkBound = &m
		}
	} else if k := sp.index("Ppk", "overall"); k != nil {
		if m, err := method.CpkSampleSize(k.Value, goal, conf); err == nil {
			ss.ForCpkBound = &m
		}
	}
	ss.DistributionFree, _ = method.DistFreeSampleSize(1, 1, coverage, conf)
	ss.DistributionFree1, _ = method.DistFreeSampleSize(0, 1, coverage, conf)
	sp.SampleSize = ss

	sp.Curves = specCurves(in, sigW, fit, lsl, usl, opts.Target)

	// Cautions.
	sp.Cautions = specCautions(w, sp, in, opts, n)
	sp.Statement = specStatement(w, sp, opts)
	return sp, notes
}

// specCurves samples the densities of the normal with the within sigma,
// the normal with the overall SD and the chosen non-normal fit over the
// readings, the limits and the target (widened by 5 % each side), for the
// chart. A fitted family's density is the difference quotient of its CDF
// over a hundredth of a step, which stays finite where the density itself
// is not (a threshold with shape below 1).
func specCurves(in specInput, sigW float64, fit *method.FitResult, lsl, usl float64, target *float64) []SpecCurve {
	n := len(in.sorted)
	if n < 2 {
		return nil
	}
	vals := []float64{in.sorted[0], in.sorted[n-1], lsl, usl}
	if target != nil {
		vals = append(vals, *target)
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range vals {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if !(hi > lo) {
		return nil
	}
	d := (hi - lo) * 0.05
	lo, hi = lo-d, hi+d
	step := (hi - lo) / (specCurvePoints - 1)
	xs := make([]float64, specCurvePoints)
	for i := range xs {
		xs[i] = lo + step*float64(i)
	}
	curve := func(model string, dens func(x float64) float64) (SpecCurve, bool) {
		c := SpecCurve{Model: model, X: xs, Density: make([]float64, len(xs))}
		for i, x := range xs {
			v := dens(x)
			if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
				return c, false
			}
			c.Density[i] = v
		}
		return c, true
	}
	normal := func(mu, sigma float64) func(float64) float64 {
		return func(x float64) float64 {
			z := (x - mu) / sigma
			return math.Exp(-z*z/2) / (sigma * math.Sqrt(2*math.Pi))
		}
	}
	var out []SpecCurve
	if sigW > 0 && !math.IsInf(sigW, 0) {
		if c, ok := curve("normal-within", normal(in.mean, sigW)); ok {
			out = append(out, c)
		}
	}
	if in.sd > 0 && !math.IsInf(in.sd, 0) {
		if c, ok := curve("normal-overall", normal(in.mean, in.sd)); ok {
			out = append(out, c)
		}
	}
	if fit != nil && fit.Chosen >= 0 && fit.Candidates[fit.Chosen].Family != method.FitNormal {
		fc := fit.Candidates[fit.Chosen]
		h := step / 100
		if c, ok := curve(fc.Family, func(x float64) float64 {
			return (fc.CDF(x+h) - fc.CDF(x-h)) / (2 * h)
		}); ok {
			out = append(out, c)
		}
	}
	return out
}

// specCounts counts the sorted readings below lsl and above usl (NaN: no
// limit on that side); a reading on a limit conforms. The limits are
// numbers as the user typed them and the readings were parsed from their
// decimals; rounding to the nearest double is monotone and maps distinct
// short decimals to distinct doubles, so comparing the doubles decides
// exactly as the decimals would.
func specCounts(sorted []float64, lsl, usl float64) (below, above int) {
	if !math.IsNaN(lsl) {
		below = lowerBound(sorted, lsl) // values < lsl
	}
	if !math.IsNaN(usl) {
		above = len(sorted) - upperBound(sorted, usl)
	}
	return below, above
}

// index returns the named index on a basis, or nil.
func (sp *Spec) index(name, basis string) *SpecIndex {
	for i := range sp.Indices {
		if sp.Indices[i].Name == name && sp.Indices[i].Basis == basis {
			return &sp.Indices[i]
		}
	}
	return nil
}

func specCount(c method.ConformInterval) SpecCount {
	return SpecCount{Count: c.K, PPM: c.Fraction * 1e6,
		CI:         Interval{Lo: c.Lower * 1e6, Hi: c.Upper * 1e6, Level: c.Level, Method: "clopper-pearson"},
		UpperBound: c.UpperBound * 1e6}
}

func specExpected(model string, e method.ExpectedFraction, lsl, usl float64) SpecExpected {
	x := SpecExpected{Model: model, Total: e.Total * 1e6}
	if !math.IsNaN(lsl) {
		b := e.Below * 1e6
		x.Below = &b
	}
	if !math.IsNaN(usl) {
		a := e.Above * 1e6
		x.Above = &a
	}
	return x
}

// specExpectedNormal is the expected fraction under a normal with the given
// sigma, with its upper bound (sum of the sides' bounds).
func specExpectedNormal(model string, mean, sigma float64, n int, df float64, lsl, usl, conf float64) SpecExpected {
	e, err := method.ExpectedOutsideNormal(mean, sigma, lsl, usl)
	if err != nil {
		return SpecExpected{Model: model}
	}
	x := specExpected(model, e, lsl, usl)
	ub, ok := 0.0, true
	for _, side := range []struct {
		lim float64
		k   float64
	}{{lsl, (mean - lsl) / sigma}, {usl, (usl - mean) / sigma}} {
		if math.IsNaN(side.lim) {
			continue
		}
		b, err := method.ConformNormalUpperBound(side.k, n, df, conf)
		if err != nil {
			ok = false
			break
		}
		ub += b
	}
	if ok {
		ub = math.Min(1, ub) * 1e6
		x.UpperBound = &ub
	}
	return x
}

// specModel turns the fit result into the report's form.
func specModel(fr method.FitResult, conf float64) *SpecModel {
	m := &SpecModel{Chosen: "empirical", Reason: fr.Reason, Candidates: []SpecCandidate{}}
	for _, c := range fr.Candidates {
		sc := SpecCandidate{Family: c.Family, Fitted: c.Valid, Adequate: c.Adequate}
		if !c.Valid {
			sc.Reason = c.Reason
		} else {
			ll, aic, ad := c.LogLik, c.AIC, c.AD
			sc.LogLik, sc.AIC, sc.AD, sc.Rule = &ll, &aic, &ad, c.AdequacyRule
			if c.HasPValue {
				p := c.ADPValue
				sc.ADP = &p
			}
			sc.Params = specParams(c)
		}
		m.Candidates = append(m.Candidates, sc)
	}
	if fr.Chosen >= 0 {
		c := fr.Candidates[fr.Chosen]
		m.Chosen = c.Family
		m.Percentiles = []SpecPercentile{{P: 0.135, Value: c.Q00135}, {P: 50, Value: c.Q50}, {P: 99.865, Value: c.Q99865}}
		return m
	}
	e := fr.Empirical
	for k, q := range []method.FitEmpirical{e.Q00135, e.Q50, e.Q99865} {
		p := SpecPercentile{P: []float64{0.135, 50, 99.865}[k], Value: q.Value}
		if q.HasLower && q.HasUpper {
			p.CI = &Interval{Lo: q.Lower, Hi: q.Upper, Level: q.Achieved, Method: "order-statistics"}
		}
		m.Percentiles = append(m.Percentiles, p)
	}
	return m
}

// specParams names a candidate's parameters.
func specParams(c method.FitCandidate) map[string]float64 {
	p := c.Params
	switch c.Family {
	case method.FitNormal:
		return map[string]float64{"mean": p.Mu, "sd": p.Sigma}
	case method.FitLognormal:
		return map[string]float64{"meanlog": p.Mu, "sdlog": p.Sigma}
	case method.FitLognormal3:
		return map[string]float64{"meanlog": p.Mu, "sdlog": p.Sigma, "threshold": p.Threshold}
	case method.FitWeibull, method.FitGamma:
		return map[string]float64{"shape": p.Shape, "scale": p.Scale}
	case method.FitWeibull3, method.FitGamma3:
		return map[string]float64{"shape": p.Shape, "scale": p.Scale, "threshold": p.Threshold}
	case method.FitBoxCox:
		return map[string]float64{"lambda": p.Lambda, "mean": p.Mu, "sd": p.Sigma, "scale": p.Scale}
	}
	return nil
}

// specTolerances: normal two-sided (exact) and one-sided, distribution-free.
func specTolerances(in specInput, n int, coverage, conf, lsl, usl float64) []SpecTolerance {
	out := []SpecTolerance{}
	inside := func(lo, hi float64) *bool {
		b := (math.IsNaN(lsl) || lo >= lsl) && (math.IsNaN(usl) || hi <= usl)
		return &b
	}
	if n >= 2 && in.sd > 0 {
		if f, err := method.NormalToleranceFactors(n, float64(n-1), coverage, conf); err == nil {
			lo, hi, k, kh := in.mean-f.K2*in.sd, in.mean+f.K2*in.sd, f.K2, f.K2Howe
			out = append(out, SpecTolerance{Kind: "normal", Coverage: coverage, Confidence: conf, Lo: &lo, Hi: &hi, Factor: &k, FactorHowe: &kh,
				Method: "odeh-owen-exact", InsideSpec: inside(lo, hi), Supported: true})
			lo1, hi1, k1 := in.mean-f.K1*in.sd, in.mean+f.K1*in.sd, f.K1
			if !math.IsNaN(lsl) && math.IsNaN(usl) {
				out = append(out, SpecTolerance{Kind: "normal-lower", Coverage: coverage, Confidence: conf, Lo: &lo1, Factor: &k1,
					Method: "noncentral-t", InsideSpec: inside(lo1, math.Inf(-1)), Supported: true})
			}
			if !math.IsNaN(usl) && math.IsNaN(lsl) {
				out = append(out, SpecTolerance{Kind: "normal-upper", Coverage: coverage, Confidence: conf, Hi: &hi1, Factor: &k1,
					Method: "noncentral-t", InsideSpec: inside(math.Inf(1), hi1), Supported: true})
			}
		}
	}
	minN, _ := method.DistFreeSampleSize(1, 1, coverage, conf)
	df := SpecTolerance{Kind: "distribution-free", Coverage: coverage, Confidence: conf, Method: "wilks-1941", MinN: minN}
	if r, s, achieved, ok := method.DistFreeRanks(n, coverage, conf, true); ok && n > 0 {
		lo, hi := in.sorted[r-1], in.sorted[n-s]
		df.Lo, df.Hi, df.Ranks, df.Confidence, df.Supported = &lo, &hi, []int{r, s}, achieved, true
		df.InsideSpec = inside(lo, hi)
	}
	return append(out, df)
}

// specCautions lists what limits the figures, most serious first.
func specCautions(w words, sp *Spec, in specInput, opts Options, n int) []Reason {
	var out []Reason
	if in.stability != nil {
		out = append(out, Reason{Code: in.stability.Code, Text: w.cautionNotStable(in.stability.Code, in.stability.Text)})
	}
	if n < specFewReadings {
		out = append(out, Reason{Code: "few-readings", Text: w.cautionFew(n, specFewReadings), Vals: map[string]float64{"n": float64(n)}})
	}
	switch sp.LeadReason {
	case "not-normal-fitted":
		out = append(out, Reason{Code: "not-normal", Text: w.cautionNotNormal(in.normalTest, sp.Lead)})
	case "not-normal-no-fit":
		out = append(out, Reason{Code: "not-normal", Text: w.cautionNotNormal(in.normalTest, "")})
	}
	if sp.Tolerance != nil && in.step > 0 && in.step*specResolutionSteps > *sp.Tolerance {
		out = append(out, Reason{Code: "coarse-resolution", Text: w.cautionCoarse(in.step, specResolutionSteps, *sp.Tolerance),
			Vals: map[string]float64{"step": in.step, "tolerance": *sp.Tolerance}})
	}
	if sp.Sigma.Within == nil {
		out = append(out, Reason{Code: "no-within", Text: w.cautionNoWithin()})
	}
	goal := opts.CpkGoal
	if goal == 0 {
		goal = DefaultCpkGoal
	}
	out = append(out, Reason{Code: "safety", Text: w.cautionSafety(goal, DefaultCpkGoal)})
	return out
}

// specStatement is the verdict in plain words: the observed count, the
// expected fraction under the leading model, the leading index against the
// Cpk goal.
func specStatement(w words, sp *Spec, opts Options) string {
	o := sp.Observed
	conf := opts.Confidence
	s := w.specObserved(o.Total.Count, o.N, sp.Sides, o.Total.PPM, conf, o.Total.UpperBound)
	var lead *SpecExpected
	for i := range sp.Expected {
		e := &sp.Expected[i]
		switch {
		case e.Model == sp.Lead:
			lead = e
		case sp.Lead == "normal" && e.Model == "normal-within":
			lead = e
		case sp.Lead == "normal" && e.Model == "normal-overall" && lead == nil:
			lead = e
		}
	}
	if lead != nil {
		ub := 0.0
		if lead.UpperBound != nil {
			ub = *lead.UpperBound
		}
		s += w.specExpected(lead.Total, lead.UpperBound != nil, conf, ub, lead.Model)
	} else if sp.Lead == "empirical" && sp.Model != nil {
		s += w.specNoFit()
	}
	goal := opts.CpkGoal
	if goal == 0 {
		goal = DefaultCpkGoal
	}
	var k *SpecIndex
	switch {
	case sp.Lead != "normal" && sp.index("Ppk", "percentile") != nil:
		k = sp.index("Ppk", "percentile")
	case sp.index("Cpk", "within") != nil:
		k = sp.index("Cpk", "within")
	default:
		k = sp.index("Ppk", "overall")
	}
	if k != nil {
		lb := 0.0
		if k.LowerBound != nil {
			lb = *k.LowerBound
		}
		s += w.specIndex(k.Name, k.Basis, sp.Lead == "normal", k.Value, k.LowerBound != nil, lb, conf, goal)
	}
	return s
}

// exactDifference is a − b computed on the shortest decimals of a and b
// (the numbers as the user typed them), correctly rounded: 5.3 − 4.9 is
// 0.4, not 0.39999999999999947.
func exactDifference(a, b float64) float64 {
	ra, okA := decimal.ShortestRat(a)
	rb, okB := decimal.ShortestRat(b)
	if !okA || !okB {
		return a - b
	}
	f, _ := new(big.Rat).Sub(ra, rb).Float64()
	return f
}
