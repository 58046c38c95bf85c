package method

import (
	"bufio"
	"os"
	"strconv"
	"strings"
	"testing"
)

// TestConformNormalUpperBoundAgainstR: check values from
// testdata/rref/conformbound.R (R 4.2.2: uniroot on pt with ncp). Where the
// noncentrality exceeds 37.62 both R and the Go code use the normal
// approximation of the noncentral t (R warns that full precision may not
// be achieved), so that row is checked to 1e-3 only.
func TestConformNormalUpperBoundAgainstR(t *testing.T) {
	f, err := os.Open("../../testdata/rref/conformbound.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Scan() // header
	rows := 0
	for sc.Scan() {
		fs := strings.Split(sc.Text(), "\t")
		var v [5]float64
		for i := range v {
			v[i], _ = strconv.ParseFloat(fs[i], 64)
		}
		got, err := ConformNormalUpperBound(v[0], int(v[1]), v[2], v[3])
		if err != nil {
			t.Fatalf("%v: %v", fs, err)
		}
		rel := 1e-7
		if v[0]*v[0]*v[1] > 37.62*37.62 {
			rel = 1e-3
		}
		if !capNear(got, v[4], rel) {
			t.Errorf("k %g n %g df %g level %g: got %.12g, want %.12g (R)", v[0], v[1], v[2], v[3], got, v[4])
		}
		rows++
	}
	if rows < 9 {
		t.Fatalf("%d reference rows", rows)
	}
	// the bound exceeds the plug-in estimate Φ(−k) and shrinks as n grows
	// (common sense of a confidence bound)
	b30, _ := ConformNormalUpperBound(3, 30, 29, 0.95)
	b300, _ := ConformNormalUpperBound(3, 300, 299, 0.95)
	if !(b30 > b300 && b300 > capNormCDF(-3)) {
		t.Errorf("bounds %g (n 30), %g (n 300), plug-in %g", b30, b300, capNormCDF(-3))
	}
	for _, c := range [][4]float64{{1, 1, 1, 0.95}, {1, 10, 0, 0.95}, {1, 10, 9, 1}, {1, 10, 9, 0}} {
		if _, err := ConformNormalUpperBound(c[0], int(c[1]), c[2], c[3]); err == nil {
			t.Errorf("%v: no error", c)
		}
	}
}
