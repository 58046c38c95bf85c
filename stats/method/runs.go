package method

import (
	"fmt"
	"math"
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
	one := [1]int{}
	w23 := ctlWindow{rule: SignalTwoOfThree, m: 2, w: 3, on: s.TwoOfThree}
	w45 := ctlWindow{rule: SignalFourOfFive, m: 4, w: 5, on: s.FourOfFive}
	side := ctlRun{rule: SignalRunSameSide, minLen: ctlDefaultI(s.SameSideRun, 9)}
	hug := ctlRun{rule: SignalHuggingCentre, minLen: ctlDefaultI(s.HuggingRun, 15)}
	avoid := ctlRun{rule: SignalAvoidCentre, minLen: ctlDefaultI(s.AvoidRun, 8), bothSides: true}
	trend := ctlStep{rule: SignalTrend, minPts: ctlDefaultI(s.TrendRun, 6)}
	alt := ctlStep{rule: SignalAlternating, minPts: ctlDefaultI(s.AlternatingRun, 14), alternate: true}
	sg := 0.0
	if len(sigma) > 0 {
		sg = sigma[0]
	}
	perPoint := len(sigma) > 1
	for i, v := range x {
		if perPoint {
			sg = sigma[i]
		}
		d := v - centre
		a := math.Abs(d)
		sd := 0 // side of the centre
		if d > 0 {
			sd = 1
		} else if d < 0 {
			sd = -1
		}
		if s.BeyondLimits && a > lim*sg {
			one[0] = i
			emit(Signal{Rule: SignalBeyondLimits, Side: sd, First: i, Last: i, Points: one[:]})
		}
		if w23.on {
			c := 0
			if a > 2*sg {
				c = sd
			}
			w23.push(i, c, emit)
		}
		if w45.on {
			c := 0
			if a > sg {
				c = sd
			}
			w45.push(i, c, emit)
		}
		if s.RunSameSide {
			side.push(i, sd, emit)
		}
		if s.HuggingCentre {
			c := 0
			if a < sg {
				c = 2
			}
			hug.push(i, c, emit)
		}
		if s.AvoidCentre {
			c := 0
			if a > sg {
				c = sd
			}
			avoid.push(i, c, emit)
		}
		if i > 0 && (s.Trend || s.Alternating) {
			st := 0 // step from x[i-1] to x[i]
			if v > x[i-1] {
				st = 1
			} else if v < x[i-1] {
				st = -1
			}
			if s.Trend {
				trend.push(i, st, emit)
			}
			if s.Alternating {
				alt.push(i, st, emit)
			}
		}
	}
	// the open clusters and runs end with the points, in the order of the
	// checks
	if n > 0 {
		w23.close(emit)
		w45.close(emit)
		if s.RunSameSide {
			side.flush(n-1, emit)
		}
		if s.Trend && n >= 2 {
			trend.flush(n-1, emit)
		}
		if s.Alternating && n >= 2 {
			alt.flush(n-1, emit)
		}
		if s.HuggingCentre {
			hug.flush(n-1, emit)
		}
		if s.AvoidCentre {
			avoid.flush(n-1, emit)
		}
	}
	return nil
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
	on   bool
	cnt  [3]int  // counts of −1, 0, +1 in the window
	ring [8]int8 // the window's classes, point i at i mod w
	r    int
	open bool // sig is open
	sig  Signal
	pts  []int // sig's points (reused)
}

func (c *ctlWindow) push(i, cl int, emit func(Signal)) {
	if i >= c.w {
		c.cnt[c.ring[c.r]+1]--
	}
	c.ring[c.r] = int8(cl)
	if c.r++; c.r == c.w {
		c.r = 0
	}
	c.cnt[cl+1]++
	if cl == 0 || c.cnt[cl+1] < c.m {
		return
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
		// point j is in the window: its class at ring slot j mod w
		if int(c.ring[j%c.w]) == cl {
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

// ctlRun is the state of a run check: maximal runs of at least minLen
// points with the same non-zero class; with bothSides the class is a side
// (±1) and a run is any stretch of non-zero classes holding both signs.
type ctlRun struct {
	rule       string
	minLen     int
	bothSides  bool
	start, cur int
	seen       [2]bool
}

func (c *ctlRun) push(i, cl int, emit func(Signal)) {
	same := cl == c.cur
	if c.bothSides {
		same = (cl != 0) == (c.cur != 0)
	}
	if !same {
		if i > 0 {
			c.flush(i-1, emit)
		}
		c.start, c.cur, c.seen = i, cl, [2]bool{}
	}
	if c.bothSides && cl != 0 {
		c.cur = 1
		if cl > 0 {
			c.seen[1] = true
		} else {
			c.seen[0] = true
		}
	}
}

func (c *ctlRun) flush(end int, emit func(Signal)) {
	if c.cur == 0 || end-c.start+1 < c.minLen {
		return
	}
	side := c.cur
	if c.bothSides {
		if !(c.seen[0] && c.seen[1]) {
			return
		}
		side = 0
	}
	if side == 2 {
		side = 0
	}
	emit(Signal{Rule: c.rule, Side: side, First: c.start, Last: end})
}

// ctlStep is the state of a step check: maximal stretches of points whose
// steps all go the same way (trend) or alternate; a zero step ends a
// stretch. A stretch of p points has p − 1 steps.
type ctlStep struct {
	rule        string
	minPts      int
	alternate   bool
	start, prev int // first point of the stretch, previous step
}

func (c *ctlStep) push(j, d int, emit func(Signal)) {
	cont := d != 0 && c.prev != 0 && ((!c.alternate && d == c.prev) || (c.alternate && d == -c.prev))
	if !cont {
		c.flush(j-1, emit)
		c.start = j - 1
		if d == 0 {
			c.start = j
		}
	}
	c.prev = d
}

func (c *ctlStep) flush(last int, emit func(Signal)) {
	if c.prev != 0 && last-c.start+1 >= c.minPts {
		side := 0
		if !c.alternate {
			side = c.prev
		}
		emit(Signal{Rule: c.rule, Side: side, First: c.start, Last: last})
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
