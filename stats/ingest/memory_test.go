package ingest

import (
	"math/rand"
	"runtime"
	"strconv"
	"testing"
)

// TestPeakMemory100MB streams 100 MB of numeric text (one value per line,
// 64 KB chunks, as the page feeds File.stream()) and checks that the heap
// never holds more than twice the parsed data: 8 bytes of value, 1 of
// decimals and 4 of row per cell. The text itself is not kept.
// Skipped with -short and under js/wasm (the test takes a few seconds).
func TestPeakMemory100MB(t *testing.T) {
	if testing.Short() || runtime.GOOS == "js" {
		t.Skip("100 MB memory test: run without -short, natively")
	}
	const total = 100 << 20
	const chunk = 64 << 10
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	base := ms.HeapInuse
	s := NewStream(ReadOptions{SizeHint: total})
	r := rand.New(rand.NewSource(9))
	buf := make([]byte, 0, chunk+32)
	buf = append(buf, "Weight (g)\n"...)
	var peak uint64
	written := 0
	for k := 0; written < total; k++ {
		for len(buf) < chunk && written+len(buf) < total {
			buf = strconv.AppendInt(buf, int64(480+r.Intn(40)), 10)
			buf = append(buf, '.')
			buf = strconv.AppendInt(buf, int64(100+r.Intn(900)), 10)
			buf = append(buf, '\n')
		}
		if _, err := s.Write(buf); err != nil {
			t.Fatal(err)
		}
		written += len(buf)
		buf = buf[:0]
		if k%16 == 0 {
			runtime.ReadMemStats(&ms)
			peak = max(peak, ms.HeapInuse-base)
		}
	}
	tab, err := s.Finish()
	if err != nil {
		t.Fatal(err)
	}
	runtime.ReadMemStats(&ms)
	peak = max(peak, ms.HeapInuse-base)
	c := tab.Columns[0]
	parsed := uint64(c.Len()) * (8 + 1 + 4)
	t.Logf("%d MB text, %d values: parsed data %.1f MB, peak heap in use %.1f MB (%.2fx), heap from the OS %.1f MB, max RSS %.1f MB",
		written>>20, c.Len(), float64(parsed)/1e6, float64(peak)/1e6, float64(peak)/float64(parsed), float64(ms.HeapSys)/1e6, float64(maxRSS())/1e6)
	if c.Bad != 0 || c.Numbers != c.Len() {
		t.Fatalf("%s", tab.Summary())
	}
	if peak > 2*parsed {
		t.Errorf("peak heap %d bytes is more than twice the parsed data (%d bytes)", peak, parsed)
	}
	runtime.KeepAlive(tab)
}
