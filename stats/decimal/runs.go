package decimal

import "sort"

// RunEnd returns the end (exclusive) of the run of values equal to
// sorted[i] in ascending data: a run of one costs one comparison, a long
// run (readings to a few decimals repeat) a few, by doubling steps and
// bisection, not one per value.
func RunEnd(sorted []float64, i int) int {
	v := sorted[i]
	if i+1 >= len(sorted) || sorted[i+1] != v {
		return i + 1
	}
	// sorted[a] == v; b past it, doubling its distance from i
	a, b := i+1, i+2
	for b < len(sorted) && sorted[b] == v {
		a, b = b, i+2*(b-i)
	}
	b = min(b, len(sorted))
	return a + 1 + sort.Search(b-a-1, func(k int) bool { return sorted[a+1+k] != v })
}

// RunStart returns the first index of the run of values equal to
// sorted[i] in ascending data, as RunEnd does going down.
func RunStart(sorted []float64, i int) int {
	v := sorted[i]
	if i == 0 || sorted[i-1] != v {
		return i
	}
	// sorted[a] == v; b before it, doubling its distance from i
	a, b := i-1, i-2
	for b >= 0 && sorted[b] == v {
		a, b = b, i-2*(i-b)
	}
	b = max(b, -1)
	// the first of b+1 .. a-1 equal to v, or a
	return b + 1 + sort.Search(a-b-1, func(k int) bool { return sorted[b+1+k] == v })
}
