package report

import "testing"

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
