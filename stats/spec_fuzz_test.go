package stats

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// FuzzSpec: random small data sets (whole mantissas at 0 to 4 decimals,
// individual readings or subgroups of 2 to 5) against random limits, one-
// or two-sided. Limits inside out must be refused with a bad-option error;
// otherwise no panic, every number finite (checkClean), the observed
// counts equal a direct count on the mantissas, the indices and the
// tolerance intervals hang together, and the curves are drawable.
//
//	go test -run '^$' -fuzz FuzzSpec -fuzztime 10m -parallel 1 ./stats/
func FuzzSpec(f *testing.F) {
	f.Add([]byte{10, 12, 11, 9, 10, 13, 8, 10}, uint8(2), int16(5), int16(15), uint8(0), uint8(0))
	f.Add([]byte{10, 12, 11, 9, 10, 13, 8, 10, 11, 12}, uint8(1), int16(9), int16(14), uint8(1), uint8(2))
	f.Add([]byte{1, 1, 1, 1}, uint8(0), int16(0), int16(2), uint8(2), uint8(0))
	f.Add([]byte{0, 200, 3, 4, 255, 7}, uint8(3), int16(100), int16(50), uint8(0), uint8(3))
	f.Add([]byte{5, 5, 6}, uint8(4), int16(6), int16(6), uint8(0), uint8(0))
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 30, 60, 120, 250, 2, 3, 1, 1, 2, 5, 9, 4, 3, 2, 1, 1, 2, 40, 90, 200}, uint8(1), int16(0), int16(180), uint8(0), uint8(0))
	f.Fuzz(func(t *testing.T, raw []byte, dec uint8, lslM, uslM int16, sides, sub uint8) {
		if len(raw) == 0 || len(raw) > 400 {
			return
		}
		d := int(dec % 5)
		scale := math.Pow10(d)
		text := func(m int64) string {
			return strconv.FormatFloat(float64(m)/scale, 'f', d, 64)
		}
		// readings: mantissas spread over a few hundred units, squared
		// bytes for a long right tail now and then
		ms := make([]int64, len(raw))
		for i, b := range raw {
			ms[i] = int64(b)
			if b > 240 {
				ms[i] = int64(b) * int64(b) / 16
			}
		}
		size := 0
		if s := int(sub % 6); s >= 2 {
			size = s
		}
		var b strings.Builder
		if size > 0 {
			b.WriteString("Sub\tVal\n")
		} else {
			b.WriteString("Val\n")
		}
		for i, m := range ms {
			if size > 0 {
				b.WriteString("s" + strconv.Itoa(i/size) + "\t")
			}
			b.WriteString(text(m) + "\n")
		}
		lsl, _ := strconv.ParseFloat(text(int64(lslM)), 64)
		usl, _ := strconv.ParseFloat(text(int64(uslM)), 64)
		o := Options{}
		hasL, hasU := sides%3 != 2, sides%3 != 1
		if hasL {
			o.LSL = &lsl
		}
		if hasU {
			o.USL = &usl
		}
		req := Request{Text: b.String(), Value: "Val", Options: o}
		if size > 0 {
			req.Subgroup = "Sub"
		}
		rep, err := Analyze(req)
		if hasL && hasU && lslM >= uslM {
			var e *Error
			if err == nil || !errors.As(err, &e) || e.Code != CodeBadOption {
				t.Fatalf("limits %v >= %v: want a bad-option error, got %v", lsl, usl, err)
			}
			return
		}
		if err != nil {
			t.Fatalf("analysis refused: %v", err)
		}
		checkClean(t, rep)
		sp := rep.Spec
		if sp == nil {
			t.Fatalf("no spec section with limits given; notes %+v", rep.Notes)
		}
		// observed counts against a direct count on the mantissas
		below, above := 0, 0
		for _, m := range ms {
			if hasL && m < int64(lslM) {
				below++
			}
			if hasU && m > int64(uslM) {
				above++
			}
		}
		ob := sp.Observed
		if ob.N != len(ms) || ob.Total.Count != below+above {
			t.Fatalf("observed %d of %d outside, direct count %d of %d", ob.Total.Count, ob.N, below+above, len(ms))
		}
		if (ob.Below != nil) != hasL || (ob.Above != nil) != hasU {
			t.Fatalf("sides: below %v above %v for LSL %v USL %v", ob.Below != nil, ob.Above != nil, hasL, hasU)
		}
		if ob.Below != nil && ob.Below.Count != below || ob.Above != nil && ob.Above.Count != above {
			t.Fatalf("observed below/above differ from the direct count %d/%d", below, above)
		}
		for _, c := range []*SpecCount{ob.Below, ob.Above, &ob.Total} {
			if c != nil && !(c.CI.Lo <= c.PPM && c.PPM <= c.CI.Hi && c.CI.Lo >= 0 && c.CI.Hi <= 1e6) {
				t.Fatalf("count %+v: fraction outside its interval", *c)
			}
		}
		// indices: an interval holds its value, the lower bound is below it
		for _, x := range sp.Indices {
			if x.CI != nil && !(x.CI.Lo <= x.Value*(1+1e-9)+1e-12 && x.Value <= x.CI.Hi*(1+1e-9)+1e-12) {
				t.Fatalf("%s (%s) = %v outside its interval %v..%v", x.Name, x.Basis, x.Value, x.CI.Lo, x.CI.Hi)
			}
			if x.LowerBound != nil && *x.LowerBound > x.Value*(1+1e-9)+1e-12 {
				t.Fatalf("%s lower bound %v above its value %v", x.Name, *x.LowerBound, x.Value)
			}
		}
		// tolerance intervals: ranks valid, ends ordered
		n := len(ms)
		for _, ti := range sp.Intervals {
			if len(ti.Ranks) > 0 {
				r, s := ti.Ranks[0], ti.Ranks[1]
				if len(ti.Ranks) != 2 || r < 1 || s < 1 || r-1 > n-s {
					t.Fatalf("distribution-free ranks %v for n = %d", ti.Ranks, n)
				}
			}
			if ti.Supported && ti.Lo != nil && ti.Hi != nil && *ti.Lo > *ti.Hi {
				t.Fatalf("%s interval %v..%v inside out", ti.Kind, *ti.Lo, *ti.Hi)
			}
		}
		if sp.Model != nil && sp.Model.Chosen != "empirical" {
			found := false
			for _, c := range sp.Model.Candidates {
				found = found || c.Family == sp.Model.Chosen && c.Fitted
			}
			if !found {
				t.Fatalf("chosen model %q is not a fitted candidate", sp.Model.Chosen)
			}
		}
		for _, c := range sp.Curves {
			if len(c.X) < 2 || len(c.X) != len(c.Density) {
				t.Fatalf("curve %s: %d x, %d densities", c.Model, len(c.X), len(c.Density))
			}
			for i, v := range c.Density {
				if v < 0 || i > 0 && !(c.X[i] > c.X[i-1]) {
					t.Fatalf("curve %s: point %d (%v, %v)", c.Model, i, c.X[i], v)
				}
			}
		}
	})
}
