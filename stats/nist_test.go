package stats

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// lre is the log relative error as NIST StRD scores an answer: the number
// of correct significant digits, -log10(|x-c|/|c|) (-log10|x| when c = 0),
// capped at 15 (the certified values carry 15 digits).
func lre(x, c float64) float64 {
	var e float64
	if c == 0 {
		e = math.Abs(x)
	} else {
		e = math.Abs(x-c) / math.Abs(c)
	}
	if e == 0 {
		return 15
	}
	return math.Min(15, -math.Log10(e))
}

// TestNISTStRD checks mean and SD on the nine NIST StRD univariate data
// sets against NIST's certified values (testdata/nist/certified.tsv, NIST
// Statistical Reference Datasets). Goal: LRE >= 14 on every set, including
// NumAcc3 and NumAcc4 (where binary floating point loses digits).
func TestNISTStRD(t *testing.T) {
	b, err := os.ReadFile("../testdata/nist/certified.tsv")
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")[1:]
	if len(lines) != 9 {
		t.Fatalf("%d certified rows, want 9", len(lines))
	}
	for _, ln := range lines {
		f := strings.Split(ln, "\t")
		name := f[0]
		n, _ := strconv.Atoi(f[1])
		mean, _ := strconv.ParseFloat(f[2], 64)
		sd, _ := strconv.ParseFloat(f[3], 64)
		data, err := os.ReadFile(filepath.Join("../testdata/nist", name+".dat"))
		if err != nil {
			t.Fatal(err)
		}
		rep, err := Analyze(Request{Text: string(data)})
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if rep.Counts.Used != n {
			t.Errorf("%s: n = %d, certified %d", name, rep.Counts.Used, n)
		}
		lm, ls := lre(rep.Centre.Mean, mean), lre(rep.Spread.SD, sd)
		t.Logf("%-9s LRE mean %.1f  sd %.1f", name, lm, ls)
		if lm < 14 || ls < 14 {
			t.Errorf("%s: LRE mean %.1f, sd %.1f; want >= 14 (mean %.17g, sd %.17g; certified %s, %s)", name, lm, ls, rep.Centre.Mean, rep.Spread.SD, f[2], f[3])
		}
	}
}

// TestCompensatedFallback: data in exponent form cannot use the exact path;
// the compensated two-pass fallback still reaches 14 digits on NumAcc3
// written as x.xxxe+06 (NIST StRD certified values).
func TestCompensatedFallback(t *testing.T) {
	data, err := os.ReadFile("../testdata/nist/NumAcc3.dat")
	if err != nil {
		t.Fatal(err)
	}
	var sb strings.Builder
	for _, ln := range strings.Fields(string(data)) {
		v, _ := strconv.ParseFloat(ln, 64)
		sb.WriteString(strconv.FormatFloat(v, 'e', -1, 64) + "\n")
	}
	rep, err := Analyze(Request{Text: sb.String()})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Counts.Decimals != -1 {
		t.Fatalf("decimals %d, want -1 (exponent form)", rep.Counts.Decimals)
	}
	// NIST StRD NumAcc3 certified: mean 1000000.2, sd 0.1. Binary floating
	// point holds the values only to about 1e-10 relative to the offset, so
	// the SD of the parsed doubles differs from the decimal SD near 1e-9:
	// check the mean at 14 digits and the SD at 8.
	if l := lre(rep.Centre.Mean, 1000000.2); l < 14 {
		t.Errorf("mean LRE %.1f", l)
	}
	if l := lre(rep.Spread.SD, 0.1); l < 8 {
		t.Errorf("sd LRE %.1f (sd %.17g)", l, rep.Spread.SD)
	}
}
