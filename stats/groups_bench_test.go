package stats

import (
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"lotlens/stats/ingest"
)

// Speed of the Groups section: 1,000,000 readings in 10 groups (invented
// fill weights, 2 decimals, a group column). In the same run: the reader,
// the engine on its table without the group choice, and with it; the
// full analysis is the reader plus the engine, and the section's cost is
// the difference the group choice makes. The goal: the section
// adds at most 50 % to the full analysis. Run:
//
//	go test -run '^$' -bench Groups1M -benchtime 3x ./stats/
func BenchmarkGroups1M(b *testing.B) {
	r := rand.New(rand.NewPCG(21, 22))
	var sb strings.Builder
	sb.WriteString("Line\tWeight (g)\n")
	for i := 0; i < 1_000_000; i++ {
		g := i % 10
		sb.WriteString("L")
		sb.WriteString(strconv.Itoa(g))
		sb.WriteByte('\t')
		sb.WriteString(strconv.FormatFloat(500+0.02*float64(g)+1.5*r.NormFloat64(), 'f', 2, 64))
		sb.WriteByte('\n')
	}
	text := sb.String()
	plain := Request{Value: "Weight"}
	grouped := Request{Value: "Weight", Group: "Line"}
	var tRead, tBase, tGroups time.Duration
	fastest := func(d *time.Duration, t time.Duration, first bool) {
		if first || t < *d {
			*d = t
		}
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		t0 := time.Now()
		tab, err := ingest.Read(text)
		if err != nil {
			b.Fatal(err)
		}
		t1 := time.Now()
		if _, err := AnalyzeTable(tab, "", plain); err != nil {
			b.Fatal(err)
		}
		t2 := time.Now()
		rep, err := AnalyzeTable(tab, "", grouped)
		if err != nil || rep.Groups == nil || len(rep.Groups.Levels) != 10 {
			b.Fatal(err)
		}
		t3 := time.Now()
		// the fastest of each part: the machine is shared, and load only adds
		fastest(&tRead, t1.Sub(t0), i == 0)
		fastest(&tBase, t2.Sub(t1), i == 0)
		fastest(&tGroups, t3.Sub(t2), i == 0)
	}
	full := tRead + tBase
	b.ReportMetric(float64(full.Milliseconds()), "ms/full")
	b.ReportMetric(float64((tGroups - tBase).Milliseconds()), "ms/groups")
	b.ReportMetric(100*float64(tGroups-tBase)/float64(full), "%added")
}
