package bridge

import (
	"bytes"
	"crypto/sha256"
	"encoding/base64"
	"encoding/hex"
	"encoding/json"
	"strings"
	"testing"

	"lotlens/stats"
	"lotlens/stats/share"
	"lotlens/stats/share/sharetest"
)

// shareReq builds the page's share request.
func shareReq(t *testing.T, req string, useTable bool) []byte {
	t.Helper()
	b, err := json.Marshal(ShareRequest{Request: json.RawMessage(req), UseTable: useTable, Created: 1796000000})
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func shareInfo(t *testing.T, out []byte) ShareInfo {
	t.Helper()
	if msg, code := errorCode(t, out); msg != "" {
		t.Fatalf("share refused (%s): %s", code, msg)
	}
	var info ShareInfo
	if err := json.Unmarshal(out, &info); err != nil {
		t.Fatal(err)
	}
	return info
}

func opened(t *testing.T, s *Session, in []byte, form string) ([]byte, Shared) {
	t.Helper()
	rep, meta, svg := s.Open(in, form)
	if msg, code := errorCode(t, rep); msg != "" {
		t.Fatalf("open refused (%s): %s", code, msg)
	}
	if len(svg) == 0 {
		t.Error("no charts with the opened report")
	}
	var sh Shared
	if err := json.Unmarshal(meta, &sh); err != nil {
		t.Fatal(err)
	}
	return rep, sh
}

// TestShareFileSameReport: a Windows-1252 file with CRLF, read in chunks,
// shared by link, file and bytes, opens in a fresh session to the identical
// report JSON: the same figures, the same reader decisions (encoding
// included) and the same fingerprint, the SHA-256 of the file's bytes as
// read. Invented values; the check is equality with the sender's report.
func TestShareFileSameReport(t *testing.T) {
	data := []byte("Shift;Temp (\xb0C)\r\nA;21,5\r\nB;21,7\r\nA;21,4\r\nB;NA\r\nA;21,9\r\nB;21,6\r\nA;22,0\r\nB;21,5\r\n")
	var s Session
	feed(t, &s, data, 7)
	var end struct{ Fingerprint string }
	json.Unmarshal(s.End(""), &end)
	sum := sha256.Sum256(data)
	if end.Fingerprint != hex.EncodeToString(sum[:]) {
		t.Fatalf("fingerprint %s", end.Fingerprint)
	}
	req := `{"schema":"lotlens.request/1","value":"Temp","options":{"target":21.6,"lsl":21,"usl":22.2,"confidence":0.9,"exclude":[4],"excludeReasons":{"4":"probe slipped"}}}`
	want, _ := s.Analyze([]byte(req), true)
	if !bytes.Contains(want, []byte(`"reason":"probe slipped"`)) {
		t.Fatalf("the sender's report does not echo the reason: %.600s", want)
	}
	for _, form := range []string{FormLink, FormFile, FormBytes} {
		out, bin := s.Share(shareReq(t, req, true), form)
		info := shareInfo(t, out)
		if info.Fingerprint != end.Fingerprint || info.Created != 1796000000 {
			t.Errorf("%s: info %+v", form, info)
		}
		in := bin
		switch form {
		case FormLink:
			if bin != nil || !strings.HasPrefix(info.Link, share.LinkPrefix) || info.Size != len(info.Link) || info.Long {
				t.Fatalf("link info %+v", info)
			}
			in = []byte(info.Link)
		case FormFile:
			if info.FileName != "test.lotlens" || !bytes.HasPrefix(bin, []byte(share.FileHeaderPrefix)) || info.Size != len(bin) {
				t.Fatalf("file info %+v", info)
			}
		}
		var r Session
		got, sh := opened(t, &r, in, form)
		if !bytes.Equal(got, want) {
			t.Errorf("%s: the opened report differs from the sender's:\n%.400s\n%.400s", form, got, want)
		}
		if sh.Fingerprint != end.Fingerprint || sh.Name != "test.txt" || sh.Value != "Temp" || sh.Created != 1796000000 ||
			sh.Options.ExcludeReasons[4] != "probe slipped" || sh.Options.Confidence != 0.9 || len(sh.Options.Exclude) != 1 || sh.Form != form || sh.Bytes != len(data) {
			t.Errorf("%s: shared %+v", form, sh)
		}
		// The receiver keeps the table: a change of settings re-runs on it,
		// and sharing again gives the same data.
		if res := r.run(t, `{"schema":"lotlens.request/1","options":{"confidence":0.99}}`, true); res.Error != "" || res.Report.Input.Fingerprint != end.Fingerprint {
			t.Errorf("%s: re-run after opening: %+v", form, res.Error)
		}
		out2, _ := r.Share(shareReq(t, req, true), FormLink)
		if info2 := shareInfo(t, out2); info2.Fingerprint != end.Fingerprint {
			t.Errorf("%s: shared again with fingerprint %s", form, info2.Fingerprint)
		}
	}
}

// TestShareTextSameReport: pasted text with columns, every option and
// exclusions gives the identical report after a link.
func TestShareTextSameReport(t *testing.T) {
	text := "Time\tLine\tFill (g)\n08:00\tL1\t5.02\n08:05\tL2\t4.98\n08:10\tL1\t5.07\n08:15\tL2\t4.95\n08:20\tL1\t5.01\n08:25\tL2\t5.00\n08:30\tL1\t5.04\n08:35\tL2\t4.97\n"
	rq, _ := json.Marshal(map[string]any{"schema": "lotlens.request/1", "text": text, "value": "Fill (g)", "order": "Time",
		"options": map[string]any{"unit": "g", "target": 5.0, "lsl": 4.9, "usl": 5.1, "confidence": 0.99, "quantile": "hf6",
			"populationSD": true, "exclude": []int{3}, "excludeReasons": map[string]string{"3": "spilled"}, "decimalMark": "point", "withinSigma": "moving-range", "coverage": 0.95, "cpkGoal": 1.67,
			"baseline": "2-6", "signals": map[string]bool{"alternating": true}, "ewmaLambda": 0.1, "ewmaL": 2.7, "cusumK": 0.25, "cusumH": 8}})
	var s Session
	want := stats.ReportJSON(stats.Analyze(mustParse(t, rq)))
	out, _ := s.Share(shareReq(t, string(rq), false), FormLink)
	info := shareInfo(t, out)
	var r Session
	got, sh := opened(t, &r, []byte(info.Link), FormLink)
	if !bytes.Equal(got, want) {
		t.Errorf("the opened report differs:\n%.400s\n%.400s", got, want)
	}
	if sh.Value != "Fill (g)" || sh.Order != "Time" || sh.Options.WithinSigma != "moving-range" || sh.Options.CpkGoal != 1.67 || sh.Options.ExcludeReasons[3] != "spilled" ||
		sh.Options.Baseline != "2-6" || !sh.Options.Signals["alternating"] || sh.Options.EWMALambda != 0.1 || sh.Options.CUSUMH != 8 {
		t.Errorf("shared %+v", sh)
	}
	// A link wrapped by a mail program (line breaks, spaces) still opens.
	wrapped := info.Link[:10] + "\r\n " + info.Link[10:]
	if got2, _ := opened(t, &r, []byte(wrapped), FormLink); !bytes.Equal(got2, want) {
		t.Error("a wrapped link gives another report")
	}
}

func mustParse(t *testing.T, b []byte) stats.Request {
	t.Helper()
	r, err := stats.ParseRequest(b)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestShareRefused: a payload carries everything or is not made.
func TestShareRefused(t *testing.T) {
	var s Session
	const text = `"text":"5.1\n5.2\n5.3\n5.0\n"`
	for _, c := range []struct {
		name, req string
		useTable  bool
		code      string
	}{
		{"target with a unit typed", `{` + text + `,"options":{"target":"12 Nm"}}`, false, stats.CodeBadRequest},
		{"exclude as a number", `{` + text + `,"options":{"exclude":3}}`, false, stats.CodeBadRequest},
		{"confidence of 2", `{` + text + `,"options":{"confidence":2}}`, false, stats.CodeBadOption},
		{"unknown option", `{` + text + `,"options":{"lls":2}}`, false, stats.CodeBadRequest},
		{"a column that is not there", `{` + text + `,"group":"Shift"}`, false, stats.CodeColumn},
		{"no data", `{"text":"  "}`, false, stats.CodeNoData},
		{"no file kept", `{}`, true, stats.CodeNoFile},
		{"a reason for no row", `{` + text + `,"options":{"exclude":[4],"excludeReasons":{"row 4":"x"}}}`, false, stats.CodeBadRequest},
		{"a reason for a row not left out", `{` + text + `,"options":{"exclude":[4],"excludeReasons":{"3":"x"}}}`, false, stats.CodeBadOption},
		{"a reason too long", `{` + text + `,"options":{"exclude":[4],"excludeReasons":{"4":"` + strings.Repeat("x", stats.MaxReasonChars+1) + `"}}}`, false, stats.CodeBadOption},
		{"cells", `{"cells":[{"row":2,"text":"5.1"},{"row":3,"text":"5.2"}]}`, false, stats.CodeBadRequest},
	} {
		out, bin := s.Share(shareReq(t, c.req, c.useTable), FormLink)
		msg, code := errorCode(t, out)
		if code != c.code || !strings.HasPrefix(msg, "No link was made") || bin != nil {
			t.Errorf("%s: code %q (want %q), message %q", c.name, code, c.code, msg)
		}
	}
	// Reasons travel in the request's options only: a second path is refused.
	if _, code := errorCode(t, first(s.Share([]byte(`{"request":{`+text+`,"options":{"exclude":[2]}},"reasons":{"2":"x"}}`), FormLink))); code != stats.CodeBadRequest {
		t.Errorf("reasons beside the request: code %q", code)
	}
	if _, code := errorCode(t, first(s.Share([]byte(`{"request":{},"extra":1}`), FormLink))); code != stats.CodeBadRequest {
		t.Errorf("unknown key in the share request: code %q", code)
	}
	if _, code := errorCode(t, first(s.Share(shareReq(t, `{`+text+`}`, false), "zip"))); code != stats.CodeBadRequest {
		t.Errorf("unknown form: code %q", code)
	}
	// Too long for a link: refused with too-large; the file form still works.
	defer func(m int) { linkMax = m }(linkMax)
	linkMax = 20
	if msg, code := errorCode(t, first(s.Share(shareReq(t, `{`+text+`}`, false), FormLink))); code != stats.CodeTooLarge || !strings.Contains(msg, share.FileExt) {
		t.Errorf("link above the limit: %q %q", code, msg)
	}
	if out, bin := s.Share(shareReq(t, `{`+text+`}`, false), FormFile); len(bin) == 0 {
		t.Errorf("file form refused: %s", out)
	}
	// A file over ShareBytesMax keeps no bytes and cannot be shared.
	s.Begin("big.txt", ShareBytesMax+1)
	s.Write([]byte("5.1\n5.2\n5.3\n"))
	s.End("")
	if msg, code := errorCode(t, first(s.Share(shareReq(t, `{}`, true), FormFile))); code != stats.CodeTooLarge || !strings.Contains(msg, "64 MB") {
		t.Errorf("file over the limit: %q %q", code, msg)
	}
}

func first(a, _ []byte) []byte { return a }

// TestOpenErrors: every share error code comes back as the bridge's
// "share-" code, with a message saying what to ask the sender for, and
// nothing of an earlier analysis is shown instead.
func TestOpenErrors(t *testing.T) {
	p := share.Payload{Created: 1796000000, Text: "5.1\n5.2\n5.3\n5.0\n5.2\n"}
	raw, err := share.Marshal(p)
	if err != nil {
		t.Fatal(err)
	}
	link := base64.RawURLEncoding.EncodeToString(raw)
	changed := []byte(link)
	changed[len(changed)/2] ^= 'A' ^ 'B'
	if changed[len(changed)/2] == link[len(link)/2] {
		t.Fatal("no change")
	}
	bad := p
	bad.Options.Confidence = 2 // a hand-made payload the engine refuses
	badLink, _ := share.Encode(bad)
	col := p
	col.Group = "Shift"
	colLink, _ := share.Encode(col)
	file, _ := share.EncodeFile(p)
	b64 := base64.RawURLEncoding.EncodeToString
	for _, c := range []struct {
		name, form string
		in         []byte
		code, ask  string
	}{
		{"empty", FormLink, nil, stats.CodeShareEmpty, "ask the sender"},
		{"only spaces", FormLink, []byte(" \n"), stats.CodeShareEmpty, "ask the sender"},
		{"cut short", FormLink, []byte(link[:len(link)-9]), stats.CodeShareTruncated, "ask the sender"},
		{"one character changed", FormLink, changed, stats.CodeShareCorrupt, "ask the sender"},
		{"not base64", FormLink, []byte(link[:30] + "%$" + link[32:]), stats.CodeShareCorrupt, "ask the sender"},
		{"random text", FormLink, []byte("hello, this is not a link"), stats.CodeShareForeign, "ask the sender"},
		{"JSON null", FormLink, []byte("null"), stats.CodeShareForeign, "ask the sender"},
		{"old page format", FormLink, []byte("d=eJwrSS0u0c1LzE0FAA"), stats.CodeShareForeign, "ask the sender"},
		{"newer version", FormLink, []byte(b64(sharetest.Reframe(raw, 2, 0))), stats.CodeShareVersion, "reload the page"},
		{"too large", FormLink, []byte(b64(sharetest.Reframe(raw, 1, share.MaxDecoded+1))), stats.CodeShareTooLarge, "ask the sender"},
		{"file cut short", FormFile, file[:len(file)-3], stats.CodeShareTruncated, "ask the sender"},
		{"not a file of ours", FormFile, []byte("Line\tValue\n1\t2\n"), stats.CodeShareForeign, "ask the sender"},
		{"stored copy damaged", FormBytes, raw[:len(raw)-1], stats.CodeShareTruncated, "stored copy"},
		{"settings refused", FormLink, []byte(badLink), stats.CodeShareSettings, "Ask the sender"},
		{"column missing", FormLink, []byte(colLink), stats.CodeShareSettings, "Ask the sender"},
	} {
		var s Session
		feed(t, &s, []byte("1\n2\n3\n"), 10)
		s.End("")
		rep, meta, svg := s.Open(c.in, c.form)
		msg, code := errorCode(t, rep)
		if code != c.code || !strings.Contains(msg, c.ask) || meta != nil || svg != nil {
			t.Errorf("%s: code %q (want %q), message %q", c.name, code, c.code, msg)
		}
		for _, w := range []string{"base64", "atob", "fetch", "CRC", "inflate", "EOF"} {
			if strings.Contains(msg, w) {
				t.Errorf("%s: the message says %q: %s", c.name, w, msg)
			}
		}
		if c.code == stats.CodeShareSettings && s.HasTable() {
			t.Errorf("%s: the refused payload's table is kept", c.name)
		}
	}
}

// TestForgetLeavesNothing: after Forget the session holds no table and no
// bytes of the data.
func TestForgetLeavesNothing(t *testing.T) {
	var s Session
	feed(t, &s, []byte("5.1\n5.2\n5.3\n"), 4)
	s.End("")
	if s.raw != "5.1\n5.2\n5.3\n" {
		t.Fatalf("kept %q", s.raw)
	}
	s.Forget()
	if s.tab != nil || s.raw != "" || s.fp != "" || s.srcName != "" {
		t.Errorf("after Forget: %v %q %q %q", s.tab != nil, s.raw, s.fp, s.srcName)
	}
	if _, code := errorCode(t, first(s.Share(shareReq(t, `{}`, true), FormLink))); code != stats.CodeNoFile {
		t.Errorf("share after forget: code %q", code)
	}
}

func TestFileName(t *testing.T) {
	for in, want := range map[string]string{"": "shared-analysis.lotlens", "fill.csv": "fill.lotlens", `C:\x\a<b>.txt`: "a_b_.lotlens", ".hidden": ".hidden.lotlens"} {
		if got := fileName(in); got != want {
			t.Errorf("fileName(%q) = %q, want %q", in, got, want)
		}
	}

}
