package method

import (
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"
	"time"
)

// Speed of the group methods on 1,000,000 readings in 10 groups, against
// same-run baselines: a plain sum over the readings, and a plain parse +
// sum of the same readings as text (strconv.ParseFloat per line). The
// issue's goal is that the groups section adds at most 50 % to the full
// analysis, which takes about 10 times a plain parse + sum: so the group
// methods should stay below about 5 times the parse + sum baseline.
//
//	go test -run '^$' -bench Groups1M -benchtime 3x ./stats/method/

const grpBenchN, grpBenchK = 1_000_000, 10

func grpBenchData() (f [][]float64, m [][]int64, text []string) {
	rng := rand.New(rand.NewPCG(11, 12))
	f = make([][]float64, grpBenchK)
	m = make([][]int64, grpBenchK)
	for i := 0; i < grpBenchN; i++ {
		g := i % grpBenchK
		// fill weights in grams, 3 decimals (invented): group centres
		// 0.004 g apart, SD 0.02 g, one group 3 times as wide
		sd := 20.0
		if g == 7 {
			sd = 60
		}
		v := int64(500000 + 4*g + int(rng.NormFloat64()*sd))
		m[g] = append(m[g], v)
		f[g] = append(f[g], float64(v)/1000)
		text = append(text, strconv.FormatFloat(float64(v)/1000, 'f', 3, 64))
	}
	return f, m, text
}

var grpSink float64

func grpBaselineSum(f [][]float64) float64 {
	s := 0.0
	for _, g := range f {
		for _, v := range g {
			s += v
		}
	}
	return s
}

func grpBaselineParse(text []string) float64 {
	s := 0.0
	for _, t := range text {
		v, _ := strconv.ParseFloat(t, 64)
		s += v
	}
	return s
}

// grpAllTests runs every group method as a section would: each group
// copied and sorted once, then all tests on the sorted groups (rank tests
// on the int64 mantissas when m is given, also sorted once).
func grpAllTests(b *testing.B, f [][]float64, m [][]int64) {
	sf := make([][]float64, len(f))
	for i, g := range f {
		sf[i] = slices.Clone(g)
		slices.Sort(sf[i])
	}
	var sm [][]int64
	if m != nil {
		sm = make([][]int64, len(m))
		for i, g := range m {
			sm[i] = slices.Clone(g)
			slices.Sort(sm[i])
		}
	}
	must := func(err error) {
		if err != nil {
			b.Fatal(err)
		}
	}
	_, err := OneWayANOVA(sf)
	must(err)
	_, err = WelchANOVA(sf)
	must(err)
	_, err = BrownForsythe(sf)
	must(err)
	_, err = Bartlett(sf)
	must(err)
	_, err = SDRatio(sf, 0.95)
	must(err)
	tk, err := TukeyKramer(sf, 0.95)
	must(err)
	_, err = GamesHowell(sf, 0.95)
	must(err)
	if sm != nil {
		_, err = KruskalWallis(sm)
		must(err)
		_, err = PairwiseMannWhitney(sm)
		must(err)
		_, err = Dunn(sm)
		must(err)
	} else {
		_, err = KruskalWallis(sf)
		must(err)
		_, err = PairwiseMannWhitney(sf)
		must(err)
		_, err = Dunn(sf)
		must(err)
	}
	_, err = CompactLetters(len(f), func(i, j int) bool {
		for _, p := range tk {
			if p.I == i && p.J == j {
				return p.P < 0.05
			}
		}
		return false
	}, nil)
	must(err)
}

func BenchmarkGroups1M(b *testing.B) {
	f, m, text := grpBenchData()
	b.Run("baseline-sum", func(b *testing.B) {
		for range b.N {
			grpSink += grpBaselineSum(f)
		}
	})
	b.Run("baseline-parse-sum", func(b *testing.B) {
		for range b.N {
			grpSink += grpBaselineParse(text)
		}
	})
	// all tests, with the same-run ratios to both baselines
	for _, c := range []struct {
		name string
		m    [][]int64
	}{{"all-float", nil}, {"all-mantissa", m}} {
		b.Run(c.name, func(b *testing.B) {
			var tAll, tSum, tParse time.Duration
			for range b.N {
				t0 := time.Now()
				grpSink += grpBaselineSum(f)
				t1 := time.Now()
				grpSink += grpBaselineParse(text)
				t2 := time.Now()
				grpAllTests(b, f, c.m)
				t3 := time.Now()
				tSum += t1.Sub(t0)
				tParse += t2.Sub(t1)
				tAll += t3.Sub(t2)
			}
			b.ReportMetric(float64(tAll.Milliseconds())/float64(b.N), "ms/all")
			b.ReportMetric(float64(tAll)/float64(tSum), "x-sum")
			b.ReportMetric(float64(tAll)/float64(tParse), "x-parse+sum")
		})
	}
}

// The Hodges-Lehmann shift and its interval for two groups of 500,000:
// four selections among 2.5e11 differences.
func BenchmarkGroupsMannWhitney1M(b *testing.B) {
	_, m, _ := grpBenchData()
	x := slices.Concat(m[0], m[2], m[4], m[6], m[8])
	y := slices.Concat(m[1], m[3], m[5], m[7], m[9])
	slices.Sort(x)
	slices.Sort(y)
	xf, yf := make([]float64, len(x)), make([]float64, len(y))
	for i := range x {
		xf[i] = float64(x[i]) / 1000
	}
	for i := range y {
		yf[i] = float64(y[i]) / 1000
	}
	b.Run("mantissa", func(b *testing.B) {
		for range b.N {
			r, err := MannWhitney(x, y, 0.95)
			if err != nil {
				b.Fatal(err)
			}
			grpSink += r.Shift
		}
	})
	b.Run("float", func(b *testing.B) {
		for range b.N {
			r, err := MannWhitney(xf, yf, 0.95)
			if err != nil {
				b.Fatal(err)
			}
			grpSink += r.Shift
		}
	})
	b.Run("baseline-sum", func(b *testing.B) {
		for range b.N {
			grpSink += grpBaselineSum([][]float64{xf, yf})
		}
	})
}
