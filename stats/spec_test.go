package stats

import (
	"math"
	"strings"
	"testing"
)

// TestSpecExactAtLimits: readings typed exactly on a limit are inside
// ("5.25" and "5.250" against USL 5.25; "4.85" against LSL 4.85); one step
// beyond is outside. Check values: counted by hand from the data below.
func TestSpecExactAtLimits(t *testing.T) {
	data := "4.85\n4.84\n5.250\n5.25\n5.26\n5.00\n5.05\n4.95\n5.10\n5.02\n4.98\n5.01\n"
	lsl, usl := 4.85, 5.25
	rep, err := Analyze(Request{Text: data, Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	o := rep.Spec.Observed
	if o.Below.Count != 1 || o.Above.Count != 1 || o.Total.Count != 2 || o.N != 12 {
		t.Fatalf("observed %+v, want 1 below (4.84), 1 above (5.26) of 12", o)
	}
	if rep.Spec.Tolerance == nil || *rep.Spec.Tolerance != 0.4 {
		t.Errorf("tolerance %v, want exactly 0.4 (5.25 − 4.85 on the decimals)", rep.Spec.Tolerance)
	}
	// 1 of 12: 83,333.3 ppm
	if math.Abs(o.Below.PPM-1e6/12) > 1e-6 {
		t.Errorf("ppm %v", o.Below.PPM)
	}
}

// TestSpecIndicesFromMovingRange: Cp and Cpk use the average moving range
// / d2(2), d2(2) = 2/√π (Tippett 1925: the mean range of two standard
// normals); Pp and Ppk the sample SD. The figures are computed here by
// their formulas (Kane 1986) from the data as typed, in the order of the
// order column.
func TestSpecIndicesFromMovingRange(t *testing.T) {
	text := "Seq\tWeight\n2\t5.04\n1\t5.00\n3\t5.10\n4\t4.98\n5\t5.06\n6\t5.01\n7\t5.09\n8\t5.03\n9\t4.97\n10\t5.05\n"
	inOrder := []float64{5.00, 5.04, 5.10, 4.98, 5.06, 5.01, 5.09, 5.03, 4.97, 5.05}
	lsl, usl, target := 4.80, 5.30, 5.05
	rep, err := Analyze(Request{Text: text, Value: "Weight", Order: "Seq", Options: Options{LSL: &lsl, USL: &usl, Target: &target}})
	if err != nil {
		t.Fatal(err)
	}
	mr := 0.0
	for i := 1; i < len(inOrder); i++ {
		mr += math.Abs(inOrder[i] - inOrder[i-1])
	}
	mr /= float64(len(inOrder) - 1)
	sigW := mr / (2 / math.Sqrt(math.Pi))
	mean, ss := 0.0, 0.0
	for _, x := range inOrder {
		mean += x
	}
	mean /= 10
	for _, x := range inOrder {
		ss += (x - mean) * (x - mean)
	}
	sd := math.Sqrt(ss / 9)
	want := map[string]float64{
		"Cp": (usl - lsl) / (6 * sigW), "Cpk": math.Min(mean-lsl, usl-mean) / (3 * sigW),
		"Pp": (usl - lsl) / (6 * sd), "Ppk": math.Min(mean-lsl, usl-mean) / (3 * sd),
		"Cpm": (usl - lsl) / (6 * math.Sqrt(sd*sd+(mean-target)*(mean-target))),
	}
	sp := rep.Spec
	if sp.Sigma.Within == nil || math.Abs(sp.Sigma.Within.Value-sigW) > 1e-12 {
		t.Fatalf("within sigma %+v, want %g (moving range in Seq order)", sp.Sigma.Within, sigW)
	}
	for name, w := range want {
		basis := "overall"
		if name == "Cp" || name == "Cpk" {
			basis = "within"
		}
		ix := sp.index(name, basis)
		if ix == nil || math.Abs(ix.Value-w) > 1e-12*w {
			t.Errorf("%s = %+v, want %g", name, ix, w)
			continue
		}
		if ix.CI == nil || ix.LowerBound == nil || !(ix.CI.Lo < ix.Value && ix.Value < ix.CI.Hi && *ix.LowerBound > ix.CI.Lo && *ix.LowerBound < ix.Value) {
			t.Errorf("%s interval %+v bound %v: want lo < bound < value < hi", name, ix.CI, ix.LowerBound)
		}
	}
	if !strings.Contains(sp.Statement, "Cpk ") || !strings.Contains(sp.Statement, "lower 95% bound") {
		t.Errorf("statement %q", sp.Statement)
	}
	codes := map[string]bool{}
	for _, c := range sp.Cautions {
		codes[c.Code] = true
	}
	if !codes["few-readings"] || !codes["safety"] {
		t.Errorf("cautions %v: want few-readings (10 < 30) and safety", codes)
	}
}

// TestSpecOneSided: with only a USL there is no Cp, no tolerance, no
// "below" count; CPU and Cpk agree (Kane 1986).
func TestSpecOneSided(t *testing.T) {
	usl := 5.2
	rep, err := Analyze(Request{Text: "5.01\n5.03\n4.98\n5.05\n5.00\n5.02\n4.99\n5.04\n5.01\n5.21\n", Options: Options{USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	sp := rep.Spec
	if sp.Sides != "upper" || sp.Tolerance != nil || sp.Observed.Below != nil || sp.Observed.Above.Count != 1 {
		t.Fatalf("one-sided spec: %+v", sp.Observed)
	}
	if sp.index("Cp", "within") != nil || sp.index("Cpk", "within") == nil || sp.index("Cpk", "within").Value != sp.index("CPU", "within").Value {
		t.Errorf("indices %+v", sp.Indices)
	}
	for _, e := range sp.Expected {
		if e.Below != nil || e.Above == nil {
			t.Errorf("expected %+v: only the upper side", e)
		}
	}
}

// TestSpecSubgroupsPooled: with a subgroup column the within sigma is the
// pooled SD / c4(ν+1), ν = Σ(nᵢ−1) (ASTM E2587); c4 by its closed form
// √(2/(m−1))·Γ(m/2)/Γ((m−1)/2).
func TestSpecSubgroupsPooled(t *testing.T) {
	text := "Lot\tX\nA\t10.1\nA\t10.3\nA\t10.2\nB\t10.6\nB\t10.4\nB\t10.5\nC\t10.0\nC\t10.2\nC\t10.1\n"
	lsl, usl := 9.5, 11.0
	rep, err := Analyze(Request{Text: text, Value: "X", Subgroup: "Lot", Options: Options{LSL: &lsl, USL: &usl}})
	if err != nil {
		t.Fatal(err)
	}
	// each subgroup has SD 0.1 exactly: pooled 0.1, ν = 6
	m := 7.0
	lg1, _ := math.Lgamma(m / 2)
	lg2, _ := math.Lgamma((m - 1) / 2)
	c4 := math.Sqrt(2/(m-1)) * math.Exp(lg1-lg2)
	w := rep.Spec.Sigma.Within
	if w == nil || w.Method != WithinPooledSD || math.Abs(w.Value-0.1/c4) > 1e-12 || w.DF != 6 {
		t.Fatalf("within %+v, want pooled-sd %g with 6 df", w, 0.1/c4)
	}
}

// TestThinSorted: evenly spaced order statistics, ascending, from the
// middle of each of m equal slices (by the formula in thinSorted).
func TestThinSorted(t *testing.T) {
	x := make([]float64, 1000)
	for i := range x {
		x[i] = float64(i)
	}
	got := thinSorted(x, 10)
	for i, v := range got {
		if want := float64(50 + 100*i); v != want {
			t.Fatalf("thinSorted[%d] = %g, want %g", i, v, want)
		}
	}
	if len(thinSorted(x[:5], 10)) != 5 {
		t.Error("short input should come back whole")
	}
}
