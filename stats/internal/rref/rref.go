// Package rref reads the reference tables the tests check against: the
// files testdata/rref/*.tsv written by the committed scripts beside them
// (R 4.2.2, Python fractions), each a header line then
// set<TAB>statistic<TAB>value. One reader for every package's tests.
package rref

import (
	"bufio"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// Path returns the path of testdata/rref/name from the working directory of
// a test anywhere in the module (the directory holding go.mod is searched
// upwards).
func Path(tb testing.TB, name string) string {
	tb.Helper()
	dir, err := os.Getwd()
	if err != nil {
		tb.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return filepath.Join(dir, "testdata", "rref", name)
		}
		up := filepath.Dir(dir)
		if up == dir {
			tb.Fatalf("no go.mod above the test's directory: cannot find testdata/rref/%s", name)
		}
		dir = up
	}
}

// Load reads testdata/rref/name: set -> statistic -> value. It fails the
// test on a missing file, a malformed line or fewer than minSets sets.
func Load(tb testing.TB, name string, minSets int) map[string]map[string]float64 {
	tb.Helper()
	path := Path(tb, name)
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	ref := map[string]map[string]float64{}
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<16), 1<<24)
	sc.Scan() // header
	for sc.Scan() {
		p := strings.Split(sc.Text(), "\t")
		if len(p) != 3 {
			tb.Fatalf("%s: bad line %q", name, sc.Text())
		}
		v, err := strconv.ParseFloat(p[2], 64)
		if err != nil {
			tb.Fatalf("%s: bad value in %q", name, sc.Text())
		}
		if ref[p[0]] == nil {
			ref[p[0]] = map[string]float64{}
		}
		ref[p[0]][p[1]] = v
	}
	if err := sc.Err(); err != nil {
		tb.Fatal(err)
	}
	if len(ref) < minSets {
		tb.Fatalf("%s holds %d sets, want at least %d", name, len(ref), minSets)
	}
	return ref
}

// Set reads testdata/sets/name (one invented data set, one value a line),
// sorted, with its mean and SD by the compensated two-pass algorithm.
func Set(tb testing.TB, name string) (sorted []float64, mean, sd float64) {
	tb.Helper()
	path := filepath.Join(filepath.Dir(filepath.Dir(Path(tb, name))), "sets", name)
	b, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	for _, l := range strings.Fields(string(b)) {
		v, err := strconv.ParseFloat(l, 64)
		if err != nil {
			tb.Fatalf("%s: %v", name, err)
		}
		sorted = append(sorted, v)
	}
	slices.Sort(sorted)
	n := float64(len(sorted))
	var s float64
	for _, x := range sorted {
		s += x
	}
	mean = s / n
	var c, ss float64
	for _, x := range sorted {
		c += x - mean
		ss += (x - mean) * (x - mean)
	}
	mean += c / n
	sd = math.Sqrt((ss - c*c/n) / (n - 1))
	return sorted, mean, sd
}

// Close reports whether got is within rel (relative) or abs of want.
func Close(got, want, rel, abs float64) bool {
	d := math.Abs(got - want)
	return d <= abs || d <= rel*math.Abs(want)
}
