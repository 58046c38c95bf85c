package share

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
)

// Generated data sets for the property tests: invented shapes of what a
// shop floor pastes or exports (no check values come from them: the
// property is that every byte comes back).

var headerNames = []string{
	"Weight (g)", "Torque (N·m)", "Bore Ø (mm)", "Temperatur (°C)", "Länge [mm]",
	"Seal strength, N", "Cycle time/s", "Messwert", "重量 (g)", "value", "",
}

var missingMarks = []string{"", "NA", "N/A", "n/a", "-", "--", "?", "#N/A", "#VALUE!", "NaN", "null"}

// genCell writes one reading with dec decimals around centre, sometimes in
// an irregular form.
func genCell(rng *rand.Rand, centre, sd float64, dec int, mark byte, irregular float64) string {
	v := centre + sd*rng.NormFloat64()
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if mark == ',' {
		s = strings.Replace(s, ".", ",", 1)
	}
	if rng.Float64() >= irregular {
		return s
	}
	switch rng.IntN(12) {
	case 0:
		return missingMarks[rng.IntN(len(missingMarks))]
	case 1:
		return strconv.FormatFloat(v, 'e', rng.IntN(4), 64) // exponent form
	case 2:
		return " " + s // odd spacing
	case 3:
		return s + " "
	case 4:
		return "+" + s
	case 5:
		return strings.TrimRight(strings.TrimRight(s, "0"), ".,") // trailing zeros dropped by a spreadsheet
	case 6:
		return s + "0" // one more decimal
	case 7:
		return "−" + strings.TrimPrefix(s, "-") // Unicode minus
	case 8:
		return "0" + s // leading zero
	case 9:
		return "\"" + s + "\"" // quoted
	case 10:
		return s + " g" // unit in the cell
	default:
		return "-0" + string(mark) + strings.Repeat("0", max(dec, 1)) // negative zero
	}
}

// genText makes one invented data set as text.
func genText(rng *rand.Rand) string {
	if rng.IntN(20) == 0 { // arbitrary bytes, any encoding
		b := make([]byte, rng.IntN(300))
		for i := range b {
			b[i] = byte(rng.IntN(256))
		}
		return string(b)
	}
	n := rng.IntN(300)
	if rng.IntN(10) == 0 {
		n = rng.IntN(3000)
	}
	type col struct {
		kind   int // 0 reading, 1 label, 2 time, 3 sequence, 4 subgroup
		dec    int
		mark   byte
		centre float64
		sd     float64
	}
	ncol := 1
	if rng.IntN(2) == 0 {
		ncol = 1 + rng.IntN(5)
	}
	comma := rng.IntN(3) == 0
	seps := []string{"\t", ";", " ", "|"}
	if !comma {
		seps = append(seps, ",", ",")
	}
	sep := seps[rng.IntN(len(seps))]
	if rng.IntN(3) == 0 {
		sep = "\t"
	}
	cols := make([]col, ncol)
	for j := range cols {
		c := &cols[j]
		if j > 0 || ncol > 1 && rng.IntN(2) == 0 {
			c.kind = rng.IntN(5)
		}
		c.dec = rng.IntN(7)
		c.mark = '.'
		if comma {
			c.mark = ','
		}
		c.centre = []float64{5, 0, -3.2, 1234.5, 0.004, 1e6}[rng.IntN(6)]
		c.sd = math.Pow(10, -float64(c.dec)) * float64(1+rng.IntN(40))
	}
	irregular := []float64{0, 0, 0.01, 0.1, 0.5}[rng.IntN(5)]
	eol := []string{"\n", "\n", "\r\n", "\r"}[rng.IntN(4)]
	var b strings.Builder
	if rng.IntN(10) == 0 {
		b.WriteString("\ufeff")
	}
	if rng.IntN(6) == 0 {
		b.WriteString("Exported by line 4 tester, 2026-11-16" + eol + eol)
	}
	if rng.IntN(3) > 0 {
		for j := range cols {
			if j > 0 {
				b.WriteString(sep)
			}
			b.WriteString(headerNames[rng.IntN(len(headerNames))])
		}
		b.WriteString(eol)
	}
	for i := 0; i < n; i++ {
		if irregular > 0 && rng.Float64() < irregular/10 {
			b.WriteString(eol) // an empty line
			continue
		}
		ncells := ncol
		if irregular > 0 && rng.Float64() < irregular/5 {
			ncells = rng.IntN(ncol + 2) // short or long row
		}
		for j := 0; j < ncells; j++ {
			if j > 0 {
				b.WriteString(sep)
			}
			c := cols[j%ncol]
			switch c.kind {
			case 0:
				b.WriteString(genCell(rng, c.centre, c.sd, c.dec, c.mark, irregular))
			case 1:
				b.WriteString([]string{"A", "B", "Line 2", "Schicht C", "ß"}[rng.IntN(5)])
			case 2:
				fmt.Fprintf(&b, "2026-11-16 %02d:%02d", 6+i/60%18, i%60)
			case 3:
				b.WriteString(strconv.Itoa(i + 1))
			case 4:
				b.WriteString(strconv.Itoa(i/5 + 1))
			}
		}
		if i < n-1 || rng.IntN(2) == 0 {
			b.WriteString(eol)
		}
	}
	if rng.IntN(8) == 0 {
		b.WriteString(eol + eol) // empty lines at the end
	}
	if rng.IntN(15) == 0 {
		b.WriteString("\xe9t\xe9 \xb0C") // Latin-1 bytes
	}
	if rng.IntN(15) == 0 {
		b.WriteString("\n5.1\r\n") // mixed line ends
	}
	if b.Len() == 0 {
		b.WriteString("5.00")
	}
	return b.String()
}

func ptr(v float64) *float64 { return &v }

// genPayload makes a payload around text with random settings.
func genPayload(rng *rand.Rand, text string) Payload {
	p := Payload{Text: text}
	p.Created = rng.Int64() - math.MaxInt64/2
	if rng.IntN(2) == 0 {
		p.Created = 1795000000 + rng.Int64N(1e8)
	}
	if rng.IntN(2) == 0 {
		p.Name = []string{"fill-weights.csv", "Drehmoment Linie 4.tsv", "data", "ü.txt"}[rng.IntN(4)]
	}
	names := []string{"", "", "Weight (g)", "Torque (N·m)", "Line", "Time"}
	p.Value, p.Order, p.Subgroup, p.Group = names[rng.IntN(6)], names[rng.IntN(6)], names[rng.IntN(6)], names[rng.IntN(6)]
	o := &p.Options
	for _, f := range []**float64{&o.Target, &o.LSL, &o.USL} {
		if rng.IntN(2) == 0 {
			*f = ptr(math.Round(rng.NormFloat64()*1e4) / 1e3)
		}
	}
	if rng.IntN(2) == 0 {
		o.Confidence = []float64{0.9, 0.95, 0.99, 2, 0.999}[rng.IntN(5)]
	}
	o.Quantile = []string{"", "hf7", "hf6", "tukey"}[rng.IntN(4)]
	o.PopulationSD = rng.IntN(2) == 0
	o.Unit = []string{"", "g", "N·m", "µm"}[rng.IntN(4)]
	o.DecimalMark = []string{"", "comma", "point"}[rng.IntN(3)]
	o.WithinSigma = []string{"", "moving-range", "pooled-sd"}[rng.IntN(3)]
	if k := rng.IntN(6); k > 0 {
		for i := 0; i < k; i++ {
			o.Exclude = append(o.Exclude, rng.IntN(400)+1)
		}
		if rng.IntN(5) == 0 {
			o.Exclude = append(o.Exclude, math.MinInt64, math.MaxInt64, -7, 0)
		}
		if rng.IntN(2) == 0 {
			o.ExcludeReasons = map[int]string{}
			for _, r := range o.Exclude[:rng.IntN(len(o.Exclude))+1] {
				o.ExcludeReasons[r] = []string{"", "gauge dropped", "Teil beschädigt", "re-measured: see row 40"}[rng.IntN(4)]
			}
		}
	}
	return p
}

// readings makes n readings about 5.00 g with SD 0.03 g typed to 0.01, one
// a line under a header: a column of fill weights as pasted.
func readings(n int, seed uint64) string {
	rng := rand.New(rand.NewPCG(seed, 1))
	var b strings.Builder
	b.WriteString("Weight (g)\n")
	for i := 0; i < n; i++ {
		b.WriteString(strconv.FormatFloat(5+0.03*rng.NormFloat64(), 'f', 2, 64))
		b.WriteByte('\n')
	}
	return b.String()
}
