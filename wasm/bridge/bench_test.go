package bridge

import (
	"encoding/json"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats"
	"lotlens/stats/chart"
)

// paste10k is the page benchmark's 10,000 invented readings (site/bench_test.go:
// the same generator), as a request the page would send.
func paste10k() []byte {
	var sb strings.Builder
	x := int64(1)
	for i := 0; i < 10000; i++ {
		x = x * 16807 % 2147483647
		sb.WriteString(strconv.FormatFloat(5+(float64(x)/2147483647-0.5)*0.4, 'f', 3, 64))
		sb.WriteByte('\n')
	}
	b, _ := json.Marshal(map[string]any{"schema": "lotlens.request/1", "text": sb.String(), "options": map[string]any{"confidence": 0.95, "quantile": "hf7"}})
	return b
}

// BenchmarkSession10k is the worker's whole call for a 10,000-value paste
// (request JSON in, report JSON and charts out), and its parts, for
// profiling (-cpuprofile) the path the page's speed goal covers.
func BenchmarkSession10k(b *testing.B) {
	req := paste10k()
	b.Run("all", func(b *testing.B) {
		var s Session
		for i := 0; i < b.N; i++ {
			j, svg := s.Analyze(req, false)
			if len(j) < 1000 || len(svg) == 0 {
				b.Fatalf("no report: %.200s", j)
			}
		}
	})
	b.Run("request", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			var r stats.Request
			if err := json.Unmarshal(req, &r); err != nil {
				b.Fatal(err)
			}
		}
	})
	var r stats.Request
	if err := json.Unmarshal(req, &r); err != nil {
		b.Fatal(err)
	}
	b.Run("analyze", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			if _, err := stats.Analyze(r); err != nil {
				b.Fatal(err)
			}
		}
	})
	rep, err := stats.Analyze(r)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("marshal", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			j := stats.ReportJSON(rep, nil)
			b.SetBytes(int64(len(j)))
		}
	})
	b.Run("charts", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			svg := chart.All(rep)
			n := 0
			for _, v := range svg {
				n += len(v)
			}
			b.SetBytes(int64(n))
		}
	})
}
