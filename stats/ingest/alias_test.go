package ingest

import (
	"strings"
	"testing"
)

// The sniffing pass reads cells in place (no copy per cell); whatever the
// table keeps from it (header names, units) must not alias the caller's
// chunk, which the page's worker reuses for the next chunk.
func TestChunkBufferReuse(t *testing.T) {
	var b strings.Builder
	b.WriteString("Lot;Weight (g);Length;Note\n")
	for i := 0; i < 15000; i++ {
		b.WriteString("A;12,5 g;3,25 mm;ok\n")
	}
	b.WriteString("1;2 3\n") // a quoteless short row
	text := []byte(b.String())
	want, err := Read(string(text))
	if err != nil {
		t.Fatal(err)
	}
	for _, size := range []int{SniffBytes, SniffBytes/2 + 1000, 4096} {
		s := NewStream(ReadOptions{})
		buf := make([]byte, size)
		for p := text; len(p) > 0; {
			n := copy(buf, p)
			if _, err := s.Write(buf[:n]); err != nil {
				t.Fatal(err)
			}
			p = p[n:]
			for i := range buf {
				buf[i] = 'x' // the caller reuses its buffer
			}
		}
		got, err := s.Finish()
		if err != nil {
			t.Fatal(err)
		}
		if d := diffTables(want, got); d != "" {
			t.Fatalf("chunks of %d bytes in a reused buffer: %s", size, d)
		}
		w, l := got.Column("Weight"), got.Column("Length")
		if w == nil || w.Unit != "g" || w.Header != "Weight (g)" || !w.DecimalComma || l == nil || l.Unit != "mm" {
			t.Fatalf("chunks of %d bytes: %+v", size, got.Infos())
		}
	}
}
