package spec

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// units maps a unit as a number writes it to its symbol: every symbol of
// the deck language, and ohm for keyboards without Ω.
var units = map[string]Unit{
	"V": Volt, "A": Ampere, "F": Farad, "H": Henry, "Ω": Ohm, "ohm": Ohm,
	"s": Second, "Hz": Hertz, "W": Watt, "J": Joule,
}

// maxExp bounds an exponent as written: far beyond any float64, and small
// enough that adding a prefix's power cannot overflow.
const maxExp = 400

// Number is a number read from text (ParseNumber).
type Number struct {
	Value   float64 // in SI units, the prefix applied; in percent when Percent
	Unit    Unit    // the unit written after it, Dimensionless when none
	Percent bool    // written with a trailing %
}

// ParseNumber reads s as the deck language writes a number: a decimal or
// exponent form (4.7, .5, 1e-9), then an optional SI prefix (Prefixes),
// then an optional unit (V A F H Ω ohm s Hz W J), with no space: 100nF,
// 8kV, 20mΩ. A lone letter after the number is a prefix unless it is a
// unit (2F is two farads). With percent, a trailing % is taken instead
// of a prefix and unit. The message, when s is not such a number, is fit
// for a user and quotes s.
func ParseNumber(s string, percent bool) (Number, string) {
	d, msg := ScanDecimal(s)
	if msg != "" {
		return Number{}, msg
	}
	var n Number
	shift := 0
	switch suffix := d.Rest; {
	case suffix == "":
	case percent && suffix == "%":
		n.Percent = true
	default:
		exp, u, ok := parseSuffix(suffix)
		if !ok {
			return Number{}, suffixProblem(s, suffix)
		}
		shift, n.Unit = exp, u
	}
	n.Value, msg = d.Value(shift)
	if msg != "" {
		return Number{}, msg
	}
	return n, ""
}

// ParsePlain reads s as a plain decimal number: the decimal or exponent
// form of ParseNumber with nothing after it, as a column of measured data
// writes one.
func ParsePlain(s string) (float64, string) {
	d, msg := ScanDecimal(s)
	switch {
	case msg != "":
		return 0, msg
	case d.Rest != "":
		return 0, fmt.Sprintf("%q is not a number", s)
	}
	return d.Value(0)
}

// ParseUnit reads a unit with an optional SI prefix, as written after a
// number or in a column header's brackets ("mA", "kΩ", "V"): the power of
// ten of its prefix and its symbol. ok is false when s is not a unit; a
// lone prefix is not one.
func ParseUnit(s string) (exp int, u Unit, ok bool) {
	exp, u, ok = parseSuffix(s)
	return exp, u, ok && u != Dimensionless
}

// parseSuffix reads what may follow a number: a unit, an SI prefix, or a
// prefix and a unit. A unit is looked up whole first, so that F is farads
// and T tera.
func parseSuffix(s string) (exp int, u Unit, ok bool) {
	if u, ok := units[s]; ok {
		return 0, u, true
	}
	_, w := utf8.DecodeRuneInString(s)
	p, ok := Prefixes[s[:w]]
	if !ok {
		return 0, "", false
	}
	if s[w:] == "" {
		return p, Dimensionless, true
	}
	u, ok = units[s[w:]]
	return p, u, ok
}

// suffixProblem says what is wrong with the suffix of number s, naming
// the slips users make: another program's mega, a stray byte, a case.
func suffixProblem(s, suffix string) string {
	r, _ := utf8.DecodeRuneInString(suffix)
	switch {
	case r == utf8.RuneError:
		return fmt.Sprintf("%q: unexpected character after the number", s)
	case strings.EqualFold(suffix, "meg") || (len(suffix) > 3 && strings.EqualFold(suffix[:3], "meg")):
		return fmt.Sprintf("%q: the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m", s)
	case suffix == "%":
		return fmt.Sprintf("%q: percentages are only for tolerance lines", s)
	}
	msg := fmt.Sprintf("%q: unknown prefix or unit %q", s, suffix)
	if hint := SuffixHint(suffix); hint != "" {
		msg += " (did you mean " + hint + "?)"
	}
	return msg
}

// SuffixHint proposes the prefix or unit a user probably meant by s, or
// "": the usual slips are the case of a prefix (K, N, U) and the spelling
// of ohm.
func SuffixHint(s string) string {
	var cands []string
	for p := range Prefixes {
		cands = append(cands, p)
		for u := range units {
			cands = append(cands, p+u)
		}
	}
	for u := range units {
		cands = append(cands, u)
	}
	// Prefer a candidate differing only in case.
	best := ""
	for _, c := range cands {
		if strings.EqualFold(c, s) && c != s {
			if best == "" || c < best {
				best = c
			}
		}
	}
	if best != "" {
		return best
	}
	return Suggest(s, cands)
}

// Decimal is the decimal number at the start of a text (ScanDecimal).
type Decimal struct {
	Rest string // the text after the number
	text string // the whole text, for messages
	mant string // sign, digits and point
	exp  int    // the exponent written after e
}

// ScanDecimal reads the decimal number at the start of s: a sign, digits
// with an optional point, then an optional e exponent; an e with no digits
// after it is left in Rest, where a reader reports it. The message, when s
// does not start with a number or its exponent is beyond any float, is fit
// for a user and quotes s.
func ScanDecimal(s string) (Decimal, string) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return Decimal{}, fmt.Sprintf("%q is not a number", s)
	}
	d := Decimal{text: s, mant: s[:i]}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			e, err := strconv.Atoi(s[i+1 : k])
			if err != nil || e > maxExp || e < -maxExp {
				return Decimal{}, fmt.Sprintf("%q: exponent out of range", s)
			}
			d.exp = e
			i = k
		}
	}
	d.Rest = s[i:]
	return d, ""
}

// Value returns the number times ten to shift (a prefix's power). The
// mantissa and both exponents are parsed as one decimal, so that 4.7
// shifted by −6 is exactly the float nearest 4.7e-6, as a user typing 4.7u
// expects. The message says when the value is beyond a float64.
func (d Decimal) Value(shift int) (float64, string) {
	v, err := strconv.ParseFloat(d.mant+"e"+strconv.Itoa(d.exp+shift), 64)
	if ne, ok := err.(*strconv.NumError); ok && ne.Err != strconv.ErrRange {
		return 0, fmt.Sprintf("%q is not a number", d.text)
	}
	if math.IsInf(v, 0) {
		return 0, fmt.Sprintf("%q is too large", d.text)
	}
	return v, ""
}
