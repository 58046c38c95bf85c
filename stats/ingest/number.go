package ingest

import (
	"math"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"
	"unsafe"
)

// pow10 holds the powers of ten that are exact in float64 (10^0..10^22).
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// fastDecimal parses plain fixed-point decimal text: an optional '-', at least
// one digit, optionally the decimal mark followed by at least one digit, and
// nothing else (no spaces). With at most 15 significant digits the mantissa m
// and the power 10^d are exact doubles, so m / 10^d is the correctly rounded
// value (Clinger 1990, "How to read floating point numbers accurately"). ok
// is false when the text needs the general parser. canon reports that
// formatting the value with dec decimals and the same mark gives the text back.
func fastDecimal(b []byte, mark byte) (v float64, dec int8, canon, ok bool) {
	n := len(b)
	if n == 0 || n > 17 {
		return
	}
	i := 0
	neg := b[0] == '-'
	if neg {
		i = 1
	}
	start := i
	var m uint64
	for i < n && b[i]-'0' < 10 {
		m = m*10 + uint64(b[i]-'0')
		i++
	}
	intDigits := i - start
	if intDigits == 0 {
		return
	}
	d := 0
	if i < n && b[i] == mark {
		i++
		fs := i
		for i < n && b[i]-'0' < 10 {
			m = m*10 + uint64(b[i]-'0')
			i++
		}
		d = i - fs
		if d == 0 {
			return
		}
	}
	if i != n || intDigits+d > 15 {
		return
	}
	v = float64(m)
	if d > 0 {
		v /= pow10[d]
	}
	if neg {
		v = -v
	}
	return v, int8(d), intDigits == 1 || b[start] != '0', true
}

// markEvidence is what one cell says about its column's decimal mark.
type markEvidence uint8

const (
	evNone   markEvidence = iota // integer, or not a number
	evPoint                      // decimal point for sure ("12.5", "1,234.5", "1,234,567")
	evComma                      // decimal comma for sure ("12,5", "0,125", "1.234,5")
	evAmbig                      // "1,234": a decimal comma or a thousands separator
	evAmbigP                     // "1.234" alone: read as a decimal point (see package doc)
)

// numParts is the split of a cell into sign, the numeric body, exponent and suffix.
type numParts struct {
	neg    bool
	body   string // digits, marks and group separators
	exp    string // exponent digits with sign, "" if none
	hasExp bool
	suffix string // trimmed text after the number (unit, %), "" if none
}

// isGroupRune reports characters used as thousands separators besides '.' and ','.
func isGroupRune(r rune) bool {
	switch r {
	case ' ', '\u00a0', '\u2009', '\u202f', '\'', '\u2019':
		return true
	}
	return false
}

// isSpaceRune is the trimming set for cells: ASCII and Unicode spaces.
func isSpaceRune(r rune) bool {
	switch r {
	case ' ', '\t', '\u00a0', '\u2009', '\u202f', '\u2007', '\u2002', '\u2003', '\u3000', '\v', '\f':
		return true
	}
	return false
}

func trimCell(s string) string {
	// A cell that starts and ends with a printable ASCII byte has nothing to
	// trim (every space of isSpaceRune is below '!' or not ASCII, and the
	// last rune of a text ending in an ASCII byte is that byte): no calls
	// per rune for the common cell.
	if n := len(s); n > 0 && s[0]-'!' < 0x7f-'!' && s[n-1]-'!' < 0x7f-'!' {
		return s
	}
	return strings.TrimFunc(s, isSpaceRune)
}

// splitNumber splits s (already trimmed) into its parts; ok is false when s
// does not start like a number.
func splitNumber(s string) (p numParts, ok bool) {
	switch {
	case strings.HasPrefix(s, "-"):
		p.neg, s = true, s[1:]
	case strings.HasPrefix(s, "+"):
		s = s[1:]
	case strings.HasPrefix(s, "\u2212"): // MINUS SIGN
		p.neg, s = true, s[len("\u2212"):]
	}
	// body: digits, '.', ',', group runes; must start with a digit or a mark
	i := 0
	digits := 0
	for i < len(s) {
		c := s[i]
		if c-'0' < 10 {
			digits++
			i++
			continue
		}
		if c == '.' || c == ',' {
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if isGroupRune(r) && i > 0 && i+size < len(s) && s[i+size]-'0' < 10 {
			i += size
			continue
		}
		break
	}
	if digits == 0 {
		return p, false
	}
	p.body = s[:i]
	rest := s[i:]
	// exponent directly after the body: e or E, optional sign, digits
	if len(rest) >= 2 && (rest[0] == 'e' || rest[0] == 'E') {
		j := 1
		if rest[j] == '+' || rest[j] == '-' {
			j++
		} else if strings.HasPrefix(rest[j:], "\u2212") {
			j += len("\u2212")
		}
		k := j
		for k < len(rest) && rest[k]-'0' < 10 {
			k++
		}
		if k > j {
			p.hasExp = true
			sign := rest[1:j]
			if sign == "\u2212" {
				sign = "-"
			}
			p.exp = sign + rest[j:k]
			rest = rest[k:]
		}
	}
	p.suffix = trimCell(rest)
	return p, true
}

// evidence classifies a number body for the column's decimal mark decision.
func evidence(body string) markEvidence {
	lp := strings.LastIndexByte(body, '.')
	lc := strings.LastIndexByte(body, ',')
	np := strings.Count(body, ".")
	nc := strings.Count(body, ",")
	switch {
	case np > 0 && nc > 0:
		if lp > lc {
			return evPoint
		}
		return evComma
	case nc == 1:
		after := len(body) - lc - 1
		intPart := body[:lc]
		digits := countDigits(intPart)
		if after != 3 || digits > 3 || digits == 0 || firstDigit(intPart) == '0' || hasGroupRune(intPart) {
			return evComma
		}
		return evAmbig
	case nc > 1:
		return evPoint // 1,234,567: commas group thousands
	case np == 1:
		after := len(body) - lp - 1
		digits := countDigits(body[:lp])
		if after == 3 && digits >= 1 && digits <= 3 && firstDigit(body) != '0' {
			return evAmbigP
		}
		return evPoint
	case np > 1:
		return evComma // 1.234.567: points group thousands
	}
	return evNone
}

func countDigits(s string) int {
	n := 0
	for i := 0; i < len(s); i++ {
		if s[i]-'0' < 10 {
			n++
		}
	}
	return n
}

func firstDigit(s string) byte {
	for i := 0; i < len(s); i++ {
		if s[i]-'0' < 10 {
			return s[i]
		}
	}
	return 0
}

func hasGroupRune(s string) bool {
	for _, r := range s {
		if isGroupRune(r) {
			return true
		}
	}
	return false
}

// numResult is the outcome of the general number parser.
type numResult struct {
	v      float64
	dec    int8
	unit   string
	reason string // why it is not a number; "" when ok
	kind   string // problem kind when not ok
}

// parseBody turns a number body into its digits with '.' as the mark, given
// the column's mark. It returns the fraction length and a reason when the
// body does not fit the column's conventions.
func parseBody(body string, mark byte, dst []byte) (norm []byte, frac int, reason, kind string) {
	other := byte(',')
	if mark == ',' {
		other = '.'
	}
	intPart, fracPart := body, ""
	if k := strings.IndexByte(body, mark); k >= 0 {
		intPart, fracPart = body[:k], body[k+1:]
		if strings.IndexByte(fracPart, mark) >= 0 {
			return nil, 0, "more than one decimal mark", "not-a-number"
		}
	}
	if k := strings.LastIndexByte(intPart, other); k >= 0 && len(intPart)-k-1 != 3 {
		return nil, 0, wrongMark(mark), "decimal-mark"
	}
	for i := 0; i < len(fracPart); i++ {
		if fracPart[i]-'0' >= 10 {
			if fracPart[i] == other {
				return nil, 0, wrongMark(mark), "decimal-mark"
			}
			return nil, 0, "separator inside the decimals", "not-a-number"
		}
	}
	// grouping in the integer part: one separator kind, groups of three
	var sep rune = -1
	groups := 0
	run := 0
	for _, r := range intPart {
		if r >= '0' && r <= '9' {
			run++
			continue
		}
		if r != rune(other) && !isGroupRune(r) {
			return nil, 0, "unexpected character in the number", "not-a-number"
		}
		if sep >= 0 && r != sep {
			return nil, 0, "mixed thousands separators", "not-a-number"
		}
		sep = r
		if groups == 0 {
			if run == 0 || run > 3 {
				return nil, 0, badGrouping(r, mark), kindForSep(r, other)
			}
		} else if run != 3 {
			return nil, 0, badGrouping(r, mark), kindForSep(r, other)
		}
		groups++
		run = 0
	}
	if groups > 0 && run != 3 {
		return nil, 0, badGrouping(sep, mark), kindForSep(sep, other)
	}
	if countDigits(intPart) == 0 && len(fracPart) == 0 {
		return nil, 0, "no digits", "not-a-number"
	}
	norm = dst[:0]
	for i := 0; i < len(intPart); i++ {
		if intPart[i]-'0' < 10 {
			norm = append(norm, intPart[i])
		}
	}
	if len(norm) == 0 {
		norm = append(norm, '0')
	}
	if len(fracPart) > 0 {
		norm = append(norm, '.')
		norm = append(norm, fracPart...)
	}
	return norm, len(fracPart), "", ""
}

func kindForSep(r rune, other byte) string {
	if r == rune(other) {
		return "decimal-mark"
	}
	return "not-a-number"
}

func wrongMark(mark byte) string {
	if mark == ',' {
		return "decimal point in a column that uses decimal commas"
	}
	return "decimal comma in a column that uses decimal points"
}

func badGrouping(r rune, mark byte) string {
	if (r == ',' && mark == '.') || (r == '.' && mark == ',') {
		return wrongMark(mark)
	}
	return "thousands separator not in groups of three"
}

// parseNumber is the general parser for a trimmed cell in a column with the
// given decimal mark. scratch is reused to avoid allocations.
func parseNumber(s string, mark byte, scratch *[]byte) (r numResult) {
	p, ok := splitNumber(s)
	if !ok {
		return numResult{reason: "not a number", kind: "not-a-number"}
	}
	if p.suffix != "" {
		u, ok := unitOf(p.suffix)
		if !ok {
			return numResult{reason: "text after the number", kind: "not-a-number"}
		}
		r.unit = u
	}
	norm, frac, reason, kind := parseBody(p.body, mark, (*scratch)[:0])
	if reason != "" {
		return numResult{reason: reason, kind: kind}
	}
	if p.neg {
		norm = append(norm, 0)
		copy(norm[1:], norm)
		norm[0] = '-'
	}
	r.dec = int8(min(frac, 127))
	if p.hasExp {
		norm = append(norm, 'e')
		norm = append(norm, p.exp...)
		r.dec = -1
	}
	*scratch = norm
	// norm is scratch space: ParseFloat does not keep its argument
	v, err := strconv.ParseFloat(unsafe.String(unsafe.SliceData(norm), len(norm)), 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return numResult{reason: "number too large", kind: "not-a-number"}
	}
	r.v = v
	return r
}

// formatValue writes v with dec decimals and the given mark: the canonical
// text of a plain decimal cell.
func formatValue(dst []byte, v float64, dec int8, mark byte) []byte {
	if dec < 0 {
		return strconv.AppendFloat(dst, v, 'g', -1, 64)
	}
	n := len(dst)
	dst = strconv.AppendFloat(dst, v, 'f', int(dec), 64)
	if mark != '.' && dec > 0 {
		for i := n; i < len(dst); i++ {
			if dst[i] == '.' {
				dst[i] = mark
			}
		}
	}
	return dst
}

// missingToken reports whether a trimmed cell marks a missing value, and
// how to describe it.
func missingToken(s string) (reason string, ok bool) {
	if s == "" {
		return "empty cell", true
	}
	if len(s) > 8 {
		return "", false
	}
	switch strings.ToLower(s) {
	case "na", "n/a", "n.a.", "nan", "null", "none", "-", "--", "---", "?", "\u2014", "\u2013":
		return "marked missing (" + s + ")", true
	case "#n/a", "#value!", "#div/0!", "#ref!", "#num!", "#name?", "#null!", "#na":
		return "spreadsheet error (" + s + ")", true
	}
	return "", false
}

// knownUnits lists units accepted after a number or in a header after '/'.
// Keys are lower case; the value is the spelling reported. Built on first
// use, not at start: the engine says "ready" sooner (package inits run
// before the worker's first message, and in the browser this map cost
// 4-12 ms there).
var knownUnits = sync.OnceValue(func() map[string]string {
	m := map[string]string{}
	for _, u := range strings.Fields(`g kg mg µg μg ug t lb lbs oz ct gr
		mm cm dm m km µm μm um nm in ft yd mil thou
		N kN mN daN lbf kgf ozf gf
		Nm N·m N.m Nmm N·mm cNm mNm kNm dNm lbf·ft lbf·in ft·lb in·lb ozf·in ft-lb in-lb lbft lbin inlb ftlb in.lb ft.lb
		Pa kPa MPa GPa hPa bar mbar psi kpsi ksi atm mmHg inHg
		s ms µs μs us min h hr hrs sec secs
		°C °F K degC degF ℃ ℉
		V mV kV µV A mA µA W kW mW Ω ohm ohms kΩ kohm MΩ mΩ Hz kHz MHz rpm
		l L ml mL µl µL μl μL cl dl cc m³ cm³ mm³ m3 cm3 mm3 dm3 dm³
		% ‰ ppm ppb
		° deg rad mrad µrad arcmin arcsec
		mm² mm2 cm² cm2 m² m2
		g/cm³ g/cm3 g/ml g/mL kg/m³ kg/m3 g/l g/L mg/l mg/L mg/kg g/m² g/m2 gsm
		N/mm² N/mm2 N/mm N/m N/cm HRC HRB HRA HV HB HBW Ra Rz µin μin
		dB dBA lx cd J kJ Wh kWh cal kcal
		mm/s m/s km/h mph m/min mm/min
		pcs pc ea`) {
		m[strings.ToLower(u)] = u
	}
	return m
})

// unitOf accepts a known unit (case-insensitive) and returns it as typed.
func unitOf(s string) (string, bool) {
	if len(s) > 12 {
		return "", false
	}
	if _, ok := knownUnits()[strings.ToLower(s)]; ok {
		return s, true
	}
	return "", false
}
