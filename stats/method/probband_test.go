package method

import (
	"bufio"
	"math"
	"math/rand/v2"
	"os"
	"slices"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats/internal/rref"
)

// probBandRow is one line of testdata/rref/probband.tsv.
type probBandRow struct {
	n, reps                 int
	level, eta, se, coverSE float64
}

// loadProbBand reads testdata/rref/probband.tsv (R 4.2.2,
// testdata/rref/probband.R: n, reps, level, eta, se, coverSE).
func loadProbBand(t *testing.T) []probBandRow {
	t.Helper()
	f, err := os.Open(rref.Path(t, "probband.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows []probBandRow
	sc := bufio.NewScanner(f)
	sc.Scan()
	for sc.Scan() {
		c := strings.Split(sc.Text(), "\t")
		if len(c) != 6 {
			t.Fatalf("bad line %q", sc.Text())
		}
		var r probBandRow
		var e [6]error
		r.n, e[0] = strconv.Atoi(c[0])
		r.reps, e[1] = strconv.Atoi(c[1])
		r.level, e[2] = strconv.ParseFloat(c[2], 64)
		r.eta, e[3] = strconv.ParseFloat(c[3], 64)
		r.se, e[4] = strconv.ParseFloat(c[4], 64)
		r.coverSE, e[5] = strconv.ParseFloat(c[5], 64)
		for _, err := range e {
			if err != nil {
				t.Fatalf("%q: %v", sc.Text(), err)
			}
		}
		rows = append(rows, r)
	}
	if len(rows) < 5*70 {
		t.Fatalf("probband.tsv holds %d rows, want every n from 3 to 30 and about 45 more at 5 levels", len(rows))
	}
	return rows
}

// The embedded table is the R script's output (testdata/rref/probband.tsv,
// R 4.2.2) value for value, and ProbBandLocalLevel gives it back at every
// tabled n and level.
func TestProbBandTableMatchesR(t *testing.T) {
	rows := loadProbBand(t)
	seen := 0
	for _, r := range rows {
		k := slices.Index(probBandN[:], r.n)
		j := slices.Index(probBandLevels[:], r.level)
		if k < 0 || j < 0 {
			t.Errorf("n %d level %v of the R output is not in the table", r.n, r.level)
			continue
		}
		seen++
		if probBandEta[k][j] != r.eta || probBandReps[k] != r.reps {
			t.Errorf("n %d level %v: table %v (%d samples), R %v (%d samples)", r.n, r.level, probBandEta[k][j], probBandReps[k], r.eta, r.reps)
		}
		eta, used, ok := ProbBandLocalLevel(r.n, r.level)
		if r.n > ProbBandTableMaxN {
			// the fitted rate: within 4 standard errors of the simulation
			if !ok || used != r.level || math.Abs(math.Log(eta/r.eta)) > 4*r.se/r.eta {
				t.Errorf("ProbBandLocalLevel(%d, %v) = %v; simulated %v ± %v", r.n, r.level, eta, r.eta, r.se)
			}
			continue
		}
		if !ok || used != r.level || math.Abs(eta-r.eta) > 1e-12*r.eta {
			t.Errorf("ProbBandLocalLevel(%d, %v) = %v, %v, %v; R table %v", r.n, r.level, eta, used, ok, r.eta)
		}
	}
	// the rate's c: as R fitted it (testdata/rref/probbandfit.R), and as
	// the weighted mean of log(η · log n · log log n) over the rows with
	// n >= 10,000 gives it here from the same R output
	raw, err := os.ReadFile(rref.Path(t, "probbandfit.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	fit := strings.Split(strings.TrimSpace(string(raw)), "\n")[1:]
	if len(fit) != len(probBandLevels) {
		t.Fatalf("probbandfit.tsv: %d levels", len(fit))
	}
	for j, l := range fit {
		c := strings.Split(l, "\t")
		lv, _ := strconv.ParseFloat(c[0], 64)
		cR, _ := strconv.ParseFloat(c[1], 64)
		if lv != probBandLevels[j] || probBandRateC[j] != cR || c[2] != strconv.Itoa(probBandFitFrom) || c[3] != strconv.Itoa(probBandFitJoin) {
			t.Errorf("level %v: c %v from %d join %d; R fit %q", probBandLevels[j], probBandRateC[j], probBandFitFrom, probBandFitJoin, l)
		}
		var sw, swy float64
		for _, r := range rows {
			if r.level == lv && r.n >= probBandFitFrom {
				w := (r.eta / r.se) * (r.eta / r.se)
				x := float64(r.n)
				sw += w
				swy += w * math.Log(r.eta*math.Log(x)*math.Log(math.Log(x)))
			}
		}
		if c := math.Exp(swy / sw); math.Abs(c-cR) > 1e-5*cR {
			t.Errorf("level %v: c from the rows %v, R fit %v", lv, c, cR)
		}
	}
	if seen != len(probBandN)*len(probBandLevels) {
		t.Errorf("R output covers %d of %d table cells", seen, len(probBandN)*len(probBandLevels))
	}
	for n := 3; n <= 30; n++ {
		if !slices.Contains(probBandN[:], n) {
			t.Errorf("n %d is not tabled", n)
		}
	}
}

// Between tabled n and levels the local level lies between its
// neighbours; a higher level gives a smaller η (a wider envelope) at every
// n, tabled, interpolated or extrapolated; out-of-range levels are clamped
// and say so; n < 3 and NaN are refused.
func TestProbBandLocalLevelShape(t *testing.T) {
	for _, n := range []int{3, 31, 50, 1000, 9999, 10_000, 20_000, 1_000_000, 100_000_000} {
		prev := math.Inf(1)
		for _, l := range []float64{0.5, 0.6, 0.8, 0.85, 0.9, 0.925, 0.95, 0.975, 0.99} {
			eta, used, ok := ProbBandLocalLevel(n, l)
			if !ok || used != l || !(eta > 0 && eta < prev && eta < 1) {
				t.Errorf("n %d level %v: eta %v used %v ok %v (previous %v)", n, l, eta, used, ok, prev)
			}
			prev = eta
		}
	}
	e50, _, _ := ProbBandLocalLevel(50, 0.95)
	e46, _, _ := ProbBandLocalLevel(46, 0.95)
	e53, _, _ := ProbBandLocalLevel(53, 0.95)
	if !(math.Min(e46, e53) <= e50 && e50 <= math.Max(e46, e53)) {
		t.Errorf("n 50: %v not between n 46 (%v) and n 53 (%v)", e50, e46, e53)
	}
	// beyond the table: continuous at the table's end and at the join
	// (neighbours within 1e-3), decreasing along the fitted curve
	at := func(n int, l float64) float64 { e, _, _ := ProbBandLocalLevel(n, l); return e }
	for _, l := range probBandLevels {
		for _, n := range []int{ProbBandTableMaxN, probBandFitJoin - 1, probBandFitJoin} {
			if a, b := at(n, l), at(n+1, l); math.Abs(a-b) > 1e-3*a {
				t.Errorf("level %v: eta %v at n %d, %v at n+1", l, a, n, b)
			}
		}
		if !(at(ProbBandTableMaxN, l) > at(probBandFitJoin, l) && at(probBandFitJoin, l) > at(100_000, l) &&
			at(100_000, l) > at(10_000_000, l) && at(10_000_000, l) > at(math.MaxInt32, l) && at(math.MaxInt32, l) > 0) {
			t.Errorf("level %v: eta does not decrease beyond the table", l)
		}
	}
	if eta, used, ok := ProbBandLocalLevel(100, 0.995); !ok || used != ProbBandLevelMax {
		t.Errorf("level 0.995: used %v (eta %v), want the highest tabled level", used, eta)
	}
	if eta, used, ok := ProbBandLocalLevel(100, 0.3); !ok || used != ProbBandLevelMin {
		t.Errorf("level 0.3: used %v (eta %v), want the lowest tabled level", used, eta)
	}
	for _, c := range []struct {
		n int
		l float64
	}{{2, 0.95}, {0, 0.95}, {-1, 0.95}, {100, math.NaN()}} {
		if _, _, ok := ProbBandLocalLevel(c.n, c.l); ok {
			t.Errorf("n %d level %v accepted", c.n, c.l)
		}
	}
}

// OrderStatBand against R 4.2.2 (testdata/rref/probbandq.R): n = 5 at
// pointwise 95 % and at η = 0.250853, and n up to 1e8 at η = 1e-4 with the
// extreme ranks, where a normal approximation of the Beta quantile fails.
func TestOrderStatBandLargeN(t *testing.T) {
	ref := rref.Load(t, "probbandq.tsv", 20)
	for set, v := range ref {
		p := strings.Split(set, "/")
		n, err1 := strconv.ParseFloat(p[0], 64)
		i, err2 := strconv.ParseFloat(p[1], 64)
		a, err3 := strconv.ParseFloat(p[2], 64)
		if err1 != nil || err2 != nil || err3 != nil {
			t.Fatalf("bad set %q", set)
		}
		lo, hi := OrderStatBand(int(i), int(n), 1-a)
		if !rref.Close(lo, v["zlo"], 1e-8, 1e-8) || !rref.Close(hi, v["zhi"], 1e-8, 1e-8) {
			t.Errorf("%s: %v %v, R %v %v", set, lo, hi, v["zlo"], v["zhi"])
		}
	}
}

// probBandCoverage simulates samples normal samples of size n (seeded),
// standardises each by its own mean and SD (divisor n-1) as the plot draws
// its line, and returns the fraction with every one of the n ordered
// values inside [zlo[i], zhi[i]].
func probBandCoverage(n, samples int, seed uint64, zlo, zhi []float64) float64 {
	rng := rand.New(rand.NewPCG(seed, uint64(n)))
	x := make([]float64, n)
	inside := 0
	for s := 0; s < samples; s++ {
		var sum float64
		for i := range x {
			x[i] = rng.NormFloat64()
			sum += x[i]
		}
		slices.Sort(x)
		m := sum / float64(n)
		var ss float64
		for _, v := range x {
			ss += (v - m) * (v - m)
		}
		sd := math.Sqrt(ss / float64(n-1))
		ok := true
		for i, v := range x {
			if z := (v - m) / sd; z < zlo[i] || z > zhi[i] {
				ok = false
				break
			}
		}
		if ok {
			inside++
		}
	}
	return float64(inside) / float64(samples)
}

// The envelope is simultaneous: the fraction of simulated normal samples
// (Go's PCG and NormFloat64, fixed seeds; an independent simulation from
// the R one behind the table) lying wholly inside it is the level, within
// 4 standard errors (the simulation's and the table's, binomial), at
// tabled n and levels, between tabled n and levels, and beyond the table
// on the fitted rate (n = 20,000, not in -short: 0.02 added, as the fit's
// own error is not known; measured 0.944 at 95 %).
//
// The old pointwise band at the same level fails the same check: with the
// mean and SD estimated it is too wide for small n (n = 20 at 95 %: about
// 98 % of samples wholly inside) and far too narrow for large n (n = 1000:
// about 61 %; n = 20000: about 31 %); where marked, its coverage is more
// than 0.03 from the level. Near n = 50-100 it happens to come close at
// 95-99 %, which is why it looked right on small examples.
func TestProbBandCoverage(t *testing.T) {
	for _, c := range []struct {
		n, samples int
		level      float64
		extra      float64 // tolerance added for interpolation or extrapolation
		long       bool
		oldOff     bool // the pointwise band misses the level by more than 0.03
	}{
		{20, 20000, 0.95, 0, false, true},
		{100, 5000, 0.95, 0, false, true},
		{1000, 2000, 0.95, 0, false, true},
		{100, 5000, 0.90, 0, false, true},
		{100, 5000, 0.99, 0, false, false},
		{12, 20000, 0.99, 0, false, false},
		{50, 5000, 0.95, 0.005, false, false},  // n between 46 and 53
		{200, 5000, 0.975, 0.005, false, true}, // level between 0.95 and 0.99
		{20000, 1000, 0.95, 0.02, true, true},  // the fitted rate
	} {
		if c.long && testing.Short() {
			continue
		}
		eta, used, ok := ProbBandLocalLevel(c.n, c.level)
		if !ok || used != c.level {
			t.Fatalf("n %d level %v: %v %v %v", c.n, c.level, eta, used, ok)
		}
		zlo, zhi := make([]float64, c.n), make([]float64, c.n)
		plo, phi := make([]float64, c.n), make([]float64, c.n)
		for i := range zlo {
			zlo[i], zhi[i] = OrderStatBand(i+1, c.n, 1-eta)
			plo[i], phi[i] = OrderStatBand(i+1, c.n, c.level)
		}
		cov := probBandCoverage(c.n, c.samples, 7, zlo, zhi)
		old := probBandCoverage(c.n, c.samples, 7, plo, phi)
		// the table's samples at the first tabled n >= n (the last beyond it)
		k, _ := slices.BinarySearch(probBandN[:], c.n)
		k = min(k, len(probBandN)-1)
		se := math.Sqrt(c.level * (1 - c.level) * (1/float64(c.samples) + 1/float64(probBandReps[k])))
		t.Logf("n %5d level %.3f eta %.5g: simultaneous coverage %.4f (±%.4f), pointwise band %.4f", c.n, c.level, eta, cov, se, old)
		if math.Abs(cov-c.level) > 4*se+c.extra {
			t.Errorf("n %d level %v: %.4f of normal samples lie wholly inside the envelope, want %v ± %.4f", c.n, c.level, cov, c.level, 4*se+c.extra)
		}
		if c.oldOff && math.Abs(old-c.level) <= 0.03 {
			t.Errorf("n %d level %v: the pointwise band covers %.4f of samples wholly: expected more than 0.03 away", c.n, c.level, old)
		}
	}
}
