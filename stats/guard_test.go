package stats

import (
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"
)

// TestGuardFiniteDropsSections: a section holding a NaN or Inf is removed
// whole and a note names the field; sections without one stay.
func TestGuardFiniteDropsSections(t *testing.T) {
	rep := &Report{
		Centre: &Centre{Mean: math.NaN()},
		Spread: &Spread{SD: 1},
		Charts: &Charts{Series: []SeriesPt{{Y: 1}, {Y: math.Inf(1)}}},
	}
	guardFinite(rep)
	if rep.Centre != nil || rep.Charts != nil {
		t.Errorf("sections with NaN/Inf kept: centre %v, charts %v", rep.Centre, rep.Charts)
	}
	if rep.Spread == nil {
		t.Error("a finite section was removed")
	}
	fields := map[string]bool{}
	for _, n := range rep.Notes {
		fields[n.Field] = true
	}
	if !fields["centre"] || !fields["charts"] || len(rep.Notes) != 2 {
		t.Errorf("notes = %+v, want one for centre and one for charts", rep.Notes)
	}
}

// TestGuardCoversEveryField puts a NaN, one at a time, into every number of
// a report that has every section, and checks that the guard removes it
// (the report encodes as JSON), names its JSON path in a note, and leaves
// the rest of the report. The walk is by reflection over the report's
// values, so a section added later is covered as long as the full report
// below holds it: the test fails when a top-level key of Report is absent
// from that report.
func TestGuardCoversEveryField(t *testing.T) {
	lsl, usl, target := 4.9, 5.3, 5.1
	base, err := Analyze(Request{Text: guardFullData, Value: "Weight", Group: "Line", Options: Options{Target: &target, LSL: &lsl, USL: &usl, PopulationSD: true}})
	if err != nil {
		t.Fatal(err)
	}
	// every top-level key holds something
	rt := reflect.TypeOf(Report{})
	rv := reflect.ValueOf(base).Elem()
	for i := 0; i < rt.NumField(); i++ {
		if name, _, _ := jsonName(rt.Field(i)); rv.Field(i).IsZero() && name != "notes" {
			t.Errorf("the full report has no %q: extend guardFullData or its options so the guard test reaches it", name)
		}
	}
	enc, _ := json.Marshal(base)
	paths := floatPaths(reflect.ValueOf(base).Elem(), "")
	if len(paths) < 50 {
		t.Fatalf("only %d number paths found in the full report", len(paths))
	}
	for _, p := range paths {
		if strings.HasPrefix(p.path, "settings.") || strings.HasPrefix(p.path, "input.") {
			continue // the user's own settings, refused at the entry when not finite (checkOptions)
		}
		var rep Report
		if err := json.Unmarshal(enc, &rep); err != nil {
			t.Fatal(err)
		}
		setAt(reflect.ValueOf(&rep).Elem(), p, math.NaN())
		guardFinite(&rep)
		if _, err := json.Marshal(&rep); err != nil {
			t.Errorf("NaN at %s: report still does not encode: %v", p.path, err)
			continue
		}
		named := false
		for _, n := range rep.Notes {
			if strings.Contains(n.Text, p.path+" ") && strings.HasPrefix(p.path, n.Field) {
				named = true
			}
		}
		if !named {
			t.Errorf("NaN at %s: no note names it and a prefix of it (notes %v)", p.path, rep.Notes[max(0, len(rep.Notes)-2):])
		}
		if rep.Verdict.Caution == "" || rep.Input.Fingerprint == "" {
			t.Errorf("NaN at %s removed required parts of the report", p.path)
		}
	}
}

// TestGuardKeepsMedianWhenIntervalOverflows: a bad interval takes only the
// interval, not the card (values near 1e308 once removed the whole centre).
func TestGuardKeepsMedianWhenIntervalOverflows(t *testing.T) {
	rep := &Report{Centre: &Centre{Mean: 1, Median: 2, MeanCI: &Interval{Lo: math.Inf(-1), Hi: math.Inf(1)}}}
	guardFinite(rep)
	if rep.Centre == nil || rep.Centre.Median != 2 || rep.Centre.MeanCI != nil {
		t.Fatalf("centre = %+v, want the median kept and the interval left out", rep.Centre)
	}
	if len(rep.Notes) != 1 || rep.Notes[0].Field != "centre.meanCI" || !strings.Contains(rep.Notes[0].Text, "centre.meanCI.lo") {
		t.Errorf("notes = %+v, want one naming centre.meanCI (.lo)", rep.Notes)
	}
}

// guardFullData: 40 readings with two far values, so every rule flags
// something and every section is filled, in three lines (A, B, C) for the
// groups section.
const guardFullData = "Line\tWeight (g)\nA\t5.11\nB\t5.09\nC\t5.12\nA\t5.10\nB\t5.08\nC\t5.13\nA\t5.10\nB\t5.11\nC\t5.09\nA\t5.12\nB\t5.10\nC\t5.07\nA\t5.11\nB\t5.14\nC\t5.10\nA\t5.09\nB\t5.12\nC\t5.11\nA\t5.10\nB\t5.08\nC\t5.55\nA\t5.10\nB\t5.12\nC\t5.09\nA\t5.11\nB\t5.10\nC\t5.13\nA\t5.08\nB\t5.10\nC\t5.11\nA\t4.70\nB\t5.12\nC\t5.09\nA\t5.10\nB\t5.11\nC\t5.10\nA\t5.12\nB\t5.09\nC\t5.10\nA\t5.11\n"

type floatPath struct {
	path   string
	idx    []int  // field/element indices from the report down
	mapKey string // set when the last step is a map key
}

// floatPaths lists every float below v with its JSON path; of each slice
// only the first and last elements are visited (the rest are alike), of
// each map one key.
func floatPaths(v reflect.Value, path string) []floatPath {
	var out []floatPath
	var rec func(v reflect.Value, path string, idx []int)
	rec = func(v reflect.Value, path string, idx []int) {
		switch v.Kind() {
		case reflect.Float64:
			out = append(out, floatPath{path: strings.TrimPrefix(path, "."), idx: slices.Clone(idx)})
		case reflect.Pointer:
			if !v.IsNil() {
				rec(v.Elem(), path, idx)
			}
		case reflect.Struct:
			for i := 0; i < v.NumField(); i++ {
				f := v.Type().Field(i)
				if !f.IsExported() {
					continue
				}
				name, _, _ := jsonName(f)
				if path == "" && name == "notes" {
					continue
				}
				p := path + "." + name
				if f.Anonymous && f.Tag.Get("json") == "" {
					p = path
				}
				rec(v.Field(i), p, append(idx, i))
			}
		case reflect.Slice, reflect.Array:
			for _, i := range slices.Compact([]int{0, v.Len() - 1}) {
				if i >= 0 && i < v.Len() {
					rec(v.Index(i), fmt.Sprintf("%s[%d]", path, i), append(idx, i))
				}
			}
		case reflect.Map:
			if keys := v.MapKeys(); len(keys) > 0 {
				k := keys[0].String()
				out = append(out, floatPath{path: strings.TrimPrefix(path+"."+k, "."), idx: slices.Clone(idx), mapKey: k})
			}
		}
	}
	rec(v, path, nil)
	return out
}

// setAt sets the float at p below v.
func setAt(v reflect.Value, p floatPath, x float64) {
	for _, i := range p.idx {
		for v.Kind() == reflect.Pointer {
			v = v.Elem()
		}
		if v.Kind() == reflect.Struct {
			v = v.Field(i)
		} else {
			v = v.Index(i)
		}
	}
	for v.Kind() == reflect.Pointer {
		v = v.Elem()
	}
	if p.mapKey != "" {
		v.SetMapIndex(reflect.ValueOf(p.mapKey), reflect.ValueOf(x))
		return
	}
	v.SetFloat(x)
}
