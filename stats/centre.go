package stats

import (
	"math"
	"math/big"

	"lotlens/stats/decimal"
	"lotlens/stats/method"
)

// Centre: location statistics.
type Centre struct {
	Mean   float64   `json:"mean"`
	MeanCI *Interval `json:"meanCI,omitempty"`
	Median float64   `json:"median"`
	// MedianCI is the interval for the median at exactly the chosen level:
	// interpolated between order statistics (Hettmansperger and Sheather
	// 1986) where that applies, else the exact order-statistic interval.
	MedianCI *Interval `json:"medianCI,omitempty"`
	// MedianCIExact is the exact order-statistic interval with the level
	// it achieves (at least the chosen one, e.g. 95.7% for 95%).
	MedianCIExact *Interval `json:"medianCIExact,omitempty"`
	Trimmed10     float64   `json:"trimmed10"`
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

// buildCentre fills the centre section: mean and median with their
// intervals, the 10% trimmed mean, the modes. An interval that cannot be
// computed (values near 1e308) is left out with a Note; the rest stays.
func buildCentre(rep *Report, w words, s *sample, opts Options, maxRun int, cv *colView) *Centre {
	n := s.n
	c := &Centre{Mean: s.mo.mean, Median: s.median.f, Trimmed10: s.trimmedMean(0.1)}
	if !s.constant {
		if iv, ok := method.MeanInterval(s.mo.mean, s.mo.sd, n, opts.Confidence); ok {
			c.MeanCI = &Interval{Lo: iv.Lo, Hi: iv.Hi, Level: iv.Level, Method: "student-t"}
		} else if n >= 2 {
			rep.Notes = append(rep.Notes, Note{Field: "centre.meanCI", Text: w.meanCIOverflow()})
		}
		if k, level, reached := method.MedianInterval(n, opts.Confidence); k > 0 {
			c.MedianCIExact = &Interval{Lo: s.sorted[k-1], Hi: s.sorted[n-k], Level: level, Method: "order-statistics"}
			c.MedianCI = c.MedianCIExact
			if lo, hi, ok := method.MedianIntervalInterpolated(s.sorted, opts.Confidence); ok {
				c.MedianCI = &Interval{Lo: lo, Hi: hi, Level: opts.Confidence, Method: "interpolated-order-statistics"}
			}
			if !reached {
				rep.Notes = append(rep.Notes, Note{Field: "centre.medianCI", Text: w.medianCINotReached(n, opts.Confidence, level)})
			}
		}
	} else {
		rep.Notes = append(rep.Notes, Note{Field: "centre.meanCI", Text: w.centreConstant()})
	}
	if n < 2 {
		rep.Notes = append(rep.Notes, Note{Field: "centre.meanCI", Text: w.oneValue()})
	}
	modes(c, w, s.sorted, maxRun, cv)
	return c
}

// trimmedMean is the mean of the values left after removing floor(n·trim)
// from each end, as R's mean(x, trim) (R 4.2.2) does (Tukey and McLaughlin
// 1963): exact on the decimals as typed, else a Neumaier compensated sum
// (Neumaier 1974).
func (s *sample) trimmedMean(trim float64) float64 {
	n := s.n
	lo := int(math.Floor(float64(n)*trim)) + 1
	hi := n + 1 - lo
	if lo > hi {
		return s.median.f
	}
	part := s.sorted[lo-1 : hi]
	if s.exact {
		sum := s.grid.Sum(part)
		den := new(big.Int).Mul(big.NewInt(int64(len(part))), s.grid.Denom())
		return decimal.Float64(new(big.Rat).SetFrac(sum, den))
	}
	return compensatedMoments(part, part[0], part[len(part)-1]).mean
}
