package stats

import (
	"math"

	"lotlens/stats/method"
)

// Spread: dispersion statistics.
type Spread struct {
	Range    float64   `json:"range"`
	Variance *float64  `json:"variance,omitempty"` // divisor n-1; omitted (with a Note) only when it exceeds the float64 range
	SD       float64   `json:"sd"`                 // divisor n-1
	SDCI     *Interval `json:"sdCI,omitempty"`
	PopSD    *float64  `json:"popSD,omitempty"` // divisor n, on request
	CV       *float64  `json:"cv,omitempty"`    // SD / |mean|, omitted when the mean is 0 or values change sign
	IQR      float64   `json:"iqr"`
	// IQRQuantile is the quantile definition of the quartiles behind the
	// IQR (settings.quantile).
	IQRQuantile string  `json:"iqrQuantile"`
	MAD         float64 `json:"mad"` // scaled by 1.4826
	SEM         float64 `json:"sem"`
}

// buildSpread fills the spread section: range, SD with its interval,
// variance, IQR and MAD (exact on the decimals as typed), SEM, CV.
func buildSpread(rep *Report, w words, s *sample, opts Options) *Spread {
	n := s.n
	lo, hi := s.sorted[0], s.sorted[n-1]
	rng := hi - lo
	if s.exact {
		// 0.3 - 0.1 is 0.2, not 0.19999999999999998
		rng = s.grid.Float(s.grid.M(hi) - s.grid.M(lo))
	}
	mad := scaled(s.mad(), 14826, 10000) // method.MADScale, as a decimal
	sp := &Spread{Range: rng, SD: s.mo.sd, IQR: s.sub(s.q3, s.q1).f, IQRQuantile: s.defCode, MAD: mad.f}
	mo := s.mo
	if mo.varInf {
		rep.Notes = append(rep.Notes, Note{Field: "spread.variance", Text: w.varianceOverflow()})
	} else {
		v := mo.varN1
		sp.Variance = &v
	}
	if n >= 2 {
		sp.SEM = mo.sd / math.Sqrt(float64(n))
		if !s.constant {
			if iv, ok := method.SDInterval(mo.sd, n, opts.Confidence); ok {
				sp.SDCI = &Interval{Lo: iv.Lo, Hi: iv.Hi, Level: iv.Level, Method: "chi-square"}
			}
		}
	} else {
		sp.SD = 0
		rep.Notes = append(rep.Notes, Note{Field: "spread.sd", Text: w.sdOneValue()})
	}
	if opts.PopulationSD {
		p := mo.popSD
		sp.PopSD = &p
	}
	if mo.mean != 0 && (lo > 0 || hi < 0) && n >= 2 {
		cvv := mo.sd / math.Abs(mo.mean)
		sp.CV = &cvv
	} else if n >= 2 {
		rep.Notes = append(rep.Notes, Note{Field: "spread.cv", Text: w.cvOmitted()})
	}
	return sp
}
