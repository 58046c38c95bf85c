package stats

import "testing"

// TestDecimalMarkOption: an ambiguous column ("1,234") follows the user's
// choice. Check values from memory: "1,234" is 1.234 with a decimal comma and
// 1234 with a thousands separator.
func TestDecimalMarkOption(t *testing.T) {
	text := "Torque\n1,234\n1,567\n1,890\n"
	for _, c := range []struct {
		mark string
		mean float64
	}{{"", 1.5636666666666668}, {"comma", 1.5636666666666668}, {"point", 1563.6666666666667}} {
		rep, err := Analyze(Request{Text: text, Options: Options{DecimalMark: c.mark}})
		if err != nil {
			t.Fatalf("mark %q: %v", c.mark, err)
		}
		if rep.Centre == nil || rep.Centre.Mean != c.mean {
			t.Errorf("mark %q: mean = %+v, want %v", c.mark, rep.Centre, c.mean)
		}
	}
	if _, err := Analyze(Request{Text: text, Options: Options{DecimalMark: "dot"}}); err == nil {
		t.Error("an unknown decimal mark must be an error")
	}
}
