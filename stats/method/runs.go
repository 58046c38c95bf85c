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
	if i := ctlFirstNonFinite(x); i >= 0 {
		return fmt.Errorf("point %d is %g: points must be finite", i, x[i])
	}
	lim := ctlDefaultF(s.Limit, 3)
	sc := ctlScan{x: x, centre: centre, sigma: sigma, emit: emit,
		minSame: ctlDefaultI(s.SameSideRun, 9), minHug: ctlDefaultI(s.HuggingRun, 15),
		minAvoid: ctlDefaultI(s.AvoidRun, 8), minTrend: ctlDefaultI(s.TrendRun, 6),
		minAlt: ctlDefaultI(s.AlternatingRun, 14)}
	if len(sigma) == 1 {
		for j := range sc.flat {
			sc.flat[j] = sigma[0]
		}
	}
	sc.w23 = ctlWindow{rule: SignalTwoOfThree, m: 2, w: 3}
	sc.w45 = ctlWindow{rule: SignalFourOfFive, m: 4, w: 5}
	// a check switched off never fires: its limit or threshold is out of
	// reach, its window table all zeros
	const never = math.MaxUint64
	if !s.BeyondLimits {
		lim = math.Inf(1)
	}
	sc.lim = lim
	for h := range 32 {
		if s.TwoOfThree && h&1 != 0 && h&6 != 0 {
			sc.t23[h] = 1
		}
		if s.FourOfFive && h&1 != 0 && bits.OnesCount8(uint8(h&0x1e)) >= 3 {
			sc.t45[h] = 1
		}
	}
	thr := func(on bool, v int) uint64 {
		if !on {
			return never
		}
		return uint64(v)
	}
	sc.thrSame, sc.thrHug, sc.thrAvoid = thr(s.RunSameSide, sc.minSame), thr(s.HuggingCentre, sc.minHug), thr(s.AvoidCentre, sc.minAvoid)
	// the step checks count steps: p points make p − 1 (at least one)
	sc.thrTrend, sc.thrAlt = thr(s.Trend, max(1, sc.minTrend-1)), thr(s.Alternating, max(1, sc.minAlt-1))
	sc.on23, sc.on45 = s.TwoOfThree, s.FourOfFive

	// The points go by words of 64. A word's zones and steps are gathered
	// as bit masks (bit j: point base + j); the state (run lengths, side
	// and step) is carried over the word from the masks alone. Where the
	// masks show that something may fire or end (a point beyond the
	// limits, a window of a windowed check filled, a run reaching its
	// length), sc.events finds each signal from the masks. The last points
	// (fewer than 64) are run through one by one (sc.exact).
	var st ctlState
	var prev ctlMasks
	for base := 0; base < n; base += 64 {
		end := min(base+64, n)
		if end-base < 64 {
			sc.exact(&st, &prev, base, end)
			break
		}
		m := sc.masks(base)
		if !sc.quiet(&st, &m, &prev) {
			sc.events(&st, &m, &prev, base)
		}
		st.carry(&m)
		prev = m
	}
	// the open clusters and runs end with the points
	if n == 0 {
		return nil
	}
	sc.w23.close(emit)
	sc.w45.close(emit)
	if st.r >= sc.thrSame {
		sc.endRun(SignalRunSameSide, st.prevSide, n-int(st.r), n-1)
	}
	if st.t >= sc.thrTrend {
		sc.endRun(SignalTrend, st.prevStep, n-1-int(st.t), n-1)
	}
	if st.tAlt >= sc.thrAlt {
		sc.endRun(SignalAlternating, 0, n-1-int(st.tAlt), n-1)
	}
	if st.rIn >= sc.thrHug {
		sc.endRun(SignalHuggingCentre, 0, n-int(st.rIn), n-1)
	}
	if st.rOut >= sc.thrAvoid {
		sc.endAvoid(n-int(st.rOut), n-1)
	}
	return nil
}

// ctlState is the state of ScanSignals after a point: the lengths of the
// runs ending there (points on one side, within 1σ, beyond 1σ; steps the
// same way, alternating) and the side and step of that point.
type ctlState struct {
	r, rIn, rOut, t, tAlt uint64
	prevSide, prevStep    int
}

// ctlFirstNonFinite returns the index of the first NaN or infinite value
// of x, or -1. v − v is 0 for a finite v and NaN otherwise, and NaN
// survives a sum, so one pass of four independent sums (no branch per
// value) answers for every value; only a series that holds one is
// searched value by value.
func ctlFirstNonFinite(x []float64) int {
	var a0, a1, a2, a3 float64
	i := 0
	for ; i+4 <= len(x); i += 4 {
		a0 += x[i] - x[i]
		a1 += x[i+1] - x[i+1]
		a2 += x[i+2] - x[i+2]
		a3 += x[i+3] - x[i+3]
	}
	for ; i < len(x); i++ {
		a0 += x[i] - x[i]
	}
	if a0+a1+a2+a3 == 0 {
		return -1
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return i
		}
	}
	return -1
}

// ctlMasks are the zones and steps of the 64 points of a word (bit j:
// point base + j): above and below the centre, beyond 1σ, 2σ and the
// limit, within 1σ, a step up or down from the point before.
type ctlMasks struct {
	above, below, o1, o2, oL, in1, up, down uint64
}

// masks gathers the masks of the 64 points from base.
func (sc *ctlScan) masks(base int) ctlMasks {
	x := (*[64]float64)(sc.x[base : base+64])
	prev := sc.x[max(0, base-1)] // no step at the first point
	centre, lim := sc.centre, sc.lim
	// the masks in local variables (registers), not in m's fields
	var above, below, o1, o2, oL, in1, up, down uint64
	// the points' sigmas: one for all (sc.flat), or one per point
	sgs := &sc.flat
	if len(sc.sigma) > 1 {
		sgs = (*[64]float64)(sc.sigma[base : base+64])
	}
	for j, v := range x {
		sg := sgs[j]
		d := v - centre
		a := math.Abs(d)
		above |= ctlU(d > 0) << j
		below |= ctlU(d < 0) << j
		o1 |= ctlU(a > sg) << j
		o2 |= ctlU(a > 2*sg) << j
		oL |= ctlU(a > lim*sg) << j
		in1 |= ctlU(a < sg) << j
		up |= ctlU(v > prev) << j
		down |= ctlU(v < prev) << j
		prev = v
	}
	return ctlMasks{above: above, below: below, o1: o1, o2: o2, oL: oL, in1: in1, up: up, down: down}
}

// quiet tells whether nothing can fire or end in the word of masks m
// (p: the word before), the state st being the one before the word. It
// may answer false where nothing happens (events then finds nothing),
// never true where something does.
func (sc *ctlScan) quiet(st *ctlState, m, p *ctlMasks) bool {
	if m.oL != 0 {
		return false
	}
	// with bit j standing for point j, M<<k | P>>(64−k) holds point j − k
	sh := func(M, P uint64, k int) uint64 { return M<<k | P>>(64-k) }
	if sc.on23 {
		for _, mp := range [2][2]uint64{{m.above & m.o2, p.above & p.o2}, {m.below & m.o2, p.below & p.o2}} {
			M, P := mp[0], mp[1]
			if M&(sh(M, P, 1)|sh(M, P, 2)) != 0 {
				return false
			}
		}
	}
	if sc.on45 {
		for _, mp := range [2][2]uint64{{m.above & m.o1, p.above & p.o1}, {m.below & m.o1, p.below & p.o1}} {
			M, P := mp[0], mp[1]
			s1, s2, s3, s4 := sh(M, P, 1), sh(M, P, 2), sh(M, P, 3), sh(M, P, 4)
			if M&(s1&s2&(s3|s4)|s3&s4&(s1|s2)) != 0 {
				return false
			}
		}
	}
	carried := func(cond bool, v uint64) uint64 {
		if cond {
			return v
		}
		return 0
	}
	alt := m.up&sh(m.down, p.down, 1) | m.down&sh(m.up, p.up, 1)
	altThr := sc.thrAlt
	if altThr != math.MaxUint64 && altThr > 1 {
		altThr-- // a stretch of k alternating steps has k − 1 alternations
	} else if altThr == 1 && m.up|m.down != 0 {
		return false
	}
	return ctlNoRun(m.above, carried(st.prevSide == 1, st.r), sc.thrSame) &&
		ctlNoRun(m.below, carried(st.prevSide == -1, st.r), sc.thrSame) &&
		ctlNoRun(m.in1, st.rIn, sc.thrHug) && ctlNoRun(m.o1, st.rOut, sc.thrAvoid) &&
		ctlNoRun(m.up, carried(st.prevStep == 1, st.t), sc.thrTrend) &&
		ctlNoRun(m.down, carried(st.prevStep == -1, st.t), sc.thrTrend) &&
		ctlNoRun(alt, carried(st.tAlt > 0, st.tAlt-1), altThr)
}

// ctlNoRun tells whether no run of ones in M, with carry ones running
// into the word from before, reaches thr (a run reaching it may end here).
func ctlNoRun(M, carry, thr uint64) bool {
	if thr == math.MaxUint64 {
		return true
	}
	if carry > 0 && carry+uint64(bits.TrailingZeros64(^M)) >= thr {
		return false
	}
	r := M // r: the starts of runs of at least k + 1 ones
	for k := uint64(1); k < thr && r != 0; k++ {
		r &= M >> k
	}
	return r == 0
}

// events emits the signals that fire or end in the word of masks m at
// base (p: the word before), st being the state before the word.
func (sc *ctlScan) events(st *ctlState, m, p *ctlMasks, base int) {
	for b := m.oL; b != 0; b &= b - 1 {
		j := bits.TrailingZeros64(b)
		sc.one[0] = base + j
		side := int(m.above>>j&1) - int(m.below>>j&1)
		sc.emit(Signal{Rule: SignalBeyondLimits, Side: side, First: base + j, Last: base + j, Points: sc.one[:]})
	}
	sh := func(M, P uint64, k int) uint64 { return M<<k | P>>(64-k) }
	if sc.on23 {
		A, B, PA, PB := m.above&m.o2, m.below&m.o2, p.above&p.o2, p.below&p.o2
		for b := A&(sh(A, PA, 1)|sh(A, PA, 2)) | B&(sh(B, PB, 1)|sh(B, PB, 2)); b != 0; b &= b - 1 {
			j := bits.TrailingZeros64(b)
			sc.w23.fire(base+j, ctlLast5(A, PA, j), ctlLast5(B, PB, j), sc.emit)
		}
	}
	if sc.on45 {
		A, B, PA, PB := m.above&m.o1, m.below&m.o1, p.above&p.o1, p.below&p.o1
		f := func(M, P uint64) uint64 {
			s1, s2, s3, s4 := sh(M, P, 1), sh(M, P, 2), sh(M, P, 3), sh(M, P, 4)
			return M & (s1&s2&(s3|s4) | s3&s4&(s1|s2))
		}
		for b := f(A, PA) | f(B, PB); b != 0; b &= b - 1 {
			j := bits.TrailingZeros64(b)
			sc.w45.fire(base+j, ctlLast5(A, PA, j), ctlLast5(B, PB, j), sc.emit)
		}
	}
	// Runs of ones in M1 (side +1) or M2 (side −1, may be 0): each ends at
	// the first bit not in it, and its length counts the bits before
	// (c1, c2: the ones carried from before the word). The runs of both
	// sides are taken in order. For runs of points (off 0) the run ends
	// at point i − 1 with i = base + j; for runs of steps (off 1) a
	// stretch of L steps ending at point i − 1 starts at point i − 1 − L.
	runs := func(rule string, M1, c1, M2, c2, thr uint64, off int) {
		if ctlNoRun(M1, c1, thr) && ctlNoRun(M2, c2, thr) {
			return
		}
		e1, e2 := ^M1&(M1<<1|ctlU(c1 > 0)), ^M2&(M2<<1|ctlU(c2 > 0))
		for b := e1 | e2; b != 0; b &= b - 1 {
			j := bits.TrailingZeros64(b)
			L, side := ctlRunBefore(M1, c1, j), 1
			if e1>>j&1 == 0 {
				L, side = ctlRunBefore(M2, c2, j), -1
			}
			if L < thr {
				continue
			}
			i := base + j
			switch rule {
			case SignalAvoidCentre:
				sc.endAvoid(i-int(L), i-1)
			case SignalHuggingCentre:
				sc.endRun(rule, 0, i-int(L), i-1)
			default:
				sc.endRun(rule, side, i-off-int(L), i-1)
			}
		}
	}
	runs(SignalRunSameSide, m.above, ctlIf(st.prevSide == 1, st.r), m.below, ctlIf(st.prevSide == -1, st.r), sc.thrSame, 0)
	runs(SignalHuggingCentre, m.in1, st.rIn, 0, 0, sc.thrHug, 0)
	runs(SignalAvoidCentre, m.o1, st.rOut, 0, 0, sc.thrAvoid, 0)
	runs(SignalTrend, m.up, ctlIf(st.prevStep == 1, st.t), m.down, ctlIf(st.prevStep == -1, st.t), sc.thrTrend, 1)
	// alternating stretches: step j alternates with step j − 1; a stretch
	// of k steps ending at point i − 1 has k − 1 alternations
	if sc.thrAlt != math.MaxUint64 {
		nz := m.up | m.down
		alt := m.up&sh(m.down, p.down, 1) | m.down&sh(m.up, p.up, 1)
		if sc.thrAlt <= 1 || !ctlNoRun(alt, ctlIf(st.tAlt > 0, st.tAlt-1), sc.thrAlt-1) {
			for b := ^alt & (nz<<1 | ctlU(st.prevStep != 0)); b != 0; b &= b - 1 {
				j := bits.TrailingZeros64(b)
				// steps in the stretch ending at point base + j − 1
				var k uint64
				if j == 0 {
					k = st.tAlt
				} else if below := alt & (1<<j - 1); below == 1<<j-1 {
					k = st.tAlt + uint64(j) // alternating since before the word
				} else {
					k = uint64(j-1-(63-bits.LeadingZeros64(^alt&(1<<j-1)))) + 1
				}
				if k >= sc.thrAlt {
					sc.endRun(SignalAlternating, 0, base+j-1-int(k), base+j-1)
				}
			}
		}
	}
}

// ctlRunBefore is the length of the run of ones in M ending at bit j − 1
// (with carry ones before the word when it reaches bit 0).
func ctlRunBefore(M, carry uint64, j int) uint64 {
	if j == 0 {
		return carry
	}
	z := ^M & (1<<j - 1) // zeros below bit j
	if z == 0 {
		return uint64(j) + carry
	}
	return uint64(j - 1 - (63 - bits.LeadingZeros64(z)))
}

// ctlLast5 gives the bits of points base+j, base+j−1, .., base+j−4 (bit k:
// point base+j−k) from the masks of the word (M) and the word before (P).
func ctlLast5(M, P uint64, j int) uint64 {
	var h uint64
	for k := 0; k < 5; k++ {
		if q := j - k; q >= 0 {
			h |= (M >> q & 1) << k
		} else {
			h |= (P >> (64 + q) & 1) << k
		}
	}
	return h
}

// carry moves the state over a word of masks m.
func (st *ctlState) carry(m *ctlMasks) {
	st.r, st.prevSide = ctlCarryPair(m.above, m.below, st.r, st.prevSide)
	st.rIn = ctlTop(m.in1) + ctlIf(ctlTop(m.in1) == 64, st.rIn)
	st.rOut = ctlTop(m.o1) + ctlIf(ctlTop(m.o1) == 64, st.rOut)
	// alternations: step j the opposite of step j − 1 (bit 0 against the
	// last step of the word before, known from prevStep)
	prevUp, prevDown := ctlU(st.prevStep == 1), ctlU(st.prevStep == -1)
	alt := m.up&(m.down<<1|prevDown) | m.down&(m.up<<1|prevUp)
	st.t, st.prevStep = ctlCarryPair(m.up, m.down, st.t, st.prevStep)
	if st.prevStep == 0 {
		st.tAlt = 0
	} else if a := ctlTop(alt); a == 64 {
		st.tAlt += 64
	} else {
		st.tAlt = a + 1
	}
}

// ctlTop is the length of the run of ones that ends at bit 63 of M.
func ctlTop(M uint64) uint64 { return uint64(bits.LeadingZeros64(^M)) }

// ctlCarryPair carries a run over a word for a pair of opposite kinds of
// point, a and b (above and below the centre; a step up and a step down):
// r is the length of the run that ends the word and prev its kind (1 for a,
// −1 for b, 0 when the word's last point is of neither). A run that fills
// the whole word adds to the run carried in when that was of the same kind.
func ctlCarryPair(a, b, r uint64, prev int) (uint64, int) {
	switch {
	case a>>63 != 0:
		return ctlTop(a) + ctlIf(ctlTop(a) == 64 && prev == 1, r), 1
	case b>>63 != 0:
		return ctlTop(b) + ctlIf(ctlTop(b) == 64 && prev == -1, r), -1
	}
	return 0, 0
}

func ctlIf(cond bool, v uint64) uint64 {
	if cond {
		return v
	}
	return 0
}

// exact runs the points base..end−1 one by one from state st (p: the
// masks of the word before, for the windows), emitting what fires.
func (sc *ctlScan) exact(st *ctlState, p *ctlMasks, base, end int) {
	x := sc.x
	rev := func(M uint64) uint64 { return bits.Reverse64(M) } // bit k: point base − 1 − k
	var hA2, hB2, hA1, hB1 uint64
	if base > 0 {
		hA2, hB2, hA1, hB1 = rev(p.above&p.o2), rev(p.below&p.o2), rev(p.above&p.o1), rev(p.below&p.o1)
	}
	r, rIn, rOut, t, tAlt := st.r, st.rIn, st.rOut, st.t, st.tAlt
	prevSide, prevStep := st.prevSide, st.prevStep
	centre, lim := sc.centre, sc.lim
	t23, t45 := &sc.t23, &sc.t45
	thrSame, thrHug, thrAvoid, thrTrend, thrAlt := sc.thrSame, sc.thrHug, sc.thrAvoid, sc.thrTrend, sc.thrAlt
	perPoint := len(sc.sigma) > 1
	sg := 0.0
	if !perPoint && len(sc.sigma) > 0 {
		sg = sc.sigma[0]
	}
	prev := x[max(0, base-1)] // no step at the first point
	for i := base; i < end; i++ {
		v := x[i]
		if perPoint {
			sg = sc.sigma[i]
		}
		d := v - centre
		a := math.Abs(d)
		above, below := ctlU(d > 0), ctlU(d < 0)
		o1, o2, in1, oL := ctlU(a > sg), ctlU(a > 2*sg), ctlU(a < sg), ctlU(a > lim*sg)
		hA2 = hA2<<1 | above&o2
		hB2 = hB2<<1 | below&o2
		hA1 = hA1<<1 | above&o1
		hB1 = hB1<<1 | below&o1
		f := oL | t23[hA2&31] | t23[hB2&31] | t45[hA1&31] | t45[hB1&31]
		side := int(above) - int(below)
		nr := (r*ctlU(side == prevSide) + 1) * (above | below)
		nIn, nOut := (rIn+1)*in1, (rOut+1)*o1
		up, down := ctlU(v > prev), ctlU(v < prev)
		step := int(up) - int(down)
		nt := (t*ctlU(step == prevStep) + 1) * (up | down)
		nAlt := (tAlt*ctlU(step == -prevStep) + 1) * (up | down)
		f |= ctlU(nr != r+1)&ctlU(r >= thrSame) | (in1^1)&ctlU(rIn >= thrHug) | (o1^1)&ctlU(rOut >= thrAvoid) |
			ctlU(nt != t+1)&ctlU(t >= thrTrend) | ctlU(nAlt != tAlt+1)&ctlU(tAlt >= thrAlt)
		if f != 0 {
			if oL != 0 {
				sc.one[0] = i
				sc.emit(Signal{Rule: SignalBeyondLimits, Side: side, First: i, Last: i, Points: sc.one[:]})
			}
			if t23[hA2&31]|t23[hB2&31] != 0 {
				sc.w23.fire(i, hA2, hB2, sc.emit)
			}
			if t45[hA1&31]|t45[hB1&31] != 0 {
				sc.w45.fire(i, hA1, hB1, sc.emit)
			}
			if nr != r+1 && r >= thrSame {
				sc.endRun(SignalRunSameSide, prevSide, i-int(r), i-1)
			}
			if in1 == 0 && rIn >= thrHug {
				sc.endRun(SignalHuggingCentre, 0, i-int(rIn), i-1)
			}
			if o1 == 0 && rOut >= thrAvoid {
				sc.endAvoid(i-int(rOut), i-1)
			}
			if nt != t+1 && t >= thrTrend {
				sc.endRun(SignalTrend, prevStep, i-1-int(t), i-1)
			}
			if nAlt != tAlt+1 && tAlt >= thrAlt {
				sc.endRun(SignalAlternating, 0, i-1-int(tAlt), i-1)
			}
		}
		r, rIn, rOut, t, tAlt = nr, nIn, nOut, nt, nAlt
		prev, prevSide, prevStep = v, side, step
	}
	st.r, st.rIn, st.rOut, st.t, st.tAlt = r, rIn, rOut, t, tAlt
	st.prevSide, st.prevStep = prevSide, prevStep
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
	centre, lim                                 float64
	sigma                                       []float64
	emit                                        func(Signal)
	one                                         [1]int
	w23, w45                                    ctlWindow
	minSame, minHug, minAvoid, minTrend, minAlt int
	// the window tables (fires for these bits of the last points, bit 0
	// the current one) and the run thresholds (never: switched off)
	t23, t45                                    [32]uint64
	on23, on45                                  bool
	thrSame, thrHug, thrAvoid, thrTrend, thrAlt uint64
	// flat holds the one sigma 64 times (masks reads a sigma per point
	// without a test per point)
	flat [64]float64
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
