package stats

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"lotlens/stats/ingest"
	"lotlens/stats/method"
)

// A request names up to four columns: the value column and, optionally, an
// order (or time) column, a subgroup column and a group column. All columns
// of one table share their rows, so cell i of each column is the same
// spreadsheet row: the columns travel through the engine together, aligned
// by index.
//
// Each optional column is read by the report sections listed in
// columnReaders. A column the request names but no section of this version
// reads is refused with CodeUnused, never ignored. Adding a section that
// reads a column: add its name here.
//
// A list, not a map, so that the compiler lays it out and nothing runs at
// start (see "Start-up" in DEVELOPERS.md).
var columnReaders = [...]struct {
	key      string
	sections []string
}{
	{"order", []string{"over time (run chart, control charts)"}},
	{"subgroup", []string{"over time (control charts)", "against the spec (within-process sigma)"}},
	{"group", []string{"groups"}},
}

// readersOf lists the sections that read the column of role key.
func readersOf(key string) []string {
	for _, r := range columnReaders {
		if r.key == key {
			return r.sections
		}
	}
	return nil
}

// KindIncomplete is the Problem kind of a row whose value is used but whose
// order, subgroup or group cell is missing or unusable.
const KindIncomplete = "incomplete-row"

// columnSet is the request's columns, aligned by cell index.
type columnSet struct {
	value                  *ingest.Column
	order, subgroup, group *ingest.Column
	// wide: the side-by-side value columns compared as groups (Request.Groups)
	wide []*ingest.Column
}

// pickColumns finds every column the request names and checks that each
// optional one is read by some section, is not the value column and has a
// kind that suits its role.
func pickColumns(tab *ingest.Table, req Request) (*columnSet, error) {
	valName := req.Value
	if valName == "" && len(req.Groups) > 0 {
		valName = req.Groups[0]
	}
	val, err := pickColumn(tab, valName)
	if err != nil {
		return nil, err
	}
	cs := &columnSet{value: val}
	if err := cs.pickWide(tab, req); err != nil {
		return nil, err
	}
	for _, r := range []struct {
		key, name string
		dst       **ingest.Column
	}{{"order", req.Order, &cs.order}, {"subgroup", req.Subgroup, &cs.subgroup}, {"group", req.Group, &cs.group}} {
		if strings.TrimSpace(r.name) == "" {
			continue
		}
		c, err := findColumn(tab, r.name, r.key)
		if err != nil {
			return nil, err
		}
		if c == val {
			return nil, errorf(CodeColumn, r.key, "the %s column %q is also the value column: choose another column for %s, or none", r.key, c.Name, r.key)
		}
		if len(readersOf(r.key)) == 0 {
			return nil, errorf(CodeUnused, r.key, "no section of this version reads a %s column, so %q would be ignored: leave the %s choice empty (comparing %s is planned)",
				r.key, c.Name, r.key, map[string]string{"subgroup": "subgroups", "group": "groups"}[r.key])
		}
		if r.key == "order" && c.Kind != "number" && c.Kind != "time" {
			return nil, errorf(CodeColumn, r.key, "the order column %q holds %s, not numbers or times: choose a column of sequence numbers, dates or times", c.Name, kindWords(c.Kind))
		}
		*r.dst = c
	}
	for _, pair := range [][2]*ingest.Column{{cs.order, cs.subgroup}, {cs.order, cs.group}, {cs.subgroup, cs.group}} {
		if pair[0] != nil && pair[0] == pair[1] {
			return nil, errorf(CodeColumn, "", "column %q is chosen for two roles: give each role its own column", pair[0].Name)
		}
	}
	for _, w := range cs.wide {
		for _, c := range []*ingest.Column{cs.order, cs.subgroup} {
			if c == w {
				return nil, errorf(CodeColumn, "groups", "column %q is chosen for two roles: give each role its own column", c.Name)
			}
		}
	}
	if cs.group != nil {
		if k := groupCount(val, cs.group); k > method.MaxGroups {
			return nil, errorf(CodeTooManyGroups, "group", "the group column %q holds more than %d groups: at most %d can be compared; choose a column with fewer groups (lines, shifts, cavities), or leave the group choice empty", cs.group.Name, method.MaxGroups, method.MaxGroups)
		}
	}
	return cs, nil
}

// pickWide reads Request.Groups: several value columns side by side, one
// per group, refused when mixed with a group column.
func (cs *columnSet) pickWide(tab *ingest.Table, req Request) error {
	if len(req.Groups) == 0 {
		return nil
	}
	if strings.TrimSpace(req.Group) != "" {
		return errorf(CodeBadRequest, "groups", "the request names a group column (%q) and side-by-side group columns (groups): give one of them, a group column for data in one column or the list of columns for data side by side", req.Group)
	}
	if len(req.Groups) < 2 {
		return errorf(CodeColumn, "groups", "groups names one column: name two or more value columns to compare them side by side")
	}
	if len(req.Groups) > method.MaxGroups {
		return errorf(CodeTooManyGroups, "groups", "groups names %d columns: at most %d can be compared", len(req.Groups), method.MaxGroups)
	}
	seen := map[*ingest.Column]bool{}
	for _, name := range req.Groups {
		c, err := findColumn(tab, name, "groups")
		if err != nil {
			return err
		}
		if seen[c] {
			return errorf(CodeColumn, "groups", "column %q is named twice in groups: name each column once", c.Name)
		}
		seen[c] = true
		if c.Numbers == 0 {
			return errorf(CodeColumn, "groups", "column %q in groups holds %s, not measurements: name the value columns to compare", c.Name, kindWords(c.Kind))
		}
		cs.wide = append(cs.wide, c)
	}
	return nil
}

func kindWords(kind string) string {
	switch kind {
	case "text":
		return "labels"
	case "empty":
		return "no values"
	}
	return kind
}

// findColumn returns the column called name (exactly, then ignoring case
// and surrounding spaces, then by its header as typed).
func findColumn(tab *ingest.Table, name, role string) (*ingest.Column, error) {
	for _, c := range tab.Columns {
		if c.Name == name {
			return c, nil
		}
	}
	for _, c := range tab.Columns {
		if strings.EqualFold(strings.TrimSpace(c.Name), strings.TrimSpace(name)) || (c.Header != "" && c.Header == name) {
			return c, nil
		}
	}
	names := make([]string, len(tab.Columns))
	for i, c := range tab.Columns {
		names[i] = fmt.Sprintf("%q", c.Name)
	}
	return nil, errorf(CodeColumn, role, "no column named %q for %s: the data have %s; choose one of those", name, role, strings.Join(names, ", "))
}

// partnerMissing reports whether cell i of an optional column c holds
// nothing usable for its role.
func partnerMissing(c *ingest.Column, i int) bool {
	if c.Kind == "text" {
		return c.Label(i) < 0
	}
	v := c.Values[i]
	return v != v || math.IsInf(v, 0)
}

// incompleteRows lists, for each optional column, the rows whose value is a
// number but whose cell in that column is missing or unusable: those
// readings stay in the whole-column figures and are left out of the
// sections that read the column. At most limit problems are listed per
// column; the count is returned whole.
func (cs *columnSet) incompleteRows(w words, limit int) (probs []ingest.Problem, counts map[string]int) {
	counts = map[string]int{}
	v := cs.value
	for _, r := range []struct {
		key string
		c   *ingest.Column
	}{{"order", cs.order}, {"subgroup", cs.subgroup}, {"group", cs.group}} {
		if r.c == nil {
			continue
		}
		for i, x := range v.Values {
			if x != x || !partnerMissing(r.c, i) {
				continue
			}
			counts[r.key]++
			if counts[r.key] <= limit {
				why, action := w.incomplete(v.Text(i), r.key, readersOf(r.key))
				probs = append(probs, ingest.Problem{
					Row: int(v.Rows[i]), Col: r.c.Position, Column: r.c.Name, Text: r.c.Text(i), Kind: KindIncomplete,
					Reason: why, Action: action,
				})
			}
		}
	}
	return probs, counts
}

// orderSequence returns the cell indices of the value column in the order
// of the order column (stable: equal keys keep row order), and how many
// rows are out of order in the file. Cells without a usable order key are
// left out. nil when the request names no order column.
func (cs *columnSet) orderSequence() (seq []int32, outOfOrder int) {
	if cs.order == nil {
		return nil, 0
	}
	key := cs.order.Values
	seq = make([]int32, 0, len(key))
	prev := math.Inf(-1)
	for i := range key {
		if partnerMissing(cs.order, i) {
			continue
		}
		if key[i] < prev {
			outOfOrder++
		}
		prev = max(prev, key[i])
		seq = append(seq, int32(i))
	}
	if outOfOrder > 0 {
		slices.SortStableFunc(seq, func(a, b int32) int {
			switch ka, kb := key[a], key[b]; {
			case ka < kb:
				return -1
			case ka > kb:
				return 1
			}
			return 0
		})
	}
	return seq, outOfOrder
}
