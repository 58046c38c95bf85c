package method

import "testing"

// Thinning keeps both tails whole and stays within the budget.
func TestThinIndices(t *testing.T) {
	idx := ThinIndices(1_000_000, 2000)
	if len(idx) > 2000 || len(idx) < 1900 {
		t.Fatalf("%d points", len(idx))
	}
	for i := 0; i < 200; i++ {
		if idx[i] != i || idx[len(idx)-1-i] != 1_000_000-1-i {
			t.Fatalf("tails not kept at %d", i)
		}
	}
	for i := 1; i < len(idx); i++ {
		if idx[i] <= idx[i-1] {
			t.Fatalf("not increasing at %d", i)
		}
	}
}
