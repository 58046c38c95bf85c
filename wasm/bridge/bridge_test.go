package bridge

import (
	"bytes"
	"encoding/json"
	"errors"
	"os"
	"strings"
	"testing"

	"lotlens/stats"
	"lotlens/stats/ingest"
)

type result struct {
	Report *stats.Report
	SVG    map[string]string
	Error  string
}

// decode reads an answer of the bridge: JSON (report or error) and charts.
func decode(t *testing.T, b []byte, svg map[string]string) result {
	t.Helper()
	var e struct {
		Error string `json:"error"`
	}
	if err := json.Unmarshal(b, &e); err != nil {
		t.Fatalf("not JSON: %v: %s", err, b)
	}
	if e.Error != "" {
		if svg != nil {
			t.Errorf("charts given with an error")
		}
		return result{Error: e.Error}
	}
	var r result
	if err := json.Unmarshal(b, &r.Report); err != nil {
		t.Fatal(err)
	}
	r.SVG = svg
	return r
}

func (s *Session) run(t *testing.T, req string, useTable bool) result {
	t.Helper()
	b, svg := s.Analyze([]byte(req), useTable)
	return decode(t, b, svg)
}

func feed(t *testing.T, s *Session, data []byte, chunk int) {
	t.Helper()
	s.Begin("test.txt", int64(len(data)))
	for i := 0; i < len(data); i += chunk {
		j := min(i+chunk, len(data))
		n, err := s.Write(data[i:j])
		if err != nil {
			t.Fatal(err)
		}
		if n != int64(j) {
			t.Fatalf("bytes read %d, want %d", n, j)
		}
	}
}

func TestFingerprintWhileStreaming(t *testing.T) {
	data := []byte("5.12\n5.08\n5.10\n")
	var s Session
	feed(t, &s, data, 4) // chunk edges fall inside values
	var end struct {
		Fingerprint string `json:"fingerprint"`
		Bytes       int64  `json:"bytes"`
		Error       string `json:"error"`
	}
	if err := json.Unmarshal(s.End(""), &end); err != nil || end.Error != "" {
		t.Fatalf("end: %v %s", err, end.Error)
	}
	// sha256sum (GNU coreutils 9.1) of the same 15 bytes.
	if want := "31f51fd5706103f52a2d313c1446945b0b7d9d39a16d18368e6698640ee0fde3"; end.Fingerprint != want {
		t.Errorf("fingerprint %s, want %s", end.Fingerprint, want)
	}
	if end.Bytes != 15 {
		t.Errorf("bytes %d, want 15", end.Bytes)
	}
}

// The fingerprint comes from the caller's digest only when the reader kept
// the bytes and the digest has the form of a SHA-256; otherwise the reader
// hashes: a malformed digest, and a file that outgrows the bytes kept (no
// size given up front, so the switch happens mid-file and the bytes
// already kept must be hashed first).
func TestFingerprintDigestGiven(t *testing.T) {
	data := []byte("5.12\n5.08\n5.10\n")
	// sha256sum (GNU coreutils 9.1) of the same 15 bytes, as above.
	const sum = "31f51fd5706103f52a2d313c1446945b0b7d9d39a16d18368e6698640ee0fde3"
	end := func(s *Session, digest string) string {
		var e struct {
			Fingerprint string `json:"fingerprint"`
			Error       string `json:"error"`
		}
		if err := json.Unmarshal(s.End(digest), &e); err != nil || e.Error != "" {
			t.Fatalf("end: %v %s", err, e.Error)
		}
		return e.Fingerprint
	}
	// a well-formed digest is taken as given (the page's Web Crypto computed it)
	given := strings.Repeat("0123456789abcdef", 4)
	var s Session
	feed(t, &s, data, 4)
	if fp := end(&s, given); fp != given {
		t.Errorf("given digest: fingerprint %s, want %s", fp, given)
	}
	if rep := s.run(t, `{"options":{}}`, true); rep.Report.Input.Fingerprint != given {
		t.Errorf("given digest: report fingerprint %s", rep.Report.Input.Fingerprint)
	}
	for _, bad := range []string{"", "xyz", strings.ToUpper(sum), sum[:63], sum + "0"} {
		feed(t, &s, data, 4)
		if fp := end(&s, bad); fp != sum {
			t.Errorf("digest %q: fingerprint %s, want the reader's own %s", bad, fp, sum)
		}
	}
	// bytes not kept: the reader's own hash of every byte, whatever is given
	for _, max := range []int{0, 5, 9, 14} {
		s.Begin("grows.txt", 0)
		s.rd = newChunkReader(0, max)
		for i := 0; i < len(data); i += 4 {
			if _, err := s.Write(data[i:min(i+4, len(data))]); err != nil {
				t.Fatal(err)
			}
		}
		if fp := end(&s, given); fp != sum {
			t.Errorf("kept at most %d bytes: fingerprint %s, want %s", max, fp, sum)
		}
	}
}

// A file read in chunks gives the same report as the same text pasted.
func TestChunkedEqualsPasted(t *testing.T) {
	data, err := os.ReadFile("../../testdata/nist/Michelso.dat")
	if err != nil {
		t.Fatal(err)
	}
	req, _ := json.Marshal(stats.Request{Text: string(data)})
	pasted := new(Session).run(t, string(req), false)
	if pasted.Error != "" {
		t.Fatal(pasted.Error)
	}
	if pasted.Report.Charts != nil && len(pasted.SVG) == 0 {
		t.Error("the report has chart data but no chart was drawn")
	}
	for _, chunk := range []int{1, 7, 4096, len(data)} {
		var s Session
		feed(t, &s, data, chunk)
		s.End("")
		got := s.run(t, `{"options":{}}`, true)
		if got.Error != "" {
			t.Fatalf("chunk %d: %s", chunk, got.Error)
		}
		a, _ := json.Marshal(got.Report)
		b, _ := json.Marshal(pasted.Report)
		if !bytes.Equal(a, b) {
			t.Errorf("chunk size %d: report differs from the pasted one\n%s\n%s", chunk, a, b)
		}
		// settings change: the kept table is analysed again, nothing re-read
		again := s.run(t, `{"options":{"confidence":0.99}}`, true)
		if again.Error != "" || again.Report.Counts.Used != pasted.Report.Counts.Used {
			t.Errorf("re-analysis of the kept table failed: %+v", again.Error)
		}
	}
}

func TestCancelAndErrors(t *testing.T) {
	var s Session
	if _, err := s.Write([]byte("1\n")); err == nil {
		t.Error("write without begin accepted")
	}
	feed(t, &s, []byte("1\n2\n3\n"), 2)
	s.Cancel()
	if r := decode(t, s.End(""), nil); r.Error == "" {
		t.Error("end after cancel gave no error")
	}
	if r := s.run(t, `{}`, true); !strings.Contains(r.Error, "no file") {
		t.Errorf("analysis without a file: error %q", r.Error)
	}
	if r := s.run(t, `{not json`, false); !strings.Contains(r.Error, "not valid JSON") {
		t.Errorf("bad JSON: error %q", r.Error)
	}
	if r := s.run(t, `{"text":"   "}`, false); r.Error == "" {
		t.Error("empty text gave no error")
	}
}

// errorCode reads the code of a JSON error object.
func errorCode(t *testing.T, b []byte) (msg, code string) {
	t.Helper()
	var e struct {
		Error string `json:"error"`
		Code  string `json:"code"`
	}
	if err := json.Unmarshal(b, &e); err != nil {
		t.Fatalf("not JSON: %v: %s", err, b)
	}
	return e.Error, e.Code
}

// A panic inside the engine becomes an error object with code "internal",
// and the session keeps working afterwards.
func TestPanicBecomesError(t *testing.T) {
	var s Session
	s.analyze = func(stats.Request, *ingest.Table, string) (*stats.Report, error) {
		var m map[string]int
		m["boom"] = 1 // a nil-map write: a real runtime panic
		return nil, nil
	}
	b, svg := s.Analyze([]byte(`{"text":"1\n2\n3\n"}`), false)
	if msg, code := errorCode(t, b); code != stats.CodeInternal || !strings.Contains(msg, "internal error") || svg != nil {
		t.Errorf("panic gave %s (charts %v)", b, svg != nil)
	}
	if msg, code := errorCode(t, s.AnalyzeJSON([]byte(`{"text":"1\n2\n3\n"}`))); code != stats.CodeInternal || msg == "" {
		t.Errorf("automation entry: code %q", code)
	}
	feed(t, &s, []byte("5.1\n5.2\n5.3\n"), 3)
	s.End("")
	if _, code := errorCode(t, func() []byte { b, _ := s.Analyze([]byte(`{}`), true); return b }()); code != stats.CodeInternal {
		t.Errorf("panic on the kept table: code %q", code)
	}
	s.analyze = nil // the engine again: the session still answers
	if r := s.run(t, `{"options":{}}`, true); r.Error != "" || r.Report.Counts.Used != 3 {
		t.Errorf("after a panic: %+v", r)
	}
}

// Cancel, and the calls after it, answer with code "cancelled".
func TestCancelCode(t *testing.T) {
	var s Session
	if _, code := errorCode(t, s.End("")); code != stats.CodeNoFile {
		t.Errorf("end without a file: code %q", code)
	}
	s.Begin("a.txt", 0)
	if _, code := errorCode(t, s.Cancel()); code != stats.CodeCancelled {
		t.Errorf("cancel: code %q", code)
	}
	var e *stats.Error
	if _, err := s.Write([]byte("1\n")); !errors.As(err, &e) || e.Code != stats.CodeCancelled {
		t.Errorf("write after cancel: %v", err)
	}
	if _, code := errorCode(t, s.End("")); code != stats.CodeCancelled {
		t.Errorf("end after cancel: code %q", code)
	}
}
