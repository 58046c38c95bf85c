package method

import (
	"fmt"
	"math"
	"math/bits"
)

// Codes of the special-cause checks (our own short names).
const (
	SignalBeyondLimits  = "beyond-limits"              // one point beyond Limit·σ
	SignalTwoOfThree    = "two-of-three-beyond-2sigma" // 2 of 3 in a row beyond 2σ, same side
	SignalFourOfFive    = "four-of-five-beyond-1sigma" // 4 of 5 in a row beyond 1σ, same side
	SignalRunSameSide   = "run-same-side"              // a run on one side of the centre
	SignalTrend         = "trend"                      // steadily rising or falling
	SignalAlternating   = "alternating"                // up and down in turn
	SignalHuggingCentre = "hugging-centre"             // a run within 1σ of the centre
	SignalAvoidCentre   = "avoiding-centre"            // a run beyond 1σ, on both sides
)

// SignalSettings switches the special-cause checks and sets their
// parameters. A zero count or limit takes the published default given
// beside it; DefaultSignalSettings turns every check on.
type SignalSettings struct {
	BeyondLimits bool
	Limit        float64 // default 3 (Shewhart 1931)

	TwoOfThree bool // Western Electric 1956; Nelson 1984
	FourOfFive bool // Western Electric 1956; Nelson 1984

	RunSameSide bool
	SameSideRun int // default 9 (Nelson 1984; Western Electric 1956 used 8)

	Trend    bool
	TrendRun int // points in a row steadily rising or falling; default 6 (Nelson 1984)

	Alternating    bool
	AlternatingRun int // points in a row alternating up and down; default 14 (Nelson 1984)

	HuggingCentre bool
	HuggingRun    int // points in a row within 1σ of the centre; default 15 (Nelson 1984)

	AvoidCentre bool
	AvoidRun    int // points in a row beyond 1σ with both sides present; default 8 (Nelson 1984)
}

// DefaultSignalSettings turns on every check with the published defaults.
func DefaultSignalSettings() SignalSettings {
	return SignalSettings{
		BeyondLimits: true, Limit: 3, TwoOfThree: true, FourOfFive: true,
		RunSameSide: true, SameSideRun: 9, Trend: true, TrendRun: 6,
		Alternating: true, AlternatingRun: 14, HuggingCentre: true, HuggingRun: 15,
		AvoidCentre: true, AvoidRun: 8,
	}
}

// Signal is one special-cause signal: the check's code, the side (+1
// above the centre or rising, −1 below or falling, 0 for checks without a
// side), and the points (0-based) that make it. For the run checks every
// point from First to Last makes the signal and Points is nil; for the
// two-of-three and four-of-five checks Points lists the points beyond the
// zone (First and Last are the first and last of them). Indices returns
// the points in both cases.
type Signal struct {
	Rule        string
	Side        int
	First, Last int
	Points      []int
}

// Indices returns the points that make the signal.
func (s Signal) Indices() []int {
	if s.Points != nil {
		return s.Points
	}
	out := make([]int, 0, s.Last-s.First+1)
	for i := s.First; i <= s.Last; i++ {
		out = append(out, i)
	}
	return out
}

// Signals runs the switched-on checks for special causes on the points x
// plotted against centre with standard deviation sigma: one value for
// every point, or one per point (a mean chart with unequal subgroup sizes
// gives each mean its own σ/√nᵢ). The checks are the zone rules of the
// Western Electric Statistical Quality Control Handbook (1956) and the
// tests of Nelson (1984, J. Quality Technology 16:237), in our own words:
//
//   - beyond-limits: a point more than Limit·σ from the centre.
//   - two-of-three-beyond-2sigma: two of three points in a row more than 2σ
//     from the centre on the same side.
//   - four-of-five-beyond-1sigma: four of five points in a row more than 1σ
//     from the centre on the same side.
//   - run-same-side: SameSideRun or more points in a row strictly on one
//     side of the centre (a point on the centre ends the run).
//   - trend: TrendRun or more points in a row, each higher than the one
//     before (or each lower); an equal neighbour ends it.
//   - alternating: AlternatingRun or more points in a row going up and
//     down in turn.
//   - hugging-centre: HuggingRun or more points in a row less than 1σ from
//     the centre.
//   - avoiding-centre: AvoidRun or more points in a row more than 1σ from
//     the centre, with points on both sides among them.
//
// "More than kσ" is strict: a point exactly on a zone edge is on neither
// side of it. Each run check reports the whole maximal run once; the
// windowed checks report each cluster of overlapping windows once, with
// the points beyond the zone. Comparisons use x − centre against k·σ (no
// division), so σ = 0 is allowed. Signals are returned check by check, in
// order of their first point within each check.
func Signals(x []float64, centre float64, sigma []float64, s SignalSettings) ([]Signal, error) {
	// ScanSignals gives the signals as each is complete, the checks
	// interleaved; they are gathered check by check here, each in the
	// order found (the order of their first points).
	var byRule [ctlRules][]Signal
	err := ScanSignals(x, centre, sigma, s, func(g Signal) {
		k := ctlRuleIndex(g.Rule)
		if g.Points != nil {
			g.Points = append([]int(nil), g.Points...)
		}
		byRule[k] = append(byRule[k], g)
	})
	if err != nil {
		return nil, err
	}
	var out []Signal
	for _, l := range byRule {
		out = append(out, l...)
	}
	return out, nil
}

// ctlRuleOrder lists the checks in the order Signals returns them.
var ctlRuleOrder = [...]string{SignalBeyondLimits, SignalTwoOfThree, SignalFourOfFive, SignalRunSameSide,
	SignalTrend, SignalAlternating, SignalHuggingCentre, SignalAvoidCentre}

const ctlRules = len(ctlRuleOrder)

func ctlRuleIndex(rule string) int {
	for k, r := range ctlRuleOrder {
		if r == rule {
			return k
		}
	}
	return 0
}

// ScanSignals runs the checks of Signals in one pass over the points and
// calls emit with each signal as soon as it is complete (a run when it
// ends, a cluster of windows when the next window of that check opens
// another or the points end). The checks are interleaved: within one
// check, signals come in the order of their first points, as Signals
// gives them. The signal's Points slice is valid only during the call
// (it is reused); nothing is kept per point, so memory is O(1) beyond the
// signals the caller keeps.
func ScanSignals(x []float64, centre float64, sigma []float64, s SignalSettings, emit func(Signal)) error {
	n := len(x)
	if len(sigma) != 1 && len(sigma) != n {
		return fmt.Errorf("%d sigmas for %d points: give one, or one per point", len(sigma), n)
	}
	for _, v := range sigma {
		if !(v >= 0) || math.IsInf(v, 0) {
			return fmt.Errorf("sigma %g: it must be a finite number >= 0", v)
		}
	}
	if math.IsNaN(centre) || math.IsInf(centre, 0) {
		return fmt.Errorf("centre %g: it must be finite", centre)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("point %d is %g: points must be finite", i, v)
		}
	}
	lim := ctlDefaultF(s.Limit, 3)
	sc := ctlScan{x: x, centre: centre, sigma: sigma, emit: emit,
		minSame: ctlDefaultI(s.SameSideRun, 9), minHug: ctlDefaultI(s.HuggingRun, 15),
		minAvoid: ctlDefaultI(s.AvoidRun, 8), minTrend: ctlDefaultI(s.TrendRun, 6),
		minAlt: ctlDefaultI(s.AlternatingRun, 14)}
	sc.w23 = ctlWindow{rule: SignalTwoOfThree, m: 2, w: 3}
	sc.w45 = ctlWindow{rule: SignalFourOfFive, m: 4, w: 5}
	onB, on23, on45 := ctlU(s.BeyondLimits), ctlU(s.TwoOfThree), ctlU(s.FourOfFive)
	onSame, onHug, onAvoid := ctlU(s.RunSameSide), ctlU(s.HuggingCentre), ctlU(s.AvoidCentre)
	onTrend, onAlt := ctlU(s.Trend), ctlU(s.Alternating)
	sg := 0.0
	if len(sigma) > 0 {
		sg = sigma[0]
	}
	perPoint := len(sigma) > 1
	// Each check keeps a few integers, updated without branches (random
	// points would mispredict them): the last points' zones as bits
	// (bit 0 the current point) for the windowed checks, and the lengths
	// of the runs ending at the current point for the run checks. A run
	// ends when its length drops to 0; the rare points where a check
	// fires or a long run ends take the slow path (sc.fire).
	var hA2, hB2, hA1, hB1 uint64 // above / below, beyond 2σ / 1σ
	var rA, rB, rIn, rOut uint64  // points in a row above, below, within 1σ, beyond 1σ
	var tU, tD, tAlt uint64       // steps in a row up, down, alternating
	prev, prevStep := 0.0, 0
	for i, v := range x {
		if perPoint {
			sg = sigma[i]
		}
		d := v - centre
		a := math.Abs(d)
		above, below := ctlU(d > 0), ctlU(d < 0)
		o1, o2, in1, oL := ctlU(a > sg), ctlU(a > 2*sg), ctlU(a < sg), ctlU(a > lim*sg)
		hA2 = hA2<<1 | above&o2
		hB2 = hB2<<1 | below&o2
		hA1 = hA1<<1 | above&o1
		hB1 = hB1<<1 | below&o1
		f23 := (hA2&1)&ctlU(hA2&6 != 0) | (hB2&1)&ctlU(hB2&6 != 0)
		f45 := (hA1&1)&ctlU(bits.OnesCount8(uint8(hA1&0x1e)) >= 3) | (hB1&1)&ctlU(bits.OnesCount8(uint8(hB1&0x1e)) >= 3)
		nA, nB, nIn, nOut := (rA+1)*above, (rB+1)*below, (rIn+1)*in1, (rOut+1)*o1
		endSame := ctlU(nA == 0)&ctlU(rA >= uint64(sc.minSame)) | ctlU(nB == 0)&ctlU(rB >= uint64(sc.minSame))
		endHug := ctlU(nIn == 0) & ctlU(rIn >= uint64(sc.minHug))
		endAvoid := ctlU(nOut == 0) & ctlU(rOut >= uint64(sc.minAvoid))
		// the step from the point before (none at the first point)
		up, down := ctlU(v > prev)&ctlU(i > 0), ctlU(v < prev)&ctlU(i > 0)
		step := int(up) - int(down)
		nU, nD := (tU+1)*up, (tD+1)*down
		nAlt := (tAlt*ctlU(step == -prevStep) + 1) * (up | down)
		endTrend := ctlU(nU == 0)&ctlU(tU+1 >= uint64(sc.minTrend))&ctlU(tU > 0) | ctlU(nD == 0)&ctlU(tD+1 >= uint64(sc.minTrend))&ctlU(tD > 0)
		endAlt := ctlU(nAlt != tAlt+1) & ctlU(tAlt > 0) & ctlU(tAlt+1 >= uint64(sc.minAlt))
		if oL&onB|f23&on23|f45&on45|endSame&onSame|endHug&onHug|endAvoid&onAvoid|endTrend&onTrend|endAlt&onAlt != 0 {
			if oL&onB != 0 {
				sc.one[0] = i
				emit(Signal{Rule: SignalBeyondLimits, Side: int(above) - int(below), First: i, Last: i, Points: sc.one[:]})
			}
			if f23&on23 != 0 {
				sc.w23.fire(i, hA2, hB2, emit)
			}
			if f45&on45 != 0 {
				sc.w45.fire(i, hA1, hB1, emit)
			}
			if endSame&onSame != 0 {
				sc.endRun(SignalRunSameSide, int(ctlU(rA > 0))-int(ctlU(rB > 0)), i-int(rA+rB), i-1)
			}
			if endHug&onHug != 0 {
				sc.endRun(SignalHuggingCentre, 0, i-int(rIn), i-1)
			}
			if endAvoid&onAvoid != 0 {
				sc.endAvoid(i-int(rOut), i-1)
			}
			if endTrend&onTrend != 0 {
				sc.endRun(SignalTrend, int(ctlU(tU > 0))-int(ctlU(tD > 0)), i-1-int(tU+tD), i-1)
			}
			if endAlt&onAlt != 0 {
				sc.endRun(SignalAlternating, 0, i-1-int(tAlt), i-1)
			}
		}
		rA, rB, rIn, rOut = nA, nB, nIn, nOut
		tU, tD, tAlt = nU, nD, nAlt
		prev, prevStep = v, step
	}
	// the open clusters and runs end with the points
	if n == 0 {
		return nil
	}
	if on23 != 0 {
		sc.w23.close(emit)
	}
	if on45 != 0 {
		sc.w45.close(emit)
	}
	if onSame != 0 && rA+rB >= uint64(sc.minSame) {
		sc.endRun(SignalRunSameSide, int(ctlU(rA > 0))-int(ctlU(rB > 0)), n-int(rA+rB), n-1)
	}
	if onTrend != 0 && tU+tD > 0 && tU+tD+1 >= uint64(sc.minTrend) {
		sc.endRun(SignalTrend, int(ctlU(tU > 0))-int(ctlU(tD > 0)), n-1-int(tU+tD), n-1)
	}
	if onAlt != 0 && tAlt > 0 && tAlt+1 >= uint64(sc.minAlt) {
		sc.endRun(SignalAlternating, 0, n-1-int(tAlt), n-1)
	}
	if onHug != 0 && rIn >= uint64(sc.minHug) {
		sc.endRun(SignalHuggingCentre, 0, n-int(rIn), n-1)
	}
	if onAvoid != 0 && rOut >= uint64(sc.minAvoid) {
		sc.endAvoid(n-int(rOut), n-1)
	}
	return nil
}

// ctlU is 1 for true (the compiler makes it a flag set, not a branch).
func ctlU(b bool) uint64 {
	var u uint64
	if b {
		u = 1
	}
	return u
}

// ctlScan holds what ScanSignals needs on its slow path.
type ctlScan struct {
	x                                           []float64
	centre                                      float64
	sigma                                       []float64
	emit                                        func(Signal)
	one                                         [1]int
	w23, w45                                    ctlWindow
	minSame, minHug, minAvoid, minTrend, minAlt int
}

func (sc *ctlScan) endRun(rule string, side, first, last int) {
	sc.emit(Signal{Rule: rule, Side: side, First: first, Last: last})
}

// endAvoid emits a run of points beyond 1σ when it holds both sides.
func (sc *ctlScan) endAvoid(first, last int) {
	var seen [2]bool
	for j := first; j <= last; j++ {
		// every point of the run is beyond 1σ, so off the centre
		if sc.x[j]-sc.centre > 0 {
			seen[1] = true
		} else {
			seen[0] = true
		}
	}
	if seen[0] && seen[1] {
		sc.emit(Signal{Rule: SignalAvoidCentre, First: first, Last: last})
	}
}

// ctlWindow is the state of a windowed check (m of w points in a row with
// the same non-zero class, a side beyond a zone edge). A window fires at
// point i when its class is not 0 and at least m of the last w points
// (fewer at the start) share it; overlapping firings on the same side
// join into one signal, which is emitted when a firing opens another or
// the points end.
type ctlWindow struct {
	rule string
	m, w int
	open bool // sig is open
	sig  Signal
	pts  []int // sig's points (reused)
}

// fire handles a firing at point i; hA and hB are the zone bits of the
// points above and below (bit k: point i − k).
func (c *ctlWindow) fire(i int, hA, hB uint64, emit func(Signal)) {
	cl, h := 1, hA
	if hA&1 == 0 {
		cl, h = -1, hB
	}
	lo := max(0, i-c.w+1)
	from := lo
	if c.open && c.sig.Side == cl && c.sig.Last >= lo {
		from = c.sig.Last + 1
	} else {
		c.close(emit)
		c.open = true
		c.sig = Signal{Rule: c.rule, Side: cl}
		c.pts = c.pts[:0]
	}
	for j := from; j <= i; j++ {
		if h>>(i-j)&1 != 0 {
			c.pts = append(c.pts, j)
		}
	}
	c.sig.First, c.sig.Last = c.pts[0], i
}

func (c *ctlWindow) close(emit func(Signal)) {
	if c.open {
		c.sig.Points = c.pts
		emit(c.sig)
		c.open = false
	}
}

// The bits of a point's zone byte in Signals: beyond 1σ, 2σ and the limit
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

func ctlDefaultI(v, d int) int {
	if v <= 0 {
		return d
	}
	return v
}

func ctlDefaultF(v, d float64) float64 {
	if !(v > 0) || math.IsInf(v, 0) {
		return d
	}
	return v
}

// ctlWindowed reports m of w points in a row with the same non-zero class
// (side beyond a zone). A window fires at point i when class(i) ≠ 0 and at
// least m of the last w points (fewer at the start) share it; overlapping
// firings on the same side join into one signal.
func ctlWindowed(out []Signal, code []uint8, rule string, m, w int, edge uint8) []Signal {
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
func ctlRuns(out []Signal, code []uint8, rule string, minLen int, what uint8, bothSides bool) []Signal {
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
func ctlSteps(out []Signal, x []float64, rule string, minPts int, alternate bool) []Signal {
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
