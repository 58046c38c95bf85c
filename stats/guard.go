package stats

import (
	"fmt"
	"math"
	"reflect"
)

// guardFinite is the last line of defence for the promise that a successful
// report holds no NaN or Inf: any section that still holds one is removed
// and a Note says so. The computations avoid them; this catches what an
// extreme input (values near 1e308) still pushes out of range.
func guardFinite(rep *Report) {
	drop := func(field string, bad string) {
		rep.Notes = append(rep.Notes, Note{Field: field, Text: fmt.Sprintf("omitted: %s is beyond the range of double-precision numbers for these values", bad)})
	}
	// Each optional section is checked whole and removed whole.
	sections := []struct {
		name  string
		v     any
		clear func()
	}{
		{"centre", rep.Centre, func() { rep.Centre = nil }},
		{"spread", rep.Spread, func() { rep.Spread = nil }},
		{"quantiles", rep.Quantile, func() { rep.Quantile = nil }},
		{"shape", rep.Shape, func() { rep.Shape = nil }},
		{"suspects", rep.Suspects, func() { rep.Suspects = nil }},
		{"target", rep.Target, func() { rep.Target = nil }},
		{"charts", rep.Charts, func() { rep.Charts = nil }},
	}
	for _, sec := range sections {
		if p, bad := nonFinite(reflect.ValueOf(sec.v), sec.name); bad {
			sec.clear()
			drop(sec.name, p)
		}
	}
	if p, bad := nonFinite(reflect.ValueOf(&rep.Verdict), "verdict"); bad {
		rep.Verdict.Reasons = []Reason{{Code: "out-of-range", Text: "The values are too large or too small for the verdict's figures; see the notes."}}
		rep.Verdict.Warnings = nil
		drop("verdict", p)
	}
	if p, bad := nonFinite(reflect.ValueOf(&rep.Counts), "counts"); bad {
		rep.Counts.Resolution, rep.Counts.Step = 0, 0
		drop("counts", p)
	}
}

// nonFinite reports the path of the first NaN or Inf inside v, path being
// v's own. The path is built only on the way back from a bad value: the
// report holds thousands of chart points, and a string per point would be
// a megabyte of garbage for every report.
func nonFinite(v reflect.Value, path string) (string, bool) {
	if sub, bad := nonFiniteBelow(v); bad {
		return path + sub, true
	}
	return "", false
}

// nonFiniteBelow reports the path below v (".Field", "[3]", ".key") of the
// first NaN or Inf inside v.
func nonFiniteBelow(v reflect.Value) (string, bool) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		if math.IsNaN(f) || math.IsInf(f, 0) {
			return "", true
		}
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			return nonFiniteBelow(v.Elem())
		}
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < v.NumField(); i++ {
			if !t.Field(i).IsExported() {
				continue
			}
			if p, bad := nonFiniteBelow(v.Field(i)); bad {
				return "." + t.Field(i).Name + p, true
			}
		}
	case reflect.Slice, reflect.Array:
		for i := 0; i < v.Len(); i++ {
			if p, bad := nonFiniteBelow(v.Index(i)); bad {
				return fmt.Sprintf("[%d]", i) + p, true
			}
		}
	case reflect.Map:
		it := v.MapRange()
		for it.Next() {
			if p, bad := nonFiniteBelow(it.Value()); bad {
				return "." + fmt.Sprint(it.Key().Interface()) + p, true
			}
		}
	}
	return "", false
}
