package method

import (
	"fmt"
	"math"
)

// EWMAChart is an exponentially weighted moving average chart. Z[i] is the
// average after point i; its limits at point i are Limits(i). Beyond lists
// the points whose average lies outside its limits (strictly).
type EWMAChart struct {
	Lambda, L     float64
	Centre, Sigma float64
	Z             []float64
	Beyond        []int
}

// Limits returns the control limits of the average after point i
// (0-based): Centre ∓ L·σ·sqrt(λ/(2−λ)·(1 − (1−λ)^(2(i+1)))), the
// time-varying limits of Lucas and Saccucci (1990).
func (c EWMAChart) Limits(i int) (lower, upper float64) {
	h := c.L * c.Sigma * math.Sqrt(c.Lambda/(2-c.Lambda)*(-math.Expm1(2*float64(i+1)*math.Log1p(-c.Lambda))))
	return c.Centre - h, c.Centre + h
}

// SteadyLimits returns the limits the time-varying ones approach,
// Centre ∓ L·σ·sqrt(λ/(2−λ)).
func (c EWMAChart) SteadyLimits() (lower, upper float64) {
	h := c.L * c.Sigma * math.Sqrt(c.Lambda/(2-c.Lambda))
	return c.Centre - h, c.Centre + h
}

func ctlCheckLambdaL(lambda, l float64) error {
	if !(lambda > 0 && lambda <= 1) {
		return fmt.Errorf("EWMA weight λ = %g: it must be in (0, 1]", lambda)
	}
	if !(l > 0) || math.IsInf(l, 0) {
		return fmt.Errorf("EWMA limit width L = %g: it must be a positive number", l)
	}
	return nil
}

// EWMA computes the exponentially weighted moving average chart of
// Roberts (1959): z₀ = centre, zᵢ = λ·xᵢ + (1−λ)·zᵢ₋₁, judged against the
// time-varying limits of Lucas and Saccucci (1990) (see Limits). sigma is
// the standard deviation of one plotted point (σ for readings, σ/√n for
// means of n). Usual settings: λ = 0.2, L = 3, or λ and L from
// EWMAARL for a wanted in-control run length.
func EWMA(x []float64, centre, sigma, lambda, l float64) (EWMAChart, error) {
	c := EWMAChart{Lambda: lambda, L: l, Centre: centre, Sigma: sigma, Z: make([]float64, len(x))}
	err, _ := EWMACUSUMScan(x, centre, sigma, lambda, l, 0, 0, func(i int, z float64, beyond bool) {
		c.Z[i] = z
		if beyond {
			c.Beyond = append(c.Beyond, i)
		}
	}, nil)
	if err != nil {
		return EWMAChart{}, err
	}
	return c, nil
}

// ctlNextAt is the next point to visit from at[k:] (every point when all;
// -1 when none is left) and its index in at.
func ctlNextAt(at []int, k int, all bool) (int, int) {
	if all {
		return 0, 0
	}
	if k < len(at) {
		return at[k], k
	}
	return -1, k
}

// ctlARLStates is the number of Markov chain states used for the average
// run lengths; the discretisation error falls as 1/states² (Brook and
// Evans 1972), and at this size the figures agree with the published
// tables to their digits (ewma_test.go, cusum_test.go).
const ctlARLStates = 301

// EWMAARL returns the average run length of an EWMA chart with weight λ
// and limits at ±L·sqrt(λ/(2−λ)) standard deviations (the steady-state
// limits) when the mean has shifted by shift standard deviations of one
// point (shift 0: the in-control run length), starting from z₀ = centre.
// It is the Markov chain approximation of Lucas and Saccucci (1990),
// after Brook and Evans (1972), with ctlARLStates states across the
// in-control region.
func EWMAARL(lambda, l, shift float64) (float64, error) {
	if err := ctlCheckLambdaL(lambda, l); err != nil {
		return 0, err
	}
	if math.IsNaN(shift) || math.IsInf(shift, 0) {
		return 0, fmt.Errorf("shift %g: it must be finite", shift)
	}
	m := ctlARLStates
	h := l * math.Sqrt(lambda/(2-lambda))
	w := 2 * h / float64(m)
	ctr := func(j int) float64 { return -h + (float64(j)+0.5)*w }
	a := make([]float64, m*m)
	for i := 0; i < m; i++ {
		base := (1 - lambda) * ctr(i)
		for j := 0; j < m; j++ {
			lo := (ctr(j)-w/2-base)/lambda - shift
			hi := (ctr(j)+w/2-base)/lambda - shift
			p := ctlPhiDiff(lo, hi)
			v := -p
			if i == j {
				v += 1
			}
			a[i*m+j] = v
		}
	}
	return ctlSolveARL(a, m, m/2)
}

// ctlSolveARL solves (I − R)·arl = 1 for the m×m matrix a (row-major,
// overwritten) and returns the run length from the start state. Gaussian
// elimination with partial pivoting (Golub and Van Loan 2013, §3.4),
// written here rather than taken from gonum/mat: this one solve was the
// only use of gonum's linear algebra, which made the page's engine 0.49 MB
// (6 %) larger to download and compile (TestSolveARL checks the solution
// by its residual).
func ctlSolveARL(a []float64, m, start int) (float64, error) {
	b := make([]float64, m)
	for i := range b {
		b[i] = 1
	}
	for k := 0; k < m; k++ {
		p := k
		for i := k + 1; i < m; i++ {
			if math.Abs(a[i*m+k]) > math.Abs(a[p*m+k]) {
				p = i
			}
		}
		if a[p*m+k] == 0 {
			return 0, fmt.Errorf("run length: the chain could not be solved (singular)")
		}
		if p != k {
			for j := k; j < m; j++ {
				a[k*m+j], a[p*m+j] = a[p*m+j], a[k*m+j]
			}
			b[k], b[p] = b[p], b[k]
		}
		piv := a[k*m+k]
		rowK := a[k*m+k+1 : k*m+m]
		for i := k + 1; i < m; i++ {
			f := a[i*m+k] / piv
			if f == 0 {
				continue
			}
			rowI := a[i*m+k+1 : i*m+m]
			for j, v := range rowK {
				rowI[j] -= f * v
			}
			b[i] -= f * b[k]
		}
	}
	for i := m - 1; i >= 0; i-- {
		s := b[i]
		for j := i + 1; j < m; j++ {
			s -= a[i*m+j] * b[j]
		}
		b[i] = s / a[i*m+i]
	}
	v := b[start]
	if !(v >= 1) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("run length %g: too long to compute for these settings", v)
	}
	return v, nil
}
