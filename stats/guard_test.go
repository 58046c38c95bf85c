package stats

import (
	"math"
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
