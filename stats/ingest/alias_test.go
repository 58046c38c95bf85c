package ingest

import (
	"math/rand"
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

// classify's shortcut for plain decimals decides as the general path does.
func TestClassifyPlainDecimal(t *testing.T) {
	r := rand.New(rand.NewSource(3))
	alpha := "0123456789.,-"
	plain := 0
	for i := 0; i < 200000; i++ {
		b := make([]byte, 1+r.Intn(9))
		for k := range b {
			b[k] = alpha[r.Intn(len(alpha))]
		}
		s := string(b)
		if _, ok := plainDecimal(s); ok {
			plain++
		}
		got, want := classify(s), classifyAny(s)
		same := got.text == want.text && got.cls == want.cls && got.ev == want.ev && got.unit == want.unit &&
			(got.date == nil) == (want.date == nil) && (got.date == nil || *got.date == *want.date)
		if !same {
			t.Fatalf("%q: %+v, general path %+v", s, got, want)
		}
	}
	if plain < 1000 {
		t.Fatalf("only %d plain decimals drawn", plain)
	}
}
