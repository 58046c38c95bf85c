package stats

// The methods (shape, probability plot, outlier rules, target tests) live in
// their own files, which register themselves here in an init function
// (shape.go: hookShape = shapeSection, and so on). A nil hook leaves its
// report section out.
var (
	hookShape    func(sorted []float64, mean, sd float64) (*Shape, []Note)
	hookProbPlot func(sorted []float64, mean, sd, conf float64, maxPoints int) ProbPlot
	hookOutliers func(sorted []float64, q1, q3, median float64, alpha float64) (rules []Rule, flags map[int][]Flag, flagged int)
	hookTarget   func(sorted []float64, mean, sd float64, target, conf float64) *Target
)
