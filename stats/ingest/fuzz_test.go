package ingest

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime/debug"
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
		// run in a goroutine so that a hang is reported with its input
		done := make(chan struct{})
		var fail string
		go func() {
			defer close(done)
			defer func() {
				if r := recover(); r != nil {
					fail = fmt.Sprintf("%v\n%s", r, debug.Stack())
				}
			}()
			fuzzOne(panicTB{t}, data, step)
		}()
		select {
		case <-done:
			if fail != "" {
				t.Fatal(fail)
			}
		case <-time.After(30 * time.Second):
			t.Fatalf("the reader took more than 30 s on %d bytes", len(data))
		}
	})
}

// panicTB turns Fatalf into a panic, caught by the fuzz goroutine.
type panicTB struct{ testing.TB }

func (p panicTB) Fatalf(format string, args ...any) { panic(fmt.Sprintf(format, args...)) }
func (p panicTB) Fatal(args ...any)                 { panic(fmt.Sprint(args...)) }
func (p panicTB) Helper()                           {}

func fuzzOne(t testing.TB, data []byte, step uint8) {
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
	// the default window on the whole input, other options
	if tab, err := ReadBytes(data, ReadOptions{DecimalMark: "point", DateOrder: "month"}); err == nil {
		checkInvariants(t, tab)
	}
}
