package ingest

import "strings"

// Date and time cells. Accepted forms (time part optional everywhere):
//
//	ISO 8601 (ISO 8601-1:2019): 2026-03-01, 2026-03-01T08:15, 2026-03-01 08:15:30.5, with Z or +01:00
//	2026/03/01 08:15
//	day-first with dots: 01.03.2026 08:15 (the usual European form)
//	slashes or dashes: 01/03/2026 8:15 PM, 01-03-2026: day-first or month-first,
//	    decided per column from cells where one part exceeds 12, else ambiguous
//	time of day alone: 08:15, 08:15:30
//
// Values are seconds since 1970-01-01 00:00 (times without an offset are
// taken as they are, without a time zone); a time of day alone counts from
// midnight.

// dateForm says how a cell was written.
type dateForm uint8

const (
	dfNone  dateForm = iota
	dfISO            // year first
	dfDot            // day.month.year
	dfSlash          // a/b/year: order unknown from this cell alone
	dfClock          // time of day only
)

// dateCell is a parsed date/time cell before the day/month order is applied.
type dateCell struct {
	form    dateForm
	y, a, b int // for dfSlash: a and b are the first two parts
	secs    float64
	offset  int // seconds east of UTC, applied already for ISO
}

// parseDate parses a trimmed cell. For dfSlash the caller resolves a and b.
func parseDate(s string) (dateCell, bool) {
	var c dateCell
	if len(s) < 4 || len(s) > 40 {
		return c, false
	}
	date, clock := s, ""
	if k := strings.IndexAny(s, "T "); k > 0 {
		date, clock = s[:k], strings.TrimSpace(s[k+1:])
	}
	if strings.IndexByte(date, ':') >= 0 && clock == "" { // time of day alone
		secs, ok := parseClock(date)
		if !ok {
			return c, false
		}
		c.form, c.secs = dfClock, secs
		return c, true
	}
	var parts [3]int
	var lens [3]int
	sep := byte(0)
	n := 0
	i := 0
	for n < 3 {
		j := i
		v := 0
		for j < len(date) && date[j]-'0' < 10 && j-i < 5 {
			v = v*10 + int(date[j]-'0')
			j++
		}
		if j == i {
			return c, false
		}
		parts[n], lens[n] = v, j-i
		n++
		if j == len(date) {
			break
		}
		if n == 3 {
			return c, false
		}
		if sep == 0 {
			sep = date[j]
			if sep != '-' && sep != '/' && sep != '.' {
				return c, false
			}
		} else if date[j] != sep {
			return c, false
		}
		i = j + 1
	}
	if n != 3 {
		return c, false
	}
	var secs float64
	if clock != "" {
		var ok bool
		secs, ok = parseClock(clock)
		if !ok {
			return c, false
		}
	}
	switch {
	case lens[0] == 4 && (sep == '-' || sep == '/'):
		c.form, c.y, c.a, c.b = dfISO, parts[0], parts[1], parts[2]
		if !validDate(c.y, c.a, c.b) {
			return c, false
		}
		c.secs = float64(daysFromCivil(c.y, c.a, c.b))*86400 + secs
	case lens[2] == 4 || lens[2] == 2:
		y := parts[2]
		if lens[2] == 2 {
			y += 2000
		}
		if lens[0] > 2 || lens[1] > 2 {
			return c, false
		}
		c.y, c.a, c.b, c.secs = y, parts[0], parts[1], secs
		if sep == '.' {
			c.form = dfDot
			if !validDate(y, c.b, c.a) {
				return c, false
			}
			c.secs += float64(daysFromCivil(y, c.b, c.a)) * 86400
		} else {
			c.form = dfSlash
			if !validDate(y, c.b, c.a) && !validDate(y, c.a, c.b) {
				return c, false
			}
		}
	default:
		return c, false
	}
	return c, true
}

// resolve gives the seconds of a slash date under the chosen order.
func (c dateCell) resolve(dayFirst bool) (float64, bool) {
	if c.form != dfSlash {
		return c.secs, true
	}
	d, m := c.a, c.b
	if !dayFirst {
		d, m = c.b, c.a
	}
	if !validDate(c.y, m, d) {
		return 0, false
	}
	return c.secs + float64(daysFromCivil(c.y, m, d))*86400, true
}

// parseClock reads HH:MM[:SS[.fff]] with optional AM/PM and an optional ISO
// offset (Z, +hh:mm, -hh:mm), returning seconds (offset applied).
func parseClock(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	pm, am := false, false
	if u := strings.ToUpper(s); strings.HasSuffix(u, "PM") || strings.HasSuffix(u, "AM") {
		pm, am = strings.HasSuffix(u, "PM"), strings.HasSuffix(u, "AM")
		s = strings.TrimSpace(s[:len(s)-2])
	}
	offset := 0
	if strings.HasSuffix(s, "Z") {
		s = s[:len(s)-1]
	} else if k := strings.LastIndexAny(s, "+-"); k > 0 {
		oh, om, ok := hhmm(s[k+1:])
		if !ok {
			return 0, false
		}
		offset = oh*3600 + om*60
		if s[k] == '-' {
			offset = -offset
		}
		s = s[:k]
	}
	var f [3]float64
	n := 0
	for _, part := range strings.SplitN(s, ":", 3) {
		if part == "" || len(part) > 12 {
			return 0, false
		}
		v, frac, dot := 0.0, 0.0, false
		scale := 1.0
		for i := 0; i < len(part); i++ {
			ch := part[i]
			switch {
			case ch-'0' < 10 && !dot:
				v = v*10 + float64(ch-'0')
			case ch-'0' < 10:
				scale /= 10
				frac += float64(ch-'0') * scale
			case (ch == '.' || ch == ',') && n == 2 && !dot:
				dot = true
			default:
				return 0, false
			}
		}
		f[n] = v + frac
		n++
	}
	if n < 2 || f[1] >= 60 || f[2] >= 61 {
		return 0, false
	}
	h := f[0]
	if am || pm {
		if h < 1 || h > 12 {
			return 0, false
		}
		if h == 12 {
			h = 0
		}
		if pm {
			h += 12
		}
	}
	if h > 24 {
		return 0, false
	}
	return h*3600 + f[1]*60 + f[2] - float64(offset), true
}

func hhmm(s string) (int, int, bool) {
	s = strings.ReplaceAll(s, ":", "")
	if len(s) != 2 && len(s) != 4 {
		return 0, 0, false
	}
	v := 0
	for i := 0; i < len(s); i++ {
		if s[i]-'0' >= 10 {
			return 0, 0, false
		}
		v = v*10 + int(s[i]-'0')
	}
	if len(s) == 2 {
		return v, 0, v <= 14
	}
	return v / 100, v % 100, v/100 <= 14 && v%100 < 60
}

func validDate(y, m, d int) bool {
	if m < 1 || m > 12 || d < 1 || y < 1000 || y > 9999 {
		return false
	}
	dim := [...]int{31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31}[m-1]
	if m == 2 && (y%4 == 0 && (y%100 != 0 || y%400 == 0)) {
		dim = 29
	}
	return d <= dim
}

// daysFromCivil counts days since 1970-01-01 in the proleptic Gregorian
// calendar (Hinnant 2013, "chrono-Compatible Low-Level Date Algorithms").
func daysFromCivil(y, m, d int) int {
	if m <= 2 {
		y--
	}
	era := y / 400
	if y < 0 {
		era = (y - 399) / 400
	}
	yoe := y - era*400
	mp := (m + 9) % 12
	doy := (153*mp+2)/5 + d - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return era*146097 + doe - 719468
}
