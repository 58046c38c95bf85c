package stats

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"lotlens/stats/decimal"
	"lotlens/stats/internal/rref"
)

// Below the validity limits the tests are left out with a Note; constant
// data give no shape section.
func TestShapeLimits(t *testing.T) {
	x := []float64{1, 2, 4, 7, 11}
	m, sd := meanSDOf(x)
	sh, notes := shapeSection(words{}, x, m, sd, nil)
	if sh == nil || sh.Skewness == nil || sh.Kurtosis == nil || sh.Shapiro == nil {
		t.Fatalf("n = 5: %+v", sh)
	}
	if sh.Skewness.Test != nil || sh.Kurtosis.Test != nil || sh.Omnibus != nil || sh.Anderson != nil {
		t.Errorf("tests outside their range: %+v", sh)
	}
	if len(notes) < 4 {
		t.Errorf("notes: %+v", notes)
	}
	if sh, notes := shapeSection(words{}, []float64{3, 3, 3, 3}, 3, 0, nil); sh != nil || len(notes) == 0 {
		t.Errorf("constant: %+v %+v", sh, notes)
	}
	if sh, notes := shapeSection(words{}, []float64{1, 2}, 1.5, math.Sqrt(0.5), nil); sh != nil || len(notes) == 0 {
		t.Errorf("n = 2: %+v %+v", sh, notes)
	}
}

// Every method's output is finite and JSON-encodable for awkward data:
// extreme magnitudes, ties, a single outlier, two values (property).
func TestMethodsFinite(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	sets := [][]float64{
		{1e300, -1e300, 0, 1e299, 5e299},
		{1e-300, 2e-300, 3e-300, 4e-300, 1e-299, 2e-300, 2e-300, 3e-300},
		{-5, -5, -5, -4, -5, -5, -5, -5, -5, 100},
		{0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1},
		{7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 7, 8},
		{1, 2, 3},
	}
	for range 200 {
		n := 3 + rng.IntN(60)
		x := make([]float64, n)
		scale := math.Pow(10, float64(rng.IntN(600)-300))
		for i := range x {
			switch rng.IntN(3) {
			case 0:
				x[i] = math.Round(rng.NormFloat64()*3) * scale
			case 1:
				x[i] = rng.ExpFloat64() * scale
			default:
				x[i] = float64(rng.IntN(3)) * scale
			}
		}
		sets = append(sets, x)
	}
	for _, x := range sets {
		slices.Sort(x)
		m, sd := meanSDOf(x)
		if !finite(m) || !finite(sd) {
			continue // the core rejects such data before the methods run
		}
		sh, notes := shapeSection(words{}, x, m, sd, nil)
		smp := binarySample(x)
		med := smp.median.f
		rules, flags, _, _ := outlierRules(words{}, smp, 0.05, len(x))
		tg := targetSection(words{}, x, m, sd, med+sd/3, 0.95, decimal.Grid{})
		pp := probPlot(x, m, sd, 0.95, 50)
		out := map[string]any{"shape": sh, "notes": notes, "rules": rules, "flags": flags, "target": tg, "pp": pp}
		if _, err := json.Marshal(out); err != nil {
			t.Fatalf("%v: %v", x, err)
		}
		if sd > 0 && (tg == nil || tg.T == nil) {
			t.Errorf("%v: no t test", x)
		}
	}
}

// An independent implementation of the D'Agostino tests: SciPy 1.10.1
// scipy.stats.skewtest, kurtosistest and normaltest on three invented sets
// (the R reference script writes the same formulas out by hand).
func TestDAgostinoSciPy(t *testing.T) {
	for _, c := range []struct {
		set            string
		zs, zk, k2, p2 float64
	}{
		{"02-fill-normal-n250.txt", -0.29791255903944963, 0.3282665055983773, 0.19651079153120302, 0.9064173790294905},
		{"04-seal-rightskew-n120.txt", 6.7638204922326155, 5.271654640685278, 73.53961030180449, 1.0741786650028262e-16},
		{"18-n1000-normal.txt", 0.8069148114125325, -1.1190643734419752, 1.9034165847840034, 0.38608092069125255},
	} {
		x, m, sd := rref.Set(t, c.set)
		sh, _ := shapeSection(words{}, x, m, sd, nil)
		got := []float64{sh.Skewness.Test.Statistic, sh.Kurtosis.Test.Statistic, sh.Omnibus.Statistic, sh.Omnibus.P}
		want := []float64{c.zs, c.zk, c.k2, c.p2}
		for i := range got {
			if !rref.Close(got[i], want[i], 1e-9, 1e-15) {
				t.Errorf("%s: %d: %.15g, SciPy 1.10.1 gives %.15g", c.set, i, got[i], want[i])
			}
		}
	}
}
