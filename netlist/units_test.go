package netlist

import (
	"math"
	"testing"
)

// The SI prefixes and their powers are those of the SI brochure (BIPM,
// 9th edition, table 7) [pub].
func TestParseNumber(t *testing.T) {
	tests := []struct {
		in   string
		val  float64
		unit string
		msg  string
	}{
		{in: "4.7", val: 4.7},
		{in: "1e-9", val: 1e-9},
		{in: "1E3", val: 1000},
		{in: "-0.5V", val: -0.5, unit: "V"},
		{in: "+2", val: 2},
		{in: ".5", val: 0.5},
		{in: "100nF", val: 100e-9, unit: "F"},
		{in: "4.7u", val: 4.7e-6},
		{in: "4.7µ", val: 4.7e-6},
		{in: "4.7μF", val: 4.7e-6, unit: "F"},
		{in: "8kV", val: 8000, unit: "V"},
		{in: "0.5ohm", val: 0.5, unit: "Ω"},
		{in: "20mΩ", val: 0.02, unit: "Ω"},
		{in: "3fF", val: 3e-15, unit: "F"},
		{in: "2pF", val: 2e-12, unit: "F"},
		{in: "1m", val: 1e-3},
		{in: "1M", val: 1e6},
		{in: "1G", val: 1e9},
		{in: "1T", val: 1e12},
		{in: "1mA", val: 1e-3, unit: "A"},
		{in: "1ms", val: 1e-3, unit: "s"},
		{in: "5kHz", val: 5000, unit: "Hz"},
		{in: "1Hz", val: 1, unit: "Hz"},
		{in: "2W", val: 2, unit: "W"},
		{in: "300uJ", val: 300e-6, unit: "J"},
		{in: "1.5nH", val: 1.5e-9, unit: "H"},
		{in: "1H", val: 1, unit: "H"},
		{in: "2F", val: 2, unit: "F"},
		{in: "1.5e3k", val: 1.5e6},
		{in: "1K", msg: `"1K": unknown prefix or unit "K" (did you mean k?)`},
		{in: "1MEG", msg: `"1MEG": there is no MEG prefix; write M for mega (1M) and m for milli`},
		{in: "1meg", msg: `"1meg": there is no MEG prefix; write M for mega (1M) and m for milli`},
		{in: "1Ohm", msg: `"1Ohm": unknown prefix or unit "Ohm" (did you mean ohm?)`},
		{in: "abc", msg: `"abc" is not a number`},
		{in: "1e", msg: `"1e": unknown prefix or unit "e"`},
		{in: "5%", msg: `"5%": percentages are only for tolerance lines`},
		{in: "1e999", msg: `"1e999": exponent out of range`},
		{in: "1e300T", msg: `"1e300T" is too large`},
		{in: ".", msg: `"." is not a number`},
	}
	for _, tt := range tests {
		n, msg := parseNumber(tt.in, false)
		if msg != tt.msg {
			t.Errorf("parseNumber(%q) message %q, want %q", tt.in, msg, tt.msg)
			continue
		}
		if msg != "" {
			continue
		}
		if n.val != tt.val || n.unit != tt.unit {
			t.Errorf("parseNumber(%q) = %g %q, want %g %q", tt.in, n.val, n.unit, tt.val, tt.unit)
		}
	}
	if n, msg := parseNumber("5%", true); msg != "" || !n.percent || n.val != 5 {
		t.Errorf("parseNumber(5%%, true) = %+v %q", n, msg)
	}
}

// Engineering notation: the mantissa in [1, 1000) with the SI prefix of the
// power of ten (BIPM SI brochure, 9th edition, table 7) [pub]; the expected
// strings are rounded to four significant digits by hand [calc].
func TestFormatSI(t *testing.T) {
	tests := []struct {
		v    float64
		unit string
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

// Units of the parameters and levels follow LANGUAGE.md and MODELS.md, the
// project's contract, and the waveform units of CHECKS.md [pub: the
// standards' level definitions].
func TestUnits(t *testing.T) {
	for _, tt := range []struct {
		k    Kind
		p    string
		want string
	}{
		{Capacitor, "value", "F"}, {Capacitor, "esr", "Ω"}, {Capacitor, "esl", "H"},
		{Clamp, "vbr", "V"}, {Clamp, "emax", "J"}, {Clamp, "nbr", ""}, {Clamp, "ipp", "A"},
		{Strike, "rate", "Hz"}, {Strike, "width", "s"}, {Line, "delay", "s"}, {Pin, "cin", "F"},
		{Resistor, "nope", ""},
	} {
		if got := ParamUnit(tt.k, tt.p); got != tt.want {
			t.Errorf("ParamUnit(%s, %s) = %q, want %q", tt.k, tt.p, got, tt.want)
		}
	}
	for w, want := range map[string]string{"iec61000-4-2": "V", "hbm": "V", "iso10605": "V",
		"surge-1.2-50": "V", "eft": "V", "surge-8-20": "A", "tlp": "A", "pwl": ""} {
		if got := LevelUnit(w); got != want {
			t.Errorf("LevelUnit(%s) = %q, want %q", w, got, want)
		}
	}
}
