package method

import (
	"math"
	"math/rand/v2"
	"testing"
)

// Benchmarks for 1,000,000 readings, each with the same-run baseline
// BenchmarkCtlBaselineSum1M (one summing pass over the same data) for
// ratios:
//
//	go test -run '^$' -bench 'Ctl' -benchtime 3x ./stats/method/

const ctlBenchN = 1_000_000

var ctlBenchX = func() []float64 {
	r := rand.New(rand.NewPCG(11, 12))
	x := make([]float64, ctlBenchN)
	for i := range x {
		x[i] = math.Round((10+0.05*r.NormFloat64())*1000) / 1000
	}
	return x
}()

var ctlSink float64

func BenchmarkCtlBaselineSum1M(b *testing.B) {
	for b.Loop() {
		s := 0.0
		for _, v := range ctlBenchX {
			s += v
		}
		ctlSink = s
	}
}

func BenchmarkCtlIndividuals1M(b *testing.B) {
	for b.Loop() {
		c, err := Individuals(ctlBenchX, IndividualsOptions{})
		if err != nil {
			b.Fatal(err)
		}
		ctlSink = c.Upper
	}
}

func BenchmarkCtlSubgroups1M(b *testing.B) {
	g := make([][]float64, 0, ctlBenchN/5)
	for i := 0; i < ctlBenchN; i += 5 {
		g = append(g, ctlBenchX[i:i+5])
	}
	for b.Loop() {
		c, err := Subgroups(g, SubgroupOptions{})
		if err != nil {
			b.Fatal(err)
		}
		ctlSink = c.Centre
	}
}

func BenchmarkCtlSignals1M(b *testing.B) {
	s := DefaultSignalSettings()
	for b.Loop() {
		got, err := Signals(ctlBenchX, 10, []float64{0.05}, s)
		if err != nil {
			b.Fatal(err)
		}
		ctlSink = float64(len(got))
	}
}

func BenchmarkCtlEWMACUSUM1M(b *testing.B) {
	for b.Loop() {
		e, _ := EWMA(ctlBenchX, 10, 0.05, 0.2, 3)
		c, _ := CUSUM(ctlBenchX, 10, 0.05, 0.5, 5)
		ctlSink = e.Z[0] + c.Upper[0]
	}
}

func BenchmarkCtlMannKendall1M(b *testing.B) {
	for b.Loop() {
		mk, err := MannKendallTest(ctlBenchX)
		if err != nil {
			b.Fatal(err)
		}
		ctlSink = mk.Z
	}
}

func BenchmarkCtlDrift1M(b *testing.B) {
	for b.Loop() {
		a, _ := Lag1Autocorrelation(ctlBenchX)
		r, _ := RunsAboutMedian(ctlBenchX)
		p, _ := PettittChange(ctlBenchX)
		ctlSink = a.R1 + r.P + p.P
	}
}
