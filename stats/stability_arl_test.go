package stats

import (
	"testing"

	"lotlens/stats/method"
)

// TestARLSeed recomputes every seeded run length with the methods that
// cachedARL calls (method.EWMAARL, method.CUSUMARL; their own tests check
// them against Lucas and Saccucci 1990 and Montgomery 2009): the seed must
// be what the engine would compute, to the 6 digits it shows.
func TestARLSeed(t *testing.T) {
	if len(arlSeed) == 0 {
		t.Fatal("no seeded run lengths")
	}
	for _, s := range arlSeed {
		key, want := s.key, s.arl
		var got float64
		var err error
		if key[3] == 1 {
			var c method.CUSUMRunLength
			c, err = method.CUSUMARL(key[0], key[1], key[2])
			got = c.TwoSided
		} else {
			got, err = method.EWMAARL(key[0], key[1], key[2])
		}
		if err != nil {
			t.Fatalf("%v: %v", key, err)
		}
		if r := roundSig(got, 6); r != want {
			t.Errorf("%v: seeded %v, the method gives %v (%v)", key, want, r, got)
		}
	}
}
