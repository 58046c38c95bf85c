package stats

import (
	"math"
	"testing"

	"lotlens/stats/method"
)

// Blom positions and the order-statistic band: for n = 5 the middle point
// sits at z = 0 (definition), the band contains the line, and the Beta
// quantiles agree with R 4.2.2: qbeta(0.025, 3, 3) = 0.14663280,
// qbeta(0.975, 3, 3) = 0.85336720.
func TestProbPlotSmall(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5}
	pp := probPlot(x, 3, math.Sqrt(2.5), 0.95, 100)
	if pp.Positions != "Blom (i-3/8)/(n+1/4)" || len(pp.Points) != 5 || len(pp.Band) != 5 {
		t.Fatalf("%+v", pp)
	}
	if pp.Points[2].Z != 0 || pp.Points[0].Z != -pp.Points[4].Z {
		t.Errorf("positions %+v", pp.Points)
	}
	// Blom's first position: Φ⁻¹((1-3/8)/5.25), R 4.2.2 qnorm(0.625/5.25) = -1.1797611
	if math.Abs(pp.Points[0].Z-(-1.1797611)) > 1e-7 {
		t.Errorf("z1 = %v", pp.Points[0].Z)
	}
	b := pp.Band[2]
	sd := math.Sqrt(2.5)
	if math.Abs(b.Lo-(3+sd*method.NormalQuantile(0.14663280))) > 1e-6 || math.Abs(b.Hi-(3+sd*method.NormalQuantile(0.85336720))) > 1e-6 {
		t.Errorf("band %+v", b)
	}
	for _, b := range pp.Band {
		y := 3 + sd*b.Z
		if !(b.Lo < y && y < b.Hi) {
			t.Errorf("band %+v misses the line", b)
		}
	}
}
