package datafile

import (
	"math"
	"strconv"
	"testing"
)

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func TestQuantity(t *testing.T) {
	for _, c := range []struct {
		s, unit string
		want    float64
		bad     bool
	}{
		{"6.8V", "V", 6.8, false},
		{"1mA", "A", 1e-3, false},
		{"45p", "F", 45e-12, false},
		{"0.4nH", "H", 0.4e-9, false},
		{"25ohm", "Ω", 25, false},
		{"4.7u", "F", 4.7e-6, false},
		{"1.2e3k", "Ω", 1.2e6, false},
		{"2MHz", "Hz", 2e6, false},
		{"3mV", "A", 0, true},
		{"1MEG", "Ω", 0, true},
		{"x", "V", 0, true},
		{"5Q", "V", 0, true},
	} {
		v, msg := quantity(c.s, c.unit)
		if (msg != "") != c.bad || (!c.bad && math.Abs(v-c.want) > 1e-15*math.Abs(c.want)) {
			t.Errorf("quantity(%q) = %g, %q", c.s, v, msg)
		}
	}
}
