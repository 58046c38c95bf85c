package stats

import (
	"fmt"
	"math"
	"reflect"
	"strconv"
	"strings"
	"sync"
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
//
// The walk runs on every report, so it is kept cheap: each type's fields
// that can hold a number are listed once (typePlan) and parts without one
// are not visited, and a JSON path is spelled out only when a bad value is
// found (the walk keeps the path as a stack of segments).
func guardFinite(rep *Report) {
	g := &guard{rep: rep}
	v := reflect.ValueOf(rep).Elem()
	for _, f := range planOf(v.Type()) {
		if f.name == "notes" {
			continue
		}
		g.push(pathSeg{name: f.name, index: -1})
		if bad, at := g.walk(v.Field(f.index)); bad {
			// a required part of the report itself: only the verdict and
			// counts have non-optional numbers
			g.dropTopLevel(f.name, at)
		}
		g.pop()
	}
	rep.Notes = append(rep.Notes, g.notes...)
}

type guard struct {
	rep   *Report
	notes []Note
	stack []pathSeg // the JSON path of the value being walked
}

// pathSeg is one step of a JSON path: a key (".name") or an index ("[3]").
type pathSeg struct {
	name  string
	index int // -1 for a key
}

func (g *guard) push(s pathSeg) { g.stack = append(g.stack, s) }
func (g *guard) pop()           { g.stack = g.stack[:len(g.stack)-1] }

// path spells out the current JSON path ("centre.meanCI.hi").
func (g *guard) path() string {
	var b strings.Builder
	for i, s := range g.stack {
		if s.index >= 0 {
			b.WriteString("[" + strconv.Itoa(s.index) + "]")
			continue
		}
		if i > 0 {
			b.WriteByte('.')
		}
		b.WriteString(s.name)
	}
	return b.String()
}

func (g *guard) note(dropped, at string) {
	g.notes = append(g.notes, Note{Field: dropped, Text: wordsFor(g.rep).guardOmitted(at)})
}

// walk looks for NaN or Inf below v, whose JSON path is the guard's stack.
// It removes what it can; it returns true (with the bad value's path) when
// v itself must be removed by its parent.
func (g *guard) walk(v reflect.Value) (bool, string) {
	switch v.Kind() {
	case reflect.Float32, reflect.Float64:
		if f := v.Float(); math.IsNaN(f) || math.IsInf(f, 0) {
			return true, g.path()
		}
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			return false, ""
		}
		if bad, at := g.walk(v.Elem()); bad {
			if !v.CanSet() {
				return true, at
			}
			v.Set(reflect.Zero(v.Type()))
			g.note(g.path(), at)
		}
	case reflect.Struct:
		return g.walkStruct(v, planOf(v.Type()))
	case reflect.Slice, reflect.Array:
		if v.Type() == floatsType {
			// the common long case (chart coordinates): no reflection per element
			for i, f := range v.Interface().([]float64) {
				if math.IsNaN(f) || math.IsInf(f, 0) {
					g.push(pathSeg{index: i})
					at := g.path()
					g.pop()
					return true, at
				}
			}
			return false, ""
		}
		et := v.Type().Elem()
		if !holdsNumber(et) {
			return false, ""
		}
		var plan []fieldPlan
		if et.Kind() == reflect.Struct {
			plan = planOf(et) // once for the list, not per element (the long point lists)
		}
		for i := 0; i < v.Len(); i++ {
			g.push(pathSeg{index: i})
			var bad bool
			var at string
			if plan != nil {
				bad, at = g.walkStruct(v.Index(i), plan)
			} else {
				bad, at = g.walk(v.Index(i))
			}
			g.pop()
			if bad {
				return true, at
			}
		}
	case reflect.Map:
		if !holdsNumber(v.Type().Elem()) {
			return false, ""
		}
		var drop []reflect.Value
		it := v.MapRange()
		for it.Next() {
			// map values are not addressable: check a copy, drop the key if bad
			g.push(pathSeg{name: fmt.Sprint(it.Key().Interface()), index: -1})
			if bad, at := g.walk(it.Value()); bad {
				drop = append(drop, it.Key())
				g.note(g.path(), at)
			}
			g.pop()
		}
		for _, k := range drop {
			v.SetMapIndex(k, reflect.Value{})
		}
	}
	return false, ""
}

// walkStruct walks the fields of struct v listed by plan (planOf of its
// type), as walk does.
func (g *guard) walkStruct(v reflect.Value, plan []fieldPlan) (bool, string) {
	for _, f := range plan {
		if f.flat {
			if bad, at := g.walk(v.Field(f.index)); bad {
				return true, at
			}
			continue
		}
		g.push(pathSeg{name: f.name, index: -1})
		fv := v.Field(f.index)
		bad, at := g.walk(fv)
		if bad && f.omitempty && (fv.Kind() == reflect.Float64 || fv.Kind() == reflect.Float32) && fv.CanSet() {
			fv.SetFloat(0) // an optional figure: left out of the JSON
			g.note(g.path(), at)
			bad = false
		}
		g.pop()
		if bad {
			return true, at
		}
	}
	return false, ""
}

// fieldPlan is one exported struct field that can hold a number.
type fieldPlan struct {
	index     int
	name      string // JSON key
	omitempty bool
	flat      bool // an embedded struct without a JSON tag: its fields are the parent's
}

var floatsType = reflect.TypeOf([]float64(nil))

var plans sync.Map // reflect.Type -> []fieldPlan

// planOf lists, once per struct type, the exported fields that can hold a
// number (holdsNumber).
func planOf(t reflect.Type) []fieldPlan {
	if p, ok := plans.Load(t); ok {
		return p.([]fieldPlan)
	}
	var out []fieldPlan
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if !f.IsExported() || !holdsNumber(f.Type) {
			continue
		}
		name, omitempty, _ := jsonName(f)
		out = append(out, fieldPlan{index: i, name: name, omitempty: omitempty,
			flat: f.Anonymous && f.Tag.Get("json") == ""})
	}
	plans.Store(t, out)
	return out
}

var holds sync.Map // reflect.Type -> bool

// holdsNumber says whether a value of type t can hold a floating-point
// number anywhere below it. An interface can hold anything; a type met
// again while it is being decided (a recursive type) counts as holding one.
func holdsNumber(t reflect.Type) bool {
	if h, ok := holds.Load(t); ok {
		return h.(bool)
	}
	holds.Store(t, true) // while deciding: a recursive type is walked
	h := false
	switch t.Kind() {
	case reflect.Float32, reflect.Float64, reflect.Interface:
		h = true
	case reflect.Pointer, reflect.Slice, reflect.Array, reflect.Map:
		h = holdsNumber(t.Elem())
	case reflect.Struct:
		for i := 0; i < t.NumField(); i++ {
			if f := t.Field(i); f.IsExported() && holdsNumber(f.Type) {
				h = true
				break
			}
		}
	}
	holds.Store(t, h)
	return h
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
