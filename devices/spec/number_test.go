package spec

import (
	"math"
	"strconv"
	"testing"
)

// The SI prefixes and their powers of ten are those of the SI Brochure
// (BIPM, 9th edition, table 7) [pub]; µ (U+00B5) and μ (U+03BC) are both
// micro, u its ASCII spelling [practice].
func TestParseNumberPrefixes(t *testing.T) {
	power := map[string]int{
		"f": -15, "p": -12, "n": -9, "u": -6, "µ": -6, "μ": -6,
		"m": -3, "k": 3, "M": 6, "G": 9, "T": 12,
	}
	if len(power) != len(Prefixes) {
		t.Errorf("%d prefixes, want %d", len(Prefixes), len(power))
	}
	for p, e := range power {
		for _, c := range []struct {
			in, literal string
			unit        Unit
		}{
			{"1" + p, "1e" + strconv.Itoa(e), Dimensionless},
			{"3" + p + "V", "3e" + strconv.Itoa(e), Volt},
		} {
			want, _ := strconv.ParseFloat(c.literal, 64)
			n, msg := ParseNumber(c.in, false)
			if msg != "" || n.Value != want || n.Unit != c.unit {
				t.Errorf("%s = %g %q (%s), want %s %q", c.in, n.Value, n.Unit, msg, c.literal, c.unit)
			}
		}
	}
}

// The units and their symbols are the SI's (SI Brochure, 9th edition,
// tables 2 and 4) [pub]; ohm is the deck's ASCII spelling of Ω, and a unit
// letter alone is the unit, not a prefix (LANGUAGE.md) [pub: the deck
// language's contract].
func TestParseNumberUnits(t *testing.T) {
	for _, c := range []struct {
		in   string
		val  float64
		unit Unit
	}{
		{"2V", 2, Volt}, {"2A", 2, Ampere}, {"2F", 2, Farad}, {"2H", 2, Henry},
		{"2Ω", 2, Ohm}, {"2ohm", 2, Ohm}, {"2s", 2, Second}, {"2Hz", 2, Hertz},
		{"2W", 2, Watt}, {"2J", 2, Joule}, {"2T", 2e12, Dimensionless},
		{"2mΩ", 2e-3, Ohm}, {"2kohm", 2e3, Ohm}, {"5kHz", 5e3, Hertz}, {"2ms", 2e-3, Second},
	} {
		n, msg := ParseNumber(c.in, false)
		if msg != "" || n.Value != c.val || n.Unit != c.unit {
			t.Errorf("%s = %g %q (%s), want %g %q", c.in, n.Value, n.Unit, msg, c.val, c.unit)
		}
	}
}

// A prefix joins the exponent before the one decimal-to-binary conversion,
// so the value is the float nearest the decimal written. IEEE 754-2019,
// section 5.12.2, asks such a conversion to be correctly rounded (up to 20
// significant digits for binary64) [mem]; strconv.ParseFloat returns "the
// nearest floating-point number rounded using IEEE754 unbiased rounding"
// [pub: Go's strconv documentation]. Multiplying by the prefix's power after
// converting is not exact: 3 × 1e-15 is one unit in the last place above
// 3e-15 [calc].
func TestParseNumberExact(t *testing.T) {
	if 3*math.Pow10(-15) == 3e-15 {
		t.Fatal("the counter-example no longer shows the rounding")
	}
	for _, c := range []struct{ in, literal string }{
		{"3f", "3e-15"}, {"4.7u", "4.7e-6"}, {"1.5e3k", "1.5e6"}, {"0.1n", "1e-10"}, {"-3.3m", "-3.3e-3"},
		{"+.5", "0.5"}, {"5.", "5"}, {"1E3", "1e3"}, {"2.2e-3p", "2.2e-15"}, {"1e-400", "0"},
		{"1.7976931348623157e308", "1.7976931348623157e308"},
	} {
		want, err := strconv.ParseFloat(c.literal, 64)
		if err != nil {
			t.Fatal(err)
		}
		n, msg := ParseNumber(c.in, false)
		if msg != "" || n.Value != want {
			t.Errorf("%s = %v (%s), want %v", c.in, n.Value, msg, want)
		}
	}
}

// What a deck refuses, each with the words a user can act on; the hints
// name the spelling the deck takes (LANGUAGE.md: prefixes are
// case-sensitive, there is no MEG) [pub: the deck language's contract].
func TestParseNumberMessages(t *testing.T) {
	for _, c := range []struct{ in, msg string }{
		{"abc", `"abc" is not a number`},
		{".", `"." is not a number`},
		{"-", `"-" is not a number`},
		{"", `"" is not a number`},
		{"1K", `"1K": unknown prefix or unit "K" (did you mean k?)`},
		{"1Ohm", `"1Ohm": unknown prefix or unit "Ohm" (did you mean ohm?)`},
		{"3kohms", `"3kohms": unknown prefix or unit "kohms" (did you mean kohm?)`},
		{"1Q", `"1Q": unknown prefix or unit "Q"`},
		{"1MEG", `"1MEG": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m`},
		{"2megohm", `"2megohm": the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m`},
		{"1\xff", `"1\xff": unexpected character after the number`},
		{"1e", `"1e": unknown prefix or unit "e"`},
		{"5%", `"5%": percentages are only for tolerance lines`},
		{"1e999", `"1e999": exponent out of range`},
		{"1e-401", `"1e-401": exponent out of range`},
		{"1e300T", `"1e300T" is too large`},
		{"2e308", `"2e308" is too large`},
	} {
		n, msg := ParseNumber(c.in, false)
		if msg != c.msg {
			t.Errorf("ParseNumber(%q) = %g, %q; want %q", c.in, n.Value, msg, c.msg)
		}
	}
	if n, msg := ParseNumber("5%", true); msg != "" || !n.Percent || n.Value != 5 || n.Unit != Dimensionless {
		t.Errorf("5%% as a percentage: %+v %q", n, msg)
	}
	if _, msg := ParseNumber("5k%", true); msg != `"5k%": unknown prefix or unit "k%"` {
		t.Errorf("5k%%: %q", msg)
	}
}

// A plain number is the decimal or exponent form alone, as measured data
// writes it; Go's other float syntaxes (hexadecimal, Inf, NaN) are not
// numbers a data file holds [practice].
func TestParsePlain(t *testing.T) {
	for _, c := range []struct {
		in  string
		val float64
		msg string
	}{
		{in: "1.5", val: 1.5}, {in: "-2e-3", val: -2e-3}, {in: "+7", val: 7},
		{in: "5V", msg: `"5V" is not a number`},
		{in: "2k", msg: `"2k" is not a number`},
		{in: "0x1p4", msg: `"0x1p4" is not a number`},
		{in: "NaN", msg: `"NaN" is not a number`},
		{in: "Inf", msg: `"Inf" is not a number`},
		{in: "1e999", msg: `"1e999": exponent out of range`},
		{in: "1e309", msg: `"1e309" is too large`},
	} {
		v, msg := ParsePlain(c.in)
		if msg != c.msg || v != c.val {
			t.Errorf("ParsePlain(%q) = %g, %q; want %g, %q", c.in, v, msg, c.val, c.msg)
		}
	}
}

// A unit in a column header: a symbol with an optional prefix; a lone
// prefix is no unit, and T alone is tera (SI Brochure, 9th edition,
// table 7) [pub].
func TestParseUnit(t *testing.T) {
	for _, c := range []struct {
		in   string
		exp  int
		unit Unit
		ok   bool
	}{
		{"mA", -3, Ampere, true}, {"kΩ", 3, Ohm, true}, {"V", 0, Volt, true}, {"µF", -6, Farad, true},
		{"GHz", 9, Hertz, true}, {"F", 0, Farad, true}, {"mohm", -3, Ohm, true},
		{"k", 0, "", false}, {"T", 0, "", false}, {"Ohm", 0, "", false}, {"", 0, "", false}, {"deg", 0, "", false},
	} {
		exp, u, ok := ParseUnit(c.in)
		if ok != c.ok || ok && (exp != c.exp || u != c.unit) {
			t.Errorf("ParseUnit(%q) = %d %q %v, want %d %q %v", c.in, exp, u, ok, c.exp, c.unit, c.ok)
		}
	}
}

// What DeckNumber writes, ParseNumber reads back to the same float: both
// follow the deck's prefixes and units, and a value of four significant
// digits survives FormatSI's rounding [calc].
func TestDeckNumberReadsBack(t *testing.T) {
	for _, c := range []struct {
		v    float64
		unit Unit
	}{
		{4.7e-9, Farad}, {8000, Volt}, {0.02, Ohm}, {1.5e-9, Henry}, {150e-12, Farad},
		{-0.5, Volt}, {5000, Hertz}, {1e-6, Second}, {2.5, Joule}, {330, Ohm}, {1e-14, Ampere},
	} {
		text := DeckNumber(c.v, c.unit)
		n, msg := ParseNumber(text, false)
		if msg != "" || n.Value != c.v || n.Unit != c.unit {
			t.Errorf("%g %s: wrote %q, read %g %q (%s)", c.v, c.unit, text, n.Value, n.Unit, msg)
		}
	}
}

// IBIS-style scaling reads the decimal, then lets the reader pick the
// power from what follows: the rest is left to it [practice].
func TestScanDecimal(t *testing.T) {
	d, msg := ScanDecimal("2.6pF")
	if msg != "" || d.Rest != "pF" {
		t.Fatalf("rest %q (%s)", d.Rest, msg)
	}
	if v, msg := d.Value(-12); msg != "" || v != 2.6e-12 {
		t.Errorf("2.6 shifted by -12 = %v (%s)", v, msg)
	}
	d, _ = ScanDecimal("1e5")
	if v, _ := d.Value(0); v != 1e5 || d.Rest != "" {
		t.Errorf("1e5 = %v, rest %q", v, d.Rest)
	}
	if _, msg := ScanDecimal("NA"); msg != `"NA" is not a number` {
		t.Errorf("NA: %q", msg)
	}
}
