// Package decimal holds measurement values exactly as typed.
//
// A value typed as a plain decimal with d decimals ("11.30", d = 2) is the
// integer mantissa m over 10^d (1130/100). The reader keeps such a value as
// the correctly rounded float64 x and the count d; when |m| < 2^51 and
// d <= MaxScale, m is recovered exactly as round(x·10^d): the product carries
// a relative error of at most about 2^-52, so an absolute error below 1/2,
// and the recovery is verified by dividing back (m/10^d must round to x).
//
// All values of a column share one scale S (the largest decimal count): a
// Grid. On a grid, distinct mantissas give distinct float64 values in the
// same order (the decimal step 10^-S is more than twice the float spacing
// when |m| < 2^51), so the sorted float64 slice the engine keeps is also the
// sorted slice of mantissas, and each mantissa is recovered on the fly
// without a second array. Exact figures (quantiles, fences, the MAD) are
// rationals (math/big) computed from a handful of mantissas; a comparison of
// every reading with such a figure becomes an integer threshold on the
// mantissas, found by binary search on the float64 slice. Rational results
// are shown as the correctly rounded float64 (big.Rat.Float64), so the
// report shows 11.3, not 11.299999999999999.
//
// Values that are not plain decimals (exponent form, more than about 15
// significant digits) have no grid: the engine then keeps its binary
// floating-point path and says so.
package decimal

import (
	"math"
	"math/big"
	"sort"
	"strconv"
	"strings"
)

// MaxScale is the largest decimal count handled exactly (10^22 is the
// largest power of ten a float64 holds exactly).
const MaxScale = 22

// MaxMantissa bounds |m| on a grid: 2^51.
const MaxMantissa = 1 << 51

// pow10 holds 10^0 .. 10^MaxScale, each exact in float64; written out so
// that the compiler lays it out and nothing runs at start.
var pow10 = [MaxScale + 1]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// Pow10 is 10^d as a float64 (exact) for 0 <= d <= MaxScale.
func Pow10(d int) float64 { return pow10[d] }

// AppendPlaces appends n·10⁻ᵈ written with exactly d decimal places (0 <=
// d <= 19): the integer part, then for d > 0 a point and d digits, leading
// zeros included ("1.05" for n 105, d 2; "0.007" for n 7, d 3). The
// writers of charts and of the report's JSON use it for a value written
// from its digits.
func AppendPlaces(b []byte, n uint64, d int) []byte {
	unit := uint64(1)
	for i := 0; i < d; i++ {
		unit *= 10
	}
	b = strconv.AppendUint(b, n/unit, 10)
	if d > 0 {
		b = append(b, '.')
		frac := n % unit
		for unit /= 10; unit > frac && unit > 1; unit /= 10 {
			b = append(b, '0') // leading zeros of the places
		}
		b = strconv.AppendUint(b, frac, 10)
	}
	return b
}

// Mantissa returns m with x = m/10^d exactly as typed, or ok = false when x
// with d decimals is not a plain decimal the exact path can hold.
func Mantissa(x float64, d int) (m int64, ok bool) {
	if d < 0 || d > MaxScale {
		return 0, false
	}
	p := pow10[d]
	f := x * p
	if !(math.Abs(f) < MaxMantissa) {
		return 0, false
	}
	m = int64(math.RoundToEven(f))
	if float64(m)/p != x {
		return 0, false
	}
	return m, true
}

// Grid is the set of values m/10^Scale with |m| < 2^51.
type Grid struct {
	Scale int
	pow   float64
}

// NewGrid returns the grid of scale d (0 <= d <= MaxScale).
func NewGrid(d int) (Grid, bool) {
	if d < 0 || d > MaxScale {
		return Grid{}, false
	}
	return Grid{Scale: d, pow: pow10[d]}, true
}

// Valid tells whether g was made by NewGrid.
func (g Grid) Valid() bool { return g.pow != 0 }

// Mantissa is the checked mantissa of x on g.
func (g Grid) Mantissa(x float64) (int64, bool) { return Mantissa(x, g.Scale) }

// M is the mantissa of a value known to lie on g (no check).
func (g Grid) M(x float64) int64 { return int64(math.RoundToEven(x * g.pow)) }

// Float is m/10^Scale correctly rounded: the float64 the reader gives for
// the same decimal text.
func (g Grid) Float(m int64) float64 { return float64(m) / g.pow }

// Holds tells whether the ascending slice lies on g, checking its two ends
// for size; every value must already be known to be a plain decimal with at
// most Scale decimals (the mantissa of a value with fewer decimals d is then
// its own mantissa times 10^(Scale-d), recovered the same way).
func (g Grid) Holds(sorted []float64) bool {
	if !g.Valid() || len(sorted) == 0 {
		return false
	}
	_, ok1 := g.Mantissa(sorted[0])
	_, ok2 := g.Mantissa(sorted[len(sorted)-1])
	return ok1 && ok2
}

// Denom is 10^Scale as a big integer (by multiplication: big.Int.Exp
// would link its modular exponentiation, about 35 KB of the WebAssembly
// engine, for a power of ten).
func (g Grid) Denom() *big.Int {
	return pow10Int(g.Scale)
}

// pow10u holds 10^0 .. 10^19, the powers of ten a uint64 holds.
var pow10u = [20]uint64{1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19}

// Rat is m/10^Scale exactly.
func (g Grid) Rat(m int64) *big.Rat {
	return new(big.Rat).SetFrac(big.NewInt(m), g.Denom())
}

// Value is the exact value of a float64 known to lie on g.
func (g Grid) Value(x float64) *big.Rat { return g.Rat(g.M(x)) }

// Units is r in mantissa units: r·10^Scale.
func (g Grid) Units(r *big.Rat) *big.Rat {
	return new(big.Rat).Mul(r, new(big.Rat).SetInt(g.Denom()))
}

// Float64 is r correctly rounded to float64 (±Inf beyond the range).
func Float64(r *big.Rat) float64 {
	f, _ := r.Float64()
	return f
}

// Interpolate is lo + (num/den)·(hi - lo) in value units, exactly, for
// mantissas lo and hi on g: the form of every sample quantile (Hyndman and
// Fan 1996).
func (g Grid) Interpolate(lo, hi int64, num, den int64) *big.Rat {
	if num == 0 || lo == hi {
		return g.Rat(lo)
	}
	if num == den {
		return g.Rat(hi)
	}
	// (lo·(den-num) + hi·num) / (den·10^S)
	a := new(big.Int).Mul(big.NewInt(lo), big.NewInt(den-num))
	a.Add(a, new(big.Int).Mul(big.NewInt(hi), big.NewInt(num)))
	d := new(big.Int).Mul(big.NewInt(den), g.Denom())
	return new(big.Rat).SetFrac(a, d)
}

// ceilM and floorM are the smallest mantissa >= t and the largest <= t
// (t in value units), clamped to just beyond the grid's range.
func (g Grid) ceilM(t *big.Rat) int64 {
	u := g.Units(t)
	q, r := new(big.Int).QuoRem(u.Num(), u.Denom(), new(big.Int))
	if r.Sign() > 0 {
		q.Add(q, big.NewInt(1))
	}
	return clampM(q)
}

func (g Grid) floorM(t *big.Rat) int64 {
	u := g.Units(t)
	q, r := new(big.Int).QuoRem(u.Num(), u.Denom(), new(big.Int))
	if r.Sign() < 0 {
		q.Sub(q, big.NewInt(1))
	}
	return clampM(q)
}

func clampM(q *big.Int) int64 {
	switch {
	case q.Cmp(big.NewInt(MaxMantissa)) > 0:
		return MaxMantissa
	case q.Cmp(big.NewInt(-MaxMantissa)) < 0:
		return -MaxMantissa
	}
	return q.Int64()
}

// CountBelow is the number of values of the ascending slice (on g) that
// are < t exactly.
func (g Grid) CountBelow(sorted []float64, t *big.Rat) int {
	c := g.ceilM(t) // x < t  <=>  m < c
	if c >= MaxMantissa {
		return len(sorted)
	}
	if c <= -MaxMantissa {
		return 0
	}
	return sort.SearchFloat64s(sorted, g.Float(c))
}

// CountAbove is the number of values of the ascending slice (on g) that
// are > t exactly.
func (g Grid) CountAbove(sorted []float64, t *big.Rat) int {
	f := g.floorM(t) // x > t  <=>  m > f
	if f >= MaxMantissa {
		return 0
	}
	if f <= -MaxMantissa {
		return len(sorted)
	}
	v := g.Float(f)
	return len(sorted) - sort.Search(len(sorted), func(i int) bool { return sorted[i] > v })
}

// ShortestRat is, exactly, the shortest decimal that reads back as x (what
// a user typed for a limit), on a grid or not; ok is false for NaN and ±Inf.
// (Written out rather than through big.Rat.SetString, whose exponent
// handling links math/big's modular exponentiation into the engine.)
func ShortestRat(x float64) (r *big.Rat, ok bool) {
	neg, digits, e, ok := shortest(x)
	if !ok {
		return nil, false
	}
	n, ok := new(big.Int).SetString(digits, 10)
	if !ok {
		return nil, false
	}
	if neg {
		n.Neg(n)
	}
	p := pow10Int(max(e, -e))
	if e >= 0 {
		return new(big.Rat).SetInt(n.Mul(n, p)), true
	}
	return new(big.Rat).SetFrac(n, p), true
}

// shortest splits the shortest decimal that reads back as x into its sign
// and digits and a power of ten: |x| = digits·10^e. ok is false for NaN
// and ±Inf.
func shortest(x float64) (neg bool, digits string, e int, ok bool) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return false, "", 0, false
	}
	s := strconv.FormatFloat(x, 'e', -1, 64) // -d.ddddde±XX
	mant, exp, _ := strings.Cut(s, "e")
	e, err := strconv.Atoi(exp)
	if err != nil {
		return false, "", 0, false
	}
	neg = strings.HasPrefix(mant, "-")
	ip, fp, _ := strings.Cut(strings.TrimPrefix(mant, "-"), ".")
	return neg, ip + fp, e - len(fp), true
}

// pow10Int is 10^k for k >= 0.
func pow10Int(k int) *big.Int {
	p := new(big.Int).SetUint64(pow10u[k%19])
	for ; k >= 19; k -= 19 {
		p.Mul(p, new(big.Int).SetUint64(pow10u[19]))
	}
	return p
}

// FromFloat returns the shortest decimal that reads back as x (what a user
// typed for a target or a limit given as a JSON number): x = m/10^d. ok is
// false for non-finite x or when the decimal does not fit a grid.
func FromFloat(x float64) (m int64, d int, ok bool) {
	neg, digits, e, ok := shortest(x)
	if !ok {
		return 0, 0, false
	}
	d = -e
	if d < 0 {
		digits += strings.Repeat("0", -d)
		d = 0
	}
	if d > MaxScale || len(digits) > 16 {
		return 0, 0, false
	}
	v, err := strconv.ParseInt(digits, 10, 64)
	if err != nil || v >= MaxMantissa {
		return 0, 0, false
	}
	if neg {
		v = -v
	}
	if float64(v)/pow10[d] != x {
		return 0, 0, false
	}
	return v, d, true
}
