package ingest

import (
	"os"
	"path/filepath"
	"testing"
	"time"
)

// FuzzRead: no input makes the reader panic, hang or return a table that
// breaks its invariants, and a chunked read (with a small sniffing window,
// so that chunks arrive after the layout is decided) gives the same table
// or the same error as a whole read.
//
//	go test -run '^$' -fuzz FuzzRead -parallel 1 -fuzztime 10m ./stats/ingest/
func FuzzRead(f *testing.F) {
	for _, dir := range []string{"", "bad"} {
		files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "ingest", dir, "*.*"))
		for _, name := range files {
			b, err := os.ReadFile(name)
			if err == nil && len(b) < 4096 {
				f.Add(b, uint8(7))
			}
		}
	}
	for _, s := range []string{"", "1", "1,5\n2,5", "a\tb\n1\t2\n", "\"x\n", "1 2 3", "\xff\xfe1\x002\x00", "12.5 g\n1e999\n-\n#N/A"} {
		f.Add([]byte(s), uint8(1))
	}
	f.Fuzz(func(t *testing.T, data []byte, step uint8) {
		done := make(chan bool)
		go func() {
			defer close(done)
			fuzzOne(t, data, step)
		}()
		select {
		case <-done:
		case <-time.After(20 * time.Second):
			t.Fatalf("the reader took more than 20 s on %d bytes", len(data))
		}
	})
}

func fuzzOne(t *testing.T, data []byte, step uint8) {
	{
		whole, werr := readChunks(data, []int{len(data) + 1}, 32, ReadOptions{})
		if werr == nil {
			checkInvariants(t, whole)
		}
		sizes := []int{int(step%17) + 1, int(step/17) + 1, 3}
		got, gerr := readChunks(data, sizes, 32, ReadOptions{})
		if (werr == nil) != (gerr == nil) || (werr != nil && werr.Error() != gerr.Error()) {
			t.Fatalf("errors differ: %v vs %v", werr, gerr)
		}
		if werr == nil {
			if d := diffTables(whole, got); d != "" {
				t.Fatalf("chunked read differs: %s", d)
			}
		}
		// the default window on the whole input
		if tab, err := ReadBytes(data, ReadOptions{DecimalMark: "point", DateOrder: "month"}); err == nil {
			checkInvariants(t, tab)
		}
	}
}
