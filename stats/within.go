package stats

import (
	"math"

	"lotlens/stats/ingest"
	"lotlens/stats/method"
)

// The within-process sigma is estimated once per report and shared by the
// sections that need it (against the spec, over time), so that their
// figures agree. Which estimator: Options.WithinSigma, else by the data:
//
//   - no subgroup column: individual readings in time order (the order
//     column, else the rows); the average moving range of span 2 / d2(2)
//     ("moving-range"), or on request the median moving range / d4(2)
//     ("median-moving-range"), which resists a few wild ranges;
//   - a subgroup column: the pooled SD / c4 ("pooled-sd", the estimator
//     with the most degrees of freedom), or on request the average range
//     / d2(n) ("mean-range") or the average SD / c4(n) ("mean-sd"), the
//     weighted forms of ASTM E2587 for unequal sizes;
//   - a subgroup column whose every subgroup holds one reading: no spread
//     within subgroups exists, so the readings are individuals and the
//     moving-range estimate is used whatever was asked (singles is set);
//     the spec and stability sections then agree on it.
//
// Moving ranges are taken between consecutive used readings: a reading the
// user left out, or a row without a value, is skipped (the part before and
// the part after it are still neighbours in time).
const (
	WithinMovingRange       = "moving-range"
	WithinMedianMovingRange = "median-moving-range"
	WithinPooledSD          = "pooled-sd"
	WithinMeanRange         = "mean-range"
	WithinMeanSD            = "mean-sd"
)

// WithinMethods are the accepted values of Options.WithinSigma.
var WithinMethods = []string{WithinMovingRange, WithinMedianMovingRange, WithinPooledSD, WithinMeanRange, WithinMeanSD}

// withinSigma is the shared estimate with what it was computed from.
type withinSigma struct {
	method string
	est    method.SigmaEstimate
	// series: the used values in time order (for the moving ranges and
	// the charts over time), with their cell indices (cell); cells is nil
	// when series is the column itself (every cell used, in row order)
	series []float64
	cells  []int32
	// subgroups: used values per subgroup, in order of first appearance
	// in time; labels as typed
	groups [][]float64
	labels []string
	gcells [][]int32
	err    error // why no estimate could be made (too few readings, constant data)
	// singles: a subgroup column was given but every subgroup holds one
	// reading, so the estimate is the individuals' (moving ranges)
	singles bool
}

// checkWithin validates Options.WithinSigma against the request's columns.
func checkWithin(o Options, hasSubgroup bool) error {
	switch o.WithinSigma {
	case "":
		return nil
	case WithinMovingRange, WithinMedianMovingRange:
		if hasSubgroup {
			return errorf(CodeBadOption, "options.withinSigma", "%q works on individual readings, but a subgroup column is chosen: use %q, %q or %q, or clear the subgroup column", o.WithinSigma, WithinPooledSD, WithinMeanRange, WithinMeanSD)
		}
	case WithinPooledSD, WithinMeanRange, WithinMeanSD:
		if !hasSubgroup {
			return errorf(CodeBadOption, "options.withinSigma", "%q needs a subgroup column: choose one, or use %q or %q for individual readings", o.WithinSigma, WithinMovingRange, WithinMedianMovingRange)
		}
	default:
		return errorf(CodeBadOption, "options.withinSigma", "within-process sigma %q is not known: use one of %v", o.WithinSigma, WithinMethods)
	}
	return nil
}

// estimateWithin computes the within-process sigma for the used readings of
// cv (excluded readings and empty cells left out), in time order.
func estimateWithin(cv *colView, sub *ingest.Column, choice string) *withinSigma {
	if sub == nil && cv.seq == nil && cv.allUsed() {
		// the column itself, without a copy (long series)
		return withinOf(cv.vals, nil, nil, choice)
	}
	series := make([]float64, 0, len(cv.vals))
	cells := make([]int32, 0, len(cv.vals))
	for i := range cv.inOrder() {
		if x := cv.vals[i]; x == x && !math.IsInf(x, 0) && !cv.excludedByUser[cv.rows[i]] {
			series = append(series, x)
			cells = append(cells, int32(i))
		}
	}
	return withinOf(series, cells, sub, choice)
}

// allUsed tells whether every cell of the value column is a used reading
// (a finite number the user did not leave out).
func (cv *colView) allUsed() bool {
	if cv.missing > 0 || cv.bad > 0 || len(cv.excludedByUser) > 0 {
		return false
	}
	for _, x := range cv.vals {
		if x != x || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// cell is the cell index (into the value column) of the k-th used reading.
func (w *withinSigma) cell(k int) int32 {
	if w.cells == nil {
		return int32(k)
	}
	return w.cells[k]
}

// withinOf is the within-process sigma of readings given in time order
// (series, with their cell indices, aligned with sub): the estimator of
// estimateWithin, for the whole column or for one group of the groups
// section.
func withinOf(series []float64, cells []int32, sub *ingest.Column, choice string) *withinSigma {
	w := &withinSigma{series: series, cells: cells}
	if sub == nil {
		w.method = choice
		if w.method == "" {
			w.method = WithinMovingRange
		}
		if w.method == WithinMedianMovingRange {
			w.est, w.err = method.SigmaMedianMovingRange(w.series, 2, nil)
		} else {
			w.est, w.err = method.SigmaMovingRange(w.series, 2, nil)
		}
		w.checkSpread(false)
		return w
	}
	idx := map[string]int{}
	for k, c := range w.cells {
		i := int(c)
		if partnerMissing(sub, i) {
			continue
		}
		key := sub.Text(i)
		g, ok := idx[key]
		if !ok {
			g = len(w.groups)
			idx[key] = g
			w.groups = append(w.groups, nil)
			w.gcells = append(w.gcells, nil)
			w.labels = append(w.labels, key)
		}
		w.groups[g] = append(w.groups[g], w.series[k])
		w.gcells[g] = append(w.gcells[g], c)
	}
	if len(w.groups) > 0 && allSingles(w.groups) {
		iw := withinOf(series, cells, nil, "")
		iw.singles = true
		return iw
	}
	w.method = choice
	if w.method == "" {
		w.method = WithinPooledSD
	}
	switch w.method {
	case WithinMeanRange:
		w.est, w.err = method.SigmaRangeBar(w.groups)
	case WithinMeanSD:
		w.est, w.err = method.SigmaSBar(w.groups)
	default:
		w.est, w.err = method.SigmaPooled(w.groups)
	}
	w.checkSpread(true)
	return w
}

// checkSpread sets err when the estimate is 0 or not finite: the readings
// do not vary between consecutive readings or within subgroups.
func (w *withinSigma) checkSpread(subgroups bool) {
	if w.err == nil && !(w.est.Sigma > 0 && !math.IsInf(w.est.Sigma, 0)) {
		w.err = withinFlat{subgroups}
	}
}

// withinFlat is the err of an estimate of 0: the readings do not vary
// (words.withinFlat says so).
type withinFlat struct{ subgroups bool }

func (e withinFlat) Error() string { return words{}.withinFlat(e.subgroups) }
