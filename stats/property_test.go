package stats

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/decimal"
)

// genDecimal makes n fixed-point values with d decimals as mantissas and text.
func genDecimal(r *rand.Rand, n, d int, centre, spread float64) []int64 {
	ms := make([]int64, n)
	p := math.Pow(10, float64(d))
	for i := range ms {
		x := centre + spread*r.NormFloat64()
		if r.IntN(10) == 0 {
			x += spread * 4 * r.ExpFloat64() // a skewed tail now and then
		}
		ms[i] = int64(math.Round(x * p))
	}
	return ms
}

// decText writes mantissa m with d decimals exactly ("-12.340").
func decText(m int64, d int) string {
	neg := m < 0
	if neg {
		m = -m
	}
	s := strconv.FormatInt(m, 10)
	if d > 0 {
		for len(s) <= d {
			s = "0" + s
		}
		s = s[:len(s)-d] + "." + s[len(s)-d:]
	}
	if neg {
		s = "-" + s
	}
	return s
}

func textOf(ms []int64, d int) string {
	var b strings.Builder
	for _, m := range ms {
		b.WriteString(decText(m, d))
		b.WriteByte('\n')
	}
	return b.String()
}

func mustAnalyze(t *testing.T, text string) *Report {
	t.Helper()
	rep, err := Analyze(Request{Text: text})
	if err != nil {
		t.Fatal(err)
	}
	checkClean(t, rep)
	return rep
}

func near(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// TestShiftEquivariance: adding a constant c to every value (exactly, in
// the decimal text) adds c to every location figure and leaves the SD,
// variance, IQR and MAD unchanged; on the exact path SD and variance are
// unchanged bit for bit (they are the correctly rounded values of the same
// rational number).
func TestShiftEquivariance(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 20; trial++ {
		n := 3 + r.IntN(400)
		d := r.IntN(5)
		ms := genDecimal(r, n, d, 50*r.Float64(), 0.1+5*r.Float64())
		c := int64(r.IntN(2000000) - 1000000)
		shifted := make([]int64, n)
		pd := int64(math.Pow(10, float64(d)))
		for i, m := range ms {
			shifted[i] = m + c*pd
		}
		a := mustAnalyze(t, textOf(ms, d))
		b := mustAnalyze(t, textOf(shifted, d))
		cf := float64(c)
		if *a.Spread.Variance != *b.Spread.Variance || a.Spread.SD != b.Spread.SD {
			t.Errorf("trial %d: SD %v vs %v after shift by %d", trial, a.Spread.SD, b.Spread.SD, c)
		}
		tol := 1e-15 * math.Abs(cf) / math.Max(1, math.Abs(a.Centre.Mean)) * 4
		for _, p := range [][2]float64{
			{a.Centre.Mean + cf, b.Centre.Mean},
			{a.Centre.Median + cf, b.Centre.Median},
			{a.Centre.Trimmed10 + cf, b.Centre.Trimmed10},
			{a.Quantile.Q1 + cf, b.Quantile.Q1},
			{a.Quantile.Q3 + cf, b.Quantile.Q3},
		} {
			if !near(p[0], p[1], math.Max(tol, 1e-14)) {
				t.Errorf("trial %d: %v + %d = %v, shifted data give %v", trial, p[0]-cf, c, p[0], p[1])
			}
		}
		if !near(a.Spread.IQR, b.Spread.IQR, 1e-9) || !near(a.Spread.MAD, b.Spread.MAD, 1e-9) {
			t.Errorf("trial %d: IQR/MAD %v %v vs %v %v", trial, a.Spread.IQR, a.Spread.MAD, b.Spread.IQR, b.Spread.MAD)
		}
		if a.Counts.Distinct != b.Counts.Distinct || a.Counts.Step != b.Counts.Step {
			t.Errorf("trial %d: counts %+v vs %+v", trial, a.Counts, b.Counts)
		}
	}
}

// TestScaleEquivariance: multiplying by 10^k (moving the decimal point in
// the text) scales location and spread by 10^k; negating the values negates
// the location figures, swaps Q1 and Q3 (type 7 is symmetric) and keeps the
// SD bit for bit.
func TestScaleEquivariance(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for trial := 0; trial < 20; trial++ {
		n := 3 + r.IntN(300)
		d := 1 + r.IntN(4)
		ms := genDecimal(r, n, d, 20*r.Float64()-10, 0.5+r.Float64())
		a := mustAnalyze(t, textOf(ms, d))
		b := mustAnalyze(t, textOf(ms, d-1)) // x10
		for _, p := range [][2]float64{
			{10 * a.Centre.Mean, b.Centre.Mean}, {10 * a.Spread.SD, b.Spread.SD},
			{10 * a.Centre.Median, b.Centre.Median}, {10 * a.Spread.IQR, b.Spread.IQR},
			{10 * a.Spread.MAD, b.Spread.MAD}, {10 * a.Quantile.Q1, b.Quantile.Q1},
			{10 * a.Centre.MeanCI.Lo, b.Centre.MeanCI.Lo}, {10 * a.Spread.SDCI.Hi, b.Spread.SDCI.Hi},
		} {
			if !near(p[0], p[1], 1e-13) {
				t.Errorf("trial %d: x10: %v vs %v", trial, p[0], p[1])
			}
		}
		neg := make([]int64, n)
		for i, m := range ms {
			neg[i] = -m
		}
		c := mustAnalyze(t, textOf(neg, d))
		if c.Centre.Mean != -a.Centre.Mean || c.Spread.SD != a.Spread.SD || c.Centre.Median != -a.Centre.Median {
			t.Errorf("trial %d: negation: mean %v/%v sd %v/%v", trial, c.Centre.Mean, a.Centre.Mean, c.Spread.SD, a.Spread.SD)
		}
		if !near(c.Quantile.Q1, -a.Quantile.Q3, 1e-14) || !near(c.Quantile.Q3, -a.Quantile.Q1, 1e-14) {
			t.Errorf("trial %d: negation quartiles %v %v vs %v %v", trial, c.Quantile.Q1, c.Quantile.Q3, a.Quantile.Q1, a.Quantile.Q3)
		}
	}
}

// TestPermutationInvariance: the order of the readings changes nothing but
// the data-order series (and the fingerprint).
func TestPermutationInvariance(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 15; trial++ {
		n := 3 + r.IntN(5000)
		d := r.IntN(4)
		ms := genDecimal(r, n, d, 100, 2)
		a := mustAnalyze(t, textOf(ms, d))
		r.Shuffle(len(ms), func(i, j int) { ms[i], ms[j] = ms[j], ms[i] })
		b := mustAnalyze(t, textOf(ms, d))
		for _, pair := range [][2]any{
			{a.Centre, b.Centre}, {a.Spread, b.Spread}, {a.Quantile.Percentiles, b.Quantile.Percentiles},
			{a.Quantile.All, b.Quantile.All}, {a.Counts, b.Counts}, {a.Verdict.Quote, b.Verdict.Quote},
			{a.Charts.Histogram, b.Charts.Histogram}, {a.Charts.Box, b.Charts.Box}, {a.Shape, b.Shape},
		} {
			ja, _ := json.Marshal(pair[0])
			jb, _ := json.Marshal(pair[1])
			if string(ja) != string(jb) {
				t.Errorf("trial %d (n=%d): after shuffling\n%s\n%s", trial, n, ja, jb)
			}
		}
	}
}

// TestRadixSort compares the radix sort with the standard library's sort
// on awkward keys (signs, zeros of both signs, subnormals, huge values).
func TestRadixSort(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for _, n := range []int{256, 300, 5000, 100000, 1000000} {
		xs := make([]float64, n)
		for i := range xs {
			switch r.IntN(6) {
			case 0:
				xs[i] = r.NormFloat64() * 1e300
			case 1:
				xs[i] = r.NormFloat64() * 1e-310
			case 2:
				xs[i] = math.Copysign(0, r.NormFloat64())
			default:
				xs[i] = 1000 + r.NormFloat64()
			}
		}
		want := append([]float64(nil), xs...)
		sortStd(want)
		got := decimal.SortFloats(xs)
		for i := range got {
			if got[i] != want[i] || math.Signbit(got[i]) != math.Signbit(want[i]) && got[i] != 0 {
				t.Fatalf("n=%d: index %d: %v, want %v", n, i, got[i], want[i])
			}
		}
	}
}

// TestCountSortFixed: the counting sort of fixed-point decimals gives the
// same values, bit for bit, as the radix sort, and declines (leaving the
// data untouched) for -0, values off the decimal grid and wide ranges.
func TestCountSortFixed(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 10))
	for _, c := range []struct {
		n, d, D      int
		centre, step float64
		want         bool
	}{
		{5000, 2, 2, 500, 0.01, true},        // fill weights to 0.01
		{100000, 3, 3, -0.2, 0.001, true},    // signs mixed around 0
		{50000, 1, 2, 12.5, 0.1, true},       // typed to 0.1 on a grid of 0.01
		{200000, 0, 0, 1e12, 1, true},        // large whole numbers
		{1000, 6, 6, 0.5, 1e-6, false},       // range wider than n/8 steps
		{100, 2, 2, 500, 0.01, false},        // too few values to pay
		{300000, 22, 22, 1e-19, 1e-22, true}, // the finest grid handled
	} {
		xs := make([]float64, c.n)
		for i := range xs {
			m := math.Round(r.NormFloat64() * 30)
			if c.d == 6 {
				m = math.Round(r.NormFloat64() * 1e5)
			}
			xs[i], _ = strconv.ParseFloat(strconv.FormatFloat(c.centre+m*c.step, 'f', c.d, 64), 64)
		}
		want := append([]float64(nil), xs...)
		decimal.SortFloats(want)
		got := append([]float64(nil), xs...)
		if ok := gridOf(c.D).CountSort(got); ok != c.want {
			t.Fatalf("%+v: applies %v, want %v", c, ok, c.want)
		} else if !ok {
			got = decimal.SortFloats(got)
		}
		for i := range got {
			if math.Float64bits(got[i]) != math.Float64bits(want[i]) {
				t.Fatalf("%+v: index %d: %v, want %v", c, i, got[i], want[i])
			}
		}
	}
	// declined: the data are left as they were
	for _, xs := range [][]float64{
		append(make([]float64, 300), math.Copysign(0, -1)), // -0 would come back as +0
		append(make([]float64, 300), 0.125),                // three decimals on a grid of two
	} {
		before := append([]float64(nil), xs...)
		if gridOf(2).CountSort(xs) {
			t.Fatalf("counting sort applied to %v", xs[len(xs)-1])
		}
		for i := range xs {
			if math.Float64bits(xs[i]) != math.Float64bits(before[i]) {
				t.Fatalf("declined but changed index %d", i)
			}
		}
	}
}

func gridOf(d int) decimal.Grid {
	g, _ := decimal.NewGrid(d)
	return g
}
