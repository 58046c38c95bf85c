package stats

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestParseRequestStrict: the scripting entry point refuses what it cannot
// honour, with a code and the JSON path of the key (the automation help
// page promises this).
func TestParseRequestStrict(t *testing.T) {
	cases := []struct {
		in, code, field, says string
	}{
		{`{"text":"1\n2","options":{"foo":1}}`, CodeBadRequest, "foo", "unknown key"},
		{`{"text":"1\n2","options":{"lls":4.9}}`, CodeBadRequest, "lls", "check the spelling"},
		{`{"text":"1\n2","colour":"red"}`, CodeBadRequest, "colour", "unknown key"},
		{`{"text":"1\n2","options":{"confidence":0}}`, CodeBadOption, "options.confidence", "confidence 0"},
		{`{"text":"1\n2","options":{"coverage":0}}`, CodeBadOption, "options.coverage", "coverage 0"},
		{`{"text":"1\n2","options":{"coverage":99}}`, CodeBadOption, "options.coverage", "between 0.5 and 1"},
		{`{"text":"1\n2","options":{"confidence":"95%"}}`, CodeBadRequest, "options.confidence", "must be a number"},
		{`{"text":"1\n2","options":{"exclude":3}}`, CodeBadRequest, "options.exclude", "list of row numbers"},
		{`{"text":"1\n2","options":{"target":"12 Nm"}}`, CodeBadRequest, "options.target", "must be a number"},
		{`null`, CodeNoData, "text", "no data"},
		{`[1,2]`, CodeBadRequest, "", "JSON object"},
		{`{"text":"1"} {"text":"2"}`, CodeBadRequest, "", "more than one"},
		{`{"text":`, CodeBadRequest, "", "not valid JSON"},
		{``, CodeBadRequest, "", "empty"},
		{`{"schema":"lotlens.request/9","text":"1\n2"}`, CodeSchema, "schema", "not supported"},
		{`{"text":"1\n2","cells":[{"row":1,"text":"3"}]}`, CodeBadRequest, "cells", "both text and cells"},
		{`{"text":"1\n2","options":{"decimalMark":"dot"}}`, CodeBadOption, "options.decimalMark", "not known"},
		{`{"text":"1\n2","options":{"confidence":1.5}}`, CodeBadOption, "options.confidence", "between 0 and 1"},
		{`{"text":"1\n2\n3","options":{"exclude":[2],"excludeReasons":{"3":"gauge dropped"}}}`, CodeBadOption, "options.excludeReasons.3", "not left out"},
		{`{"text":"1\n2\n3","options":{"excludeReasons":{"2":"x"}}}`, CodeBadOption, "options.excludeReasons.2", "not left out"},
		{`{"text":"1\n2\n3","options":{"exclude":[2],"excludeReasons":{"2":"` + strings.Repeat("ü", MaxReasonChars+1) + `"}}}`, CodeBadOption, "options.excludeReasons.2", "2001 characters"},
		{`{"text":"1\n2\n3","options":{"exclude":[2],"excludeReasons":{"row 2":"x"}}}`, CodeBadRequest, "options.excludeReasons", ""},
		{`{"text":"1\n2\n3","options":{"exclude":[2],"excludeReasons":["x"]}}`, CodeBadRequest, "options.excludeReasons", ""},
	}
	for _, c := range cases {
		var e struct{ Error, Code, Field string }
		if err := json.Unmarshal(AnalyzeJSON([]byte(c.in)), &e); err != nil {
			t.Fatal(err)
		}
		if e.Code != c.code || e.Field != c.field || !strings.Contains(e.Error, c.says) {
			t.Errorf("%s:\n got code %q field %q %q\nwant code %q field %q, saying %q", c.in, e.Code, e.Field, e.Error, c.code, c.field, c.says)
		}
	}
	// the default still applies when the key is absent, and a Go caller's zero means the default
	rep, err := Analyze(Request{Text: "1\n2\n3"})
	if err != nil || rep.Settings.Confidence != 0.95 {
		t.Errorf("default confidence: %v %v", rep.Settings.Confidence, err)
	}
	if _, err := ParseRequest([]byte(`{"text":"1\n2","options":{"LSL":1}}`)); err != nil {
		t.Errorf("keys match without regard to case (encoding/json): %v", err)
	}
}

// TestErrorJSONInternal: an error that is not the engine's own is reported
// as internal, with its message.
func TestErrorJSONInternal(t *testing.T) {
	var e struct{ Error, Code string }
	json.Unmarshal(ErrorJSON(errString("boom")), &e)
	if e.Code != CodeInternal || e.Error != "boom" {
		t.Errorf("got %+v", e)
	}
}

type errString string

func (e errString) Error() string { return string(e) }

// TestColumnsAligned: order, subgroup and group columns are read with the
// value column, rows aligned; a row missing its partner cell is listed; a
// column no section reads is refused, never ignored. (Values and rows
// worked by hand from the table below.)
func TestColumnsAligned(t *testing.T) {
	text := "Seq\tShift\tWeight (g)\tLot\n3\tA\t5.12\tL1\n1\tA\t5.08\tL1\n2\tB\t5.10\tL2\n\tB\t5.11\tL2\n5\tA\t5.09\t\n4\tB\t5.13\tL3\n"
	rep, err := Analyze(Request{Text: text, Value: "Weight", Order: "Seq"})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Input.Order != "Seq" || rep.Counts.Used != 6 {
		t.Fatalf("order %q used %d", rep.Input.Order, rep.Counts.Used)
	}
	// the series follows Seq: rows 3 (1), 4 (2), 2 (3), 7 (4), 6 (5); row 5 has no Seq
	var rows []int
	for _, p := range rep.Charts.Series {
		rows = append(rows, p.Row)
	}
	if want := []int{3, 4, 2, 7, 6}; !equalInts(rows, want) {
		t.Errorf("series rows %v, want %v (the order column's order)", rows, want)
	}
	found := false
	for _, p := range rep.Input.Problems {
		if p.Kind == KindIncomplete && p.Row == 5 && p.Column == "Seq" {
			found = true
		}
	}
	if !found {
		t.Errorf("row 5 (no Seq) not listed: %+v", rep.Input.Problems)
	}
	noted := false
	for _, n := range rep.Notes {
		noted = noted || strings.Contains(n.Text, "not in the order of column \"Seq\"")
	}
	if !noted {
		t.Errorf("out-of-order rows not noted: %+v", rep.Notes)
	}
	// a subgroup column is read by the over-time section (stability.go)
	if rep, err := Analyze(Request{Text: text, Value: "Weight", Subgroup: "Lot"}); err != nil || rep.Stability == nil {
		t.Errorf("subgroup column refused or unread: %v", err)
	}
	// the group column is read by the groups section, cell by cell with
	// the values: Shift A holds rows 2, 3 and 6
	grp, err := Analyze(Request{Text: text, Value: "Weight", Group: "Shift"})
	if err != nil || grp.Groups == nil || len(grp.Groups.Levels) != 2 {
		t.Fatalf("group Shift: %v %+v", err, grp)
	}
	if a := grp.Groups.Levels[0]; a.Name != "A" || a.N != 3 || a.Min != 5.08 || a.Max != 5.12 {
		t.Errorf("group A: %s n %d %g..%g, want A, 3 readings 5.08..5.12 (rows 2, 3, 6)", a.Name, a.N, a.Min, a.Max)
	}
	for _, c := range []struct {
		req  Request
		code string
	}{
		{Request{Text: text, Value: "Weight", Order: "Weight"}, CodeColumn},
		{Request{Text: text, Value: "Weight", Order: "Shift"}, CodeColumn},
		{Request{Text: text, Value: "Weight", Order: "Nope"}, CodeColumn},
		{Request{Text: text, Value: "Nope"}, CodeColumn},
	} {
		_, err := Analyze(c.req)
		if CodeOf(err) != c.code {
			t.Errorf("%+v: got %v (%s), want code %s", c.req, err, CodeOf(err), c.code)
		}
	}
}

// TestUnreadColumnRefused: a column role that no section reads is refused
// with CodeUnused, never ignored. Every role has a reader today, so the
// test takes the group column's reader away for its duration.
func TestUnreadColumnRefused(t *testing.T) {
	text := "Shift\tWeight\nA\t5.12\nA\t5.08\nB\t5.10\nB\t5.11\n"
	g := -1
	for i, r := range columnReaders {
		if r.key == "group" {
			g = i
		}
	}
	if g < 0 {
		t.Fatal("no reader listed for the group column")
	}
	saved := columnReaders[g].sections
	defer func() { columnReaders[g].sections = saved }()
	columnReaders[g].sections = nil
	_, err := Analyze(Request{Text: text, Value: "Weight", Group: "Shift"})
	if CodeOf(err) != CodeUnused {
		t.Errorf("group column without a reader: %v (code %s), want code %s", err, CodeOf(err), CodeUnused)
	}
	columnReaders[g].sections = saved
	if _, err := Analyze(Request{Text: text, Value: "Weight", Group: "Shift"}); err != nil {
		t.Errorf("group column with its reader: %v", err)
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}
