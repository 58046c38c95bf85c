package stats

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzAnalyze: the entry point never panics, and a successful report is
// JSON without NaN or Inf. Run long with
//
//	go test -run '^$' -fuzz FuzzAnalyze -fuzztime 10m -parallel 1 ./stats/
func FuzzAnalyze(f *testing.F) {
	for _, s := range []string{
		"1\n", "1\n2\n", "1\n2\n3\n", "5\n5\n5\n", "1e300\n-1e300\n2e300\n", "1e-300\n2e-300\n",
		"Inf\n1\n2\n", "NaN\n-inf\n3\n", "1,5\n2,5\n", "0.1\n0.10\n0.100\n", "-0\n0\n",
		"1.7976931348623157e308\n-1.7976931348623157e308\n0\n", "4.9e-324\n1e-320\n",
		"99999999999999999999\n1\n", "12.345678901234567890123\n1\n2\n",
	} {
		f.Add(s, 0.95, uint8(7), 0)
	}
	for _, name := range []string{"13-tiny-n3.txt", "14-small-n5.txt", "16-small-n12-outlier.txt", "17-n20-two-outliers.txt", "23-mixed-decimals-n25.txt", "10-coarse-half-n64.txt"} {
		b, err := os.ReadFile(filepath.Join("../testdata/sets", name))
		if err == nil {
			f.Add(string(b), 0.9, uint8(1), 3)
		}
	}
	f.Fuzz(func(t *testing.T, text string, conf float64, q uint8, excl int) {
		o := Options{Confidence: conf, Quantile: QuantileMethods[int(q)%len(QuantileMethods)], PopulationSD: q%2 == 0}
		if excl != 0 {
			o.Exclude = []int{excl}
		}
		if q%3 == 0 {
			lsl, usl, tg := -1.0, 1.0, 0.0
			o.LSL, o.USL, o.Target = &lsl, &usl, &tg
		}
		rep, err := Analyze(Request{Text: text, Options: o})
		if err != nil {
			if rep != nil {
				t.Fatal("report and error together")
			}
			return
		}
		checkClean(t, rep)
		if rep.Counts.Used > 0 && (rep.Centre == nil && rep.Spread == nil && len(rep.Notes) == 0) {
			t.Fatal("figures omitted without a note")
		}
	})
}
