package method

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

func fitByFamily(res FitResult, fam string) FitCandidate {
	for _, c := range res.Candidates {
		if c.Family == fam {
			return c
		}
	}
	return FitCandidate{}
}

func TestFitAgainstR(t *testing.T) {
	ref := capRef(t) // R 4.2.2: MASS fitdistr, optim on the written-out likelihoods, nortest ad.test
	data := capData(t)
	keys := map[string]string{FitNormal: "normal", FitLognormal: "lognormal", FitLognormal3: "lognormal3",
		FitWeibull: "weibull", FitWeibull3: "weibull3", FitGamma: "gamma", FitGamma3: "gamma3", FitBoxCox: "boxcox"}
	for _, set := range []string{"norm50", "lnorm200", "weib3", "gamma3", "lnorm3", "small5"} {
		r := ref[set]
		res := FitDistributions(data[set], 0.95)
		if res.N != len(data[set]) || len(res.Candidates) != 8 {
			t.Fatalf("%s: %d candidates", set, len(res.Candidates))
		}
		for fam, k := range keys {
			c := fitByFamily(res, fam)
			want, ok := r[k+"_ll"]
			if !ok {
				continue
			}
			name := set + " " + fam
			if !c.Valid {
				// R's optimum ran off to a threshold far below the data (the
				// 2-parameter or normal limit): the candidate is refused.
				if th, ok := r[k+"_threshold"]; ok && th < c.base-400*(data[set][len(data[set])-1]-c.base) && c.Reason == FitReasonNoThreshold {
					continue
				}
				t.Errorf("%s not valid (%s)", name, c.Reason)
				continue
			}
			capCheck(t, name+" loglik", c.LogLik, want, 1e-8)
			capCheck(t, name+" AIC", c.AIC, 2*float64(c.NParams)-2*want, 1e-8)
			if v, ok := r[k+"_ad"]; ok {
				capCheck(t, name+" A²", c.AD, v, 2e-5)
			}
			if v, ok := r[k+"_p"]; ok {
				if !c.HasPValue {
					t.Errorf("%s: no p-value", name)
				}
				capCheck(t, name+" p", c.ADPValue, v, 2e-5)
			}
			for _, p := range []struct {
				key string
				got float64
			}{{"_mu", c.Params.Mu}, {"_sigma", c.Params.Sigma}, {"_shape", c.Params.Shape}, {"_scale", c.Params.Scale},
				{"_threshold", c.Params.Threshold}, {"_lambda", c.Params.Lambda}} {
				if v, ok := r[k+p.key]; ok {
					capCheck(t, name+p.key, p.got, v, 5e-5) // R's optimisers stop at about 1e-6
				}
			}
			if v, ok := r[k+"_q00135"]; ok {
				capCheck(t, name+" q0.135%", c.Q00135, v, 1e-10)
			}
			if v, ok := r[k+"_q99865"]; ok {
				capCheck(t, name+" q99.865%", c.Q99865, v, 1e-5)
			}
		}
	}
}

func TestFitChooser(t *testing.T) {
	data := capData(t)
	// The normal set: normal adequate and within 2 AIC units.
	res := FitDistributions(data["norm50"], 0.95)
	if res.Chosen != 0 || res.Reason != FitReasonNormalAdequate {
		t.Errorf("norm50: chosen %d %s", res.Chosen, res.Reason)
	}
	// The 3-parameter lognormal set: the normal is refused (nortest p < 1e-20).
	res = FitDistributions(data["lnorm3"], 0.95)
	if res.Chosen <= 0 || res.Reason != FitReasonLowestAIC || !res.Candidates[res.Chosen].Adequate {
		t.Errorf("lnorm3: chosen %d %s", res.Chosen, res.Reason)
	}
	for i, c := range res.Candidates {
		if c.Valid && c.Adequate && c.AIC < res.Candidates[res.Chosen].AIC {
			t.Errorf("lnorm3: candidate %d has a lower AIC", i)
		}
	}
	// Two overlapping clusters: nothing adequate, empirical percentiles.
	x := make([]float64, 0, 2000)
	rng := rand.New(rand.NewPCG(7, 11))
	for i := 0; i < 1000; i++ {
		x = append(x, 10+0.1*rng.NormFloat64(), 11+0.1*rng.NormFloat64())
	}
	res = FitDistributions(x, 0.95)
	if res.Chosen != -1 || res.Reason != FitReasonNoAdequate {
		t.Errorf("bimodal: chosen %d %s", res.Chosen, res.Reason)
	}
	e := res.Empirical
	// n = 2000: Pr{no reading below the 0.135 % point} = 0.99865^2000 = 0.067
	// > 0.025, so no order statistic is a 95 % lower limit (binomial formula).
	if e.Q00135.HasLower || !e.Q00135.HasUpper || e.Q00135.Value > e.Q00135.Upper || !(e.Q00135.Achieved >= 0.95) {
		t.Errorf("bimodal empirical 0.135 %%: %+v", e.Q00135)
	}
	if !(e.Q50.HasLower && e.Q50.HasUpper && e.Q50.Lower <= e.Q50.Value && e.Q50.Value <= e.Q50.Upper) {
		t.Errorf("bimodal empirical median: %+v", e.Q50)
	}
}

func TestFitEmpiricalAgainstR(t *testing.T) {
	ref := capRef(t) // R 4.2.2 quantile(type = 7), qbinom, pbinom
	data := capData(t)
	for _, set := range []string{"lnorm200", "weib3"} {
		x := append([]float64(nil), data[set]...)
		res := FitDistributions(x, 0.95)
		sorted := append([]float64(nil), x...)
		fitSortForTest(sorted)
		for _, q := range []FitEmpirical{res.Empirical.Q00135, res.Empirical.Q50, res.Empirical.Q99865} {
			k := fmt.Sprintf("eq_%g", q.P)
			r := ref[set]
			capCheck(t, set+" "+k, q.Value, r[k], 1e-14)
			capCheck(t, set+" "+k+" achieved", q.Achieved, r[k+"_ach"], 1e-12)
			l, u := int(r[k+"_l"]), int(r[k+"_u"])
			if l >= 1 {
				if !q.HasLower || q.LowerRank != l || q.Lower != sorted[l-1] {
					t.Errorf("%s %s lower rank %d, want %d", set, k, q.LowerRank, l)
				}
			} else if q.HasLower {
				t.Errorf("%s %s: lower should be missing", set, k)
			}
			if u <= len(x) {
				if !q.HasUpper || q.UpperRank != u || q.Upper != sorted[u-1] {
					t.Errorf("%s %s upper rank %d, want %d", set, k, q.UpperRank, u)
				}
			} else if q.HasUpper {
				t.Errorf("%s %s: upper should be missing", set, k)
			}
		}
	}
}

func fitSortForTest(x []float64) {
	for i := 1; i < len(x); i++ {
		for j := i; j > 0 && x[j] < x[j-1]; j-- {
			x[j], x[j-1] = x[j-1], x[j]
		}
	}
}

// fitCheckFinite fails when a valid candidate holds a NaN or Inf.
func fitCheckFinite(t testing.TB, res FitResult) {
	t.Helper()
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	for _, c := range res.Candidates {
		if !c.Valid {
			continue
		}
		p := c.Params
		for _, v := range []float64{p.Threshold, p.Mu, p.Sigma, p.Shape, p.Scale, p.Lambda, c.LogLik, c.AIC, c.AD, c.ADPValue, c.Q00135, c.Q50, c.Q99865} {
			if bad(v) {
				t.Fatalf("%s: non-finite figure in %+v", c.Family, c)
			}
		}
		if !(c.Q00135 <= c.Q50 && c.Q50 <= c.Q99865) {
			t.Fatalf("%s: quantiles out of order %+v", c.Family, c)
		}
	}
	if res.Chosen >= 0 && !res.Candidates[res.Chosen].Valid {
		t.Fatalf("chosen candidate not valid")
	}
	e := res.Empirical
	for _, q := range []FitEmpirical{e.Q00135, e.Q50, e.Q99865} {
		if bad(q.Value) || bad(q.Lower) || bad(q.Upper) || bad(q.Achieved) {
			t.Fatalf("empirical non-finite %+v", q)
		}
	}
}

func TestFitEdgeCases(t *testing.T) {
	// Constant data: nothing fitted, no NaN.
	res := FitDistributions([]float64{5, 5, 5, 5, 5, 5, 5, 5, 5, 5, 5, 5}, 0.95)
	if res.Reason != FitReasonConstant || res.Chosen != -1 {
		t.Errorf("constant: %s", res.Reason)
	}
	for _, c := range res.Candidates {
		if c.Valid || (c.Reason != FitReasonConstant) {
			t.Errorf("constant: %s %v %s", c.Family, c.Valid, c.Reason)
		}
	}
	fitCheckFinite(t, res)
	if res.Empirical.Q50.Value != 5 {
		t.Errorf("constant median %v", res.Empirical.Q50.Value)
	}
	// n = 2.
	res = FitDistributions([]float64{1, 2}, 0.95)
	fitCheckFinite(t, res)
	if !res.Candidates[0].Valid || fitByFamily(res, FitWeibull3).Reason != FitReasonTooFew {
		t.Errorf("n=2: %+v", res.Candidates)
	}
	// Negative values: positive-only families skipped with their reason,
	// the threshold families still fitted.
	data := capData(t)["gamma3"]
	neg := make([]float64, len(data))
	for i, v := range data {
		neg[i] = v - 3
	}
	res = FitDistributions(neg, 0.95)
	fitCheckFinite(t, res)
	for _, f := range []string{FitLognormal, FitWeibull, FitGamma, FitBoxCox} {
		if c := fitByFamily(res, f); c.Valid || c.Reason != FitReasonNeedsPositive {
			t.Errorf("negative data %s: %v %s", f, c.Valid, c.Reason)
		}
	}
	// The threshold families are shift-equivariant: same log-likelihood.
	pos := FitDistributions(data, 0.95)
	for _, f := range []string{FitLognormal3, FitGamma3, FitWeibull3} {
		a, b := fitByFamily(pos, f), fitByFamily(res, f)
		if !a.Valid || !b.Valid || !capNear(a.LogLik, b.LogLik, 1e-6) || !capNear(a.Params.Threshold-3, b.Params.Threshold, 1e-6) {
			t.Errorf("shift %s: %v %v %v / %v", f, a.LogLik, b.LogLik, a.Params.Threshold, b.Params.Threshold)
		}
	}
	// Huge offset: 1e9 + the normal set; the normal fit and its A² as without the offset.
	base := capData(t)["norm50"]
	off := make([]float64, len(base))
	for i, v := range base {
		off[i] = 1e9 + v
	}
	r0 := FitDistributions(base, 0.95)
	r1 := FitDistributions(off, 0.95)
	fitCheckFinite(t, r1)
	n0, n1 := r0.Candidates[0], r1.Candidates[0]
	if !capNear(n0.Params.Sigma, n1.Params.Sigma, 1e-6) || !capNear(n0.AD, n1.AD, 1e-4) || r1.Chosen != 0 {
		t.Errorf("offset: sigma %v vs %v, AD %v vs %v, chosen %d", n0.Params.Sigma, n1.Params.Sigma, n0.AD, n1.AD, r1.Chosen)
	}
	// Non-finite input.
	if res := FitDistributions([]float64{1, math.NaN()}, 0.95); res.Reason != FitReasonNonFinite || len(res.Candidates) != 0 {
		t.Errorf("NaN: %s", res.Reason)
	}
	if res := FitDistributions(nil, 0.95); res.Reason != FitReasonTooFew {
		t.Errorf("empty: %s", res.Reason)
	}
	// Invalid candidate: methods answer without NaN.
	var c FitCandidate
	if q, ok := c.Quantile(0.5); ok || q != 0 || c.CDF(1) != 0 {
		t.Error("zero candidate")
	}
	if _, err := c.ExpectedOutside(0, 1); err == nil {
		t.Error("zero candidate ExpectedOutside: no error")
	}
}

// TestFitThinning: above fitThinTo distinct values the threshold search runs
// on grouped data; the result must stay close to the search on all values.
func TestFitThinning(t *testing.T) {
	if testing.Short() {
		t.Skip("slow")
	}
	rng := rand.New(rand.NewPCG(3, 5))
	x := make([]float64, 20000)
	for i := range x {
		x[i] = 20 + math.Exp(0.5+0.5*rng.NormFloat64())
	}
	thin := FitDistributions(x, 0.95)
	old := fitThinTo
	fitThinTo = 1 << 30
	full := FitDistributions(x, 0.95)
	fitThinTo = old
	for _, f := range []string{FitLognormal3, FitWeibull3, FitGamma3, FitBoxCox} {
		a, b := fitByFamily(thin, f), fitByFamily(full, f)
		if a.Valid != b.Valid || (a.Valid && math.Abs(a.LogLik-b.LogLik) > 0.05) {
			t.Errorf("%s: thinned %v %.4f, full %v %.4f", f, a.Valid, a.LogLik, b.Valid, b.LogLik)
		}
	}
}

func FuzzFitDistributions(f *testing.F) {
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}, 1.0, 0.0)
	f.Add([]byte{0, 0, 0, 0}, 1e9, 1.0)
	f.Add([]byte{200, 1, 1, 1, 1, 1, 1, 1, 1, 1, 1, 2}, 1e-9, -5.0)
	f.Fuzz(func(t *testing.T, b []byte, scale, shift float64) {
		if len(b) > 400 || math.IsNaN(scale) || math.IsInf(scale, 0) || math.IsNaN(shift) || math.IsInf(shift, 0) ||
			math.Abs(scale) > 1e100 || math.Abs(shift) > 1e100 {
			return
		}
		x := make([]float64, len(b))
		for i, v := range b {
			x[i] = shift + scale*float64(v)*float64(v)
		}
		res := FitDistributions(x, 0.95)
		fitCheckFinite(t, res)
	})
}

// Speed: the fits on 1,000,000 readings against a plain sum over the same
// data in the same run (ratio = Fit ns/op ÷ Sum ns/op).
func fitBenchData(distinct bool) []float64 {
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 1_000_000)
	for i := range x {
		v := 20 + math.Exp(0.5+0.4*rng.NormFloat64())
		if !distinct {
			v = math.Round(v*1000) / 1000 // typed with 3 decimals
		}
		x[i] = v
	}
	return x
}

func BenchmarkFitSumBaseline1M(b *testing.B) {
	x := fitBenchData(true)
	b.ResetTimer()
	var s float64
	for i := 0; i < b.N; i++ {
		for _, v := range x {
			s += v
		}
	}
	if s == 1 {
		b.Log(s)
	}
}

func BenchmarkFit1M3Decimals(b *testing.B) {
	x := fitBenchData(false)
	fitSortForBench(x)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		FitDistributions(x, 0.95)
	}
}

func BenchmarkFit1MDistinct(b *testing.B) {
	x := fitBenchData(true)
	fitSortForBench(x)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		FitDistributions(x, 0.95)
	}
}
