package share_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"lotlens/stats"
	"lotlens/stats/share"
)

// TestOptionsMirror: share.Options carries every field of stats.Options,
// with the same type and JSON name, so that a link never drops a setting.
func TestOptionsMirror(t *testing.T) {
	st, sh := reflect.TypeOf(stats.Options{}), reflect.TypeOf(share.Options{})
	if st.NumField() != sh.NumField() {
		t.Errorf("stats.Options has %d fields, share.Options %d: carry the new option in the payload (and bump share.Version)", st.NumField(), sh.NumField())
	}
	for i := 0; i < st.NumField(); i++ {
		f := st.Field(i)
		g, ok := sh.FieldByName(f.Name)
		if !ok || g.Type != f.Type || g.Tag.Get("json") != f.Tag.Get("json") {
			t.Errorf("stats.Options.%s (%s, json %q) is not mirrored in share.Options", f.Name, f.Type, f.Tag.Get("json"))
		}
	}
}

// request is how a receiver turns a payload back into the engine's request.
func request(p share.Payload) stats.Request {
	var o stats.Options
	b, _ := json.Marshal(p.Options)
	_ = json.Unmarshal(b, &o)
	return stats.Request{Schema: stats.RequestSchema, Text: p.Text, Value: p.Value, Order: p.Order,
		Subgroup: p.Subgroup, Group: p.Group, Options: o}
}

// TestSameReport: a data set sent through a link gives the identical report
// (every figure, the fingerprint, the flags) on the other side.
func TestSameReport(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 2026))
	n := 60
	if testing.Short() {
		n = 20
	}
	for i := 0; i < n; i++ {
		var b strings.Builder
		dec := rng.IntN(5)
		comma := rng.IntN(3) == 0
		crlf := []string{"\n", "\r\n"}[rng.IntN(2)]
		sep := "\t"
		if comma && rng.IntN(2) == 0 {
			sep = ";"
		}
		b.WriteString("Line" + sep + "Torque (N·m)" + crlf)
		rows := 20 + rng.IntN(400)
		for r := 0; r < rows; r++ {
			v := strconv.FormatFloat(12+rng.NormFloat64()*0.2, 'f', dec, 64)
			k := rng.IntN(40)
			if r == 0 {
				k = 39 // the first row plain, so that the header is read as one
			}
			switch k {
			case 0:
				v = "NA"
			case 1:
				v = ""
			case 2:
				v = "1.2e1"
			}
			if comma {
				v = strings.Replace(v, ".", ",", 1)
			}
			fmt.Fprintf(&b, "%c%s%s%s", "AB"[rng.IntN(2)], sep, v, crlf)
		}
		target, lsl, usl := 12.0, 11.4, 12.6
		p := share.Payload{
			Created: 1795000000 + int64(i), Text: b.String(), Value: "Torque (N·m)",
			Options: share.Options{Target: &target, LSL: &lsl, USL: &usl, Confidence: []float64{0.9, 0.95, 0.99}[rng.IntN(3)],
				Quantile: []string{"", "hf6", "tukey"}[rng.IntN(3)], PopulationSD: rng.IntN(2) == 0,
				Exclude: []int{2 + rng.IntN(rows), 2 + rng.IntN(rows)}},
		}
		if rng.IntN(2) == 0 { // the over-time settings
			p.Options.Baseline = fmt.Sprintf("2-%d", 4+rng.IntN(rows))
			p.Options.Signals = map[string]bool{"alternating": rng.IntN(2) == 0, "ewma": rng.IntN(2) == 0}
			p.Options.EWMALambda, p.Options.EWMAL = []float64{0.05, 0.1, 0.3}[rng.IntN(3)], 2.8
			p.Options.CUSUMK, p.Options.CUSUMH = 0.75, 4
		}
		s, err := share.Encode(p)
		if err != nil {
			t.Fatal(err)
		}
		q, err := share.Decode(s)
		if err != nil {
			t.Fatal(err)
		}
		a := stats.ReportJSON(stats.Analyze(request(p)))
		c := stats.ReportJSON(stats.Analyze(request(q)))
		if !bytes.Equal(a, c) {
			t.Fatalf("set %d: the report differs after the link", i)
		}
		var rep struct {
			Input struct{ Fingerprint string } `json:"input"`
		}
		if err := json.Unmarshal(c, &rep); err != nil || rep.Input.Fingerprint != p.Fingerprint() || q.Fingerprint() != p.Fingerprint() {
			t.Fatalf("set %d: fingerprint %q, want %q (%v): %.300s", i, rep.Input.Fingerprint, p.Fingerprint(), err, c)
		}
	}
}
