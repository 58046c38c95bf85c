package share

import (
	"bytes"
	"compress/flate"
	"crypto/sha256"
	"encoding/base64"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"hash/crc32"
	"math/rand/v2"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

func codeOf(err error) Code {
	var e *Error
	if errors.As(err, &e) {
		return e.Code
	}
	return ""
}

// TestRoundTrip: encode then decode gives the identical payload and the
// identical text bytes, over generated data sets; and the table form alone
// gives back every text it takes (so the raw fallback cannot hide a bug).
func TestRoundTrip(t *testing.T) {
	n := 3000
	if testing.Short() {
		n = 400
	}
	rng := rand.New(rand.NewPCG(13, 2026))
	forms := map[byte]int{}
	for i := 0; i < n; i++ {
		text := genText(rng)
		p := genPayload(rng, text)
		if tab, ok := encodeTable(text); ok {
			back, err := decodeTable(tab, len(text))
			if err != nil || back != text {
				t.Fatalf("set %d: table form gives back %q (%v), want %q", i, back, err, text)
			}
		}
		_, _, form := build(p)
		forms[form]++
		s, err := Encode(p)
		if err != nil {
			t.Fatalf("set %d: %v", i, err)
		}
		if !strings.HasPrefix(s, LinkPrefix) || strings.ContainsAny(s, "+/=") {
			t.Fatalf("set %d: not base64url with the prefix: %.40s", i, s)
		}
		q, err := Decode(s)
		if err != nil {
			t.Fatalf("set %d: %v", i, err)
		}
		if !reflect.DeepEqual(p, q) {
			t.Fatalf("set %d: payload changed:\n got %+v\nwant %+v", i, q, p)
		}
		if q.Text != text || q.Fingerprint() != p.Fingerprint() {
			t.Fatalf("set %d: text bytes changed", i)
		}
		f, err := EncodeFile(p)
		if err != nil {
			t.Fatal(err)
		}
		q, err = DecodeFile(f)
		if err != nil || !reflect.DeepEqual(p, q) {
			t.Fatalf("set %d: file round trip: %v", i, err)
		}
	}
	// Both forms must have been exercised, the table form mostly.
	if forms[formTable] < n/2 || forms[formRaw] == 0 {
		t.Errorf("forms used: %v", forms)
	}
	t.Logf("forms used: raw %d, table %d", forms[formRaw], forms[formTable])
}

// TestTypedForms: cells that are plain decimals are coded as numbers, every
// irregular one as text, and both come back as typed.
func TestTypedForms(t *testing.T) {
	for _, c := range []struct {
		cell string
		mark byte
		num  bool
	}{
		{"5.10", '.', true}, {"5.1", '.', true}, {"5", '.', true}, {"0", '.', true},
		{"0.000001", '.', true}, {"-0.05", '.', true}, {"-12", '.', true},
		{"5,10", ',', true}, {"123456789012345678", '.', true},
		{"1234567890123456789", '.', false}, // 19 digits
		{"-0", '.', false}, {"-0.00", '.', false}, {"05.1", '.', false}, {"00", '.', false},
		{".5", '.', false}, {"5.", '.', false}, {"+5", '.', false}, {" 5", '.', false},
		{"5 ", '.', false}, {"5e3", '.', false}, {"5,1", '.', false}, {"5.1", ',', false},
		{"−5", '.', false}, {"", '.', false}, {"-", '.', false}, {"NA", '.', false},
	} {
		m, d, ok := parseDec(c.cell, c.mark)
		if ok != c.num {
			t.Errorf("%q: number %v, want %v", c.cell, ok, c.num)
			continue
		}
		if ok {
			if got := string(appendDec(nil, m, d, c.mark)); got != c.cell {
				t.Errorf("%q comes back as %q", c.cell, got)
			}
		}
	}
}

// samplePayload is a small payload with every kind of content: 40 invented
// torque readings with a time and a line, decimal commas, a missing marker.
func samplePayload() Payload {
	var b strings.Builder
	b.WriteString("Time;Line;Torque (N·m)\r\n")
	for i := 0; i < 40; i++ {
		v := strconv.FormatFloat(12.35+float64((i*37)%17-8)/100, 'f', 2, 64)
		if i == 7 {
			v = "NA"
		}
		fmt.Fprintf(&b, "2026-11-16 %02d:%02d;%c;%s\r\n", 6+i/12, i*5%60, "AB"[i%2], strings.Replace(v, ".", ",", 1))
	}
	return Payload{
		Created: 1795000000,
		Name:    "torque-line4.csv",
		Text:    b.String(),
		Value:   "Torque (N·m)", Order: "Time", Group: "Line",
		Options: Options{Unit: "N·m", Target: ptr(12.35), LSL: ptr(12), USL: ptr(12.7), Confidence: 0.99,
			Quantile: "hf6", PopulationSD: true, Exclude: []int{3}, DecimalMark: "comma", WithinSigma: "moving-range", Coverage: 0.999, CpkGoal: 1.67,
			ExcludeReasons: map[int]string{3: "gauge dropped"},
			Baseline:       "2-13, 20", Signals: map[string]bool{"alternating": true, "cusum": false}, EWMALambda: 0.1, EWMAL: 2.7,
			CUSUMK: 0.25, CUSUMH: 8, ChartSpread: "range"},
	}
}

// TestTamper: every single-byte change and every truncation of a sample
// link and of a sample file is refused with the right code.
func TestTamper(t *testing.T) {
	p := samplePayload()
	if _, _, form := build(p); form != formTable {
		t.Fatalf("the sample should use the table form")
	}
	s, err := Encode(p)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("sample link payload: %d characters", len(s))
	changes := 0
	for i := 0; i < len(s); i++ {
		for c := 0; c < 256; c++ {
			if byte(c) == s[i] {
				continue
			}
			bad := s[:i] + string(rune(c)) + s[i+1:]
			if c >= 0x80 {
				bad = s[:i] + string([]byte{byte(c)}) + s[i+1:]
			}
			q, err := Decode(bad)
			if code := codeOf(err); code != CodeCorrupt {
				t.Fatalf("byte %d changed to %#x: code %q (%v), payload %+v", i, c, code, err, q)
			}
			changes++
		}
	}
	for k := 0; k < len(s); k++ {
		_, err := Decode(s[:k])
		want := CodeTruncated
		if k == 0 {
			want = CodeEmpty
		}
		if code := codeOf(err); code != want {
			t.Fatalf("cut to %d characters: code %q (%v), want %q", k, code, err, want)
		}
	}
	// Extra characters at the end are a change too.
	for _, tail := range []string{"A", "AA", "AAA", "AAAA", "x"} {
		if code := codeOf(firstErr(Decode(s + tail))); code != CodeCorrupt {
			t.Errorf("with %q added: code %q", tail, code)
		}
	}
	f, err := EncodeFile(p)
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < len(f); i++ {
		for c := 0; c < 256; c++ {
			if byte(c) == f[i] {
				continue
			}
			bad := bytes.Clone(f)
			bad[i] = byte(c)
			q, err := DecodeFile(bad)
			if code := codeOf(err); code != CodeCorrupt {
				t.Fatalf("file byte %d changed to %#x: code %q (%v), payload %+v", i, c, code, err, q)
			}
			changes++
		}
	}
	for k := 0; k < len(f); k++ {
		_, err := DecodeFile(f[:k])
		want := CodeTruncated
		if k == 0 {
			want = CodeEmpty
		}
		if code := codeOf(err); code != want {
			t.Fatalf("file cut to %d bytes: code %q (%v), want %q", k, code, err, want)
		}
	}
	t.Logf("%d single-byte changes refused", changes)
}

func firstErr(_ Payload, err error) error { return err }

// frame wraps a body as Marshal does, with a declared inflated size and
// version of the test's choosing: hand-made payloads with good checksums.
func frame(version byte, body []byte, declared uint32) []byte {
	var z bytes.Buffer
	z.Write(make([]byte, headerLen))
	w, _ := flate.NewWriter(&z, flate.BestSpeed)
	w.Write(body)
	w.Close()
	out := z.Bytes()
	copy(out, magic[:])
	out[3] = version
	binary.BigEndian.PutUint32(out[4:], uint32(len(out)-headerLen))
	binary.BigEndian.PutUint32(out[8:], declared)
	binary.BigEndian.PutUint32(out[12:], crc32.Checksum(out[:12], castagnoli()))
	return binary.BigEndian.AppendUint32(out, crc32.Checksum(out, castagnoli()))
}

func link(b []byte) string { return base64.RawURLEncoding.EncodeToString(b) }

// TestDecodeErrors: each kind of bad input gets its code and a message
// that says what to ask the sender for.
func TestDecodeErrors(t *testing.T) {
	good, _, _ := build(samplePayload())
	other := Payload{Text: "5.00\n5.01\n"}
	otherBody, _, _ := build(other)
	otherSum := sha256.Sum256([]byte(other.Text))
	for _, c := range []struct {
		name string
		in   string
		want Code
	}{
		{"empty", "", CodeEmpty},
		{"random text", "hello world", CodeForeign},
		{"JSON null", "null", CodeForeign},
		{"old page link", "d=q1YqU7IyqDHUK0nOz1Wy", CodeForeign},
		{"not base64", "Lotl!!!!", CodeCorrupt},
		{"prefix only", "Lotl", CodeTruncated},
		{"newer version", link(frame(2, good, uint32(len(good)))), CodeVersion},
		{"version 0", link(frame(0, good, uint32(len(good)))), CodeCorrupt},
		{"declared size too small", link(frame(1, good, uint32(len(good)-1))), CodeCorrupt},
		{"declared size too large", link(frame(1, good, uint32(len(good)+1))), CodeCorrupt},
		{"body with bytes after it", link(frame(1, append(bytes.Clone(good), 0), uint32(len(good)+1))), CodeCorrupt},
		{"body cut", link(frame(1, good[:len(good)-3], uint32(len(good)-3))), CodeCorrupt},
		{"text of another fingerprint", link(frame(1, bytes.Replace(otherBody, otherSum[:], make([]byte, 32), 1), uint32(len(otherBody)))), CodeCorrupt},
		{"empty body", link(frame(1, nil, 0)), CodeCorrupt},
	} {
		_, err := Decode(c.in)
		if code := codeOf(err); code != c.want {
			t.Errorf("%s: code %q (%v), want %q", c.name, code, err, c.want)
			continue
		}
		msg := err.Error()
		if !strings.Contains(msg, "ask the sender") && !strings.Contains(msg, "check that the whole link") {
			t.Errorf("%s: the message does not say what to do: %s", c.name, msg)
		}
		if strings.Contains(msg, "base64") || strings.Contains(msg, "flate") {
			t.Errorf("%s: technical message: %s", c.name, msg)
		}
	}
	// A file that is not ours, and a file holding a link.
	if _, err := DecodeFile([]byte("Weight\n5.1\n")); codeOf(err) != CodeForeign {
		t.Errorf("foreign file: %v", err)
	}
	s, _ := Encode(samplePayload())
	if p, err := DecodeFile([]byte("\n" + s + "\r\n")); err != nil || !reflect.DeepEqual(p, samplePayload()) {
		t.Errorf("file holding a link: %v", err)
	}
	// A file whose first line says another version than its frame.
	f, _ := EncodeFile(samplePayload())
	f2 := bytes.Replace(f, []byte("format 1"), []byte("format 7"), 1)
	if _, err := DecodeFile(f2); codeOf(err) != CodeCorrupt {
		t.Errorf("first line of another version: %v", err)
	}
	f3 := append([]byte(strings.Replace(FileHeader, "1", "2", 1)), frame(2, good, uint32(len(good)))...)
	if _, err := DecodeFile(f3); codeOf(err) != CodeVersion {
		t.Errorf("a newer file: %v", err)
	}
}

// TestEncodeErrors: no link without data, none beyond the size cap.
func TestEncodeErrors(t *testing.T) {
	if _, err := Encode(Payload{}); codeOf(err) != CodeEmpty {
		t.Errorf("empty text: %v", err)
	}
	if _, err := EncodeFile(Payload{Text: strings.Repeat("5.1\n", MaxDecoded/4+1)}); codeOf(err) != CodeTooLarge {
		t.Errorf("too large: %v", err)
	}
}

// TestBomb: a small payload that would unpack to more than MaxDecoded is
// refused without unpacking it, and one that lies about its size is refused
// after at most its declared size.
func TestBomb(t *testing.T) {
	zeros := make([]byte, MaxDecoded+1)
	honest := frame(1, zeros, uint32(len(zeros)))
	liar := frame(1, zeros, 1000)
	t.Logf("bomb: %d bytes unpacking to %d", len(honest), len(zeros))
	zeros = nil
	var m0, m1 runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&m0)
	if _, err := Decode(link(honest)); codeOf(err) != CodeTooLarge {
		t.Errorf("honest bomb: %v", err)
	}
	if _, err := Unmarshal(liar); codeOf(err) != CodeCorrupt {
		t.Errorf("lying bomb: %v", err)
	}
	// A table body declaring a text beyond the cap.
	p := Payload{Text: "5.1\n"}
	body, _, _ := build(p)
	i := bytes.IndexByte(body, 4) // the text length: every byte before it is 0 for this payload
	big := append(bytes.Clone(body[:i]), binary.AppendUvarint(nil, MaxDecoded+1)...)
	big = append(big, body[i+1:]...)
	if _, err := Unmarshal(frame(1, big, uint32(len(big)))); codeOf(err) != CodeTooLarge {
		t.Errorf("text beyond the cap: %v", err)
	}
	// A table form whose lines would make more text than it declares.
	tab := []byte{eolLF, 0, 0}
	tab = binary.AppendUvarint(tab, 60)     // lines
	tab = binary.AppendUvarint(tab, 1)      // one run
	tab = binary.AppendUvarint(tab, 1)      // of one field
	tab = binary.AppendUvarint(tab, 60)     // for 60 lines
	tab = append(tab, '.', 1, 60, 120)      // column: one text run of 60 cells, 120 bytes of text:
	tab = append(tab, make([]byte, 120)...) // each cell 0 bytes shared, 0 more
	if got, err := decodeTable(tab, 59); err != nil || got != strings.Repeat("\n", 59) {
		t.Errorf("the hand-made table: %q, %v", got, err)
	}
	if _, err := decodeTable(tab, 50); err == nil { // 59 line ends > 50 bytes
		t.Errorf("a table longer than declared was accepted")
	}
	runtime.ReadMemStats(&m1)
	if grew := m1.TotalAlloc - m0.TotalAlloc; grew > 3*MaxDecoded/2 {
		t.Errorf("decoding the bombs allocated %d bytes", grew)
	}
}

// TestSamples: the committed samples of format 1 still decode to the
// payload they were made from (testdata/share/README.md).
func TestSamples(t *testing.T) {
	want := samplePayload()
	s, err := readSample("sample.link")
	if err != nil {
		t.Fatal(err)
	}
	p, err := Decode(strings.TrimSpace(string(s)))
	if err != nil || !reflect.DeepEqual(p, want) {
		t.Errorf("sample.link: %v\n got %+v\nwant %+v", err, p, want)
	}
	f, err := readSample("sample" + FileExt)
	if err != nil {
		t.Fatal(err)
	}
	p, err = DecodeFile(f)
	if err != nil || !reflect.DeepEqual(p, want) {
		t.Errorf("sample%s: %v", FileExt, err)
	}
}

// TestOptionsJSON: the options have the engine's JSON names (checked
// against stats.Options in the external test).
func TestOptionsJSON(t *testing.T) {
	b, err := json.Marshal(samplePayload().Options)
	if err != nil {
		t.Fatal(err)
	}
	var o Options
	if err := json.Unmarshal(b, &o); err != nil || !reflect.DeepEqual(o, samplePayload().Options) {
		t.Errorf("options through JSON: %s, %v", b, err)
	}
}
