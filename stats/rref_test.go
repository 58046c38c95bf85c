package stats

import (
	"fmt"
	"lotlens/stats/internal/rref"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// Reference values for the invented sets in testdata/sets come from
// R 4.2.2 (Debian r-base-core) by testdata/rref/core.R; the output is
// committed as testdata/rref/core.tsv.

func loadRef(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	return rref.Load(t, "core.tsv", 20)
}

func analyzeFile(t *testing.T, path string, o Options) *Report {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rep, err := Analyze(Request{Text: string(b), Options: o})
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return rep
}

// relErr is |got-want|/|want| (absolute when want is 0).
func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

func TestAgainstR(t *testing.T) {
	ref := loadRef(t)
	sets := make([]string, 0, len(ref))
	for s := range ref {
		sets = append(sets, s)
	}
	sort.Strings(sets)
	for _, set := range sets {
		r := ref[set]
		t.Run(set, func(t *testing.T) {
			rep := analyzeFile(t, filepath.Join("../testdata/sets", set), Options{})
			chk := func(name string, got float64, tol float64) {
				t.Helper()
				want, ok := r[name]
				if !ok {
					t.Fatalf("no R value %s", name)
				}
				if e := relErr(got, want); !(e <= tol) {
					t.Errorf("%s = %.17g, R 4.2.2 gives %.17g (rel. error %.2g > %.0g)", name, got, want, e, tol)
				}
			}
			// R computes order statistics and their interpolation in binary;
			// ours are the exact decimals as typed, rounded once (checked bit
			// for bit in TestExactFigures against Python fractions). They
			// agree within a few units of the last place of the data's
			// magnitude.
			scale := math.Max(math.Abs(rep.Quantile.Min), math.Abs(rep.Quantile.Max))
			chkQ := func(name string, got float64) {
				t.Helper()
				want, ok := r[name]
				if !ok {
					t.Fatalf("no R value %s", name)
				}
				if d := math.Abs(got - want); !(d <= 8*2.220446049250313e-16*scale) {
					t.Errorf("%s = %.17g, R 4.2.2 gives %.17g (difference %.2g, beyond 8 ulp of %.3g)", name, got, want, d, scale)
				}
			}
			// R 4.2.2: length, mean, sd, var, median, mean(trim=0.1), mad, min, max
			chk("n", float64(rep.Counts.Used), 0)
			// R computes in binary floating point: agreement to 1e-10 (set 12,
			// a large offset, costs R about 11 significant digits); the exact
			// values are checked bit for bit in TestExactMoments.
			chk("mean", rep.Centre.Mean, 1e-14)
			chk("sd", rep.Spread.SD, 1e-10)
			chk("var", *rep.Spread.Variance, 1e-10)
			chkQ("median", rep.Centre.Median)
			chk("trim10", rep.Centre.Trimmed10, 1e-14)
			chkQ("mad", rep.Spread.MAD)
			chk("min", rep.Quantile.Min, 0)
			chk("max", rep.Quantile.Max, 0)
			chk("distinct", float64(rep.Counts.Distinct), 0)
			mc := 1
			if len(rep.Centre.Modes) > 0 {
				mc = rep.Centre.Modes[0].Count
			}
			chk("maxcount", float64(mc), 0)
			chk("sem", rep.Spread.SEM, 1e-10)
			// R 4.2.2 t.test(x)$conf.int, and the chi-square SD interval by formula with qchisq
			chk("tci_lo", rep.Centre.MeanCI.Lo, 1e-10)
			chk("tci_hi", rep.Centre.MeanCI.Hi, 1e-10)
			chk("sdci_lo", rep.Spread.SDCI.Lo, 1e-9)
			chk("sdci_hi", rep.Spread.SDCI.Hi, 1e-9)
			// R 4.2.2 order statistics and pbinom, by formula (core.R)
			if _, ok := r["medci_lo"]; ok {
				chk("medci_lo", rep.Centre.MedianCIExact.Lo, 0)
				chk("medci_hi", rep.Centre.MedianCIExact.Hi, 0)
				chk("medci_level", rep.Centre.MedianCIExact.Level, 1e-12)
			} else if rep.Centre.MedianCI != nil && rep.Centre.MedianCI.Level >= 0.95 {
				t.Errorf("median CI claims level %v where R finds no 95%% order-statistic interval", rep.Centre.MedianCI.Level)
			}
			// R 4.2.2 fivenum(x)[2], [4]: Tukey's hinges
			for _, q := range rep.Quantile.All {
				if q.Method == "tukey" {
					chkQ("hinge_lo", q.Q1)
					chkQ("hinge_hi", q.Q3)
				}
			}
			// R 4.2.2 quantile(x, type = 1..9): every definition, all percentiles
			for ty := 1; ty <= 9; ty++ {
				m := fmt.Sprintf("hf%d", ty)
				rq := analyzeFile(t, filepath.Join("../testdata/sets", set), Options{Quantile: m, Confidence: 0.90})
				q := rq.Quantile
				if q.Method != m {
					t.Fatalf("method %q, asked for %q", q.Method, m)
				}
				chkQ(fmt.Sprintf("q%d_0.25", ty), q.Q1)
				chkQ(fmt.Sprintf("q%d_0.5", ty), q.Median)
				chkQ(fmt.Sprintf("q%d_0.75", ty), q.Q3)
				// R takes p as a binary double (0.99865 is off by 3.8e-17),
				// which moves the interpolation weight by up to n times that;
				// ours is the decimal p exactly.
				for i, p := range q.Percentiles {
					name := fmt.Sprintf("q%d_%g", ty, percentileProbs[i])
					tol := 8*2.220446049250313e-16*scale + float64(rq.Counts.Used)*1.2e-16*(rq.Quantile.Max-rq.Quantile.Min)
					if d := math.Abs(p.Value - r[name]); !(d <= tol) {
						t.Errorf("%s = %.17g, R 4.2.2 gives %.17g (difference %.2g)", name, p.Value, r[name], d)
					}
				}
				all := q.All[ty-1]
				chkQ(fmt.Sprintf("q%d_0.25", ty), all.Q1)
				chkQ(fmt.Sprintf("q%d_0.75", ty), all.Q3)
				chk("tci90_lo", rq.Centre.MeanCI.Lo, 1e-10)
				chk("tci90_hi", rq.Centre.MeanCI.Hi, 1e-10)
				chk("sdci90_lo", rq.Spread.SDCI.Lo, 1e-9)
				chk("sdci90_hi", rq.Spread.SDCI.Hi, 1e-9)
				if ty == 7 {
					// IQR under type 7 (R 4.2.2 IQR(x) is type 7)
					if d := math.Abs(rq.Spread.IQR - (r["q7_0.75"] - r["q7_0.25"])); d > 16*2.220446049250313e-16*scale {
						t.Errorf("IQR %v, R 4.2.2 %v", rq.Spread.IQR, r["q7_0.75"]-r["q7_0.25"])
					}
				}
			}
		})
	}
}

// loadExact reads testdata/rref/exact.tsv: the exact mean, variance and SD
// of each set as typed, rounded once to float64 (Python 3 fractions and
// decimal, exact rational arithmetic; testdata/rref/exact.py).
func loadExact(t *testing.T) map[string][3]float64 {
	t.Helper()
	b, err := os.ReadFile("../testdata/rref/exact.tsv")
	if err != nil {
		t.Fatal(err)
	}
	out := map[string][3]float64{}
	for _, ln := range strings.Split(strings.TrimSpace(string(b)), "\n")[1:] {
		p := strings.Split(ln, "\t")
		var v [3]float64
		for i := range v {
			if v[i], err = strconv.ParseFloat(p[2+i], 64); err != nil {
				t.Fatal(err)
			}
		}
		out[p[0]] = v
	}
	return out
}

// TestExactMoments: on fixed-point decimal data the mean, variance and SD
// are the correctly rounded values of the data as typed, bit for bit
// (reference: exact rational arithmetic, testdata/rref/exact.tsv).
func TestExactMoments(t *testing.T) {
	ex := loadExact(t)
	if len(ex) < 30 {
		t.Fatalf("only %d sets in exact.tsv", len(ex))
	}
	for name, want := range ex {
		path := filepath.Join("../testdata/sets", name)
		if strings.HasSuffix(name, ".dat") {
			path = filepath.Join("../testdata/nist", name)
		}
		rep := analyzeFile(t, path, Options{})
		got := [3]float64{rep.Centre.Mean, *rep.Spread.Variance, rep.Spread.SD}
		if got != want {
			t.Errorf("%s: mean, var, sd = %v, exact %v", name, got, want)
		}
	}
}
