package method

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"testing"
)

// The bits of a point's zone byte in the check-by-check reference
// (ctlSignalsOld, the code Signals had before ScanSignals): beyond 1σ, 2σ and the limit
// (strictly), strictly within 1σ, and the side of the centre.
const (
	zoneBeyond1 uint8 = 1 << iota
	zoneBeyond2
	zoneBeyondLimit
	zoneWithin1
	zoneBelow
	zoneAbove
	classSide // not a bit of the byte: ctlClass gives the side of the centre
)

// ctlBit is 1 for true (the compiler makes it a flag set, not a branch).
func ctlBit(b bool) uint8 {
	var u uint8
	if b {
		u = 1
	}
	return u
}

// ctlClass is the class of a point with zone byte c that a check reads:
// for an edge (zoneBeyond1, zoneBeyond2, zoneBeyondLimit) +1 beyond it
// above the centre, −1 below, 0 otherwise; for classSide the side of the
// centre (0 on it); for zoneWithin1 2 when strictly within 1σ (a class of
// its own, without a side), else 0.
func ctlClass(c, what uint8) int {
	side := int(c&zoneAbove)>>5 - int(c&zoneBelow)>>4
	switch {
	case what == classSide:
		return side
	case what == zoneWithin1:
		return int(c&zoneWithin1) >> 2
	case c&what == 0:
		return 0
	}
	return side
}

// The checks as they were written before ScanSignals fused them into one
// pass, check by check over a byte of zones per point: kept as the
// oracle the fused pass must agree with, signal for signal.
func ctlSignalsOld(x []float64, centre float64, sigma []float64, s SignalSettings) ([]Signal, error) {
	n := len(x)
	if len(sigma) != 1 && len(sigma) != n {
		return nil, fmt.Errorf("%d sigmas for %d points: give one, or one per point", len(sigma), n)
	}
	for _, v := range sigma {
		if !(v >= 0) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("sigma %g: it must be a finite number >= 0", v)
		}
	}
	if math.IsNaN(centre) || math.IsInf(centre, 0) {
		return nil, fmt.Errorf("centre %g: it must be finite", centre)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("point %d is %g: points must be finite", i, v)
		}
	}
	// One pass classifies every point (a byte each): which zone edges it
	// lies beyond and on which side; the checks then read the bytes.
	lim := ctlDefaultF(s.Limit, 3)
	code := make([]uint8, n)
	for i, v := range x {
		sg := sigma[0]
		if len(sigma) > 1 {
			sg = sigma[i]
		}
		d := v - centre
		a := math.Abs(d)
		// without branches (random points would mispredict them)
		code[i] = ctlBit(a > sg)*zoneBeyond1 | ctlBit(a > 2*sg)*zoneBeyond2 | ctlBit(a > lim*sg)*zoneBeyondLimit |
			ctlBit(a < sg)*zoneWithin1 | ctlBit(d < 0)*zoneBelow | ctlBit(d > 0)*zoneAbove
	}
	var out []Signal
	if s.BeyondLimits {
		for i, c := range code {
			if z := ctlClass(c, zoneBeyondLimit); z != 0 {
				out = append(out, Signal{Rule: SignalBeyondLimits, Side: z, First: i, Last: i, Points: []int{i}})
			}
		}
	}
	if s.TwoOfThree {
		out = ctlWindowedOld(out, code, SignalTwoOfThree, 2, 3, zoneBeyond2)
	}
	if s.FourOfFive {
		out = ctlWindowedOld(out, code, SignalFourOfFive, 4, 5, zoneBeyond1)
	}
	if s.RunSameSide {
		out = ctlRunsOld(out, code, SignalRunSameSide, ctlDefaultI(s.SameSideRun, 9), classSide, false)
	}
	if s.Trend {
		out = ctlStepsOld(out, x, SignalTrend, ctlDefaultI(s.TrendRun, 6), false)
	}
	if s.Alternating {
		out = ctlStepsOld(out, x, SignalAlternating, ctlDefaultI(s.AlternatingRun, 14), true)
	}
	if s.HuggingCentre {
		out = ctlRunsOld(out, code, SignalHuggingCentre, ctlDefaultI(s.HuggingRun, 15), zoneWithin1, false)
	}
	if s.AvoidCentre {
		out = ctlRunsOld(out, code, SignalAvoidCentre, ctlDefaultI(s.AvoidRun, 8), zoneBeyond1, true)
	}
	return out, nil
}

// ctlWindowed reports m of w points in a row with the same non-zero class
// (side beyond a zone). A window fires at point i when class(i) ≠ 0 and at
// least m of the last w points (fewer at the start) share it; overlapping
// firings on the same side join into one signal.
func ctlWindowedOld(out []Signal, code []uint8, rule string, m, w int, edge uint8) []Signal {
	n := len(code)
	cnt := [3]int{}         // counts of −1, 0, +1 in the window
	ring := make([]int8, w) // the window's classes, point i at r = i mod w
	open := -1              // index in out of the signal still open
	r := 0
	for i := 0; i < n; i++ {
		c := ctlClass(code[i], edge)
		if i >= w {
			cnt[ring[r]+1]--
		}
		ring[r] = int8(c)
		if r++; r == w {
			r = 0
		}
		cnt[c+1]++
		if c == 0 || cnt[c+1] < m {
			continue
		}
		lo := max(0, i-w+1)
		if open >= 0 && out[open].Side == c && out[open].Last >= lo {
			sg := &out[open]
			for j := sg.Last + 1; j <= i; j++ {
				if ctlClass(code[j], edge) == c {
					sg.Points = append(sg.Points, j)
				}
			}
			sg.Last = i
			continue
		}
		var pts []int
		for j := lo; j <= i; j++ {
			if ctlClass(code[j], edge) == c {
				pts = append(pts, j)
			}
		}
		out = append(out, Signal{Rule: rule, Side: c, First: pts[0], Last: i, Points: pts})
		open = len(out) - 1
	}
	return out
}

// ctlRuns reports maximal runs of at least minLen points with the same
// non-zero class. With bothSides, the class is a side (±1) and a run is
// any stretch of non-zero classes that holds both signs.
func ctlRunsOld(out []Signal, code []uint8, rule string, minLen int, what uint8, bothSides bool) []Signal {
	n := len(code)
	start, cur := 0, 0
	seen := [2]bool{}
	flush := func(end int) {
		if cur == 0 || end-start+1 < minLen {
			return
		}
		side := cur
		if bothSides {
			if !(seen[0] && seen[1]) {
				return
			}
			side = 0
		}
		if side == 2 {
			side = 0
		}
		out = append(out, Signal{Rule: rule, Side: side, First: start, Last: end})
	}
	for i := 0; i < n; i++ {
		c := ctlClass(code[i], what)
		same := c == cur
		if bothSides {
			same = (c != 0) == (cur != 0)
		}
		if !same {
			flush(i - 1)
			start, cur, seen = i, c, [2]bool{}
		}
		if bothSides && c != 0 {
			cur = 1
			if c > 0 {
				seen[1] = true
			} else {
				seen[0] = true
			}
		}
	}
	flush(n - 1)
	return out
}

// ctlSteps reports maximal stretches of points whose steps all go the same
// way (trend: every step up, or every step down) or alternate (every step
// the opposite of the one before); a zero step ends a stretch. A stretch
// of p points has p − 1 steps.
func ctlStepsOld(out []Signal, x []float64, rule string, minPts int, alternate bool) []Signal {
	n := len(x)
	if n < 2 {
		return out
	}
	step := func(j int) int { // step from x[j-1] to x[j]
		switch {
		case x[j] > x[j-1]:
			return 1
		case x[j] < x[j-1]:
			return -1
		}
		return 0
	}
	start := 0 // first point of the current stretch
	prev := 0  // previous step
	flush := func(last int) {
		if prev != 0 && last-start+1 >= minPts {
			side := 0
			if !alternate {
				side = prev
			}
			out = append(out, Signal{Rule: rule, Side: side, First: start, Last: last})
		}
	}
	for j := 1; j < n; j++ {
		d := step(j)
		cont := d != 0 && prev != 0 && ((!alternate && d == prev) || (alternate && d == -prev))
		if !cont {
			flush(j - 1)
			start = j - 1
			if d == 0 {
				start = j
			}
		}
		prev = d
	}
	flush(n - 1)
	return out
}

func ctlSameSignals(t *testing.T, x []float64, centre float64, sigma []float64, s SignalSettings) {
	t.Helper()
	want, err1 := ctlSignalsOld(x, centre, sigma, s)
	got, err2 := Signals(x, centre, sigma, s)
	if (err1 == nil) != (err2 == nil) {
		t.Fatalf("errors differ: %v / %v", err1, err2)
	}
	if !reflect.DeepEqual(want, got) {
		t.Fatalf("signals differ on %v (centre %g, sigma %v):\nwant %+v\ngot  %+v", x, centre, sigma, want, got)
	}
}

func FuzzScanSignals(f *testing.F) {
	f.Add([]byte{1, 2, 3, 200, 4, 5, 6, 7, 8, 9, 10, 30, 31, 32, 33, 34, 35}, uint8(10), uint8(3), false)
	f.Add(make([]byte, 64), uint8(0), uint8(0), true)
	long := make([]byte, 300) // several words of 64 points
	for i := range long {
		long[i] = byte(i*37%251) / 4
	}
	f.Add(long, uint8(16), uint8(9), false)
	f.Fuzz(func(t *testing.T, data []byte, sig uint8, runs uint8, perPoint bool) {
		x := make([]float64, len(data))
		sigma := []float64{float64(sig) / 16}
		if perPoint {
			sigma = make([]float64, len(data))
		}
		for i, b := range data {
			x[i] = float64(int8(b)) / 16
			if perPoint {
				sigma[i] = float64((int(b)*7+int(sig))%13) / 8
			}
		}
		s := DefaultSignalSettings()
		if r := int(runs % 20); r > 0 {
			s.SameSideRun, s.TrendRun, s.AlternatingRun, s.HuggingRun, s.AvoidRun = r, r, r, r, r
		}
		if runs&32 != 0 {
			s.TwoOfThree, s.Trend = false, false
		}
		ctlSameSignals(t, x, 0, sigma, s)
	})
}

// TestScanSignalsAgrees: the fused pass gives the signals of the checks run
// one by one, on random walks and in-control series with every check on
// and several run lengths.
func TestScanSignalsAgrees(t *testing.T) {
	for seed := uint64(1); seed <= 40; seed++ {
		x := ctlRandomSeries(seed, 3000)
		if seed%2 == 0 {
			x = append(x, ctlLongRuns(seed)...)
		}
		for _, r := range []int{0, 1, 2, 3, 7, 63, 64, 65, 70, 130} {
			s := DefaultSignalSettings()
			s.SameSideRun, s.TrendRun, s.AlternatingRun, s.HuggingRun, s.AvoidRun = r, r, r, r, r
			ctlSameSignals(t, x, 0, []float64{1}, s)
			ctlSameSignals(t, x, 0.3, []float64{0.7}, s)
		}
		sig := make([]float64, len(x))
		for i := range sig {
			sig[i] = 0.5 + float64(i%4)/4
		}
		ctlSameSignals(t, x, 0, sig, DefaultSignalSettings())
	}
}

// ctlRandomSeries mixes in-control stretches, shifts, drifts, repeated
// values and alternation, so that every check fires.
func ctlRandomSeries(seed uint64, n int) []float64 {
	r := rand.New(rand.NewPCG(seed, 7))
	x := make([]float64, n)
	level := 0.0
	for i := range x {
		switch r.IntN(200) {
		case 0:
			level = r.NormFloat64() * 1.5
		case 1:
			level = 0
		}
		v := level + r.NormFloat64()
		switch i % 97 {
		case 10, 11, 12:
			v = math.Round(v)
		}
		if i%500 > 480 {
			v = float64(i%2)*2 - 1
		}
		x[i] = math.Round(v*8) / 8
	}
	return x
}

// TestScanAtVisits: the fused pass, each scan on its own (the other's
// visit nil), gives the values of the full reference scans at the points
// asked for, at every point beyond and at the point after each, and at no
// other point.
func TestScanAtVisits(t *testing.T) {
	x := ctlRandomSeries(3, 5000)
	at := []int{0, 7, 8, 500, 2001, 4999}
	want := func(i int, beyond, was bool) bool {
		_, listed := slicesIndex(at, i)
		return listed || beyond || was
	}
	type ev struct {
		i    int
		a, b float64
		n    int32
		out  bool
	}
	var full, got []ev
	was := false
	if err := ewmaScanOld(x, 0, 1, 0.2, 3, nil, true, func(i int, z float64, out bool) {
		if want(i, out, was) {
			full = append(full, ev{i: i, a: z, out: out})
		}
		was = out
	}); err != nil {
		t.Fatal(err)
	}
	if err, _ := EWMACUSUMScanAt(x, 0, 1, 0.2, 3, 0, 0, at, func(i int, z float64, out bool) { got = append(got, ev{i: i, a: z, out: out}) }, nil); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(full, got) || len(got) < len(at)+2 {
		t.Fatalf("EWMA: %d visits, want %d", len(got), len(full))
	}
	full, got, was = nil, nil, false
	if err := cusumScanOld(x, 0, 1, 0.5, 4, nil, true, func(i int, up, lo float64, nu, nl int32, out bool) {
		if want(i, out, was) {
			full = append(full, ev{i, up, lo, nu - nl, out})
		}
		was = out
	}); err != nil {
		t.Fatal(err)
	}
	if _, err := EWMACUSUMScanAt(x, 0, 1, 0, 0, 0.5, 4, at, nil, func(i int, up, lo float64, nu, nl int32, out bool) {
		got = append(got, ev{i, up, lo, nu - nl, out})
	}); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(full, got) || len(got) < len(at)+2 {
		t.Fatalf("CUSUM: %d visits, want %d", len(got), len(full))
	}
}

func slicesIndex(s []int, v int) (int, bool) {
	for k, x := range s {
		if x == v {
			return k, true
		}
	}
	return -1, false
}

// ctlLongRuns gives stretches longer than the 64 points ScanSignals
// passes at a time: steady climbs and falls, points hugging the centre,
// points alternating beyond 1σ, long runs on one side, each of a length
// that crosses words at several offsets.
func ctlLongRuns(seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 9))
	var x []float64
	for k := 0; k < 12; k++ {
		n := 50 + r.IntN(200)
		switch k % 4 {
		case 0: // a climb or a fall
			dir := float64(1 - 2*r.IntN(2))
			for i := 0; i < n; i++ {
				x = append(x, dir*(-2+4*float64(i)/float64(n)))
			}
		case 1: // hugging the centre
			for i := 0; i < n; i++ {
				x = append(x, 0.5*r.Float64()-0.25)
			}
		case 2: // alternating beyond 1σ
			for i := 0; i < n; i++ {
				x = append(x, float64(1-2*(i%2))*(1.2+0.6*r.Float64()))
			}
		default: // on one side
			for i := 0; i < n; i++ {
				x = append(x, 0.1+r.Float64())
			}
		}
		x = append(x, r.NormFloat64())
	}
	return x
}

// TestEWMACUSUMScanAt: the fused pass visits the points the single scans
// (ewmaScanOld, cusumScanOld) visit, with the same values, and a refused
// setting stops only its own scan.
func TestEWMACUSUMScanAt(t *testing.T) {
	type ev struct {
		i          int
		a, b       float64
		nu, nl     int32
		out, cusum bool
	}
	x := ctlRandomSeries(5, 7000)
	at := []int{0, 1, 64, 65, 3000, 6999}
	var want []ev
	if err := ewmaScanOld(x, 0.1, 0.9, 0.2, 3, at, false, func(i int, z float64, out bool) { want = append(want, ev{i: i, a: z, out: out}) }); err != nil {
		t.Fatal(err)
	}
	if err := cusumScanOld(x, 0.1, 0.9, 0.5, 4, at, false, func(i int, up, lo float64, nu, nl int32, out bool) {
		want = append(want, ev{i, up, lo, nu, nl, out, true})
	}); err != nil {
		t.Fatal(err)
	}
	var gotE, gotC []ev
	errE, errC := EWMACUSUMScanAt(x, 0.1, 0.9, 0.2, 3, 0.5, 4, at,
		func(i int, z float64, out bool) { gotE = append(gotE, ev{i: i, a: z, out: out}) },
		func(i int, up, lo float64, nu, nl int32, out bool) {
			gotC = append(gotC, ev{i, up, lo, nu, nl, out, true})
		})
	if errE != nil || errC != nil {
		t.Fatal(errE, errC)
	}
	if got := append(gotE, gotC...); !reflect.DeepEqual(want, got) || len(gotE) < len(at) || len(gotC) < len(at) {
		t.Fatalf("fused: %d + %d visits, want %d", len(gotE), len(gotC), len(want))
	}
	gotE, gotC = nil, nil
	errE, errC = EWMACUSUMScanAt(x, 0.1, 0.9, 1.5, 3, 0.5, 4, at,
		func(i int, z float64, out bool) { gotE = append(gotE, ev{}) },
		func(i int, up, lo float64, nu, nl int32, out bool) { gotC = append(gotC, ev{}) })
	if errE == nil || errC != nil || len(gotE) != 0 || len(gotC) == 0 {
		t.Errorf("λ = 1.5: errors %v, %v; %d and %d visits", errE, errC, len(gotE), len(gotC))
	}
}

// TestFirstNonFinite: the one-pass test for NaN and infinities finds the
// first one wherever it stands (by construction).
func TestFirstNonFinite(t *testing.T) {
	for _, n := range []int{0, 1, 3, 4, 5, 8, 9, 64, 67} {
		x := make([]float64, n)
		for i := range x {
			x[i] = float64(i%7) - 3.5
		}
		if got := ctlFirstNonFinite(x); got != -1 {
			t.Errorf("n %d, all finite: got %d", n, got)
		}
		for at := range n {
			for _, bad := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
				y := append([]float64(nil), x...)
				y[at] = bad
				if at+1 < n {
					y[n-1] = math.NaN() // a later one must not hide the first
				}
				if got := ctlFirstNonFinite(y); got != at {
					t.Errorf("n %d, %g at %d: got %d", n, bad, at, got)
				}
			}
		}
	}
}

// ewmaScanOld and cusumScanOld are the single scans EWMA and CUSUM had
// before the fused pass (ctlScanEC), kept as the reference it is checked
// against (TestEWMACUSUMScanAt, TestScanAtVisits): one recursion each, a
// visit at every point when all, else at the points of at, at every point
// beyond and at the point after each.
func ewmaScanOld(x []float64, centre, sigma, lambda, l float64, at []int, all bool, visit func(i int, z float64, beyond bool)) error {
	if err := ctlCheckLambdaL(lambda, l); err != nil {
		return err
	}
	if !(sigma >= 0) || math.IsInf(sigma, 0) || math.IsNaN(centre) || math.IsInf(centre, 0) {
		return fmt.Errorf("centre %g and sigma %g: they must be finite, sigma >= 0", centre, sigma)
	}
	z := centre
	a := 1.0 // (1−λ)^(2(i+1))
	q := (1 - lambda) * (1 - lambda)
	k := lambda / (2 - lambda)
	h := 0.0
	next, ai := ctlNextAt(at, 0, all)
	was := false // the point before was beyond
	for i, v := range x {
		z = lambda*v + (1-lambda)*z
		if 1-a != 1 { // once (1−λ)^(2(i+1)) is below the rounding of 1, h stays
			a *= q
			h = l * sigma * math.Sqrt(k*(1-a))
		}
		d := z - centre
		beyond := d > h || d < -h
		if beyond || was || i == next {
			visit(i, z, beyond)
			if i == next {
				next, ai = ctlNextAt(at, ai+1, all)
				if all {
					next = i + 1
				}
			}
		}
		was = beyond
	}
	return nil
}

func cusumScanOld(x []float64, centre, sigma, k, h float64, at []int, all bool, visit func(i int, up, lo float64, nu, nl int32, beyond bool)) error {
	if err := ctlCheckKH(k, h); err != nil {
		return err
	}
	if !(sigma >= 0) || math.IsInf(sigma, 0) || math.IsNaN(centre) || math.IsInf(centre, 0) {
		return fmt.Errorf("centre %g and sigma %g: they must be finite, sigma >= 0", centre, sigma)
	}
	up, lo := 0.0, 0.0
	var nu, nl int32
	slack, decision := k*sigma, h*sigma
	hi, low := centre+slack, centre-slack
	next, ai := ctlNextAt(at, 0, all)
	was := false
	for i, v := range x {
		up = max(0, v-hi+up) // the built-in max: no branch to mispredict
		lo = max(0, low-v+lo)
		// counts of points above 0 in a row, without branches
		nu = (nu + 1) * int32(ctlU(up > 0))
		nl = (nl + 1) * int32(ctlU(lo > 0))
		beyond := up > decision || lo > decision
		if beyond || was || i == next {
			visit(i, up, lo, nu, nl, beyond)
			if i == next {
				next, ai = ctlNextAt(at, ai+1, all)
				if all {
					next = i + 1
				}
			}
		}
		was = beyond
	}
	return nil
}
