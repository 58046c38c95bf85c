package dist

import (
	"encoding/json"
	"os"
	"regexp"
	"sort"
	"strings"
	"testing"

	"lotlens/stats"
)

// helpSlugs are the pages the page links to (the contract with the page:
// site/cards.js and site/index.html link to help/<slug>.html).
var helpSlugs = []string{"verdict", "reading-your-report", "data-formats", "privacy", "sharing", "cautions", "automation",
	"mean", "median", "trimmed-mean", "mode", "standard-deviation", "range-iqr", "mad", "cv", "sem", "quantiles",
	"confidence-intervals", "skewness-kurtosis", "dagostino", "shapiro-wilk", "anderson-darling", "probability-plot",
	"histogram", "box-plot", "tukey-fences", "adjusted-boxplot", "modified-z", "gesd", "t-test", "wilcoxon",
	"resolution", "run-chart", "control-charts", "control-constants", "signal-checks", "ewma", "cusum", "drift-tests", "change-point",
	"groups", "anova", "kruskal-wallis", "two-groups", "spread-tests", "pairwise", "letters"}

// general pages explain the tool rather than one method.
var general = map[string]bool{"index": true, "reading-your-report": true, "data-formats": true, "privacy": true,
	"sharing": true, "cautions": true, "automation": true, "verdict": true, "groups": true}

// ruleCodes are the outlier rules stats/report.go names for Rule.Code.
var ruleCodes = []string{"tukey-inner", "tukey-outer", "adjusted-box", "modified-z", "gesd"}

func loadSiteHelp(t *testing.T) []*HelpPage {
	t.Helper()
	site, err := readSite("../../site")
	if err != nil {
		t.Fatal(err)
	}
	pages, err := loadHelp(site)
	if err != nil {
		t.Fatal(err)
	}
	return pages
}

// liveReport analyses an invented test set with a target and both limits,
// so that every section the engine can fill is present.
func liveReport(t *testing.T) map[string]any {
	t.Helper()
	data, err := os.ReadFile("../../testdata/sets/17-n20-two-outliers.txt")
	if err != nil {
		t.Fatal(err)
	}
	ex := &Example{Request: stats.Request{Text: string(data)}}
	rep, err := ex.Run()
	if err != nil {
		t.Fatal(err)
	}
	q := rep["quantiles"].(map[string]any)
	lo, hi, med := q["min"].(float64), q["max"].(float64), q["median"].(float64)
	ex.Request.Options = stats.Options{Target: &med, LSL: &lo, USL: &hi, PopulationSD: true}
	if rep, err = ex.Run(); err != nil {
		t.Fatal(err)
	}
	return rep
}

// TestHelpCoversEveryStatistic fails when the report carries a field (by the
// Go types, and in a live report) or an outlier rule that no help page
// documents in its front matter.
func TestHelpCoversEveryStatistic(t *testing.T) {
	pages := loadSiteHelp(t)
	var fields []string
	codes := map[string]bool{}
	all := FieldPaths()
	for _, p := range pages {
		for _, f := range p.Fields {
			valid := false
			for _, a := range all {
				if Covers(f, a) {
					valid = true
					break
				}
			}
			if !valid {
				t.Errorf("help/%s.md documents %q, which is not a report field", p.Slug, f)
			}
			fields = append(fields, f)
		}
		for _, c := range p.Codes {
			codes[c] = true
		}
	}
	covered := func(path string) bool {
		for _, f := range fields {
			if Covers(f, path) {
				return true
			}
		}
		return false
	}
	for _, p := range all {
		if !covered(p) {
			t.Errorf("report field %s has no help page: add it to the fields: line of the page that explains it", p)
		}
	}
	rep := liveReport(t)
	for _, p := range JSONPaths(rep) {
		if !covered(p) {
			t.Errorf("the engine's report carries %s, which no help page documents", p)
		}
	}
	for _, c := range ruleCodes {
		if !codes[c] {
			t.Errorf("outlier rule %q has no help page (codes: line)", c)
		}
	}
	if s, ok := rep["suspects"].(map[string]any); ok {
		rules, _ := s["rules"].([]any)
		for _, r := range rules {
			c, _ := r.(map[string]any)["code"].(string)
			if !codes[c] {
				t.Errorf("the engine applies outlier rule %q, which no help page documents", c)
			}
		}
	}
}

// TestHelpPagesComplete checks the page's help links and the parts every
// method page must have.
func TestHelpPagesComplete(t *testing.T) {
	pages := loadSiteHelp(t)
	bySlug := map[string]*HelpPage{}
	for _, p := range pages {
		bySlug[p.Slug] = p
	}
	index, ok := bySlug["index"]
	if !ok {
		t.Fatal("help/index.md is missing")
	}
	for _, s := range helpSlugs {
		p, ok := bySlug[s]
		if !ok {
			t.Errorf("help/%s.md is missing (the page links to it)", s)
			continue
		}
		if !strings.Contains(string(index.Body), "("+s+".html)") {
			t.Errorf("help/index.md does not list %s.html", s)
		}
		if general[s] {
			continue
		}
		body := string(p.Body)
		for _, h := range []string{"## What it tells you", "## When to use it", "## Formula", "## Assumptions", "## Published source", "## Worked example"} {
			if !strings.Contains(body, h) {
				t.Errorf("help/%s.md has no %q section", s, h)
			}
		}
		if !exampleBlock.MatchString(body) {
			t.Errorf("help/%s.md has no lotlens-example block", s)
		}
		// The source names an author and a year.
		src := body[strings.Index(body, "## Published source"):]
		if !regexp.MustCompile(`(1[89]|20)\d\d`).MatchString(src) {
			t.Errorf("help/%s.md: the published source names no year", s)
		}
	}
}

// TestHelpExamples runs every worked example through the engine. A field the
// engine gives in the live report but not for an example's data means the
// example's data are badly chosen: that fails. A field the engine does not
// give at all yet is logged.
func TestHelpExamples(t *testing.T) {
	live := liveReport(t)
	n := 0
	for _, p := range loadSiteHelp(t) {
		for _, m := range exampleBlock.FindAllStringSubmatch(string(p.Body), -1) {
			n++
			html, missing, err := renderExample(m[1])
			if err != nil {
				t.Errorf("help/%s.md: %v", p.Slug, err)
				continue
			}
			if !strings.Contains(html, "<table>") {
				t.Errorf("help/%s.md: example renders no table", p.Slug)
			}
			for _, f := range missing {
				if _, ok := Lookup(live, f); ok {
					t.Errorf("help/%s.md: the engine gives %s on the test set but not for the example's data: choose data that show it", p.Slug, f)
				} else {
					t.Logf("help/%s.md: the engine does not give %s yet", p.Slug, f)
				}
			}
		}
	}
	if n < len(helpSlugs)-len(general)+1 {
		t.Errorf("only %d worked examples", n)
	}
}

func TestParseExample(t *testing.T) {
	ex, err := ParseExample("caption: c\ntarget: 5\nlsl: 4.5\nusl: 5.5\nconfidence: 0.9\nquantile: hf8\nvalue: W\ngroup: Line\ngroups: A, B\nshow: centre.mean, spread.sd\ndata: 1\n2\n3\n")
	if err != nil {
		t.Fatal(err)
	}
	o := ex.Request.Options
	if *o.Target != 5 || *o.LSL != 4.5 || *o.USL != 5.5 || o.Confidence != 0.9 || o.Quantile != "hf8" {
		t.Errorf("options %+v", o)
	}
	if r := ex.Request; r.Value != "W" || r.Group != "Line" || strings.Join(r.Groups, "|") != "A|B" {
		t.Errorf("columns %q %q %q", r.Value, r.Group, r.Groups)
	}
	if ex.Request.Text != "1\n2\n3" || strings.Join(ex.Show, "|") != "centre.mean|spread.sd" || ex.Caption != "c" {
		t.Errorf("parsed %+v", ex)
	}
	for _, bad := range []string{"show: x\n", "target: five\ndata: 1\n", "colour: red\ndata: 1\n", "data:\n"} {
		if _, err := ParseExample(bad); err == nil {
			t.Errorf("ParseExample(%q) accepted", bad)
		}
	}
	if _, _, err := renderExample("show: centre.nosuch\ndata: 1\n2\n"); err == nil {
		t.Error("an example showing an unknown field renders")
	}
}

func TestFieldPathsAndCoverage(t *testing.T) {
	all := FieldPaths()
	sort.Strings(all)
	for _, want := range []string{"centre.meanCI.lo", "suspects.readings.row", "suspects.readings.flags.rule", "verdict.reasons.vals", "charts.probPlot.band.hi"} {
		i := sort.SearchStrings(all, want)
		if i == len(all) || all[i] != want {
			t.Errorf("FieldPaths lacks %s", want)
		}
	}
	if !Covers("centre.meanCI", "centre.meanCI.lo") || Covers("centre.mean", "centre.meanCI.lo") || !Covers("quantiles.percentiles.2", "quantiles.percentiles.value") {
		t.Error("Covers")
	}
	var v any
	json.Unmarshal([]byte(`{"a":{"b":[{"c":1},{"d":2}],"e":[]},"f":3}`), &v)
	if got := strings.Join(JSONPaths(v), " "); got != "a.b.c a.b.d a.e f" {
		t.Errorf("JSONPaths = %q", got)
	}
	if k, ok := FieldKind("suspects.readings.row"); !ok || k.String() != "int" {
		t.Errorf("FieldKind(suspects.readings.row) = %v %v", k, ok)
	}
	if _, ok := FieldKind("centre.nosuch"); ok {
		t.Error("FieldKind accepts an unknown field")
	}
}

func TestFormatValue(t *testing.T) {
	// Expected strings: the formatting rules of formatValue (six significant digits).
	for _, c := range []struct {
		in   string
		want string
	}{
		{`5.0166666666`, "5.01667"},
		{`0.000012345`, "1.2345e-05"},
		{`250`, "250"},
		{`{"lo":1.5,"hi":2.25,"level":0.95,"method":"student-t"}`, "1.5 to 2.25 (95%, student-t)"},
		{`{"name":"Shapiro-Wilk","statistic":0.97,"p":0.41}`, "Shapiro-Wilk: statistic 0.97, p = 0.41"},
		{`[1,2]`, "1; 2"},
		{`true`, "yes"},
	} {
		var v any
		if err := json.Unmarshal([]byte(c.in), &v); err != nil {
			t.Fatal(err)
		}
		if got := formatValue(v); got != c.want {
			t.Errorf("formatValue(%s) = %q, want %q", c.in, got, c.want)
		}
	}
}
