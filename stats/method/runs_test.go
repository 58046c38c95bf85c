package method

import (
	"encoding/binary"
	"math"
	"slices"
	"testing"
)

func ctlOnly(rule string) SignalSettings {
	s := SignalSettings{}
	switch rule {
	case SignalBeyondLimits:
		s.BeyondLimits = true
	case SignalTwoOfThree:
		s.TwoOfThree = true
	case SignalFourOfFive:
		s.FourOfFive = true
	case SignalRunSameSide:
		s.RunSameSide = true
	case SignalTrend:
		s.Trend = true
	case SignalAlternating:
		s.Alternating = true
	case SignalHuggingCentre:
		s.HuggingCentre = true
	case SignalAvoidCentre:
		s.AvoidCentre = true
	}
	return s
}

// Each check fires on a sequence built to show it and stays quiet on its
// near miss (centre 0, σ = 1; the published patterns of Western Electric
// 1956 and Nelson 1984 with their default counts).
func TestSignalsFireAndNearMiss(t *testing.T) {
	rep := func(v float64, k int) []float64 {
		out := make([]float64, k)
		for i := range out {
			out[i] = v
		}
		return out
	}
	cat := func(parts ...[]float64) []float64 { return slices.Concat(parts...) }
	rise := func(k int) []float64 {
		out := make([]float64, k)
		for i := range out {
			out[i] = -0.5 + 0.1*float64(i)
		}
		return out
	}
	alt := func(k int) []float64 {
		out := make([]float64, k)
		for i := range out {
			out[i] = 0.3
			if i%2 == 1 {
				out[i] = -0.3
			}
		}
		return out
	}
	avoid := func(k int) []float64 {
		out := make([]float64, k)
		for i := range out {
			out[i] = 1.5
			if i%3 == 0 {
				out[i] = -1.5
			}
		}
		return out
	}
	cases := []struct {
		rule      string
		fire, not []float64
		want      []int // indices of the signal on fire
	}{
		{SignalBeyondLimits, []float64{0, 0.2, 3.1, 0}, []float64{0, 0.2, 3.0, -2.99}, []int{2}},
		{SignalTwoOfThree, []float64{0, 2.5, 0.1, 2.1, 0}, []float64{0, 2.5, 0.1, 0.1, 2.1, 0, -2.5}, []int{1, 3}},
		{SignalFourOfFive, []float64{0, 1.2, 1.5, 0.2, 1.1, 1.9, 0}, []float64{0, 1.2, 1.5, 0.2, 0.5, 1.1, 1.9, -1.5}, []int{1, 2, 4, 5}},
		{SignalRunSameSide, cat([]float64{-1}, rep(0.1, 9), []float64{-1}), cat([]float64{-1}, rep(0.1, 4), []float64{0}, rep(0.1, 4), []float64{-1}), []int{1, 2, 3, 4, 5, 6, 7, 8, 9}},
		{SignalTrend, cat([]float64{0.9}, rise(6)), cat(rise(3), []float64{-0.3}, rise(4)[1:]), []int{1, 2, 3, 4, 5, 6}},
		{SignalAlternating, cat([]float64{-0.3}, alt(14)), cat(alt(7), alt(7)), nil},
		{SignalHuggingCentre, cat([]float64{2}, rep(0.5, 15), []float64{2}), cat([]float64{2}, rep(0.5, 14), []float64{1}, rep(0.5, 3)), nil},
		{SignalAvoidCentre, cat([]float64{0}, avoid(8), []float64{0}), cat([]float64{0}, rep(1.5, 8), []float64{0}, avoid(7)), []int{1, 2, 3, 4, 5, 6, 7, 8}},
	}
	for _, c := range cases {
		got, err := Signals(c.fire, 0, []float64{1}, ctlOnly(c.rule))
		if err != nil {
			t.Fatal(err)
		}
		if len(got) != 1 || got[0].Rule != c.rule {
			t.Errorf("%s: on its pattern gave %+v", c.rule, got)
			continue
		}
		if c.want != nil && !slices.Equal(got[0].Indices(), c.want) {
			t.Errorf("%s: points %v, want %v", c.rule, got[0].Indices(), c.want)
		}
		quiet, _ := Signals(c.not, 0, []float64{1}, ctlOnly(c.rule))
		if len(quiet) != 0 {
			t.Errorf("%s: near miss gave %+v", c.rule, quiet)
		}
	}
	// Alternating: the 14 points after the first (which continues the
	// pattern too: 15 points in all).
	got, _ := Signals(cat([]float64{-0.3}, alt(14)), 0, []float64{1}, ctlOnly(SignalAlternating))
	if got[0].First != 0 || got[0].Last != 14 {
		t.Errorf("alternating: %+v", got[0])
	}
}

// Per-point sigma (unequal subgroup sizes), σ = 0 and argument checks.
func TestSignalsSigmaAndErrors(t *testing.T) {
	x := []float64{0.5, 0.5, 2}
	got, _ := Signals(x, 0, []float64{1, 0.1, 1}, ctlOnly(SignalBeyondLimits))
	if len(got) != 1 || got[0].First != 1 {
		t.Errorf("per-point sigma: %+v", got)
	}
	got, _ = Signals([]float64{2, 2, 2.001, 2}, 2, []float64{0}, DefaultSignalSettings())
	if len(got) != 1 || got[0].Rule != SignalBeyondLimits || got[0].First != 2 {
		t.Errorf("sigma 0: %+v", got)
	}
	for _, bad := range [][]float64{{1, 2}, {-1}, {math.NaN()}, {math.Inf(1)}} {
		if _, err := Signals(x, 0, bad, DefaultSignalSettings()); err == nil {
			t.Errorf("sigma %v: no error", bad)
		}
	}
	if _, err := Signals([]float64{math.NaN()}, 0, []float64{1}, DefaultSignalSettings()); err == nil {
		t.Error("NaN point: no error")
	}
	if got, err := Signals(nil, 0, []float64{1}, DefaultSignalSettings()); err != nil || len(got) != 0 {
		t.Errorf("empty: %v %v", got, err)
	}
}

// FuzzSignals: no panic, and every signal's points in range, inside
// [First, Last], in order.
func FuzzSignals(f *testing.F) {
	f.Add([]byte{1, 2, 3, 200, 4, 5, 6, 7, 8, 9, 10}, uint8(10), uint8(3))
	f.Add(make([]byte, 64), uint8(0), uint8(0))
	f.Fuzz(func(t *testing.T, data []byte, sig uint8, runs uint8) {
		x := make([]float64, len(data))
		for i, b := range data {
			x[i] = float64(int8(b)) / 16
		}
		if len(data) >= 8 {
			x[0] = math.Float64frombits(binary.LittleEndian.Uint64(data))
			if math.IsNaN(x[0]) || math.IsInf(x[0], 0) {
				x[0] = 0
			}
		}
		s := DefaultSignalSettings()
		r := int(runs % 20)
		s.SameSideRun, s.TrendRun, s.AlternatingRun, s.HuggingRun, s.AvoidRun = r, r, r, r, r
		got, err := Signals(x, 0, []float64{float64(sig) / 16}, s)
		if err != nil {
			t.Fatal(err)
		}
		for _, g := range got {
			idx := g.Indices()
			if len(idx) == 0 || g.First < 0 || g.Last >= len(x) || g.First > g.Last {
				t.Fatalf("%+v out of range (n=%d)", g, len(x))
			}
			for k, i := range idx {
				if i < g.First || i > g.Last || (k > 0 && i <= idx[k-1]) {
					t.Fatalf("%+v: bad points", g)
				}
			}
		}
	})
}
