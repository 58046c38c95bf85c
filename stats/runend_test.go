package stats

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"lotlens/stats/decimal"
)

// runsWalk is runs as first written (a comparison per value), the
// reference for the galloping decimal.RunEnd; bounds lists where each run ends.
func runsWalk(sorted []float64) (distinct, maxRun int, bounds []int) {
	distinct, maxRun = 1, 1
	run := 1
	for i := 1; i < len(sorted); i++ {
		if sorted[i] != sorted[i-1] {
			distinct++
			bounds = append(bounds, i)
			run = 1
		} else if run++; run > maxRun {
			maxRun = run
		}
	}
	if len(sorted) > 0 {
		bounds = append(bounds, len(sorted))
	}
	return distinct, maxRun, bounds
}

// runs and decimal.RunEnd give the walk's counts and run ends on sorted data
// with runs of every length from 1 to a few hundred, zeros of both signs,
// and empty data.
func TestRunEndWalk(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 1))
	for trial := range 3000 {
		var x []float64
		for range r.IntN(12) {
			v := float64(r.IntN(30) - 15)
			n := 1 + r.IntN(1+r.IntN(300))
			for range n {
				x = append(x, v)
			}
		}
		for i := range x {
			if x[i] == 0 && r.IntN(2) == 0 {
				x[i] = math.Copysign(0, -1)
			}
		}
		slices.Sort(x)
		wd, wm, wb := runsWalk(x)
		d, m := runs(x)
		var bounds []int
		for i := 0; i < len(x); {
			i = decimal.RunEnd(x, i)
			bounds = append(bounds, i)
		}
		for i := range x {
			if s := decimal.RunStart(x, i); (s > 0 && x[s-1] == x[i]) || slices.ContainsFunc(x[s:i], func(v float64) bool { return v != x[i] }) {
				t.Fatalf("trial %d: %v: run of %d starts at %d", trial, x, i, s)
			}
		}
		if d != wd || m != wm || !slices.Equal(bounds, wb) {
			t.Fatalf("trial %d: %v: runs %d %d ends %v, want %d %d %v", trial, x, d, m, bounds, wd, wm, wb)
		}
	}
}
