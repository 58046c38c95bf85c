package stats

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
)

// guardFinite is the last line of defence for the promise that a successful
// report holds no NaN or Inf. It walks the whole report by reflection (a
// new section or field is covered without being listed here) and removes
// the smallest optional part that holds a bad value:
//
//   - an optional number (a *float64, or a float64 tagged omitempty) is
//     left out;
//   - otherwise the nearest enclosing pointer (an interval, a test, a
//     section) is left out;
//   - a bad value of a map (a reason's figures) drops that key;
//   - with no optional part above it (the verdict), the verdict's reasons
//     are replaced by one that points to the notes.
//
// Each removal adds a Note naming the JSON path of what was left out
// ("centre.meanCI") and of the bad value ("centre.meanCI.hi"). The
// computations avoid non-finite values; this catches what an extreme input
// (values near 1e308) still pushes out of range.
func guardFinite(rep *Report) {
	g := &guard{rep: rep}
	v := reflect.ValueOf(rep).Elem()
	t := v.Type()
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		name, _, _ := jsonName(f)
		if name == "notes" || !f.IsExported() {
			continue
		}
		if bad, at := g.walk(v.Field(i), name); bad {
			// a required part of the report itself: only the verdict and
			// counts have non-optional numbers
			g.dropTopLevel(name, at)
		}
	}
	rep.Notes = append(rep.Notes, g.notes...)
}

type guard struct {
	rep   *Report
	notes []Note
}

func (g *guard) note(dropped, at string) {
	g.notes = append(g.notes, Note{Field: dropped, Text: wordsFor(g.rep).guardOmitted(at)})
}

// walk looks for NaN or Inf below v, whose JSON path is path. It removes
// what it can; it returns true (with the bad value's path) when v itself
// must be removed by its parent.
func (g *guard) walk(v reflect.Value, path string) (bool, string) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			return true, path
		}
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return false, ""
		}
		if bad, at := g.walk(v.Elem(), path); bad {
			if !v.CanSet() {
				return true, at
			}
			v.Set(reflect.Zero(v.Type()))
			g.note(path, at)
		}
	case reflect.Struct:
		t := v.Type()
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			name, omitempty, _ := jsonName(f)
			p := path
			if !f.Anonymous || f.Tag.Get("json") != "" {
				p = path + "." + name
			}
			fv := v.Field(i)
			bad, at := g.walk(fv, p)
			if !bad {
				continue
			}
			if omitempty && (fv.Kind() == reflect.Float64 || fv.Kind() == reflect.Float32) && fv.CanSet() {
				fv.SetFloat(0) // an optional figure: left out of the JSON
				g.note(p, at)
				continue
			}
			return true, at
		}
	case reflect.Slice, reflect.Array:
		for i := 0; i < v.Len(); i++ {
			if bad, at := g.walk(v.Index(i), path+"["+strconv.Itoa(i)+"]"); bad {
				return true, at
			}
		}
	case reflect.Map:
		var drop []reflect.Value
		it := v.MapRange()
		for it.Next() {
			// map values are not addressable: check a copy, drop the key if bad
			p := path + "." + fmt.Sprint(it.Key().Interface())
			if bad, at := g.walk(it.Value(), p); bad {
				drop = append(drop, it.Key())
				g.note(p, at)
			}
		}
		for _, k := range drop {
			v.SetMapIndex(k, reflect.Value{})
		}
	}
	return false, ""
}

// dropTopLevel handles a bad value in a part of the report that has no
// optional parent.
func (g *guard) dropTopLevel(name, at string) {
	switch name {
	case "verdict":
		g.rep.Verdict.Reasons = []Reason{{Code: "out-of-range", Text: wordsFor(g.rep).reasonOutOfRange()}}
		g.rep.Verdict.Warnings = nil
		g.rep.Verdict.Quote = ""
	case "counts":
		g.rep.Counts.Resolution, g.rep.Counts.Step = 0, 0
	default:
		// input and settings hold the user's own values, checked on the
		// way in: nothing to remove; the note names the fault and
		// ReportJSON refuses to encode the report (CodeInternal)
	}
	g.note(name, at)
}

// jsonName returns the JSON key of a struct field and whether it is
// omitempty.
func jsonName(f reflect.StructField) (name string, omitempty, tagged bool) {
	tag, ok := f.Tag.Lookup("json")
	name, opts, _ := strings.Cut(tag, ",")
	if name == "" {
		name = f.Name
	}
	return name, strings.Contains(","+opts+",", ",omitempty,"), ok
}
