package stats

// This file holds every sentence the engine writes into a report, and the
// number formatting they use. The builders (one file per section) compute
// the numbers and call one method of words per sentence; they hold no text
// and format no number themselves.
//
// The decimal mark: a report whose value column was typed with a decimal
// comma (Input.DecimalComma) writes every number of every sentence with a
// comma ("The target 5,10 lies inside the 95% interval for the mean, 5,06
// to 5,16."), p-values and constants of formulas included; otherwise with a
// point. Integers are written without grouping, except where a sentence
// names a large round figure (grouped, see words.grouped). Text the user
// typed (readings, column names) is quoted as typed.
//
// Adding a sentence: a method of words in the section of this file that
// matches the report section, taking numbers (and codes or typed text) and
// returning the string; format each number with one of the formatters
// below, never with fmt's %f/%g or strconv directly.
//
// Error messages (the errorf calls of analyze.go, columns.go, within.go)
// are not report sentences: they stay beside their checks, are written for
// the request as sent (numbers with a point, formatted by plainNum).

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"lotlens/stats/method"
)

// words writes the report's sentences with the decimal mark of its value
// column.
type words struct {
	comma bool // write numbers with a decimal comma
}

// wordsFor is the words of a report (its decimal mark).
func wordsFor(rep *Report) words { return words{comma: rep.Input.DecimalComma} }

// ---- Number formatting ----------------------------------------------------

// mark writes the decimal mark of a number formatted with a point.
func (w words) mark(s string) string {
	if !w.comma {
		return s
	}
	return strings.ReplaceAll(s, ".", ",")
}

// sig formats x with d significant digits, without exponent for everyday
// magnitudes (1e-4 to 1e9), trailing zeros kept: sig(0.2, 3) is "0.200".
func (w words) sig(x float64, d int) string {
	if x == 0 || !finite(x) {
		return "0"
	}
	e := int(math.Floor(math.Log10(math.Abs(x))))
	if e < -4 || e >= 9 {
		return w.mark(strconv.FormatFloat(x, 'g', d, 64))
	}
	return w.mark(strconv.FormatFloat(x, 'f', max(0, d-1-e), 64))
}

// g formats x with d significant digits, trailing zeros dropped, exponent
// form for very large and small magnitudes (as %g): g(0.5, 3) is "0.5".
func (w words) g(x float64, d int) string {
	return w.mark(strconv.FormatFloat(x, 'g', d, 64))
}

// g3 is g with 3 significant digits.
func (w words) g3(x float64) string { return w.g(x, 3) }

// shortest is the shortest decimal that reads back as x ("4.5", not
// "4.500000000000001" for exact figures).
func (w words) shortest(x float64) string {
	return w.mark(strconv.FormatFloat(x, 'g', -1, 64))
}

// trim formats x with up to d decimals, trailing zeros dropped: trim(1.50,
// 2) is "1.5".
func (w words) trim(x float64, d int) string {
	s := strconv.FormatFloat(x, 'f', d, 64)
	if strings.IndexByte(s, '.') >= 0 {
		s = strings.TrimRight(s, "0")
		s = strings.TrimSuffix(s, ".")
	}
	return w.mark(s)
}

// fixed formats x with dec decimals (6 significant digits from 1e15 on).
func (w words) fixed(x float64, dec int) string {
	if math.Abs(x) >= 1e15 {
		return w.mark(strconv.FormatFloat(x, 'g', 6, 64))
	}
	return w.mark(strconv.FormatFloat(x, 'f', dec, 64))
}

// decimalsFor is the number of decimals that shows a half-width h with one
// significant digit, two when its leading digit is 1.
func decimalsFor(h float64) int {
	if !(h > 0) || !finite(h) {
		return 2
	}
	e := int(math.Floor(math.Log10(h)))
	d := -e
	if h/math.Pow(10, float64(e)) < 2 {
		d++
	}
	return min(15, max(0, d))
}

// pct writes a fraction as a percentage with 4 significant digits
// ("2.5%").
func (w words) pct(p float64) string { return w.g(100*p, 4) + "%" }

// level writes a confidence level or coverage as a percentage with up to
// two decimals ("95%", "99.73%").
func (w words) level(c float64) string { return w.trim(100*c, 2) + "%" }

// p writes a p-value: "p < 0.001", else "p = 0.123".
func (w words) p(p float64) string {
	if p < 0.001 {
		return "p < " + w.mark("0.001")
	}
	return "p = " + w.mark(strconv.FormatFloat(p, 'f', 3, 64))
}

// ppm writes a fraction given in ppm: "120 ppm" below 1 % (two significant
// digits), else a percentage ("1.2%").
func (w words) ppm(ppm float64) string {
	r := roundSig(ppm, 2)
	switch {
	case ppm == 0:
		return "0 ppm"
	case ppm < 0.01:
		return "below " + w.mark("0.01") + " ppm"
	case r < 10000: // 9,960 ppm is "10000 ppm" at two digits: "1%"
		return w.shortest(r) + " ppm"
	}
	return w.trim(roundSig(ppm/1e4, 2), 2) + "%"
}

// grouped writes a whole number with its thousands grouped: "100,000"
// with a decimal point, "100 000" (no-break space) with a decimal comma,
// where a comma would read as the decimal mark.
func (w words) grouped(n int) string {
	s := strconv.Itoa(n)
	neg := strings.HasPrefix(s, "-")
	s = strings.TrimPrefix(s, "-")
	sep := ","
	if w.comma {
		sep = "\u00a0"
	}
	var b strings.Builder
	for i, c := range s {
		if i > 0 && (len(s)-i)%3 == 0 {
			b.WriteString(sep)
		}
		b.WriteRune(c)
	}
	if neg {
		return "-" + b.String()
	}
	return b.String()
}

func roundSig(x float64, d int) float64 {
	if x == 0 {
		return 0
	}
	e := math.Pow(10, float64(d-1)-math.Floor(math.Log10(math.Abs(x))))
	return math.Round(x*e) / e
}

func plural(k int, one, many string) string {
	if k == 1 {
		return one
	}
	return many
}

// plainNum writes a number of an error message as the request gives it
// (JSON: a decimal point): the shortest decimal at 15 significant digits,
// so 99.9/100 reads 0.999, and exponent form only below 1e-6 or from 1e21.
func plainNum(x float64) string {
	if !finite(x) {
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 15, 64), 64)
	if a := math.Abs(r); a != 0 && (a < 1e-6 || a >= 1e21) {
		return strconv.FormatFloat(r, 'g', -1, 64)
	}
	return strconv.FormatFloat(r, 'f', -1, 64)
}

// ---- Input: exclusions, problems, columns ---------------------------------

func (w words) excludeNotARow(row int) string {
	return fmt.Sprintf("row %d in the exclusion list is not a row of the data; ignored", row)
}

func (w words) excludeNoNumber(row int, column string) string {
	return fmt.Sprintf("row %d is listed for exclusion but holds no number in column %q; nothing to exclude there", row, column)
}

// notFinite is the reason and action of a problem: a value that is not a
// finite number.
func (w words) notFinite() (reason, action string) {
	return "not a finite number", "left out"
}

// incomplete is the reason and action of a problem: a used value whose
// row has no usable cell in the optional column key, which the sections
// readers read. valueText is the value as typed.
func (w words) incomplete(valueText, key string, readers []string) (reason, action string) {
	return fmt.Sprintf("the value %s is used, but this row has no usable %s", valueText, key),
		"left out of " + strings.Join(readers, " and ")
}

func (w words) incompleteMore(rows int, key string, listed int) string {
	return fmt.Sprintf("%d rows have a value but no usable %s; the first %d are listed", rows, key, listed)
}

func (w words) outOfOrder(rows int, column string) string {
	return fmt.Sprintf("%d rows are not in the order of column %q; the series over time follows that column, not the rows", rows, column)
}

// otherColumnsCells ends input.summary (the value column's account) when
// cells of other columns are empty or not readable; they are listed in
// input.problems with their column.
func (w words) otherColumnsCells(k int) string {
	return fmt.Sprintf("; other columns: %d %s empty or not readable", k, plural(k, "cell", "cells"))
}

// rowsWithText lists readings as "row 12 (5.31), row 40 (5.02)", with " and
// k more" when more were not listed; texts are as typed.
func (w words) rowsWithText(rows []int32, texts []string, more int) string {
	parts := make([]string, len(rows))
	for i, r := range rows {
		parts[i] = "row " + strconv.Itoa(int(r)) + " (" + texts[i] + ")"
	}
	s := strings.Join(parts, ", ")
	if more > 0 {
		s += fmt.Sprintf(" and %d more", more)
	}
	return s
}

// valueText writes a value whose typed text is unknown.
func (w words) valueText(x float64) string { return w.shortest(x) }

// ---- Counts ---------------------------------------------------------------

func (w words) noDataReason() string {
	return "No values are left to analyse: every number is excluded. Remove exclusions to see figures."
}

func (w words) noDataNote() string { return "no values left after the exclusions" }

// binaryPath says why the figures are computed in binary floating point:
// allFixed is true when every value was a plain decimal (but too long).
func (w words) binaryPath(allFixed bool) string {
	why := "some values are not plain decimals (exponent form, or more than 15 significant digits)"
	if allFixed {
		why = "the values carry too many digits to be held as exact decimals"
	}
	return why + ": quartiles, fences, ties and moments are computed in binary floating point, not on the decimals as typed"
}

// ---- Verdict --------------------------------------------------------------

// caution is the standing caution shown with every verdict.
func (w words) caution() string {
	return "These figures describe the data as entered. Where a decision " +
		"affects safety-critical parts, legal net quantity or medical products, follow the " +
		"applicable local regulations, codes and licensed professional practice; this report " +
		"does not replace them."
}

func (w words) reasonSingle() string {
	return "One reading: it is its own mean and median, and that is all it can say. No spread (SD, range, IQR), no interval, no shape and no suspect reading can be told from one reading: measure more parts."
}

// warnMixedMarks: the value column mixes decimal marks and the cells with
// the minority mark were left out (comma: the column's own mark).
func (w words) warnMixedMarks(column string, comma bool, dropped, used int) string {
	other, own := "a decimal comma", "decimal points"
	if comma {
		other, own = "a decimal point", "decimal commas"
	}
	return fmt.Sprintf("%d %s of %q %s left out because %s %s while the column uses %s; the mean and median are from the other %d %s. "+
		"Check the rows listed under What was read, and export the data with one decimal mark.",
		dropped, plural(dropped, "value", "values"), column, plural(dropped, "was", "were"), plural(dropped, "it uses", "they use"), other, own, used, plural(used, "value", "values"))
}

// warnAmbiguousMark: every decimal of the value column looked like "1,234"
// and no decimal mark was chosen, so the column was read by the default
// (comma: with a decimal comma; otherwise the comma as a thousands
// separator); the other reading differs by a factor of 1000.
func (w words) warnAmbiguousMark(column string, comma bool) string {
	if comma {
		return fmt.Sprintf("%q was read with a decimal comma, but its commas could also separate thousands: then every value written with a comma is %s times larger. "+
			"If so, choose the decimal point under Decimal mark in Settings.", column, w.grouped(1000))
	}
	return fmt.Sprintf("%q was read with the comma as a thousands separator (1,234 as %s), but its commas could also be decimal commas: then every value written with a comma is %s times smaller. "+
		"If so, choose the decimal comma under Decimal mark in Settings.", column, w.grouped(1234), w.grouped(1000))
}

// reasonFewReadings: what two or three readings can and cannot show.
func (w words) reasonFewReadings(n int) string {
	if n == 2 {
		return "Two readings: they give a mean and the range between them (the SD is that range divided by √2, a very rough figure). They say nothing about the shape, and no suspect-reading rule can be applied: with two readings neither can be called the odd one."
	}
	return "Three readings: they give a mean, a median and a rough SD, but no test of the shape can run, and one reading far from the other two cannot be told apart from real spread (the suspect-reading rules seldom flag anything with so few)."
}

func (w words) reasonConstant(n int, value float64) string {
	return fmt.Sprintf("All %d values are equal (%s): the SD and IQR are 0.", n, w.g3(value))
}

// reasonSkew: the data are side-skewed ("right", "left") or, with side
// "", roughly symmetric; p < 0 when there is no skewness test.
func (w words) reasonSkew(side string, g1, p float64) string {
	s := "the data are roughly symmetric (G1 = " + w.g3(g1)
	if side != "" {
		s = "the data are " + side + "-skewed (G1 = " + w.g3(g1)
	}
	if p >= 0 {
		s += ", " + w.p(p)
	}
	return s + ")"
}

// reasonSkewRest: the readings inside the outer fences are side-skewed
// (G1 g1, p < 0 without a test), far readings left out of that measure.
func (w words) reasonSkewRest(side string, g1, p float64, far int) string {
	s := fmt.Sprintf("the data are %s-skewed (G1 = %s without the %d far-out reading%s", side, w.g3(g1), far, plural(far, "", "s"))
	if p >= 0 {
		s += ", " + w.p(p)
	}
	return s + ")"
}

// reasonFarOutNotShape: below and above readings beyond the outer fences
// alone make G1 (g1All) look skewed; the rest has G1 g1Rest.
func (w words) reasonFarOutNotShape(below, above int, g1All, g1Rest float64) string {
	k := below + above
	where := "on opposite sides"
	switch {
	case above == 0:
		where = "below the rest"
	case below == 0:
		where = "above the rest"
	}
	return fmt.Sprintf("the skewness of all readings (G1 = %s) comes from %s far out %s; the rest is roughly symmetric (G1 = %s without %s)",
		w.g3(g1All), countWords(k, "reading", "readings"), where, w.g3(g1Rest), plural(k, "it", "them"))
}

// countWords writes small counts in words ("two readings").
func countWords(k int, one, many string) string {
	names := []string{"no", "one", "two", "three", "four", "five", "six", "seven", "eight", "nine", "ten"}
	if k >= 0 && k < len(names) {
		return names[k] + " " + plural(k, one, many)
	}
	return strconv.Itoa(k) + " " + many
}

func (w words) reasonBeyondOuter(k int) string {
	return fmt.Sprintf("%d reading%s beyond the outer fence (3 IQR beyond the quartiles)", k, plural(k, " lies", "s lie"))
}

func (w words) reasonManyInner(k, n int) string {
	return fmt.Sprintf("%d readings (%s of %d) lie beyond the inner fences (%s IQR), far more than normal data give", k, w.pct(float64(k)/float64(n)), n, w.mark("1.5"))
}

func (w words) reasonIQRZero() string {
	return "the middle half of the readings share one value (IQR = 0), so the IQR and the fences cannot describe the spread; the SD can"
}

func (w words) reasonSmallSample(n int) string {
	return fmt.Sprintf("with %d values the shape cannot be tested; the choice rests on the fences alone", n)
}

func (w words) reasonShapeUnknown() string {
	return "the shape statistics are not available; the choice rests on the fences alone"
}

func (w words) reasonNoFarOut() string { return "no reading lies beyond the outer fences" }

// reasonOutOfRange replaces the verdict's reasons when its figures are not
// finite (guard.go).
func (w words) reasonOutOfRange() string {
	return "The values are too large or too small for the verdict's figures; see the notes."
}

func (w words) warnSmallSample(n, want int) string {
	if n == 1 {
		return fmt.Sprintf("Only one value: collect %d or more where you can.", want)
	}
	return fmt.Sprintf("Only %d values: intervals are wide and the shape is hard to judge; collect %d or more where you can.", n, want)
}

func (w words) warnConstant() string {
	return "All values are equal: check that the gauge resolves the variation (or that the right column was read)."
}

func (w words) warnCoarseForTolerance(step, steps float64, want int) string {
	return fmt.Sprintf("The values move in steps of %s: only %s steps across the tolerance (at least %d are usual). Measure with a finer resolution.", w.g3(step), w.g3(steps), want)
}

func (w words) warnCoarseForSpread(sd, steps, step float64) string {
	return fmt.Sprintf("The SD (%s) is only %s resolution steps (%s): the recorded values cannot show the spread well. Measure with a finer resolution.", w.g3(sd), w.g3(steps), w.g3(step))
}

func (w words) warnHeavyTies(distinct, n, maxCount int) string {
	return fmt.Sprintf("Heavy ties: %d distinct values among %d readings, the most common one %d times. Normality tests reject such data readily and rank methods lose power.", distinct, n, maxCount)
}

// ---- Centre ---------------------------------------------------------------

func (w words) meanCIOverflow() string {
	return "the interval for the mean is omitted: its limits are beyond the range of double-precision numbers for these values"
}

func (w words) medianCINotReached(n int, asked, reached float64) string {
	return fmt.Sprintf("with %d values no order-statistic interval reaches %s; the widest one (minimum to maximum) reaches %s", n, w.pct(asked), w.pct(reached))
}

func (w words) centreConstant() string {
	return "all values are equal: no interval for the mean or the median can be computed"
}

func (w words) oneValue() string { return "one value: no interval, SD or shape can be computed" }

func (w words) modeNone() string { return "no repeated value" }

// modeTies: tied values each occurring count times; listed of them are
// listed (listed < tied when not all are).
func (w words) modeTies(tied, count, listed int) string {
	if listed < tied {
		return fmt.Sprintf("%d values tie, each occurring %d times; the %d smallest are listed", tied, count, listed)
	}
	return fmt.Sprintf("%d values tie, each occurring %d times", tied, count)
}

// ---- Spread ---------------------------------------------------------------

func (w words) varianceOverflow() string {
	return fmt.Sprintf("the variance exceeds the largest double-precision number (%s) and is omitted; the SD is given", w.mark("1.8e308"))
}

func (w words) sdOneValue() string { return "one value: the SD needs at least two (shown as 0)" }

func (w words) cvOmitted() string {
	return "the coefficient of variation is omitted: it needs values all of one sign (a ratio scale), and a mean other than 0"
}

// ---- Quantiles ------------------------------------------------------------

// quantileNames are the plain names shown beside each definition (a
// switch, not a map: nothing to build at start).
func quantileNames(code string) string {
	switch code {
	case "hf1":
		return "Hyndman-Fan type 1: inverse of the empirical distribution function"
	case "hf2":
		return "Hyndman-Fan type 2: inverse of the empirical distribution function, averaged at discontinuities"
	case "hf3":
		return "Hyndman-Fan type 3: nearest even order statistic"
	case "hf4":
		return "Hyndman-Fan type 4: linear interpolation of the empirical distribution function, p = k/n"
	case "hf5":
		return "Hyndman-Fan type 5: piecewise linear, p = (k - 1/2)/n"
	case "hf6":
		return "Hyndman-Fan type 6: p = k/(n + 1)"
	case "hf7":
		return "Hyndman-Fan type 7: p = (k - 1)/(n - 1)"
	case "hf8":
		return "Hyndman-Fan type 8: median-unbiased, p = (k - 1/3)/(n + 1/3)"
	case "hf9":
		return "Hyndman-Fan type 9: normal-unbiased, p = (k - 3/8)/(n + 1/4)"
	case "tukey":
		return "Tukey's hinges (quartiles only; other percentiles by type 7)"
	}
	return ""
}

// quantileName is the plain name of a quantile definition.
func (w words) quantileName(code string) string { return quantileNames(code) }

// quartileCaption names the definition behind the quartile-based figures
// (IQR, fences, box plot) of a report, in words: "quartiles by
// Hyndman-Fan type 7 (p = (k - 1)/(n - 1))".
func (w words) quartileCaption(code string) string {
	name, formula, ok := strings.Cut(quantileNames(code), ": ")
	if !ok {
		return "quartiles by " + name
	}
	return "quartiles by " + name + " (" + formula + ")"
}

// quantileMedian: the quantile section's median (under code) differs from
// the centre's.
func (w words) quantileMedian(code string, n int, qmed, median float64) string {
	return fmt.Sprintf("The quantile section follows %s, whose median of these %d values is %s; the centre's median is the usual one, the middle value or the mean of the two middle values (%s), which types 2 and 5 to 9 and Tukey's hinges share. The IQR, the fences and the box plot use the %s quartiles.",
		code, n, w.shortest(qmed), w.shortest(median), code)
}

// differRule: rule (a quartile-based rule code) flags another set under
// the definitions methods.
func (w words) differRule(rule string, methods []string) string {
	name := map[string]string{"tukey-inner": "Tukey's inner fences", "tukey-outer": "Tukey's outer fences", "adjusted-box": "the adjusted box plot"}[rule]
	return "by " + name + " under " + strings.Join(methods, ", ")
}

// fenceSensitive: rules (differRule phrases) flag other readings than under
// code; rows is rowsWithText's list.
func (w words) fenceSensitive(rules []string, code, rows string) string {
	return fmt.Sprintf("Which readings are flagged depends on the quartile definition here: compared with %s, another set of readings is flagged %s. Readings affected: %s.",
		code, strings.Join(rules, " and "), rows)
}

// ---- Shape ----------------------------------------------------------------

// Test names of the shape section.
const (
	testSkew     = "D'Agostino skewness"
	testKurt     = "Anscombe-Glynn kurtosis"
	testOmnibus  = "D'Agostino-Pearson K²"
	testShapiro  = "Shapiro-Wilk"
	testAnderson = "Anderson-Darling"
)

func (w words) skewMethod() string { return "normal approximation to √b1 (D'Agostino 1970)" }

func (w words) kurtMethod() string { return "normal approximation to b2 (Anscombe and Glynn 1983)" }

func (w words) omnibusMethod(large bool) string {
	if large {
		return fmt.Sprintf("chi-square with 2 degrees of freedom; used in place of Shapiro-Wilk above n = %d", method.ShapiroMaxN)
	}
	return "chi-square with 2 degrees of freedom"
}

func (w words) shapiroMethod() string { return "Royston (1995) AS R94" }

func (w words) andersonMethod(a, astar float64) string {
	return fmt.Sprintf("A² = %s; p from the adjusted A²* = A²(1+%s/n+%s/n²) = %s (D'Agostino and Stephens 1986)",
		w.g(a, 4), w.mark("0.75"), w.mark("2.25"), w.g(astar, 4))
}

func (w words) shapeFew(n int) string {
	return fmt.Sprintf("Shape statistics need at least 3 values; there are %d.", n)
}

func (w words) shapeConstant() string {
	return "Shape statistics are not defined: all values are equal."
}

// shapeSubjects name the figure of each shape note's field (a switch, not
// a map: nothing to build at start).
func shapeSubjects(field string) string {
	switch field {
	case "shape.skewness":
		return "The skewness"
	case "shape.skewness.test":
		return "The skewness test"
	case "shape.kurtosis":
		return "The kurtosis"
	case "shape.kurtosis.test":
		return "The kurtosis test"
	case "shape.omnibus":
		return "The K² omnibus test"
	case "shape.shapiroWilk":
		return "Shapiro-Wilk"
	case "shape.andersonDarling":
		return "Anderson-Darling"
	}
	return ""
}

// notComputed: the figure at field (a key of shapeSubjects) could not be
// computed for these values.
func (w words) notComputed(field string) string {
	return shapeSubjects(field) + " could not be computed for these values."
}

// needsN: the figure at field (a key of shapeSubjects) needs at least min
// values; there are n.
func (w words) needsN(field string, min, n int) string {
	return fmt.Sprintf("%s needs at least %d values; there are %d.", shapeSubjects(field), min, n)
}

func (w words) noLargeTest() string {
	return "No normality test for large samples could be computed for these values."
}

func (w words) shapiroRange(n int) string {
	return fmt.Sprintf("Shapiro-Wilk is defined for %d to %d values; there are %d. The D'Agostino-Pearson K² test is shown instead.", method.ShapiroMinN, method.ShapiroMaxN, n)
}

// shapeSectionConstant and shapeSectionFew are the report-level notes when
// the shape section is left out.
func (w words) shapeSectionConstant() string {
	return "all values are equal: shape statistics and normality tests cannot be computed"
}

func (w words) shapeSectionFew() string {
	return "shape statistics and normality tests need at least 3 values"
}

// normalTest names the normality test whose p-value chooses the spec
// section's model: "Shapiro-Wilk p = 0.012".
func (w words) normalTest(name string, p float64) string { return name + " " + w.p(p) }

// ---- Suspect readings -----------------------------------------------------

// tukeyRule is the name of Tukey's fences at k·1.5 IQR (k 1 inner, 2 outer).
func (w words) tukeyRule(outer bool) string {
	if outer {
		return "Tukey's outer fences (3 IQR)"
	}
	return "Tukey's inner fences (" + w.mark("1.5") + " IQR)"
}

// tukeyNote: fences iqrs IQR beyond the nearest quartile; caption is
// quartileCaption; zeroIQR adds the warning for an IQR of 0.
func (w words) tukeyNote(iqrs float64, caption string, zeroIQR bool) string {
	return fmt.Sprintf("Common practice (Tukey 1977): fences %s IQR beyond the nearest quartile; %s.%s", w.shortest(iqrs), caption, w.zeroIQR(zeroIQR))
}

func (w words) zeroIQR(zero bool) string {
	if !zero {
		return ""
	}
	return " The IQR is 0 (at least half the values are equal), so the fences sit on the quartiles and every other value is flagged: read these flags with care."
}

// tukeyFlag: a reading iqrs IQR below Q1 (below) or above Q3, beyond the
// outer fence or only the inner one; with an IQR of 0 (iqrs < 0) only the
// fence is named.
func (w words) tukeyFlag(below bool, iqrs float64, outer bool) string {
	label := "outside the inner fence"
	if outer {
		label = "far out, beyond the outer fence"
	}
	if iqrs < 0 {
		return label
	}
	if below {
		return fmt.Sprintf("%s IQR below Q1 (%s)", w.sig(iqrs, 3), label)
	}
	return fmt.Sprintf("%s IQR above Q3 (%s)", w.sig(iqrs, 3), label)
}

func (w words) adjustedBoxRule() string { return "Adjusted box plot for skewed data" }

// adjustedBoxFlag: a reading dist beyond the adjusted lower (below) or
// upper fence.
func (w words) adjustedBoxFlag(below bool, dist float64) string {
	if below {
		return fmt.Sprintf("%s below the lower fence of the box plot adjusted for skewness", w.sig(dist, 3))
	}
	return fmt.Sprintf("%s above the upper fence of the box plot adjusted for skewness", w.sig(dist, 3))
}

// mcWords explains a medcouple value in words.
func (w words) mcWords(mc float64) string {
	side := "the two sides are balanced"
	switch {
	case mc > 0:
		side = "positive: the upper side is the longer"
	case mc < 0:
		side = "negative: the lower side is the longer"
	}
	return fmt.Sprintf("medcouple %s (a measure of skewness from -1 to 1 that far-out readings hardly move; 0 for symmetric data; %s)", w.sig(mc, 2), side)
}

func (w words) adjustedBoxNote(mc float64, caption string, zeroIQR bool) string {
	return fmt.Sprintf("Hubert and Vandervieren (2008): Tukey's %s IQR fences stretched on the long side and pulled in on the short side by the %s (Brys, Hubert and Struyf 2004); %s.%s", w.mark("1.5"), w.mcWords(mc), caption, w.zeroIQR(zeroIQR))
}

func (w words) adjustedBoxNotApplied() string {
	return "The medcouple could not be computed (it needs at least 3 values): rule not applied."
}

func (w words) modifiedZRule() string { return "Modified z-score above " + w.mark("3.5") }

func (w words) modifiedZFlag(m float64) string {
	return fmt.Sprintf("modified z-score %s (limit %s)", w.sig(m, 3), w.mark("3.5"))
}

func (w words) modifiedZNote(mad float64) string {
	return fmt.Sprintf("Iglewicz and Hoaglin (1993): Mi = %s(xi - median)/MAD with the raw MAD %s; |Mi| > %s is flagged.", w.mark("0.6745"), w.sig(mad, 4), w.mark("3.5"))
}

func (w words) modifiedZNotApplied() string {
	return "The median absolute deviation is 0 (more than half the values equal the median), so the modified z-score is not defined: rule not applied."
}

// gesdRule is the rule's name: Grubbs' test when it tests one suspect.
func (w words) gesdRule(one bool) string {
	if one {
		return "Grubbs' test (generalized ESD with one suspect)"
	}
	return "Generalized ESD (Grubbs' test for one suspect)"
}

func (w words) gesdFew() string {
	return "The generalized ESD needs at least 3 values: rule not applied."
}

// gesdFlag: step (1-based) of the procedure flagged a reading with
// statistic r against the critical value lambda; grubbs when one suspect.
func (w words) gesdFlag(grubbs bool, step int, r, lambda, alpha float64) string {
	if grubbs {
		return fmt.Sprintf("%s SDs from the mean (Grubbs' test); normal data of this size go beyond %s SDs only %s of the time", w.sig(r, 3), w.sig(lambda, 3), w.pct(alpha))
	}
	return fmt.Sprintf("%s SDs from the mean of the readings left at step %d of the generalized ESD; normal data go beyond %s SDs there only %s of the time", w.sig(r, 3), step, w.sig(lambda, 3), w.pct(alpha))
}

// gesdNote: at level alpha, up to r suspects; rough when n < 25; stopped
// after steps when fewer than r steps ran.
func (w words) gesdNote(alpha float64, r, n, steps int) string {
	s := fmt.Sprintf("Rosner (1983) at α = %s, testing up to %d suspect(s) (our limit: min(10, max(1, n/10))); with one suspect this is Grubbs' two-sided test. It assumes the other values are roughly normal.", w.sig(alpha, 3), r)
	if n < 25 && r > 1 {
		s += " Rosner's critical values are approximate below 25 values."
	}
	if steps < r {
		s += fmt.Sprintf(" Stopped after %d step(s): the remaining values are all equal.", steps)
	}
	return s
}

// Plain names of the rules, for "also flagged by ...".
func (w words) tukeyPlain(outer bool) string {
	if outer {
		return "far out: more than 3 IQR beyond the quartiles (Tukey's outer fences)"
	}
	return "more than " + w.mark("1.5") + " IQR beyond the quartiles (Tukey's fences)"
}

func (w words) adjustedBoxPlain() string {
	return "beyond the fences of the box plot adjusted for skewness"
}

func (w words) modifiedZPlain() string {
	return "far from the median in units of the median absolute deviation (modified z-score)"
}

func (w words) gesdPlain() string {
	return "too far from the mean for normal data (generalized ESD test)"
}

// Why the leading rule leads (Suspects.Lead.Text).

func (w words) leadIQRZero() string {
	return "Half the readings or more share one value (IQR 0), so fences built on the quartiles would flag every other reading; the count is the generalized ESD test's, which measures distance from the mean in SDs."
}

func (w words) leadSkewed(mc float64) string {
	return fmt.Sprintf("The data are clearly skewed (%s), so the count is the box plot adjusted for skewness: it does not flag the long side's ordinary readings as Tukey's fences would.", w.mcWords(mc))
}

func (w words) leadFewDistinct(mc float64, distinct, want int) string {
	return fmt.Sprintf("The %s would call the data skewed, but with only %d distinct values (fewer than %d) it cannot be trusted: it jumps between a few values. The count is Tukey's fences (%s IQR beyond the quartiles).", w.mcWords(mc), distinct, want, w.mark("1.5"))
}

func (w words) leadMCUnstable(mc, spread float64, distinct, n int, step float64) string {
	return fmt.Sprintf("The %s would call the data skewed, but the readings are rounded to %s with many ties (%d distinct values among %d): with each group of equal readings spread over its rounding interval the medcouple moves to %s: its value here depends on the rounding more than on the process. The count is Tukey's fences (%s IQR beyond the quartiles); the adjusted box plot's other flags are listed as \"also flagged\".", w.mcWords(mc), w.shortest(step), distinct, n, w.sig(spread, 2), w.mark("1.5"))
}

func (w words) leadSymmetric(mc float64, mcOK bool, n, esdMin int) string {
	s := "The data are roughly symmetric"
	if mcOK {
		s += fmt.Sprintf(" (medcouple %s, within what chance gives)", w.sig(mc, 2))
	}
	if n < esdMin {
		return s + fmt.Sprintf(", and with fewer than %d readings the normality the ESD test needs cannot be checked: the count is Tukey's fences (%s IQR beyond the quartiles).", esdMin, w.mark("1.5"))
	}
	return s + fmt.Sprintf(": the count is Tukey's fences (%s IQR beyond the quartiles).", w.mark("1.5"))
}

// restTest names the normality test of the readings inside the fences.
func (w words) restTest(large bool, p float64) string {
	if large {
		return testOmnibus + " " + w.p(p)
	}
	return testShapiro + " " + w.p(p)
}

func (w words) leadRestNormal(mc float64, mcOK bool, p float64, large bool, rest int) string {
	s := "The data are roughly symmetric"
	if mcOK {
		s += fmt.Sprintf(" (medcouple %s, within what chance gives)", w.sig(mc, 2))
	}
	return s + fmt.Sprintf(" and the %d readings inside Tukey's outer fences (3 IQR beyond the quartiles) look normal (%s), so the count is the generalized ESD test's, which asks whether the extremes are too far out for normal data at this sample size.", rest, w.restTest(large, p))
}

func (w words) leadRestNotNormal(mc float64, mcOK bool, p float64, large bool, rest int) string {
	s := "The data are roughly symmetric"
	if mcOK {
		s += fmt.Sprintf(" (medcouple %s, within what chance gives)", w.sig(mc, 2))
	}
	if p >= 0 {
		s += fmt.Sprintf(", but the %d readings inside Tukey's outer fences (3 IQR beyond the quartiles) do not look normal (%s), which the ESD test assumes", rest, w.restTest(large, p))
	}
	return s + fmt.Sprintf(": the count is Tukey's fences (%s IQR beyond the quartiles).", w.mark("1.5"))
}

func (w words) suspectsMore(flagged, listed int) string {
	return fmt.Sprintf("%d readings are flagged; the %d most extreme are listed (the rules give the full counts)", flagged, listed)
}

// ---- Target ---------------------------------------------------------------

// Test names of the target section.
const (
	testT        = "One-sample t"
	testWilcoxon = "Wilcoxon signed-rank"
)

func (w words) targetFew() string {
	return "The tests against the target need at least two values that are not all equal."
}

func (w words) targetFewNote() string {
	return "tests against the target need at least two values that are not all equal"
}

func (w words) tTestFailed() string { return "The t test could not be computed for these values." }

func (w words) tMethod() string { return "two-sided" }

func insideWord(inside bool) string {
	if inside {
		return "inside"
	}
	return "outside"
}

// targetMean: the target against the t interval [lo, hi] at level conf,
// all written to the decimals that show the interval's half-width.
func (w words) targetMean(target float64, inside bool, conf, lo, hi float64) string {
	dec := decimalsFor((hi - lo) / 2)
	return fmt.Sprintf("The target %s lies %s the %s interval for the mean, %s to %s.",
		w.fixed(target, dec), insideWord(inside), w.level(conf), w.fixed(lo, dec), w.fixed(hi, dec))
}

// targetPseudoMedian follows targetMean: the target against the
// Hodges-Lehmann interval.
func (w words) targetPseudoMedian(inside bool, level, lo, hi float64) string {
	dec := decimalsFor((hi - lo) / 2)
	return fmt.Sprintf(" It lies %s the %s interval for the pseudo-median (Wilcoxon), %s to %s.",
		insideWord(inside), w.level(level), w.fixed(lo, dec), w.fixed(hi, dec))
}

// wilcoxonMethod: exact or normal approximation (with tie correction);
// dropped values equal to the target; capped when the pseudo-median is
// left out above maxHL values.
func (w words) wilcoxonMethod(exact, ties bool, dropped int, capped bool, maxHL int) string {
	s := "exact"
	if !exact {
		s = "normal approximation with continuity correction"
		if ties {
			s += " and tie correction"
		}
	}
	if dropped > 0 {
		s += fmt.Sprintf("; %d value(s) equal to the target dropped", dropped)
	}
	if capped {
		s += "; the pseudo-median and its interval are given up to " + w.grouped(maxHL) + " values"
	}
	return s
}

// walshMethod is the method of the Hodges-Lehmann interval.
func (w words) walshMethod(exact, reached bool) string {
	m := "normal approximation"
	if exact {
		m = "exact signed-rank distribution"
	} else if !reached {
		m += "; the requested level is not reachable with so few values"
	}
	return "walsh-averages (" + m + ")"
}

// ---- Against the spec -----------------------------------------------------

func (w words) specFailed(err error) string {
	return "the spec section could not be computed: " + err.Error()
}

// withinSingles: a subgroup column was chosen but every subgroup holds one
// reading (within.go).
func (w words) withinSingles() string {
	return "every subgroup holds one reading: the within-process sigma is estimated from the moving ranges of consecutive readings, as on the control chart"
}

func (w words) noWithin(err error) string {
	return "no within-process sigma: " + err.Error() + "; the within-process indices (Cp, Cpk) are left out"
}

// withinFlat is why no within-process sigma exists: the readings do not
// vary between consecutive readings or within subgroups.
func (w words) withinFlat(subgroups bool) string {
	if subgroups {
		return "the readings do not vary within subgroups"
	}
	return "the readings do not vary within consecutive readings"
}

func (w words) specIndicesFew() string {
	return "capability indices need at least two readings that are not all equal"
}

func (w words) specIndicesFailed(err error) string {
	return "capability indices could not be computed: " + err.Error()
}

func (w words) specThinned(m, n, distinct, max int) string {
	return fmt.Sprintf("the distributions were fitted to %d evenly spaced order statistics of the %d readings (%d distinct values), which follow the data's distribution to within 1 in %d", m, n, distinct, max)
}

func (w words) specNoPercentileIndices(n int) string {
	return fmt.Sprintf("no percentile-method indices: no distribution fits and %d readings cannot locate the %s%% and %s%% points of the data (that needs a few thousand)", n, w.mark("0.135"), w.mark("99.865"))
}

func (w words) specPercentileNoInterval() string {
	return "the percentile-method indices (ISO 22514-2) have no interval: the standard gives none for a fitted distribution; the bound on the observed count, and the normal-based indices' intervals, show how uncertain the figures are"
}

// cautionNotStable is the spec section's caution from the stability
// section (Stability.Caution): code "not-stable" with its verdict, or
// "stability-not-judged" with why.
func (w words) cautionNotStable(code, verdict string) string {
	if code == "stability-not-judged" {
		return verdict + "; capability then describes this batch, not the process."
	}
	return "The process was not stable over time (" + verdict + "): capability then describes this batch, not the process; find and remove the cause, then measure again."
}

func (w words) cautionFew(n, want int) string {
	return fmt.Sprintf("Only %d readings: capability figures from fewer than about %d readings are rough, as their wide intervals show (common practice).", n, want)
}

// cautionNotNormal: the readings are not normal by normalTest (see
// normalTest); family is the fitted family leading, "" when none fits.
func (w words) cautionNotNormal(normalTest, family string) string {
	if family != "" {
		return fmt.Sprintf("The readings are not normal (%s), so the figures that lead come from the fitted %s distribution and the percentile method of ISO 22514-2; the normal-based Cp and Cpk are shown for comparison only.", normalTest, familyWords(family))
	}
	return fmt.Sprintf("The readings are not normal (%s) and no candidate distribution fits them: quote the observed count; the data's own %s%% and %s%% points need a few thousand readings, and the normal-based Cp and Cpk are for reference only. If the batch mixes lines, cavities or lots, analyse each on its own.", normalTest, w.mark("0.135"), w.mark("99.865"))
}

func (w words) cautionCoarse(step float64, want int, tolerance float64) string {
	return fmt.Sprintf("The readings move in steps of %s, fewer than %d steps across the tolerance of %s: the gauge is too coarse for this specification (common practice asks for at least ten steps).", w.g3(step), want, w.g3(tolerance))
}

func (w words) cautionNoWithin() string {
	return "No within-process sigma could be estimated, so only the overall figures (Pp, Ppk) are given."
}

// cautionSafety: goal is the Cpk goal applied; usual the common one
// (DefaultCpkGoal).
func (w words) cautionSafety(goal, usual float64) string {
	s := "For safety-critical characteristics, legal net quantity or medical products, the customer's requirements, the applicable standards and local regulations decide which index, which level and how many readings are needed; "
	if goal == usual {
		return s + "the " + w.trim(goal, 2) + " used here is common practice, not a law."
	}
	return s + "the goal of " + w.trim(goal, 2) + " used here was set in the settings; the usual " + w.trim(usual, 2) + " is common practice, not a law."
}

func familyWords(f string) string {
	switch f {
	case method.FitLognormal:
		return "lognormal"
	case method.FitLognormal3:
		return "three-parameter lognormal"
	case method.FitWeibull:
		return "Weibull"
	case method.FitWeibull3:
		return "three-parameter Weibull"
	case method.FitGamma:
		return "gamma"
	case method.FitGamma3:
		return "three-parameter gamma"
	case method.FitBoxCox:
		return "Box-Cox-transformed normal"
	case "empirical":
		return "empirical"
	}
	return f
}

func limitWords(sides string) string {
	switch sides {
	case "lower":
		return "lower limit"
	case "upper":
		return "upper limit"
	}
	return "limits"
}

func modelWords(model string) string {
	switch model {
	case "normal-within":
		return "for a normal process with the within-process sigma"
	case "normal-overall":
		return "for a normal distribution with the overall SD"
	}
	return "under the fitted " + familyWords(model) + " distribution"
}

// specObserved opens the statement: outside of n readings outside the
// limits of sides, as a fraction (ppm) with its upper bound at conf.
func (w words) specObserved(outside, n int, sides string, ppm, conf, upper float64) string {
	if outside == 0 {
		return fmt.Sprintf("None of the %d readings lies outside the %s (%s upper bound %s).", n, limitWords(sides), w.level(conf), w.ppm(upper))
	}
	return fmt.Sprintf("%d of the %d readings %s outside the %s (%s; %s upper bound %s).", outside, n, plural(outside, "lies", "lie"), limitWords(sides), w.ppm(ppm), w.level(conf), w.ppm(upper))
}

// specExpected: about ppm expected outside under model, with its upper
// bound at conf when hasUpper.
func (w words) specExpected(ppm float64, hasUpper bool, conf, upper float64, model string) string {
	s := " About " + w.ppm(ppm) + " expected outside"
	if hasUpper {
		s += fmt.Sprintf(" (%s upper bound %s)", w.level(conf), w.ppm(upper))
	}
	return s + " " + modelWords(model) + "."
}

func (w words) specNoFit() string {
	return " No distribution fits these readings, so no expected fraction is given; the observed count is the figure to quote."
}

// specIndex ends the statement: the leading index (name on basis) with its
// lower bound at conf (when hasBound), against goal; normal tells whether
// the normal model leads.
func (w words) specIndex(name, basis string, normal bool, value float64, hasBound bool, bound, conf, goal float64) string {
	if basis == "percentile" {
		name += " (percentile method)"
	} else if !normal {
		name += " (normal-based, for reference only: the readings are not normal)"
	}
	s := fmt.Sprintf(" %s %s", name, w.trim(value, 2))
	ref := value
	if hasBound {
		s += fmt.Sprintf(", lower %s bound %s", w.level(conf), w.trim(bound, 2))
		ref = bound
	}
	switch {
	case ref >= goal:
		s += fmt.Sprintf(", above the %s that many customers require (common practice, not a law).", w.trim(goal, 2))
	case value >= goal:
		s += fmt.Sprintf(": the estimate is above %s but the bound is not, so these readings do not show %s with %s confidence.", w.trim(goal, 2), w.trim(goal, 2), w.level(conf))
	default:
		s += fmt.Sprintf(", below the %s that many customers require (common practice, not a law).", w.trim(goal, 2))
	}
	return s
}

// ---- Over time ------------------------------------------------------------

// stabRuleIndividuals .. stabRuleChosen say why the chart is the one shown.
func (w words) stabRuleIndividuals() string {
	return "Individual readings (no subgroup column): an individuals chart with the moving range of consecutive readings."
}

func (w words) stabRuleAuto(maxn int) string {
	if maxn >= 10 {
		return fmt.Sprintf("Subgroups of up to %d readings: mean and standard deviation chart (from 10 readings a subgroup the SD is the more efficient measure of spread).", maxn)
	}
	return fmt.Sprintf("Subgroups of up to %d readings: mean and range chart (below 10 readings a subgroup the range loses little against the SD).", maxn)
}

func (w words) stabRuleChosen(spread string) string {
	if spread == "sd" {
		return "Mean and standard deviation chart, as chosen in the settings."
	}
	return "Mean and range chart, as chosen in the settings."
}

func (w words) stabAllSingles() string {
	return "every subgroup holds one reading: the readings are charted as individuals with moving ranges"
}

func (w words) stabNotExact() string {
	return "some readings are not plain decimals (exponent form): ties and sides of the median in the drift tests were decided on binary values"
}

// stabDriftBlocks: above limit readings the trend test, the runs test and
// the change point run on the means of blocks of size consecutive
// readings (blocks of them).
func (w words) stabDriftBlocks(n, limit, size, blocks int) string {
	return fmt.Sprintf("with %s readings (more than %s) the trend test, the runs test and the change point were computed on the means of %s consecutive blocks of %d readings, in time order; the autocorrelation, the control chart, its checks, EWMA and CUSUM use every reading", w.grouped(n), w.grouped(limit), w.grouped(blocks), size)
}

func (w words) stabSenThinned(n, every, used int) string {
	return fmt.Sprintf("Sen's slope forms every pair of points, which is too many for %s: it was computed from every %d-th point (%s points) and scaled to a slope per reading", w.grouped(n), every, w.grouped(used))
}

func (w words) stabSignalsCut(total, listed int) string {
	return fmt.Sprintf("%d signals were found; %d are listed, check by check in the order of the checks (the checks give the full counts, and the verdict names the earliest signal of all)", total, listed)
}

// stabTestFailed: a drift test (named) could not be computed.
func (w words) stabTestFailed(test string, err error) string {
	return test + " not computed: " + err.Error()
}

func (w words) stabTooFew(n int) string {
	return fmt.Sprintf("Stability not judged: %d readings in time order, and control limits need at least 3", n)
}

// stabNoSpread: no limits could be set (why is one of the stabBaseline*
// sentences or a method's error).
func (w words) stabNoSpread(why string) string {
	return "Stability not judged: " + why
}

func (w words) stabBaselineFew(rows string, n int) string {
	return fmt.Sprintf("the baseline rows %q hold %d of the readings used: the limits need at least 2 in a row", rows, n)
}

func (w words) stabBaselineFlat(subgroups bool) string {
	if subgroups {
		return "the readings do not vary within the baseline subgroups: no limits can be set from them"
	}
	return "the baseline readings do not vary: no limits can be set from them"
}

func (w words) stabBaselineNoSubgroup(rows string) string {
	return fmt.Sprintf("no subgroup lies wholly in the baseline rows %q: the limits need at least one", rows)
}

func (w words) stabBaseline(points, total, first, last int, subgroup bool) string {
	what := "readings"
	if subgroup {
		what = "subgroups"
	}
	if points == last-first+1 {
		return fmt.Sprintf("limits set from %s %d-%d", what, first, last)
	}
	return fmt.Sprintf("limits set from %d of the %d %s (%d to %d)", points, total, what, first, last)
}

func (w words) stabOrderRows() string {
	return "In the order of the rows (no order or time column chosen)."
}

func (w words) stabOrderColumn(o StabilityOrder) string {
	s := fmt.Sprintf("In the order of column %q", o.Column)
	if o.Kind == "time" {
		s += " (times)"
	}
	s += "."
	if o.OutOfOrder > 0 {
		s += fmt.Sprintf(" %d rows are not in that order in the file; the readings were put in order.", o.OutOfOrder)
	}
	if o.Duplicates > 0 {
		s += fmt.Sprintf(" %d readings share their %s with the one before (kept in row order).", o.Duplicates, map[bool]string{true: "time", false: "order value"}[o.Kind == "time"])
	}
	if o.GapCount > 0 {
		s += fmt.Sprintf(" %d gaps: steps more than %d times the usual step of %s.", o.GapCount, gapFactor, w.stabStep(o.MedianStep, o.Kind))
	}
	return s
}

func (w words) stabStep(s float64, kind string) string {
	if kind != "time" {
		return w.g3(s)
	}
	switch {
	case s >= 86400:
		return w.g3(s/86400) + " days"
	case s >= 3600:
		return w.g3(s/3600) + " h"
	case s >= 60:
		return w.g3(s/60) + " min"
	}
	return w.g3(s) + " s"
}

// stabCheckName and stabCheckText are the checks in our own words.
func (w words) stabCheckName(code string) string {
	return map[string]string{
		method.SignalBeyondLimits:  "Beyond a limit",
		method.SignalTwoOfThree:    "Two of three far out",
		method.SignalFourOfFive:    "Four of five out on one side",
		method.SignalRunSameSide:   "Long run on one side",
		method.SignalTrend:         "Steady climb or fall",
		method.SignalAlternating:   "Saw-tooth",
		method.SignalHuggingCentre: "Crowding the centre",
		method.SignalAvoidCentre:   "Avoiding the centre",
		SignalEWMA:                 "EWMA beyond its limits",
		SignalCUSUM:                "CUSUM beyond its decision interval",
		SignalSpreadBeyond:         "Spread beyond its limits",
	}[code]
}

func (w words) stabCheckText(code string) string {
	return map[string]string{
		method.SignalBeyondLimits:  "a point outside the control limits (3 sigma); on the spread chart, a spread outside its limits",
		method.SignalTwoOfThree:    "two of three points in a row more than 2 sigma from the centre, on the same side",
		method.SignalFourOfFive:    "four of five points in a row more than 1 sigma from the centre, on the same side",
		method.SignalRunSameSide:   "nine or more points in a row on the same side of the centre line",
		method.SignalTrend:         "six or more points in a row, each higher (or each lower) than the one before",
		method.SignalAlternating:   "fourteen or more points in a row going up and down in turn",
		method.SignalHuggingCentre: "fifteen or more points in a row within 1 sigma of the centre (limits too wide, or mixed streams)",
		method.SignalAvoidCentre:   "eight or more points in a row more than 1 sigma from the centre, on both sides (two streams mixed)",
		SignalEWMA:                 "the exponentially weighted average outside its limits: a small sustained shift",
		SignalCUSUM:                "a cumulative sum of deviations beyond its decision interval: a small sustained shift",
	}[code]
}

// stabSignal is one signal with where it lies and the rows (or subgroups)
// that make it.
func (w words) stabSignal(s SignalInfo, subgroup bool) string {
	what, where := "reading", ""
	if subgroup {
		what = "subgroup"
	}
	if s.First == s.Last {
		where = fmt.Sprintf("%s %d", what, s.First)
	} else {
		where = fmt.Sprintf("%ss %d-%d", what, s.First, s.Last)
	}
	by := ""
	if len(s.Rows) > 0 {
		parts := make([]string, len(s.Rows))
		for i, x := range s.Rows {
			parts[i] = strconv.Itoa(x)
		}
		by = " (" + plural(s.Points, "row ", "rows ") + stabJoin(parts, s.Points) + ")"
	} else if len(s.Subgroups) > 0 {
		by = " (" + plural(s.Points, "subgroup ", "subgroups ") + stabJoin(s.Subgroups, s.Points) + ")"
	}
	side := ""
	switch s.Side {
	case 1:
		side = " (upward)"
	case -1:
		side = " (downward)"
	}
	return w.stabCheckName(s.Code) + side + ": " + where + by
}

func stabJoin(v []string, total int) string {
	s := strings.Join(v, ", ")
	if total > len(v) {
		s += fmt.Sprintf(" and %d more", total-len(v))
	}
	return s
}

// stabReasonSignals .. stabReasonCUSUM: n signals, first the earliest
// (its text from stabSignal), nil when none is listed.
func (w words) stabReasonSignals(n int, first *SignalInfo) string {
	s := fmt.Sprintf("%d %s on the control chart", n, plural(n, "signal", "signals"))
	if first != nil {
		s += "; the first: " + first.Text
	}
	return s
}

func (w words) stabReasonEWMA(n int, first *SignalInfo) string {
	s := fmt.Sprintf("the EWMA left its limits %d %s", n, plural(n, "time", "times"))
	if first != nil {
		s += ", first " + first.Text
	}
	return s
}

func (w words) stabReasonCUSUM(n int, first *SignalInfo) string {
	s := fmt.Sprintf("the CUSUM crossed its decision interval %d %s", n, plural(n, "time", "times"))
	if first != nil {
		s += ", first " + first.Text
	}
	return s
}

// stabValue writes a data value (a mean, a shift, a slope) with the data's
// decimals dec plus extra; stabSigned adds the sign and the unit.
func (w words) stabValue(x float64, dec, extra int) string {
	return w.fixed(x, min(15, dec+extra))
}

func (w words) stabSigned(x float64, dec, extra int, unit string) string {
	s := w.stabValue(x, dec, extra)
	if x > 0 {
		s = "+" + s
	}
	if unit != "" {
		s += " " + unit
	}
	return s
}

// stabReasonTrend: Mann-Kendall's S and p, Sen's slope (nil when none) in
// data units per reading.
func (w words) stabReasonTrend(s int64, p float64, slope *SlopeInfo, dec int, unit string) string {
	trend := "an upward trend"
	if s < 0 {
		trend = "a downward trend"
	}
	out := fmt.Sprintf("%s (Mann-Kendall %s)", trend, w.p(p))
	if slope != nil {
		out += ", about " + w.stabSigned(slope.Slope, dec, 2, unit) + " per reading (Sen's slope)"
	}
	return out
}

func (w words) stabChangeAt(c *ChangeInfo, subgroup bool) string {
	if subgroup {
		return fmt.Sprintf("subgroup %d (%s)", c.Position, c.Subgroup)
	}
	return fmt.Sprintf("reading %d (row %d)", c.Position, c.Row)
}

func (w words) stabReasonChange(c *ChangeInfo, subgroup bool, dec int) string {
	return fmt.Sprintf("the level changed at %s: mean %s before, %s after (Pettitt %s)", w.stabChangeAt(c, subgroup), w.stabValue(c.MeanBefore, dec, 1), w.stabValue(c.MeanAfter, dec, 1), w.p(c.P))
}

func (w words) stabReasonNoSignal() string {
	return "no point beyond the limits, no run or pattern among the checks switched on, no EWMA or CUSUM alarm, no trend and no change point"
}

func (w words) stabWarnAutocorr(r1, p float64) string {
	return fmt.Sprintf("Consecutive readings are correlated (lag-1 autocorrelation %s, %s): limits from moving ranges are then too narrow and signal too often; sample less often or model the drift.", w.g3(r1), w.p(p))
}

func (w words) stabWarnGaps(o StabilityOrder) string {
	return fmt.Sprintf("%d %s in the order column (steps more than %d times the usual %s): the process may have been stopped or changed there.", o.GapCount, plural(o.GapCount, "gap", "gaps"), gapFactor, w.stabStep(o.MedianStep, o.Kind))
}

func (w words) stabWarnOutOfOrder(o StabilityOrder) string {
	return fmt.Sprintf("%d rows are out of order in the file; the chart follows column %q.", o.OutOfOrder, o.Column)
}

// stabLeadStable: points on the chart (subgroups when subgroup) of
// readings readings.
func (w words) stabLeadStable(points, readings int, subgroup bool) string {
	if subgroup {
		return fmt.Sprintf("Stable over the %d subgroups (%d readings): no signal", points, readings)
	}
	return fmt.Sprintf("Stable over the %d readings: no signal", readings)
}

func (w words) stabLeadShift(c *ChangeInfo, subgroup bool, dec int, unit string) string {
	dir := "upward"
	if c.Shift < 0 {
		dir = "downward"
	}
	at := fmt.Sprintf("reading %d", c.Position)
	if subgroup {
		at = fmt.Sprintf("subgroup %d (%s)", c.Position, c.Subgroup)
	}
	return fmt.Sprintf("Shift %s from %s (about %s)", dir, at, w.stabSigned(c.Shift, dec, 1, unit))
}

func (w words) stabLeadDrift(slope float64, dec int, unit string) string {
	dir := "upward"
	if slope < 0 {
		dir = "downward"
	}
	return fmt.Sprintf("Drifting %s: about %s per reading", dir, w.stabSigned(slope, dec, 2, unit))
}

func (w words) stabLeadSignals(n int, first *SignalInfo) string {
	s := fmt.Sprintf("Not stable: %d %s", n, plural(n, "signal", "signals"))
	if first != nil {
		s += "; the first: " + first.Text
	}
	return s
}

// stabLeadBaseline joins the lead and the baseline's sentence.
func (w words) stabLeadBaseline(lead, baseline string) string { return lead + "; " + baseline }

// ---- Groups ---------------------------------------------------------------

// grpFig writes a figure of the groups' statement with dec decimals (dec
// < 0: three significant digits), without a negative zero.
func (w words) grpFig(x float64, dec int) string {
	var s string
	if dec < 0 {
		s = w.g3(x)
	} else {
		s = w.fixed(x, dec)
	}
	if strings.HasPrefix(s, "-") && strings.Trim(s[1:], "0.,") == "" {
		s = s[1:]
	}
	return s
}

// grpWithUnit adds the data's unit (as typed) to a figure.
func grpWithUnit(s, unit string) string {
	if unit != "" {
		return s + " " + unit
	}
	return s
}

func (w words) grpTooMany(k, most int) string {
	return fmt.Sprintf("%d groups: at most %d can be compared", k, most)
}

func (w words) grpNotExact() string {
	return "Some readings are not plain decimals as typed (exponent form or too many digits): the rank tests and fences of the groups use binary doubles, so ties and comparisons may differ in the last digit."
}

func (w words) grpLeftOut(n, need int) string {
	return fmt.Sprintf("only %d %s: left out of the tests (at least %d are needed to estimate a group's own spread)", n, plural(n, "reading", "readings"), need)
}

func (w words) grpTooFew(k, need int) string {
	return fmt.Sprintf("%d %s with %d or more readings: at least two are needed to compare groups", k, plural(k, "group", "groups"), need)
}

// grpReason is a group's verdict reason, named by the group's title.
func (w words) grpReason(title, reason string) string { return title + ": " + reason }

func (w words) grpAllMean() string {
	return "every group is roughly symmetric without far-out readings (the verdict's rules, group by group), so the tests of means lead"
}

// grpNoWithin: no within-process sigma for the group title (so no Cpk).
func (w words) grpNoWithin(title string, err error) string {
	var why string
	if f, ok := err.(withinFlat); ok {
		why = w.withinFlat(f.subgroups)
	} else {
		why = "too few readings in time order"
	}
	return fmt.Sprintf("%s: no Cpk, the within-process sigma cannot be estimated (%s); Ppk, from the group's overall SD, is given", title, why)
}

// grpTestName names a test of the section by its code.
func (w words) grpTestName(code string) string {
	return map[string]string{
		"welch-t":        "Welch's t test",
		"welch-anova":    "Welch's ANOVA",
		"anova":          "One-way ANOVA",
		"mann-whitney":   "Mann-Whitney (Wilcoxon rank-sum)",
		"kruskal-wallis": "Kruskal-Wallis",
		"brown-forsythe": "Brown-Forsythe (Levene about the medians)",
		"bartlett":       "Bartlett",
		"f-ratio":        "F test of the variance ratio",
	}[code]
}

// grpTestShort is the test's name in the statement.
func (w words) grpTestShort(code string) string {
	n := w.grpTestName(code)
	if i := strings.Index(n, " ("); i >= 0 {
		return n[:i]
	}
	return n
}

// grpTestMethod says how a test of the section is computed.
func (w words) grpTestMethod(code string) string {
	return map[string]string{
		"welch-t":     "Welch-Satterthwaite degrees of freedom",
		"welch-anova": "F with Welch's fractional denominator degrees of freedom",
		"anova":       "F test, equal variances assumed",
		"bartlett":    "chi-squared; assumes normal data",
		"f-ratio":     "assumes normal data",
	}[code]
}

func (w words) grpMannWhitneyMethod(exact bool) string {
	if exact {
		return "exact distribution (no ties, both groups under 50)"
	}
	return "normal approximation with tie and continuity corrections"
}

func (w words) grpKruskalMethod(tieFactor float64) string {
	return "chi-squared approximation, corrected for ties (factor " + w.g(tieFactor, 4) + ")"
}

func (w words) grpCentreWhy(lead string, k int) string {
	switch {
	case lead == "means" && k == 2:
		return "Welch's t test leads: both groups suit the mean, and Welch's test does not assume equal spreads. The rank test is shown beside it."
	case lead == "means":
		return "Welch's ANOVA leads: every group suits the mean, and Welch's test does not assume equal spreads (the classic one-way ANOVA, which does, is shown too). Kruskal-Wallis is shown beside them."
	case k == 2:
		return "The Mann-Whitney test leads: at least one group is skewed or holds far-out readings, so the comparison rests on ranks, and the Hodges-Lehmann shift gives the difference. Welch's t test is shown beside it."
	}
	return "Kruskal-Wallis leads: at least one group is skewed or holds far-out readings, so the comparison rests on ranks. The tests of means are shown beside it."
}

func (w words) grpLeadMissing() string {
	return "The leading test could not be computed for these data (see the notes); the others are shown."
}

func (w words) grpSpreadWhy(lead string) string {
	if lead == "bartlett" {
		return "Bartlett's test leads: every group looks normal, where it is the most sensitive test of equal spreads. Brown-Forsythe, which does not need normal data, is shown beside it."
	}
	return "The Brown-Forsythe test leads: it compares the spread about each group's median and stays honest for skewed data or far-out readings. Bartlett's test assumes normal data."
}

func (w words) grpMeansPairsWhy(m string, spreadsDiffer, equalN bool) string {
	if m == "tukey-kramer" {
		return "Tukey-Kramer: the groups are of equal size and their spreads are alike, so a pooled SD serves every pair."
	}
	switch {
	case spreadsDiffer && !equalN:
		return "Games-Howell: the spreads differ and the group sizes are unequal, so each pair uses its own SDs."
	case spreadsDiffer:
		return "Games-Howell: the spreads differ, so each pair uses its own SDs."
	}
	return "Games-Howell: the group sizes are unequal, so each pair uses its own SDs rather than a pooled one."
}

func (w words) grpDunnWhy() string {
	return "Dunn's test on the joint ranks of the Kruskal-Wallis test, with Holm's adjustment for the number of pairs; the Hodges-Lehmann shift of each pair gives the difference in the data's unit."
}

func (w words) grpNoShifts(n, k, most int) string {
	return fmt.Sprintf("the Hodges-Lehmann shift of each pair is left out for %s readings in %d groups (it is computed up to %s readings × (groups − 1)); the differences in means are given", w.grouped(n), k, w.grouped(most))
}

// grpMethodFailed: a method of the section could not run (code a
// method.GroupsCode; who the group's title, or "").
func (w words) grpMethodFailed(code method.GroupsCode, who string) string {
	if who != "" {
		who = " (" + who + ")"
	}
	switch code {
	case method.GroupsNoSpread:
		return "not computed: a group has no variation where this test needs some" + who
	case method.GroupsNotFinite:
		return "not computed: the result would not be a finite number for these values" + who
	case method.GroupsTooComplex:
		return "the letters are left out: the pattern of differences would need too many letters"
	}
	return "not computed for these data" + who
}

func (w words) grpNoComparison(k, need int) string {
	return "No comparison: " + w.grpTooFew(k, need) + "."
}

// grpTwo opens the statement for two groups A and B: B minus A is d (the
// Hodges-Lehmann shift when shift, else the difference in means), with
// its interval ci (nil: none), differing clearly or not, by the leading
// test's p.
func (w words) grpTwo(a, b string, differ, shift bool, d float64, ci *Interval, dec int, unit string, p float64) string {
	test, what, in := "Welch's t test", "on average", ""
	if shift {
		test, what, in = "Mann-Whitney test", "in centre", "Hodges-Lehmann shift; "
	}
	iv := ""
	if differ {
		dir := "higher"
		if d < 0 {
			dir = "lower"
		}
		if ci != nil {
			lo, hi := ci.Lo, ci.Hi
			if d < 0 {
				lo, hi = -hi, -lo // the interval of the distance "lower"
			}
			iv = fmt.Sprintf("%s interval %s to %s, ", w.level(ci.Level), w.grpFig(lo, dec), grpWithUnit(w.grpFig(hi, dec), unit))
		}
		return fmt.Sprintf("%s reads %s %s than %s %s (%s%s%s %s)", b, grpWithUnit(w.grpFig(math.Abs(d), dec), unit), dir, a, what, in, iv, test, w.p(p))
	}
	if ci != nil {
		iv = fmt.Sprintf("%s interval %s to %s, ", w.level(ci.Level), w.grpFig(ci.Lo, dec), grpWithUnit(w.grpFig(ci.Hi, dec), unit))
	}
	return fmt.Sprintf("%s and %s show no clear difference in centre: %s minus %s is %s %s (%s%s%s %s)", b, a, b, a, grpWithUnit(w.grpFig(d, dec), unit), what, in, iv, test, w.p(p))
}

// grpMany opens the statement for k groups: the leading test (code) and
// its p, the highest and lowest centre (medians or means); of np pairs nd
// differ clearly (np < 0: no pairwise comparisons).
func (w words) grpMany(k int, code string, medians, differ bool, p float64, hiName string, hi float64, loName string, lo float64, dec int, unit string, nd, np int) string {
	word := "mean"
	if medians {
		word = "median"
	}
	name := w.grpTestShort(code)
	if !differ {
		return fmt.Sprintf("The %d groups show no clear difference in centre (%s %s; %ss from %s to %s)", k, name, w.p(p), word, w.grpFig(lo, dec), grpWithUnit(w.grpFig(hi, dec), unit))
	}
	s := fmt.Sprintf("The %d groups differ in centre (%s %s): %s has the highest %s (%s), %s the lowest (%s)",
		k, name, w.p(p), hiName, word, grpWithUnit(w.grpFig(hi, dec), unit), loName, grpWithUnit(w.grpFig(lo, dec), unit))
	if np >= 0 {
		s += fmt.Sprintf("; %d of %d pairs differ clearly (groups sharing a letter do not)", nd, np)
	}
	return s
}

func (w words) grpCentreFailed() string {
	return "The tests of a difference in centre could not be computed for these data (see the notes)"
}

// grpSpreadPart continues the statement with the spreads of k groups by
// the leading spread test (code, p); ratio is the largest SD over the
// smallest.
func (w words) grpSpreadPart(k int, differ bool, code string, p, ratio float64) string {
	both := "their spreads"
	if k > 2 {
		both = "the spreads"
	}
	if differ {
		return fmt.Sprintf("; %s differ (%s %s; the largest SD is %s times the smallest)", both, w.grpTestShort(code), w.p(p), w.fixed(ratio, 2))
	}
	return fmt.Sprintf("; %s are alike (%s %s)", both, w.grpTestShort(code), w.p(p))
}

// grpOfTolerance: the leading difference is frac of the tolerance.
func (w words) grpOfTolerance(frac float64) string {
	return " The difference is " + w.fixed(100*frac, 0) + " % of the tolerance."
}

func (w words) grpSkipped(k, need int) string {
	return fmt.Sprintf(" %d %s fewer than %d readings %s listed but left out of the tests.", k, plural(k, "group with", "groups with"), need, plural(k, "is", "are"))
}

// ---- Charts ---------------------------------------------------------------

// probPlotPositions names the plotting positions of the probability plot.
const probPlotPositions = "Blom (i-3/8)/(n+1/4)"

// probBandLevelClamped says that the probability plot's envelope is drawn
// at the nearest tabled level, not at the confidence asked for.
func (w words) probBandLevelClamped(asked, used float64) string {
	return fmt.Sprintf("the probability plot's envelope is drawn at %s (the nearest level it is tabled for), not at the %s asked for", w.level(used), w.level(asked))
}

// ---- Guard ----------------------------------------------------------------

// guardOmitted: a part of the report was left out because the value at
// the JSON path at is not finite.
func (w words) guardOmitted(at string) string {
	return fmt.Sprintf("omitted: %s is beyond the range of double-precision numbers for these values", at)
}
