package dist

import (
	"bytes"
	_ "embed"
	"encoding/json"
	"fmt"
	"html"
	"html/template"
	"math"
	"path"
	"reflect"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
	"github.com/yuin/goldmark/parser"
	gmhtml "github.com/yuin/goldmark/renderer/html"

	"lotlens/stats"
)

// A help page is site/help/<slug>.md: front matter, then Markdown.
//
//	---
//	title: Mean
//	fields: centre.mean, centre.meanCI
//	codes: tukey-inner, tukey-outer
//	---
//
// fields lists the report fields (JSON paths, dot-separated, arrays
// transparent) the page documents; a field covers everything below it. codes
// lists the outlier-rule codes (Rule.Code) it documents. A test requires every
// field and rule code of the report to be documented by some page.
//
// A fenced block with the info string lotlens-example is a worked example run
// through stats.Analyze at build time, so its figures are the engine's own:
//
//	```lotlens-example
//	caption: what the data are
//	target: 5.0          (optional; also lsl, usl, confidence, quantile)
//	group: Line          (optional: the group column; value: the value column;
//	                      groups: A, B, C for columns side by side)
//	show: centre.mean, centre.meanCI
//	data: 5.02 4.98 5.01 ...   (and/or on the lines below, as pasted)
//	```
//
// It renders as the data and a table of the fields shown. A field the engine
// does not give for these data shows as "not given" (with the engine's note
// when it has one).

//go:embed layout.html
var layoutHTML string

//go:embed help.css
var helpCSS []byte

var layout = template.Must(template.New("layout").Parse(layoutHTML))

// HelpPage is one parsed help page.
type HelpPage struct {
	Slug   string
	Title  string
	Fields []string
	Codes  []string
	Body   []byte // Markdown after the front matter
}

// ParseHelp parses a help page's source.
func ParseHelp(slug string, src []byte) (*HelpPage, error) {
	p := &HelpPage{Slug: slug}
	s := strings.ReplaceAll(string(src), "\r\n", "\n")
	rest, ok := strings.CutPrefix(s, "---\n")
	if !ok {
		return nil, fmt.Errorf("help/%s.md: starts without front matter (---, title: ..., ---)", slug)
	}
	fm, body, ok := strings.Cut(rest, "\n---\n")
	if !ok {
		return nil, fmt.Errorf("help/%s.md: front matter is not closed by a --- line", slug)
	}
	for i, line := range strings.Split(fm, "\n") {
		if strings.TrimSpace(line) == "" {
			continue
		}
		k, v, ok := strings.Cut(line, ":")
		if !ok {
			return nil, fmt.Errorf("help/%s.md: front matter line %d is not key: value", slug, i+2)
		}
		v = strings.TrimSpace(v)
		switch strings.TrimSpace(k) {
		case "title":
			p.Title = v
		case "fields":
			p.Fields = splitList(v)
		case "codes":
			p.Codes = splitList(v)
		default:
			return nil, fmt.Errorf("help/%s.md: unknown front matter key %q (title, fields, codes)", slug, k)
		}
	}
	if p.Title == "" {
		return nil, fmt.Errorf("help/%s.md: front matter has no title", slug)
	}
	p.Body = []byte(body)
	return p, nil
}

func splitList(v string) []string {
	var out []string
	for _, f := range strings.Split(v, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}

var exampleBlock = regexp.MustCompile("(?ms)^```lotlens-example[ \t]*\n(.*?)^```[ \t]*$")

// Example is a parsed lotlens-example block.
type Example struct {
	Caption string
	Request stats.Request
	Show    []string
}

// ParseExample parses the body of a lotlens-example block.
func ParseExample(body string) (*Example, error) {
	ex := &Example{Request: stats.Request{Schema: stats.RequestSchema}}
	lines := strings.Split(body, "\n")
	for i, line := range lines {
		if strings.TrimSpace(line) == "" {
			continue
		}
		k, v, ok := strings.Cut(line, ":")
		if !ok {
			return nil, fmt.Errorf("example line %d: want key: value", i+1)
		}
		v = strings.TrimSpace(v)
		num := func() (*float64, error) {
			f, err := strconv.ParseFloat(v, 64)
			if err != nil {
				return nil, fmt.Errorf("example %s: %q is not a number", k, v)
			}
			return &f, nil
		}
		var err error
		switch strings.TrimSpace(k) {
		case "caption":
			ex.Caption = v
		case "target":
			ex.Request.Options.Target, err = num()
		case "lsl":
			ex.Request.Options.LSL, err = num()
		case "usl":
			ex.Request.Options.USL, err = num()
		case "confidence":
			var f *float64
			f, err = num()
			if f != nil {
				ex.Request.Options.Confidence = *f
			}
		case "quantile":
			ex.Request.Options.Quantile = v
		case "value":
			ex.Request.Value = v
		case "group":
			ex.Request.Group = v
		case "groups":
			ex.Request.Groups = splitList(v)
		case "show":
			ex.Show = splitList(v)
		case "data":
			// The data follow on the same line (one line of values is one
			// column) and/or on the lines below, as they would be pasted.
			ex.Request.Text = strings.TrimSpace(strings.Join(append([]string{v}, lines[i+1:]...), "\n"))
			if strings.TrimSpace(ex.Request.Text) == "" {
				return nil, fmt.Errorf("example has no data after data:")
			}
			return ex, nil
		default:
			return nil, fmt.Errorf("example: unknown key %q", k)
		}
		if err != nil {
			return nil, err
		}
	}
	return nil, fmt.Errorf("example has no data: line")
}

// Run analyses the example and returns the report as generic JSON.
func (ex *Example) Run() (map[string]any, error) {
	rep, err := stats.Analyze(ex.Request)
	if err != nil {
		return nil, fmt.Errorf("the engine refused the example data: %v", err)
	}
	b, err := json.Marshal(rep)
	if err != nil {
		return nil, err
	}
	var m map[string]any
	err = json.Unmarshal(b, &m)
	return m, err
}

// Lookup finds a dot path in generic report JSON; a numeric segment indexes
// an array.
func Lookup(m map[string]any, p string) (any, bool) {
	var cur any = m
	for _, seg := range strings.Split(p, ".") {
		switch c := cur.(type) {
		case map[string]any:
			v, ok := c[seg]
			if !ok {
				return nil, false
			}
			cur = v
		case []any:
			i, err := strconv.Atoi(seg)
			if err != nil || i < 0 || i >= len(c) {
				return nil, false
			}
			cur = c[i]
		default:
			return nil, false
		}
	}
	if a, ok := cur.([]any); ok && len(a) == 0 {
		return nil, false
	}
	return cur, cur != nil
}

// renderExample returns the HTML for one example block and the fields it
// could not show.
func renderExample(body string) (string, []string, error) {
	ex, err := ParseExample(body)
	if err != nil {
		return "", nil, err
	}
	rep, err := ex.Run()
	if err != nil {
		return "", nil, err
	}
	for _, f := range ex.Show {
		if _, known := FieldKind(f); !known {
			return "", nil, fmt.Errorf("example shows %q, which is not a report field (see stats/report.go)", f)
		}
	}
	var b strings.Builder
	b.WriteString("<figure class=\"example\">\n")
	if ex.Caption != "" {
		fmt.Fprintf(&b, "<figcaption>%s</figcaption>\n", html.EscapeString(ex.Caption))
	}
	// One value a line shows as a wrapped row of values; tables as typed.
	lines := strings.Split(strings.TrimSpace(ex.Request.Text), "\n")
	single := true
	for _, l := range lines {
		if strings.ContainsAny(strings.TrimSpace(l), "\t;|") || (strings.Contains(strings.TrimSpace(l), " ") && l != lines[0]) {
			single = false
		}
	}
	if single {
		fmt.Fprintf(&b, "<p class=\"data\"><span>Data, as typed (%d lines):</span> %s</p>\n", len(lines), html.EscapeString(strings.Join(lines, "  ")))
	} else {
		fmt.Fprintf(&b, "<p class=\"data\"><span>Data, as typed:</span></p>\n<pre class=\"data\">%s</pre>\n", html.EscapeString(strings.TrimSpace(ex.Request.Text)))
	}
	var opts []string
	o := ex.Request.Options
	for _, kv := range []struct {
		k string
		v *float64
	}{{"target", o.Target}, {"LSL", o.LSL}, {"USL", o.USL}} {
		if kv.v != nil {
			opts = append(opts, kv.k+" "+num(*kv.v))
		}
	}
	if o.Confidence != 0 {
		opts = append(opts, "confidence "+num(o.Confidence*100)+"%")
	}
	if o.Quantile != "" {
		opts = append(opts, "quantile definition "+o.Quantile)
	}
	if g := ex.Request.Group; g != "" {
		opts = append(opts, "groups from column "+g)
	}
	if len(ex.Request.Groups) > 0 {
		opts = append(opts, "groups side by side: "+strings.Join(ex.Request.Groups, ", "))
	}
	if len(opts) > 0 {
		fmt.Fprintf(&b, "<p class=\"settings\">Settings: %s.</p>\n", html.EscapeString(strings.Join(opts, ", ")))
	}
	b.WriteString("<table>\n<thead><tr><th>Report field</th><th>Lotlens gives</th></tr></thead>\n<tbody>\n")
	var missing []string
	notes, _ := rep["notes"].([]any)
	for _, f := range ex.Show {
		v, ok := Lookup(rep, f)
		cell := ""
		if ok {
			cell = html.EscapeString(formatValue(v))
		} else if k, known := FieldKind(f); known && (k == reflect.Slice || k == reflect.Map || k == reflect.Bool) {
			// An omitted list or flag is an empty list or false, not a gap.
			cell = "none"
			if k == reflect.Bool {
				cell = "no"
			}
		} else {
			missing = append(missing, f)
			cell = "<em>not given for these data</em>"
			for _, n := range notes {
				if nm, _ := n.(map[string]any); nm != nil && strings.HasPrefix(f, fmt.Sprint(nm["field"])) {
					cell += ": " + html.EscapeString(fmt.Sprint(nm["text"]))
				}
			}
		}
		fmt.Fprintf(&b, "<tr><td><code>%s</code></td><td>%s</td></tr>\n", html.EscapeString(f), cell)
	}
	b.WriteString("</tbody>\n</table>\n</figure>\n")
	return b.String(), missing, nil
}

// num formats a number with six significant digits and no exponent for
// everyday magnitudes.
func num(f float64) string {
	if f == 0 {
		return "0"
	}
	a := math.Abs(f)
	if a >= 1e-4 && a < 1e9 {
		s := strconv.FormatFloat(f, 'f', -1, 64)
		// six significant digits
		digits := 6 - int(math.Floor(math.Log10(a))) - 1
		if digits < 0 {
			digits = 0
		}
		s = strconv.FormatFloat(f, 'f', digits, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
		return s
	}
	return strconv.FormatFloat(f, 'g', 6, 64)
}

// formatValue renders a report value for a reader.
func formatValue(v any) string {
	switch x := v.(type) {
	case float64:
		return num(x)
	case bool:
		if x {
			return "yes"
		}
		return "no"
	case string:
		return x
	case []any:
		parts := make([]string, 0, len(x))
		for i, e := range x {
			if i == 12 {
				parts = append(parts, fmt.Sprintf("… (%d in all)", len(x)))
				break
			}
			parts = append(parts, formatValue(e))
		}
		return strings.Join(parts, "; ")
	case map[string]any:
		if p, ok := x["p"].(float64); ok && len(x) == 2 {
			if v, ok := x["value"].(float64); ok { // a percentile
				return num(p) + "th percentile " + num(v)
			}
		}
		if m, ok := x["method"].(string); ok && x["q1"] != nil && x["q3"] != nil && len(x) == 4 { // a quartile set
			return m + ": Q1 " + formatValue(x["q1"]) + ", median " + formatValue(x["median"]) + ", Q3 " + formatValue(x["q3"])
		}
		if code, ok := x["code"].(string); ok && x["count"] != nil { // an outlier rule
			s := fmt.Sprint(x["name"])
			if s == "" || s == "<nil>" {
				s = code
			}
			var lim []string
			if lo, ok := x["lo"].(float64); ok {
				lim = append(lim, "below "+num(lo))
			}
			if hi, ok := x["hi"].(float64); ok {
				lim = append(lim, "above "+num(hi))
			}
			if len(lim) > 0 {
				s += " (" + strings.Join(lim, " or ") + ")"
			}
			return s + ": " + formatValue(x["count"]) + " flagged"
		}
		if row, ok := x["row"].(float64); ok && x["flags"] != nil { // a suspect reading
			var rules []string
			for _, f := range x["flags"].([]any) {
				if fm, ok := f.(map[string]any); ok {
					rules = append(rules, fmt.Sprint(fm["rule"]))
				}
			}
			return "row " + num(row) + " (" + fmt.Sprint(x["text"]) + "): " + strings.Join(rules, ", ")
		}
		if t, ok := x["text"].(string); ok && x["code"] != nil { // a reason
			return t
		}
		if lo, ok := x["lo"].(float64); ok {
			if hi, ok := x["hi"].(float64); ok {
				s := num(lo) + " to " + num(hi)
				var extra []string
				if l, ok := x["level"].(float64); ok {
					extra = append(extra, num(l*100)+"%")
				}
				if m, ok := x["method"].(string); ok && m != "" {
					extra = append(extra, m)
				}
				if len(extra) > 0 {
					s += " (" + strings.Join(extra, ", ") + ")"
				}
				return s
			}
		}
		if st, ok := x["statistic"].(float64); ok {
			s := ""
			if n, ok := x["name"].(string); ok && n != "" {
				s = n + ": "
			}
			s += "statistic " + num(st)
			if df, ok := x["df"].(float64); ok {
				s += ", df " + num(df)
			}
			if p, ok := x["p"].(float64); ok {
				s += ", p = " + num(p)
			}
			if e, ok := x["estimate"].(float64); ok {
				s += ", estimate " + num(e)
			}
			if ci, ok := x["ci"]; ok {
				s += ", interval " + formatValue(ci)
			}
			if m, ok := x["method"].(string); ok && m != "" {
				s += " (" + m + ")"
			}
			return s
		}
		keys := make([]string, 0, len(x))
		for k := range x {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		parts := make([]string, 0, len(keys))
		for _, k := range keys {
			parts = append(parts, k+" "+formatValue(x[k]))
		}
		return strings.Join(parts, ", ")
	case nil:
		return "none"
	}
	return fmt.Sprint(v)
}

func markdown() goldmark.Markdown {
	return goldmark.New(
		goldmark.WithExtensions(extension.GFM),
		goldmark.WithParserOptions(parser.WithAutoHeadingID()),
		// Raw HTML is allowed: the sources are ours and the examples render to HTML.
		goldmark.WithRendererOptions(gmhtml.WithUnsafe()),
	)
}

// layoutData fills layout.html.
type layoutData struct {
	Title string
	Root  string // "../" from help/, "/" for the 404 page
	Help  bool
	Body  template.HTML
}

// renderHelp turns one help page into HTML in the site's layout. It returns
// the example fields the engine did not give.
func renderHelp(p *HelpPage) ([]byte, []string, error) {
	var missing []string
	var ferr error
	src := exampleBlock.ReplaceAllStringFunc(string(p.Body), func(block string) string {
		m := exampleBlock.FindStringSubmatch(block)
		h, miss, err := renderExample(m[1])
		if err != nil && ferr == nil {
			ferr = fmt.Errorf("help/%s.md: %v", p.Slug, err)
		}
		for _, m := range miss {
			if !slices.Contains(missing, m) {
				missing = append(missing, m)
			}
		}
		return "\n" + h + "\n"
	})
	if ferr != nil {
		return nil, nil, ferr
	}
	var body bytes.Buffer
	if err := markdown().Convert([]byte(src), &body); err != nil {
		return nil, nil, fmt.Errorf("help/%s.md: %v", p.Slug, err)
	}
	out, err := page(p.Title, "../", true, body.String())
	return out, missing, err
}

func page(title, root string, help bool, body string) ([]byte, error) {
	var b bytes.Buffer
	err := layout.Execute(&b, layoutData{Title: title, Root: root, Help: help, Body: template.HTML(body)})
	return b.Bytes(), err
}

// notFoundPage is the 404 page (used when site/ has no 404.html). Its links
// are root-relative: it is served at any depth.
func notFoundPage() ([]byte, error) {
	return page("Page not found", "/", false, `<h1>Page not found</h1>
<p>There is no page at this address. The analysis page is at <a href="/index.html">the start</a>; the help topics are listed in <a href="/help/index.html">the help index</a>.</p>`)
}

// FieldPaths lists every JSON path a Report can carry (dot-separated, arrays
// transparent, maps as leaves), from the Go types.
func FieldPaths() []string {
	var out []string
	var walk func(t reflect.Type, prefix string, seen map[reflect.Type]bool)
	walk = func(t reflect.Type, prefix string, seen map[reflect.Type]bool) {
		for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice || t.Kind() == reflect.Array {
			t = t.Elem()
		}
		if t.Kind() != reflect.Struct || seen[t] {
			if prefix != "" {
				out = append(out, prefix)
			}
			return
		}
		seen[t] = true
		defer delete(seen, t)
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			if !f.IsExported() {
				continue
			}
			tag := f.Tag.Get("json")
			name, _, _ := strings.Cut(tag, ",")
			if name == "-" {
				continue
			}
			if f.Anonymous && name == "" {
				walk(f.Type, prefix, seen)
				continue
			}
			if name == "" {
				name = f.Name
			}
			p := name
			if prefix != "" {
				p = prefix + "." + name
			}
			walk(f.Type, p, seen)
		}
	}
	walk(reflect.TypeOf(stats.Report{}), "", map[reflect.Type]bool{})
	return out
}

// JSONPaths lists the leaf key paths of generic JSON (arrays transparent).
func JSONPaths(v any) []string {
	set := map[string]bool{}
	var walk func(v any, prefix string)
	walk = func(v any, prefix string) {
		switch x := v.(type) {
		case map[string]any:
			if len(x) == 0 && prefix != "" {
				set[prefix] = true
			}
			for k, e := range x {
				p := k
				if prefix != "" {
					p = prefix + "." + k
				}
				walk(e, p)
			}
		case []any:
			if len(x) == 0 && prefix != "" {
				set[prefix] = true
			}
			for _, e := range x {
				walk(e, prefix)
			}
		default:
			set[prefix] = true
		}
	}
	walk(v, "")
	out := make([]string, 0, len(set))
	for p := range set {
		out = append(out, p)
	}
	sort.Strings(out)
	return out
}

// Covers reports whether documented field f covers report path p.
func Covers(f, p string) bool {
	f = stripIndexes(f)
	return p == f || strings.HasPrefix(p, f+".")
}

var indexSeg = regexp.MustCompile(`\.\d+(\.|$)`)

func stripIndexes(p string) string {
	for indexSeg.MatchString(p) {
		p = indexSeg.ReplaceAllString(p, "$1")
	}
	return strings.TrimSuffix(p, ".")
}

// loadHelp reads and parses every help page in site.
func loadHelp(site files) ([]*HelpPage, error) {
	var pages []*HelpPage
	for _, n := range site.names() {
		if !strings.HasPrefix(n, "help/") || path.Ext(n) != ".md" {
			continue
		}
		slug := strings.TrimSuffix(strings.TrimPrefix(n, "help/"), ".md")
		p, err := ParseHelp(slug, site[n])
		if err != nil {
			return nil, err
		}
		pages = append(pages, p)
	}
	return pages, nil
}

// FieldKind is the Go kind of the Report field at a JSON dot path (numeric
// segments index arrays); known is false for a path the Report cannot carry.
func FieldKind(p string) (kind reflect.Kind, known bool) {
	t := reflect.TypeOf(stats.Report{})
	for _, seg := range strings.Split(stripIndexes(p), ".") {
		for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice || t.Kind() == reflect.Array {
			t = t.Elem()
		}
		if t.Kind() != reflect.Struct {
			return 0, false
		}
		f, ok := fieldByJSON(t, seg)
		if !ok {
			return 0, false
		}
		t = f.Type
	}
	for t.Kind() == reflect.Pointer {
		t = t.Elem()
	}
	return t.Kind(), true
}

// fieldByJSON finds a struct field by its JSON name, through embedded structs.
func fieldByJSON(t reflect.Type, name string) (reflect.StructField, bool) {
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag, _, _ := strings.Cut(f.Tag.Get("json"), ",")
		if f.Anonymous && tag == "" {
			ft := f.Type
			if ft.Kind() == reflect.Pointer {
				ft = ft.Elem()
			}
			if sf, ok := fieldByJSON(ft, name); ok {
				return sf, true
			}
			continue
		}
		if tag == name || (tag == "" && f.Name == name) {
			return f, true
		}
	}
	return reflect.StructField{}, false
}
