package method

import "testing"

// Check values: R 4.2.2 via testdata/rref/groups.R (bartlett.test,
// var.test; Brown-Forsythe written out as the ANOVA of |x - median|).
func TestGrpSpreadAgainstR(t *testing.T) {
	sets, ref := grpLoadSets(t), grpLoadRef(t)
	for _, name := range grpSetNames(sets) {
		s, r := sets[name], ref[name]
		bf, err := BrownForsythe(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" BF F", bf.F, grpRef(t, r, "bf.F"), 1e-9)
		grpNear(t, name+" BF p", bf.P, grpRef(t, r, "bf.p"), 1e-9)
		b, err := Bartlett(s.f)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" Bartlett", b.K2, grpRef(t, r, "bartlett.K2"), 1e-9)
		grpNear(t, name+" Bartlett p", b.P, grpRef(t, r, "bartlett.p"), 1e-9)
		sd, err := SDRatio(s.f, 0.95)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		grpNear(t, name+" SD ratio", sd.Ratio, grpRef(t, r, "sdratio.ratio"), 1e-12)
		if float64(sd.Largest) != grpRef(t, r, "sdratio.largest") || float64(sd.Smallest) != grpRef(t, r, "sdratio.smallest") {
			t.Errorf("%s: largest %d smallest %d", name, sd.Largest, sd.Smallest)
		}
		if sd.HasCI != (len(s.f) == 2) {
			t.Errorf("%s: HasCI %v", name, sd.HasCI)
		}
		if !sd.HasCI {
			continue
		}
		grpNear(t, name+" SD ratio lo", sd.Lo, grpRef(t, r, "sdratio.lo"), 1e-9)
		grpNear(t, name+" SD ratio hi", sd.Hi, grpRef(t, r, "sdratio.hi"), 1e-9)
		grpNear(t, name+" var F", sd.F, grpRef(t, r, "sdratio.F"), 1e-12)
		grpNear(t, name+" var p", sd.P, grpRef(t, r, "sdratio.p"), 1e-9)
	}
}
