package stats

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"lotlens/stats/internal/rref"
	"lotlens/stats/method"
)

// Blom positions and the simultaneous envelope: for n = 5 the middle point
// sits at z = 0 (definition), the envelope contains the line, and its ends
// are R 4.2.2's Beta quantiles at the local level of the table
// (testdata/rref/probbandq.R: qnorm(qbeta(0.250853/2, i, 6-i)) and the
// upper end, with η = 0.250853 the 95 % row for n = 5 of
// testdata/rref/probband.tsv).
func TestProbPlotSmall(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5}
	pp := probPlot(x, 3, math.Sqrt(2.5), 0.95, 100)
	if pp.Positions != "Blom (i-3/8)/(n+1/4)" || len(pp.Points) != 5 || len(pp.Band) != 5 {
		t.Fatalf("%+v", pp)
	}
	if pp.BandMethod != "tail-sensitive" || pp.BandLevel != 0.95 || pp.BandLocalLevel != 0.250853 {
		t.Errorf("band %q at %v, local level %v; want tail-sensitive at 0.95, 0.250853 (R table)", pp.BandMethod, pp.BandLevel, pp.BandLocalLevel)
	}
	if pp.Points[2].Z != 0 || pp.Points[0].Z != -pp.Points[4].Z {
		t.Errorf("positions %+v", pp.Points)
	}
	// Blom's first position: Φ⁻¹((1-3/8)/5.25), R 4.2.2 qnorm(0.625/5.25) = -1.1797611
	if math.Abs(pp.Points[0].Z-(-1.1797611)) > 1e-7 {
		t.Errorf("z1 = %v", pp.Points[0].Z)
	}
	ref := rref.Load(t, "probbandq.tsv", 10)
	sd := math.Sqrt(2.5)
	for i, b := range pp.Band {
		r := ref["5/"+string(rune('1'+i))+"/0.250853"]
		if r == nil {
			t.Fatalf("probbandq.tsv has no n 5 rank %d at 0.250853", i+1)
		}
		if !rref.Close(b.Lo, 3+sd*r["zlo"], 1e-9, 1e-9) || !rref.Close(b.Hi, 3+sd*r["zhi"], 1e-9, 1e-9) {
			t.Errorf("rank %d: band %+v, R %v %v", i+1, b, 3+sd*r["zlo"], 3+sd*r["zhi"])
		}
		if y := 3 + sd*b.Z; !(b.Lo < y && y < b.Hi) {
			t.Errorf("band %+v misses the line", b)
		}
	}
}

// The report names the envelope: bandMethod "tail-sensitive", bandLevel
// the confidence setting (clamped to the tabled 0.5-0.99, with a note),
// bandLocalLevel the table's η for n (method.ProbBandLocalLevel); the
// band's ends are the order-statistic quantiles at that η for the ranks
// drawn, both tails whole; data set 02-fill-normal-n250.txt (invented).
func TestProbPlotReportsEnvelope(t *testing.T) {
	for _, c := range []struct{ asked, used float64 }{{0.9, 0.9}, {0.95, 0.95}, {0.99, 0.99}, {0.995, 0.99}, {0.975, 0.975}} {
		rep := analyzeFile(t, "../testdata/sets/02-fill-normal-n250.txt", Options{Confidence: c.asked})
		pp := rep.Charts.ProbPlot
		n := rep.Counts.Used
		eta, used, _ := method.ProbBandLocalLevel(n, c.asked)
		if pp.BandMethod != method.ProbBandTailSensitive || pp.BandLevel != c.used || used != c.used || pp.BandLocalLevel != eta || !(eta > 0 && eta < 1-c.used) {
			t.Errorf("asked %v: method %q level %v local %v; want %q, %v, %v", c.asked, pp.BandMethod, pp.BandLevel, pp.BandLocalLevel, method.ProbBandTailSensitive, c.used, eta)
		}
		noted := false
		for _, nt := range rep.Notes {
			if nt.Field == "charts.probPlot.bandLevel" && strings.Contains(nt.Text, "99%") && strings.Contains(nt.Text, "99.5%") {
				noted = true
			}
		}
		if noted != (c.asked != c.used) {
			t.Errorf("asked %v used %v: note %v (notes %v)", c.asked, c.used, noted, rep.Notes)
		}
		if len(pp.Band) < 100 {
			t.Fatalf("%d band points", len(pp.Band))
		}
		m, sd := pp.Line[0], pp.Line[1]
		for k, i := range method.ThinIndices(n, probBandMaxPoints) {
			zl, zh := method.OrderStatBand(i+1, n, 1-eta)
			b := pp.Band[k]
			if b.Z != method.BlomPosition(i+1, n) || math.Abs(b.Lo-(m+sd*zl)) > 1e-12*math.Abs(m) || math.Abs(b.Hi-(m+sd*zh)) > 1e-12*math.Abs(m) {
				t.Fatalf("band point %d (rank %d): %+v", k, i+1, b)
			}
		}
		enc, _ := json.Marshal(pp)
		for _, k := range []string{`"bandMethod":"tail-sensitive"`, `"bandLevel":`, `"bandLocalLevel":`} {
			if !strings.Contains(string(enc), k) {
				t.Errorf("JSON lacks %s", k)
			}
		}
	}
	// no band for fewer than 3 readings, and no band fields
	rep, err := Analyze(Request{Text: "5.1\n5.2\n", Options: Options{Confidence: 0.95}})
	if err != nil {
		t.Fatal(err)
	}
	if pp := rep.Charts.ProbPlot; len(pp.Band) != 0 || pp.BandMethod != "" || pp.BandLevel != 0 {
		t.Errorf("n 2: %+v", pp)
	}
}
