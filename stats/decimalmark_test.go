package stats

import (
	"fmt"
	"strings"
	"testing"

	"lotlens/stats/ingest"
)

// warningOf returns the verdict's warning with the code, or nil.
func warningOf(rep *Report, code string) *Reason {
	for i := range rep.Verdict.Warnings {
		if rep.Verdict.Warnings[i].Code == code {
			return &rep.Verdict.Warnings[i]
		}
	}
	return nil
}

// TestMixedMarksWarning: a column that mixes decimal marks has its
// minority-mark cells left out by the reader; the verdict says how many
// and that the mean and median are from the rest. Invented data: 20
// readings typed with a point, 3 with a comma (rows 5, 11, 17); the counts
// follow from the construction.
func TestMixedMarksWarning(t *testing.T) {
	for _, comma := range []bool{false, true} {
		var b strings.Builder
		b.WriteString("Torque\n")
		row := 1
		for i := 0; i < 23; i++ {
			row++
			v := fmt.Sprintf("12.%02d", 30+i%9)
			minority := row == 5 || row == 11 || row == 17
			if minority != comma {
				v = strings.Replace(v, ".", ",", 1)
			}
			b.WriteString(v + "\n")
		}
		if comma {
			// the comma column: 20 with a comma, 3 with a point
			rep, err := Analyze(Request{Text: b.String()})
			if err != nil {
				t.Fatal(err)
			}
			checkMixed(t, rep, true)
			continue
		}
		rep, err := Analyze(Request{Text: b.String()})
		if err != nil {
			t.Fatal(err)
		}
		checkMixed(t, rep, false)
	}
	// one mark throughout: no such warning
	rep, _ := Analyze(Request{Text: lines("12.31", "12.35", "12.40", "12.33")})
	if warningOf(rep, "mixed-decimal-marks") != nil || warningOf(rep, "ambiguous-decimal-mark") != nil {
		t.Errorf("clean data warned: %+v", rep.Verdict.Warnings)
	}
}

func checkMixed(t *testing.T, rep *Report, comma bool) {
	t.Helper()
	w := warningOf(rep, "mixed-decimal-marks")
	if w == nil {
		t.Fatalf("comma %v: no mixed-marks warning: %+v (summary %q)", comma, rep.Verdict.Warnings, rep.Input.Summary)
	}
	// by construction: 3 cells of the other mark, 20 values used
	if w.Vals["dropped"] != 3 || w.Vals["used"] != 20 || rep.Counts.Used != 20 || rep.Counts.Rejected != 3 {
		t.Errorf("comma %v: vals %v, counts %+v", comma, w.Vals, rep.Counts)
	}
	if !strings.Contains(w.Text, "3 values of \"Torque\" were left out") || !strings.Contains(w.Text, "the mean and median are from the other 20 values") {
		t.Errorf("comma %v: %q", comma, w.Text)
	}
	other := "a decimal comma"
	if comma {
		other = "a decimal point"
	}
	if !strings.Contains(w.Text, other) || rep.Input.DecimalComma != comma {
		t.Errorf("comma %v: the warning does not name the other mark: %q", comma, w.Text)
	}
}

// TestAmbiguousMarkWarning: a column where every decimal looks like
// "1,234", read by the default (no decimal mark chosen), gets a verdict
// warning that the other reading is 1000 times larger; a chosen mark
// silences it. Invented data; the factor 1000 is the definition of the
// ambiguity (three digits after the comma).
func TestAmbiguousMarkWarning(t *testing.T) {
	text := lines("Gap (mm)", "1,234", "1,256", "1,301", "1,199", "1,245", "1,262")
	rep, err := Analyze(Request{Text: text})
	if err != nil {
		t.Fatal(err)
	}
	w := warningOf(rep, "ambiguous-decimal-mark")
	if w == nil {
		t.Fatalf("no ambiguous-mark warning: %+v", rep.Verdict.Warnings)
	}
	// read with the default decimal comma (ingest.ReadOptions.DecimalMark):
	// the other reading is larger; 1000 with the comma's grouping (words.grouped)
	if !rep.Input.DecimalComma || !strings.Contains(w.Text, "read with a decimal comma") || !strings.Contains(w.Text, "1\u00a0000 times larger") ||
		!strings.Contains(w.Text, "Decimal mark") || w.Vals["factor"] != 1000 {
		t.Errorf("warning %q %v", w.Text, w.Vals)
	}
	for _, mark := range []string{"comma", "point"} {
		rep, err := Analyze(Request{Text: text, Options: Options{DecimalMark: mark}})
		if err != nil {
			t.Fatal(err)
		}
		if warningOf(rep, "ambiguous-decimal-mark") != nil {
			t.Errorf("decimal mark %q chosen: still warned", mark)
		}
	}
	// the point reading's sentence, with the point's grouping
	if s := (words{}).warnAmbiguousMark("Gap", false); !strings.Contains(s, "thousands separator") || !strings.Contains(s, "1,000 times smaller") {
		t.Errorf("point reading: %q", s)
	}
}

// TestUnusedCellsAgree: the value column's unused cells are counted the
// same way in counts, input.summary and input.problems: rejected = cells
// not numbers in the summary = problems of the value column that are not
// missing; missing = empty + marked missing = its missing problems; other
// columns' cells are only counted at the end of the summary. Invented
// data: row 3 a comma among points, row 4 NA, row 5 empty, row 6 text,
// row 8 an empty label.
func TestUnusedCellsAgree(t *testing.T) {
	text := "Line\tTorque\nA\t12.31\nB\t12,35\nA\tNA\nB\t\nA\tabc\nB\t12.40\n\t12.33\nA\t12.36\n"
	rep, err := Analyze(Request{Text: text, Value: "Torque"})
	if err != nil {
		t.Fatal(err)
	}
	var notNum, missing, other int
	for _, p := range rep.Input.Problems {
		switch {
		case p.Row <= 0:
		case p.Column != "Torque":
			other++
		case p.Kind == ingest.KindMissing:
			missing++
		default:
			notNum++
		}
	}
	// by construction: 2 not numbers (rows 3, 6), 2 missing (rows 4, 5),
	// 1 empty label (row 8), 4 values read (rows 2, 7, 8, 9)
	c := rep.Counts
	if c.Rejected != 2 || notNum != 2 || c.Missing != 2 || missing != 2 || other != 1 || c.Used != 4 {
		t.Errorf("counts %+v; problems: %d not numbers, %d missing, %d in other columns", c, notNum, missing, other)
	}
	want := "4 values read; 2 cells not numbers (rows 3, 6); 1 empty; 1 marked missing"
	if !strings.HasPrefix(rep.Input.Summary, want) || !strings.Contains(rep.Input.Summary, "other columns: 1 cell empty or not readable") {
		t.Errorf("summary %q, want it to start %q and count the other column's cell", rep.Input.Summary, want)
	}
	if w := warningOf(rep, "mixed-decimal-marks"); w == nil || w.Vals["dropped"] != 1 {
		t.Errorf("mixed-marks warning %+v", w)
	}
}
