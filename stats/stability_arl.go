package stats

// arlSeed holds the average run lengths of the EWMA and CUSUM charts at
// their default settings (λ 0.2, L 3; k 0.5, h 5) for no shift and for a
// shift of one standard deviation, as cachedARL computes them
// (method.EWMAARL and method.CUSUMARL, rounded to 6 significant digits).
// Every analysis with the default settings needs these four figures, and
// computing them (six Markov chains of 301 states) was the largest single
// cost of the first analysis in the browser, before the engine's code is
// optimised (about half of a first 10,000-reading analysis in Node's
// WebAssembly). TestARLSeed recomputes each one: the seed cannot go stale.
// The key is cachedARL's: λ and L (or k and h), the shift, 0 for EWMA and
// 1 for CUSUM. A list, laid out by the compiler: nothing runs at start.
var arlSeed = [...]struct {
	key [4]float64
	arl float64
}{
	{[4]float64{defaultLambda, defaultL, 0, 0}, 559.75},
	{[4]float64{defaultLambda, defaultL, 1, 0}, 10.836},
	{[4]float64{defaultK, defaultH, 0, 1}, 465.412},
	{[4]float64{defaultK, defaultH, 1, 1}, 10.376},
}

// seededARLCache is the run-length cache to start from: the seed.
func seededARLCache() map[[4]float64]*float64 {
	c := make(map[[4]float64]*float64, len(arlSeed))
	for _, s := range arlSeed {
		v := s.arl
		c[s.key] = &v
	}
	return c
}
