package share

import (
	"bytes"
	"compress/flate"
	"encoding/base64"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// todayLink is the size of the page's link before this package (site/share.js,
// makeShareLink): JSON.stringify of {v, text, name, cols, options}, deflated
// ("deflate-raw", zlib's default level; flate.DefaultCompression here), then
// base64url without padding. Only the payload after "#d=" is counted.
func todayLink(t testing.TB, text string) int {
	type cols struct {
		Value    string `json:"value"`
		Group    string `json:"group"`
		Order    string `json:"order"`
		Subgroup string `json:"subgroup"`
	}
	type opts struct { // readSettings() with the page's defaults
		Confidence float64 `json:"confidence"`
		Quantile   string  `json:"quantile"`
	}
	var js bytes.Buffer
	enc := json.NewEncoder(&js)
	enc.SetEscapeHTML(false) // JSON.stringify does not escape <, >, &
	err := enc.Encode(struct {
		V       int    `json:"v"`
		Text    string `json:"text"`
		Name    string `json:"name"`
		Cols    cols   `json:"cols"`
		Options opts   `json:"options"`
	}{1, text, "", cols{}, opts{0.95, "hf7"}})
	if err != nil {
		t.Fatal(err)
	}
	b := bytes.TrimSuffix(js.Bytes(), []byte("\n"))
	var z bytes.Buffer
	w, _ := flate.NewWriter(&z, flate.DefaultCompression)
	w.Write(b)
	w.Close()
	return base64.RawURLEncoding.EncodedLen(z.Len())
}

// TestSizes holds the goal: a column of 10,000 readings at 0.01 resolution
// (about 5.00 g, SD 0.03 g) in at most 20 KB of link, and logs the sizes
// beside the page's link of before.
func TestSizes(t *testing.T) {
	for _, n := range []int{100, 1000, 10000, 100000} {
		if n == 100000 && testing.Short() {
			continue
		}
		text := readings(n, uint64(n))
		s, err := Encode(Payload{Created: 1795000000, Text: text, Options: Options{Confidence: 0.95, Quantile: "hf7"}})
		if err != nil {
			t.Fatal(err)
		}
		old := todayLink(t, text)
		t.Logf("%6d readings: text %7d B, link %6d characters (%.2f a reading), before %6d characters (%.1fx smaller)",
			n, len(text), len(s), float64(len(s))/float64(n), old, float64(old)/float64(len(s)))
		if n == 10000 && len(s) > 20000 {
			t.Errorf("10,000 readings take %d characters, more than 20,000", len(s))
		}
		if len(s) >= old {
			t.Errorf("%d readings: %d characters, not smaller than before (%d)", n, len(s), old)
		}
	}
}

// TestSizesTable logs a table of 10,000 rows as a spreadsheet copies it: a
// time, a line label and a reading, tab-separated, CRLF.
func TestSizesTable(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 5))
	var b strings.Builder
	b.WriteString("Sampled at\tLine\tFill weight (g)\r\n")
	for i := 0; i < 10000; i++ {
		fmt.Fprintf(&b, "2026-11-%02d %02d:%02d\t%c\t%.2f\r\n", 16+i/288, i/12%24, i*5%60, "AB"[rng.IntN(2)], 5+0.03*rng.NormFloat64())
	}
	text := b.String()
	s, err := Encode(Payload{Created: 1795000000, Text: text, Value: "Fill weight (g)", Order: "Sampled at", Group: "Line"})
	if err != nil {
		t.Fatal(err)
	}
	old := todayLink(t, text)
	t.Logf("10000-row table: text %d B, link %d characters, before %d characters (%.1fx smaller)", len(text), len(s), old, float64(old)/float64(len(s)))
	if len(s) >= old {
		t.Errorf("not smaller than before")
	}
}

func BenchmarkEncode100k(b *testing.B) {
	p := Payload{Created: 1795000000, Text: readings(100000, 7)}
	b.SetBytes(int64(len(p.Text)))
	for b.Loop() {
		if _, err := Encode(p); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkDecode100k(b *testing.B) {
	s, err := Encode(Payload{Created: 1795000000, Text: readings(100000, 7)})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportMetric(float64(len(s)), "chars")
	for b.Loop() {
		if _, err := Decode(s); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkToday100k is the page's link of before on the same data, for ratios.
func BenchmarkToday100k(b *testing.B) {
	text := readings(100000, 7)
	for b.Loop() {
		todayLink(b, text)
	}
}
