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
	sg := func(i int) float64 {
		if len(sigma) == 1 {
			return sigma[0]
		}
		return sigma[i]
	}
	// zone(i, k): +1 if x[i] is more than kσ above the centre, −1 if more
	// than kσ below, 0 otherwise.
	zone := func(i int, k float64) int {
		d, lim := x[i]-centre, k*sg(i)
		switch {
		case d > lim:
			return 1
		case d < -lim:
			return -1
		}
		return 0
	}
	var out []Signal
	if s.BeyondLimits {
		lim := ctlDefaultF(s.Limit, 3)
		for i := range x {
			if z := zone(i, lim); z != 0 {
				out = append(out, Signal{Rule: SignalBeyondLimits, Side: z, First: i, Last: i, Points: []int{i}})
			}
		}
	}
	if s.TwoOfThree {
		out = ctlWindowed(out, n, SignalTwoOfThree, 2, 3, func(i int) int { return zone(i, 2) })
	}
	if s.FourOfFive {
		out = ctlWindowed(out, n, SignalFourOfFive, 4, 5, func(i int) int { return zone(i, 1) })
	}
	if s.RunSameSide {
		side := func(i int) int {
			switch {
			case x[i] > centre:
				return 1
			case x[i] < centre:
				return -1
			}
			return 0
		}
		out = ctlRuns(out, n, SignalRunSameSide, ctlDefaultI(s.SameSideRun, 9), side, false)
	}
	if s.Trend {
		out = ctlSteps(out, x, SignalTrend, ctlDefaultI(s.TrendRun, 6), false)
	}
	if s.Alternating {
		out = ctlSteps(out, x, SignalAlternating, ctlDefaultI(s.AlternatingRun, 14), true)
	}
	if s.HuggingCentre {
		in := func(i int) int {
			if math.Abs(x[i]-centre) < sg(i) {
				return 2 // a class of its own (no side)
			}
			return 0
		}
		out = ctlRuns(out, n, SignalHuggingCentre, ctlDefaultI(s.HuggingRun, 15), in, false)
	}
	if s.AvoidCentre {
		out = ctlRuns(out, n, SignalAvoidCentre, ctlDefaultI(s.AvoidRun, 8), func(i int) int { return zone(i, 1) }, true)
	}
	return out, nil
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
func ctlWindowed(out []Signal, n int, rule string, m, w int, class func(int) int) []Signal {
	cnt := [3]int{} // counts of −1, 0, +1 in the window
	cls := make([]int8, 0, w)
	open := -1 // index in out of the signal still open
	for i := 0; i < n; i++ {
		c := class(i)
		if len(cls) == w {
			cnt[cls[0]+1]--
			cls = cls[1:]
			if cap(cls) < w {
				cls = append(make([]int8, 0, 2*w), cls...)
			}
		}
		cls = append(cls, int8(c))
		cnt[c+1]++
		if c == 0 || cnt[c+1] < m {
			continue
		}
		lo := i - len(cls) + 1
		if open >= 0 && out[open].Side == c && out[open].Last >= lo {
			sg := &out[open]
			for j := sg.Last + 1; j <= i; j++ {
				if class(j) == c {
					sg.Points = append(sg.Points, j)
				}
			}
			sg.Last = i
			continue
		}
		var pts []int
		for j := lo; j <= i; j++ {
			if class(j) == c {
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
func ctlRuns(out []Signal, n int, rule string, minLen int, class func(int) int, bothSides bool) []Signal {
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
		c := class(i)
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
