package method

import (
	"encoding/binary"
	"math"
	"testing"
)

// grpFuzzGroups decodes fuzz bytes into groups: the first byte gives the
// number of groups (2..9), then each value is two bytes: a group index
// and a reading on a coarse grid (many ties), with an occasional large
// or tiny one.
func grpFuzzGroups(data []byte) ([][]float64, [][]int64) {
	if len(data) < 1 {
		return nil, nil
	}
	k := 2 + int(data[0])%8
	f := make([][]float64, k)
	m := make([][]int64, k)
	for i := 1; i+2 <= len(data); i += 2 {
		g := int(data[i]) % k
		v := int64(int8(data[i+1]))
		switch data[i] >> 5 {
		case 7:
			v *= 1 << 40
		case 6:
			v = int64(binary.LittleEndian.Uint16(data[i:]))
		}
		m[g] = append(m[g], v)
		f[g] = append(f[g], float64(v)*0.01)
	}
	return f, m
}

func grpProb(t *testing.T, what string, p float64) {
	if !(p >= 0 && p <= 1) {
		t.Fatalf("%s: p = %v", what, p)
	}
}

func grpFin(t *testing.T, what string, xs ...float64) {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			t.Fatalf("%s: %v", what, xs)
		}
	}
}

// FuzzGroups: every group method on arbitrary groups: no panic, p-values
// in [0, 1], no NaN or Inf in a result returned without error.
//
//	go test -run '^$' -fuzz FuzzGroups -fuzztime 2m -parallel 1 ./stats/method/
func FuzzGroups(f *testing.F) {
	f.Add([]byte{0, 0, 1, 1, 2, 0, 3, 1, 4, 0, 5, 1, 6})
	f.Add([]byte{3, 0, 1, 1, 1, 2, 1, 3, 1, 0, 1, 1, 1, 2, 1, 3, 1, 0, 9, 1, 9, 2, 9, 3, 9})
	f.Add([]byte{1, 0, 200, 1, 5, 2, 7, 0, 250, 1, 3, 2, 8, 0, 1, 1, 2, 2, 3})
	f.Fuzz(func(t *testing.T, data []byte) {
		fg, mg := grpFuzzGroups(data)
		if fg == nil {
			return
		}
		if a, err := OneWayANOVA(fg); err == nil {
			grpProb(t, "anova", a.P)
			grpFin(t, "anova", a.F, a.SSBetween, a.SSWithin)
		}
		if w, err := WelchANOVA(fg); err == nil {
			grpProb(t, "welch", w.P)
			grpFin(t, "welch", w.F, w.DF2)
		}
		for _, kw := range []func() (KruskalWallisTest, error){
			func() (KruskalWallisTest, error) { return KruskalWallis(fg) },
			func() (KruskalWallisTest, error) { return KruskalWallis(mg) },
		} {
			if r, err := kw(); err == nil {
				grpProb(t, "kw", r.P)
				grpFin(t, "kw", r.H)
			}
		}
		if r, err := BrownForsythe(fg); err == nil {
			grpProb(t, "bf", r.P)
		}
		if r, err := Bartlett(fg); err == nil {
			grpProb(t, "bartlett", r.P)
		}
		if r, err := SDRatio(fg, 0.95); err == nil {
			grpFin(t, "sd ratio", r.Ratio, r.Lo, r.Hi)
			if r.HasCI {
				grpProb(t, "var test", r.P)
			}
		}
		for _, pf := range []func([][]float64, float64) ([]MeanPair, error){TukeyKramer, GamesHowell} {
			if ps, err := pf(fg, 0.95); err == nil {
				for _, p := range ps {
					grpProb(t, "pair", p.P)
					grpFin(t, "pair", p.Diff, p.Lo, p.Hi, p.Q)
				}
			}
		}
		for _, ps := range [][]RankPair{grpMust(PairwiseMannWhitney(mg)), grpMust(Dunn(fg))} {
			for _, p := range ps {
				grpProb(t, "rank pair", p.P)
				grpProb(t, "rank pair adj", p.PAdj)
			}
		}
		if ps, err := TukeyKramer(fg, 0.95); err == nil {
			l, err := CompactLetters(len(fg), func(i, j int) bool {
				for _, p := range ps {
					if p.I == i && p.J == j {
						return p.P < 0.05
					}
				}
				return false
			}, nil)
			if err == nil && len(l) != len(fg) {
				t.Fatal("letters")
			}
		}
		if len(fg) >= 2 {
			if r, err := MannWhitney(mg[0], mg[1], 0.95); err == nil {
				grpProb(t, "mw", r.P)
				grpFin(t, "mw", r.Shift, r.Lo, r.Hi)
				if !(r.Lo <= r.Shift && r.Shift <= r.Hi) {
					t.Fatalf("shift %g outside [%g, %g]", r.Shift, r.Lo, r.Hi)
				}
			}
			if r, err := MannWhitney(fg[0], fg[1], 0.9); err == nil {
				grpProb(t, "mw", r.P)
			}
			if r, err := WelchT(fg[0], fg[1], 0.95); err == nil {
				grpProb(t, "t", r.P)
				grpFin(t, "t", r.Lo, r.Hi)
			}
			if r, err := Hedges(fg[0], fg[1], 0.95); err == nil {
				grpFin(t, "g", r.G, r.Lo, r.Hi)
			}
		}
	})
}

func grpMust(ps []RankPair, err error) []RankPair {
	if err != nil {
		return nil
	}
	return ps
}
