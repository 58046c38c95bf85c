package method

import (
	"math"
	"math/big"

	"lotlens/stats/decimal"
)

// ShapeMoments are the moment statistics of a sample's shape.
//
//   - Sqrtb1 = g1 = m3/m2^(3/2) and B2 = m4/m2² (central moments mk with
//     divisor n) are the inputs of the normality tests of D'Agostino (1970)
//     and Anscombe and Glynn (1983).
//   - G1 = g1·√(n(n-1))/(n-2) and G2 = ((n+1)(b2-3)+6)(n-1)/((n-2)(n-3))
//     are the adjusted (sample) skewness and excess kurtosis, with the
//     standard errors SES = √(6n(n-1)/((n-2)(n+1)(n+3))) and
//     SEK = 2·SES·√((n²-1)/((n-3)(n+5))) (Joanes and Gill 1998, "Comparing
//     measures of sample skewness and kurtosis", The Statistician 47,
//     183-189).
//
// HasKurtosis is false for n < 4 (G2, SEK and B2 are then 0).
type ShapeMoments struct {
	N           int
	Sqrtb1, B2  float64
	G1, G2      float64
	SES, SEK    float64
	HasKurtosis bool
}

// momStdErrors fills SES and SEK.
func momStdErrors(s *ShapeMoments) {
	fn := float64(s.N)
	s.SES = math.Sqrt(6 * fn * (fn - 1) / ((fn - 2) * (fn + 1) * (fn + 3)))
	if s.N >= 4 {
		s.SEK = 2 * s.SES * math.Sqrt((fn*fn-1)/((fn-3)*(fn+5)))
	}
}

// ShapeExact computes the shape moments from exact sums of powers of the
// mantissas (decimal.Grid.PowerSums): every figure is the correctly rounded
// value of the exact one (the square roots rounded from 256-bit results),
// whatever the offset of the data. ok is false for n < 3 or constant data.
func ShapeExact(ps decimal.PowerSums) (s ShapeMoments, ok bool) {
	n := ps.N
	if n < 3 {
		return s, false
	}
	A, B, C := ps.CentralSums() // n·M2, n²·M3, n³·M4
	if A.Sign() <= 0 {
		return s, false
	}
	s.N = int(n)
	bn := big.NewInt(n)
	A3 := new(big.Int).Mul(A, A)
	A3.Mul(A3, A)
	// g1² = B²/A³
	g1sq := new(big.Rat).SetFrac(new(big.Int).Mul(B, B), A3)
	s.Sqrtb1 = decimal.SqrtRat(g1sq)
	// G1² = g1²·n(n-1)/(n-2)²
	f := new(big.Rat).SetFrac(new(big.Int).Mul(bn, big.NewInt(n-1)), new(big.Int).Mul(big.NewInt(n-2), big.NewInt(n-2)))
	s.G1 = decimal.SqrtRat(new(big.Rat).Mul(g1sq, f))
	if B.Sign() < 0 {
		s.Sqrtb1, s.G1 = -s.Sqrtb1, -s.G1
	}
	if n >= 4 {
		// b2 = C/A²
		b2 := new(big.Rat).SetFrac(C, new(big.Int).Mul(A, A))
		s.B2 = decimal.Float64(b2)
		// G2 = (n-1)/((n-2)(n-3)) · ((n+1)(b2-3)+6)
		t := new(big.Rat).Sub(b2, big.NewRat(3, 1))
		t.Mul(t, big.NewRat(n+1, 1))
		t.Add(t, big.NewRat(6, 1))
		t.Mul(t, big.NewRat(n-1, (n-2)*(n-3)))
		s.G2 = decimal.Float64(t)
		s.HasKurtosis = true
	}
	momStdErrors(&s)
	return s, normalFinite(s.G1) && normalFinite(s.G2)
}

// ShapeBinary computes the shape moments in binary floating point, for
// data that are not plain decimals: the standardised powers z = (x-mean)/sd
// (finite for any finite data, |z| <= (n-1)/√n) summed with Kahan's
// compensation. mean and sd (divisor n-1) should be the best available.
func ShapeBinary(sorted []float64, mean, sd float64) (s ShapeMoments, ok bool) {
	n := len(sorted)
	if n < 3 || !(sd > 0) || !normalFinite(sd) || !normalFinite(mean) {
		return s, false
	}
	fn := float64(n)
	var s3, s4, c3, c4 float64
	for _, x := range sorted {
		z := (x - mean) / sd
		z2 := z * z
		y := z2*z - c3
		t := s3 + y
		c3 = (t - s3) - y
		s3 = t
		y = z2*z2 - c4
		t = s4 + y
		c4 = (t - s4) - y
		s4 = t
	}
	m2 := (fn - 1) / fn // m2/sd²
	s.N = n
	s.Sqrtb1 = (s3 / fn) / math.Pow(m2, 1.5)
	s.G1 = s.Sqrtb1 * math.Sqrt(fn*(fn-1)) / (fn - 2)
	if n >= 4 {
		s.B2 = (s4 / fn) / (m2 * m2)
		s.G2 = (fn - 1) / ((fn - 2) * (fn - 3)) * ((fn+1)*(s.B2-3) + 6)
		s.HasKurtosis = true
	}
	momStdErrors(&s)
	return s, normalFinite(s.G1) && normalFinite(s.G2)
}
