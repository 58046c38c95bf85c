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
		out = ctlWindowed(out, code, SignalTwoOfThree, 2, 3, zoneBeyond2)
	}
	if s.FourOfFive {
		out = ctlWindowed(out, code, SignalFourOfFive, 4, 5, zoneBeyond1)
	}
	if s.RunSameSide {
		out = ctlRuns(out, code, SignalRunSameSide, ctlDefaultI(s.SameSideRun, 9), classSide, false)
	}
	if s.Trend {
		out = ctlSteps(out, x, SignalTrend, ctlDefaultI(s.TrendRun, 6), false)
	}
	if s.Alternating {
		out = ctlSteps(out, x, SignalAlternating, ctlDefaultI(s.AlternatingRun, 14), true)
	}
	if s.HuggingCentre {
		out = ctlRuns(out, code, SignalHuggingCentre, ctlDefaultI(s.HuggingRun, 15), zoneWithin1, false)
	}
	if s.AvoidCentre {
		out = ctlRuns(out, code, SignalAvoidCentre, ctlDefaultI(s.AvoidRun, 8), zoneBeyond1, true)
	}
	return out, nil
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
