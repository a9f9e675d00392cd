package report

import (
	"strings"
	"testing"

	"zapnet/mna/study/whatif"
)

func TestFractionText(t *testing.T) {
	// [practice] interval bounds near 0 and 1 keep two significant digits
	// of their distance from the edge.
	for _, c := range []struct {
		f    float64
		want string
	}{
		{0, "0.0 %"}, {1, "100.0 %"}, {0.5, "50.0 %"}, {0.00038, "0.038 %"},
		{0.9996, "99.960 %"}, {0.995, "99.50 %"}, {0.97, "97.0 %"},
	} {
		if got := fractionText(c.f); got != c.want {
			t.Errorf("fractionText(%g) = %q, want %q", c.f, got, c.want)
		}
	}
}

// A step given as a whole percentage is printed as given: 0.07 is 7 %,
// though 100 × 0.07 is 7.000000000000001 in binary floating point [calc].
func TestSensitivityStepText(t *testing.T) {
	var b strings.Builder
	r := &whatif.SensitivityResult{Step: 0.07, Baseline: 12.5, BaselineLimiting: "U1 vmax"}
	if err := SensitivityTable(&b, r, "", ""); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	for _, want := range []string{"each parameter ±7 %,", "| −7 % ", "| +7 % ", "raising the parameter 7 % "} {
		if !strings.Contains(out, want) {
			t.Errorf("no %q in:\n%s", want, out)
		}
	}
	if strings.Contains(out, "0000") {
		t.Errorf("the step is printed with binary noise:\n%s", out)
	}
}
