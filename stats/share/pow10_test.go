package share

import (
	"strconv"
	"testing"
)

// The written-out powers of ten are 10^0 .. 10^maxDigits: each equals the
// integer strconv reads from "1" followed by d zeros (definition), and
// none was left out of the literal.
func TestPow10Table(t *testing.T) {
	digits := "1"
	for d := 0; d <= maxDigits; d++ {
		want, err := strconv.ParseInt(digits, 10, 64)
		if err != nil || pow10[d] != want {
			t.Errorf("pow10[%d] = %d, want %d (%v)", d, pow10[d], want, err)
		}
		digits += "0"
	}
}
