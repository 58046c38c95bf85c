package method

import (
	"lotlens/stats/internal/rref"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// Reference values for the methods: testdata/rref/methods.tsv, written by
// testdata/rref/methods.R with R 4.2.2 (r-cran-nortest 1.0-4,
// r-cran-robustbase 0.95-0) from the invented sets in testdata/sets.

func methodsRef(t *testing.T) map[string]map[string]float64 {
	t.Helper()
	ref := rref.Load(t, "methods.tsv", 0)
	if len(ref) < 24 {
		t.Fatalf("methods.tsv holds %d sets, want 24", len(ref))
	}
	return ref
}

// methodsSet reads one invented set, sorted, with its mean and SD
// (compensated two-pass).
func methodsSet(t *testing.T, name string) (sorted []float64, mean, sd float64) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "sets", name))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range strings.Fields(string(b)) {
		v, err := strconv.ParseFloat(l, 64)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		sorted = append(sorted, v)
	}
	slices.Sort(sorted)
	n := float64(len(sorted))
	var s float64
	for _, x := range sorted {
		s += x
	}
	mean = s / n
	var c, ss float64
	for _, x := range sorted {
		c += x - mean
		ss += (x - mean) * (x - mean)
	}
	mean += c / n
	sd = math.Sqrt((ss - c*c/n) / (n - 1))
	return
}

// mClose reports whether got is within rel (relative) or abs of want.
func mClose(got, want, rel, abs float64) bool {
	d := math.Abs(got - want)
	return d <= abs || d <= rel*math.Abs(want)
}
