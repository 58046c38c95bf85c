package method

import "sort"

func fitSortForBench(x []float64) { sort.Float64s(x) }
