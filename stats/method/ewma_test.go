package method

import (
	"fmt"
	"math"
	"testing"
)

// EWMA averages and time-varying limits against the recursion written out
// in R 4.2.2 (testdata/rref/control.R), λ = 0.2, L = 3, centre and σ from
// the individuals chart.
func TestEWMAAgainstR(t *testing.T) {
	ref := ctlRef(t)
	for _, set := range []string{"ind", "ar", "ties", "small"} {
		m := ref[set]
		x := ctlSeries(t, m, "x")
		ind, _ := Individuals(x, IndividualsOptions{})
		c, err := EWMA(x, ind.Centre, ind.Sigma.Sigma, 0.2, 3)
		if err != nil {
			t.Fatal(err)
		}
		z := ctlSeries(t, m, "ewma")
		hw := ctlSeries(t, m, "ewmahw")
		for i := range x {
			ctlClose(t, fmt.Sprintf("%s z[%d]", set, i), c.Z[i], z[i], 1e-13)
			lo, hi := c.Limits(i)
			ctlClose(t, fmt.Sprintf("%s hw[%d]", set, i), (hi-lo)/2, hw[i], 1e-9)
			out := math.Abs(z[i]-ind.Centre) > hw[i]
			if got := containsInt(c.Beyond, i); got != out {
				t.Errorf("%s point %d beyond: %v, R says %v", set, i, got, out)
			}
		}
		slo, shi := c.SteadyLimits()
		lo, hi := c.Limits(1000)
		ctlClose(t, "steady", shi-slo, hi-lo, 1e-12)
	}
}

func containsInt(s []int, v int) bool {
	for _, x := range s {
		if x == v {
			return true
		}
	}
	return false
}

// EWMA run lengths: against Lucas and Saccucci (1990), Table 3 as
// reproduced in Montgomery (2009) Table 9.11 (values from memory, to the
// table's 3 significant figures), and against the same Markov chain solved
// in R 4.2.2.
func TestEWMAARL(t *testing.T) {
	table := []struct{ lambda, l, shift, arl float64 }{
		{0.1, 2.814, 0, 500}, {0.1, 2.814, 0.5, 31.3}, {0.1, 2.814, 1, 10.3}, {0.1, 2.814, 2, 4.4},
		{0.2, 2.962, 0, 500}, {0.2, 2.962, 0.5, 41.8}, {0.2, 2.962, 1, 10.5}, {0.2, 2.962, 2, 3.7},
		{0.05, 2.615, 0, 500}, {0.05, 2.615, 0.5, 28.8}, {0.05, 2.615, 1, 11.4}, {0.05, 2.615, 2, 5.2},
		{0.4, 3.054, 0, 500}, {0.4, 3.054, 0.5, 71.2}, {0.4, 3.054, 1, 14.3}, {0.4, 3.054, 2, 3.5},
	}
	ref := ctlRef(t)
	for _, r := range table {
		got, err := EWMAARL(r.lambda, r.l, r.shift)
		if err != nil {
			t.Fatal(err)
		}
		tol := 0.005 * r.arl // the table's 3 figures (500 is a design value: within 0.2 %)
		if r.arl < 10 {
			tol = 0.05
		}
		if math.Abs(got-r.arl) > tol {
			t.Errorf("EWMA λ=%g L=%g shift %g: ARL %.2f, table %g", r.lambda, r.l, r.shift, got, r.arl)
		}
		want := ref[fmt.Sprintf("ewma-%g-%g", r.lambda, r.l)][fmt.Sprintf("arl:%g", r.shift)]
		ctlClose(t, "EWMA ARL vs R", got, want, 1e-9)
	}
	for _, bad := range [][2]float64{{0, 3}, {1.5, 3}, {0.2, 0}, {0.2, math.Inf(1)}} {
		if _, err := EWMAARL(bad[0], bad[1], 0); err == nil {
			t.Errorf("%v: no error", bad)
		}
	}
	if _, err := EWMA([]float64{1}, 0, 1, math.NaN(), 3); err == nil {
		t.Error("NaN λ: no error")
	}
}

// TestSolveARL: the elimination solves (I − R)·x = 1 for chains built like
// the run-length ones and for a matrix that needs row exchanges; checked by
// the residual of the solution (by construction), to 1e-10 relative.
func TestSolveARL(t *testing.T) {
	for _, m := range []int{1, 2, 5, 40} {
		for _, swap := range []bool{false, true} {
			a := make([]float64, m*m)
			for i := range m {
				for j := range m {
					// a sub-stochastic chain: each row sums to 0.9
					a[i*m+j] = -0.9 / float64(m) * (1 + 0.5*math.Sin(float64(3*i+7*j)))
				}
				a[i*m+i] += 1
			}
			if swap && m > 1 {
				// a zero on the diagonal: pivoting must exchange rows
				// (the solution is unchanged: both rows keep b = 1)
				for j := range m {
					a[j], a[m+j] = a[m+j], a[j]
				}
				a[0] = 0
			}
			orig := append([]float64(nil), a...)
			x := make([]float64, m)
			for start := range m {
				a := append([]float64(nil), orig...)
				v, err := ctlSolveARL(a, m, start)
				if err != nil {
					t.Fatalf("m %d swap %v: %v", m, swap, err)
				}
				x[start] = v
			}
			for i := range m {
				r := -1.0
				for j := range m {
					r += orig[i*m+j] * x[j]
				}
				if math.Abs(r) > 1e-10 {
					t.Errorf("m %d swap %v: residual %g in row %d", m, swap, r, i)
				}
			}
		}
	}
	if _, err := ctlSolveARL([]float64{0, 0, 0, 0}, 2, 0); err == nil {
		t.Error("a singular chain was solved")
	}
}
