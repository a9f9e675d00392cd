package spec

import (
	"math"
	"testing"
)

// Engineering notation: the mantissa in [1, 1000) with the SI prefix of the
// power of ten (BIPM SI brochure, 9th edition, table 7) [pub]; the expected
// strings are rounded to four significant digits by hand [calc].
func TestFormatSI(t *testing.T) {
	tests := []struct {
		v    float64
		unit Unit
		want string
	}{
		{4.7e-9, "F", "4.7 nF"},
		{8000, "V", "8 kV"},
		{0, "V", "0 V"},
		{math.Copysign(0, -1), "V", "0 V"},
		{0.02, "Ω", "20 mΩ"},
		{1, "A", "1 A"},
		{-0.5, "V", "-500 mV"},
		{1.5e-9, "H", "1.5 nH"},
		{123456, "V", "123.5 kV"},
		{999.96, "V", "1 kV"},
		{999.94, "V", "999.9 V"},
		{100e-9, "F", "100 nF"},
		{1e-6, "F", "1 µF"},
		{150e-12, "F", "150 pF"},
		{1e-14, "A", "10 fA"},
		{1e-18, "A", "1e-18 A"},
		{2.5e15, "Hz", "2.5e15 Hz"},
		{5000, "Hz", "5 kHz"},
		{1e-3, "", "0.001"},
		{1, "", "1"},
		{1e-14, "", "1e-14"},
		{330, "Ω", "330 Ω"},
		{0.7, "V", "700 mV"},
	}
	for _, tt := range tests {
		if got := FormatSI(tt.v, tt.unit); got != tt.want {
			t.Errorf("FormatSI(%g, %q) = %q, want %q", tt.v, tt.unit, got, tt.want)
		}
	}
}

// NiceCeil rounds up to 1, 2 or 5 times a power of ten [practice].
func TestNiceCeil(t *testing.T) {
	for _, c := range [][2]float64{{9.6e-9, 10e-9}, {16e-9, 20e-9}, {1e-9, 1e-9}, {2.1, 5}, {51, 100}} {
		if got := NiceCeil(c[0]); math.Abs(got/c[1]-1) > 1e-12 {
			t.Errorf("NiceCeil(%g) = %g, want %g", c[0], got, c[1])
		}
	}
}
