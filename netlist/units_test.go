package netlist

import (
	"math"
	"testing"
	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/waveforms"
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
		{in: "1MEG", msg: `"1MEG": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m`},
		{in: "1meg", msg: `"1meg": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m`},
		{in: "1Ohm", msg: `"1Ohm": unknown prefix or unit "Ohm" (did you mean ohm?)`},
		{in: "abc", msg: `"abc" is not a number`},
		{in: "1e", msg: `"1e": unknown prefix or unit "e"`},
		{in: "5%", msg: `"5%": percentages are only for tolerance lines`},
		{in: "1e999", msg: `"1e999": exponent out of range`},
		{in: "1e300T", msg: `"1e300T" is too large`},
		{in: ".", msg: `"." is not a number`},
	}
	for _, tt := range tests {
		n, msg := spec.ParseNumber(tt.in, false)
		if msg != tt.msg {
			t.Errorf("spec.ParseNumber(%q) message %q, want %q", tt.in, msg, tt.msg)
			continue
		}
		if msg != "" {
			continue
		}
		if n.Value != tt.val || string(n.Unit) != tt.unit {
			t.Errorf("spec.ParseNumber(%q) = %g %q, want %g %q", tt.in, n.Value, n.Unit, tt.val, tt.unit)
		}
	}
	if n, msg := spec.ParseNumber("5%", true); msg != "" || !n.Percent || n.Value != 5 {
		t.Errorf("spec.ParseNumber(5%%, true) = %+v %q", n, msg)
	}
}

// Units of the parameters and levels follow LANGUAGE.md and MODELS.md, the
// project's contract, and the waveform units of CHECKS.md [pub: the
// standards' level definitions]; the deck reads them from the catalogues.
func TestUnits(t *testing.T) {
	for _, tt := range []struct {
		k, p string
		want spec.Unit
	}{
		{"capacitor", "value", "F"}, {"capacitor", "esr", "Ω"}, {"capacitor", "esl", "H"},
		{"clamp", "vbr", "V"}, {"clamp", "emax", "J"}, {"clamp", "nbr", ""}, {"clamp", "ipp", "A"},
		{"line", "delay", "s"}, {"pin", "cin", "F"},
	} {
		if got := devices.Lookup(tt.k).Param(tt.p).Unit; got != tt.want {
			t.Errorf("unit of %s of a %s = %q, want %q", tt.p, tt.k, got, tt.want)
		}
	}
	if devices.Lookup("resistor").Param("nope") != nil {
		t.Errorf("a resistor has no parameter nope")
	}
	for _, tt := range []struct {
		w, p string
		want spec.Unit
	}{{"eft", "rate", "Hz"}, {"tlp", "width", "s"}} {
		if got := waveforms.Lookup(tt.w).Param(tt.p).Unit; got != tt.want {
			t.Errorf("unit of %s of waveform %s = %q, want %q", tt.p, tt.w, got, tt.want)
		}
	}
	for w, want := range map[string]spec.Unit{"iec61000-4-2": "V", "hbm": "V", "iso10605": "V",
		"surge-1.2-50": "V", "eft": "V", "surge-8-20": "A", "tlp": "A", "pwl": ""} {
		if got := waveforms.Lookup(w).Unit; got != want {
			t.Errorf("level unit of %s = %q, want %q", w, got, want)
		}
	}
}

// Values from the command line follow the deck's rules exactly: the SI
// prefixes and units of LANGUAGE.md, the parameter's unit, its rule.
func TestParseValue(t *testing.T) {
	for _, c := range []struct {
		s    string
		unit spec.Unit
		rule spec.Rule
		want float64
		ok   bool
	}{
		{"4k", "V", spec.Positive, 4000, true},
		{"8kV", "V", spec.Positive, 8000, true},
		{"16A", "A", spec.Positive, 16, true},
		{"1.5e3", "V", spec.Positive, 1500, true},
		{"330p", "F", spec.Positive, 330e-12, true},
		{"2.5µ", "H", spec.Positive, 2.5e-6, true},
		{"100m", "Ω", spec.NonNegative, 0.1, true},
		{"50ohm", "Ω", spec.NonNegative, 50, true},
		{"50Ω", "Ω", spec.NonNegative, 50, true},
		{"1M", "Ω", spec.NonNegative, 1e6, true},
		{"0", "Ω", spec.NonNegative, 0, true},
		{"0", "Ω", spec.Positive, 0, false},
		{"4kA", "V", spec.Positive, 0, false},
		{"4MEG", "V", spec.Positive, 0, false},
		{"", "V", spec.Positive, 0, false},
		{"k", "V", spec.Positive, 0, false},
		{"NaN", "V", spec.Positive, 0, false},
	} {
		got, err := ParseValue("x", c.s, c.unit, c.rule)
		if (err == nil) != c.ok || (c.ok && math.Abs(got-c.want) > 1e-12*math.Abs(c.want)) {
			t.Errorf("ParseValue(%q, %q) = %g, %v; want %g, ok %v", c.s, c.unit, got, err, c.want, c.ok)
		}
	}
}
