package method

import (
	"lotlens/stats/internal/rref"
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

// methodsSet reads one invented set (rref.Set).
func methodsSet(t *testing.T, name string) (sorted []float64, mean, sd float64) {
	t.Helper()
	return rref.Set(t, name)
}

// mClose is rref.Close.
var mClose = rref.Close
