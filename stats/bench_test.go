package stats

import (
	"math"
	"math/rand/v2"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"lotlens/stats/decimal"
	"lotlens/stats/ingest"
)

// Speed goals (issue 3): the full analysis of 1,000,000 values from text in
// at most 0.15 s natively and 10,000,000 in at most 1.5 s; peak memory
// beyond the input text at most 24 bytes per value. Run:
//
//	go test -run '^$' -bench 'Analyze|Baseline|Core' -benchtime 5x ./stats/
//
// BenchmarkBaseline* is a plain parse + sum + sort of the same text, measured
// in the same run, so the engine can be reported as a ratio to it.

var benchText = map[int]string{}
var benchMu sync.Mutex

// benchData is n invented fill weights with 2 decimals, one a line.
func benchData(n int) string {
	benchMu.Lock()
	defer benchMu.Unlock()
	if s, ok := benchText[n]; ok {
		return s
	}
	r := rand.New(rand.NewPCG(11, 12))
	var b strings.Builder
	b.Grow(n * 7)
	for i := 0; i < n; i++ {
		x := 500 + 1.5*r.NormFloat64()
		b.WriteString(strconv.FormatFloat(x, 'f', 2, 64))
		b.WriteByte('\n')
	}
	benchText[n] = b.String()
	return benchText[n]
}

// allocPerValue measures the bytes allocated by f with the collector off:
// an upper bound of its peak memory.
func allocPerValue(n int, f func()) float64 {
	runtime.GC()
	old := debug.SetGCPercent(-1)
	var m0, m1 runtime.MemStats
	runtime.ReadMemStats(&m0)
	f()
	runtime.ReadMemStats(&m1)
	debug.SetGCPercent(old)
	return float64(m1.TotalAlloc-m0.TotalAlloc) / float64(n)
}

// peakPerValue estimates the peak of live heap memory during f beyond what
// was live before, per value: the collector runs often (GOGC=5) and a
// sampler reads the live heap every 200 µs. An estimate, not a bound; the
// collector-off total (allocPerValue) is the bound.
func peakPerValue(n int, f func()) float64 {
	runtime.GC()
	old := debug.SetGCPercent(5)
	defer debug.SetGCPercent(old)
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	metrics.Read(sample)
	base := sample[0].Value.Uint64()
	var peak atomic.Uint64
	done := make(chan struct{})
	stopped := make(chan struct{})
	go func() {
		defer close(stopped)
		s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
		for {
			select {
			case <-done:
				return
			default:
			}
			metrics.Read(s)
			if v := s[0].Value.Uint64(); v > peak.Load() {
				peak.Store(v)
			}
			time.Sleep(200 * time.Microsecond)
		}
	}()
	f()
	close(done)
	<-stopped
	p := peak.Load()
	if p < base {
		return 0
	}
	return float64(p-base) / float64(n)
}

func benchAnalyze(b *testing.B, n int) {
	text := benchData(n)
	b.SetBytes(int64(len(text)))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Analyze(Request{Text: text}); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(allocPerValue(n, func() { Analyze(Request{Text: text}) }), "allocB/value")
	b.ReportMetric(peakPerValue(n, func() { Analyze(Request{Text: text}) }), "peakB/value")
	var tab *ingest.Table
	readB := allocPerValue(n, func() { tab, _ = ingest.Read(text) })
	b.ReportMetric(readB, "readerB/value")
	b.ReportMetric(allocPerValue(n, func() { AnalyzeTable(tab, "", Request{}) }), "engineB/value")
}

func BenchmarkAnalyze1M(b *testing.B)  { benchAnalyze(b, 1_000_000) }
func BenchmarkAnalyze10M(b *testing.B) { benchAnalyze(b, 10_000_000) }

// BenchmarkCore1M is the engine alone on a table already read.
func BenchmarkCore1M(b *testing.B) {
	text := benchData(1_000_000)
	tab, err := ingest.Read(text)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := AnalyzeTable(tab, "", Request{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRead1M is the reader alone.
func BenchmarkRead1M(b *testing.B) {
	text := benchData(1_000_000)
	b.SetBytes(int64(len(text)))
	for i := 0; i < b.N; i++ {
		if _, err := ingest.Read(text); err != nil {
			b.Fatal(err)
		}
	}
}

func baseline(text string) float64 {
	xs := make([]float64, 0, len(text)/6)
	for len(text) > 0 {
		j := strings.IndexByte(text, '\n')
		if j < 0 {
			j = len(text)
		}
		v, err := strconv.ParseFloat(text[:j], 64)
		if err == nil {
			xs = append(xs, v)
		}
		if j == len(text) {
			break
		}
		text = text[j+1:]
	}
	var s float64
	for _, x := range xs {
		s += x
	}
	slices.Sort(xs)
	return s + xs[len(xs)/2]
}

// BenchmarkBaseline1M: parse + sum + slices.Sort of the same text.
func BenchmarkBaseline1M(b *testing.B) {
	text := benchData(1_000_000)
	b.SetBytes(int64(len(text)))
	for i := 0; i < b.N; i++ {
		baseline(text)
	}
}

func BenchmarkBaseline10M(b *testing.B) {
	text := benchData(10_000_000)
	b.SetBytes(int64(len(text)))
	for i := 0; i < b.N; i++ {
		baseline(text)
	}
}

// BenchmarkSort1M: the radix sort against slices.Sort on the same keys.
func BenchmarkSort1M(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 1))
	src := make([]float64, 1_000_000)
	for i := range src {
		src[i] = 500 + r.NormFloat64()
	}
	xs := make([]float64, len(src))
	b.Run("radix", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			copy(xs, src)
			decimal.SortFloats(xs)
		}
	})
	b.Run("slices.Sort", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			copy(xs, src)
			slices.Sort(xs)
		}
	})
}

// BenchmarkAnalyzeSpec1M is the full analysis with both limits and a
// target (the spec section on top of Analyze1M); BenchmarkAnalyzeSpecSkewed1M
// the same on right-skewed readings (lognormal, typed to 0.01), where the
// normal is rejected and the candidate distributions are fitted.
func BenchmarkAnalyzeSpec1M(b *testing.B) {
	text := benchData(1_000_000)
	lsl, usl, target := 495.0, 505.0, 500.0
	b.SetBytes(int64(len(text)))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Analyze(Request{Text: text, Options: Options{LSL: &lsl, USL: &usl, Target: &target}}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkAnalyzeSpecSkewed1M(b *testing.B) {
	r := rand.New(rand.NewPCG(13, 14))
	var sb strings.Builder
	for i := 0; i < 1_000_000; i++ {
		sb.WriteString(strconv.FormatFloat(2+math.Exp(1.9+0.45*r.NormFloat64()), 'f', 2, 64))
		sb.WriteByte('\n')
	}
	text := sb.String()
	usl := 40.0
	b.SetBytes(int64(len(text)))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rep, err := Analyze(Request{Text: text, Options: Options{USL: &usl}})
		if err != nil {
			b.Fatal(err)
		}
		if rep.Spec == nil || rep.Spec.Model == nil {
			b.Fatal("no fitted model")
		}
	}
}
