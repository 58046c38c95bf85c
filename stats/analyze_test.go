package stats

import (
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

// TestSliceMichelson checks the foundation slice on NIST StRD Michelso
// (certified mean 299.852400000000, SD 0.0790105478190518; testdata/nist).
func TestSliceMichelson(t *testing.T) {
	b, err := os.ReadFile("../testdata/nist/Michelso.dat")
	if err != nil {
		t.Fatal(err)
	}
	rep, err := Analyze(Request{Text: string(b)})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Counts.Used != 100 {
		t.Fatalf("n = %d, want 100 (NIST StRD)", rep.Counts.Used)
	}
	check := func(name string, got, want float64) {
		if lre := -math.Log10(math.Abs(got-want) / math.Abs(want)); lre < 12 {
			t.Errorf("%s = %.17g, want %.15g (LRE %.1f)", name, got, want, lre)
		}
	}
	check("mean", rep.Centre.Mean, 299.852400000000)
	check("sd", rep.Spread.SD, 0.0790105478190518)
}

func TestSliceMedian(t *testing.T) {
	// from memory: the median of 1..4 is 2.5
	var b strings.Builder
	for i := 1; i <= 4; i++ {
		b.WriteString(strconv.Itoa(i) + "\n")
	}
	rep, err := Analyze(Request{Text: b.String()})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Centre.Median != 2.5 {
		t.Fatalf("median = %v, want 2.5", rep.Centre.Median)
	}
}
