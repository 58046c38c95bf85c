package stats

import (
	"runtime"
	"slices"
	"testing"
	"time"

	"lotlens/stats/decimal"
	"lotlens/stats/ingest"
)

// BenchmarkStability1M: the share of the "Over time" section (within
// sigma, chart, every check, EWMA, CUSUM, drift tests, change point) in
// the full analysis of 1,000,000 readings, measured in the same run:
// "stability%" is the section's time over the time of everything else
// (the full analysis less the section; goal: at most 30 %). Run with
//
//	go test -run '^$' -bench Stability1M -benchtime 3x ./stats/
func BenchmarkStability1M(b *testing.B) {
	text := benchData(1_000_000)
	tab, err := ingest.Read(text)
	if err != nil {
		b.Fatal(err)
	}
	col := tab.Columns[0]
	cv := &colView{name: col.Name, rows: col.Rows, vals: col.Values, dec: col.Dec, text: col.Text}
	// the sorted sample the engine shares with the section (benchData is
	// typed to 0.01)
	g, _ := decimal.NewGrid(2)
	sorted := slices.Clone(col.Values)
	if !g.CountSort(sorted) {
		decimal.SortFloats(sorted)
	}
	dm, ok := g.PowerSums(sorted).Moments(g)
	if !ok {
		b.Fatal("no exact moments")
	}
	smp := newSample(sorted, g, fromDecimal(dm), quantileDef(DefaultQuantile), DefaultQuantile)
	var full, part time.Duration
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		runtime.GC() // each timing starts from the same clean heap
		t0 := time.Now()
		if _, err := Analyze(Request{Text: text}); err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		runtime.GC()
		t2 := time.Now()
		st, _ := buildStability(words{}, cv, estimateWithin(cv, nil, ""), smp, Options{Confidence: 0.95})
		t3 := time.Now()
		if st == nil || st.Chart == nil {
			b.Fatal("no chart")
		}
		full += t1.Sub(t0)
		part += t3.Sub(t2)
	}
	b.StopTimer()
	b.ReportMetric(float64(full.Milliseconds())/float64(b.N), "fullms/op")
	b.ReportMetric(float64(part.Milliseconds())/float64(b.N), "stabilityms/op")
	b.ReportMetric(100*float64(part)/float64(full-part), "stability%")
}
