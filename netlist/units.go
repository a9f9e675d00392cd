package netlist

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// prefixes maps an SI prefix to its power of ten. Both the micro sign (U+00B5)
// and the Greek mu (U+03BC) are accepted because keyboards produce either.
var prefixes = map[string]int{
	"f": -15, "p": -12, "n": -9, "u": -6, "µ": -6, "μ": -6,
	"m": -3, "k": 3, "M": 6, "G": 9, "T": 12,
}

// units maps a unit as written to the symbol used everywhere else.
var units = map[string]string{
	"V": "V", "A": "A", "F": "F", "H": "H", "Ω": "Ω", "ohm": "Ω",
	"s": "s", "Hz": "Hz", "W": "W", "J": "J",
}

// unitWords names the units in messages.
var unitWords = map[string]string{
	"V": "volts", "A": "amperes", "F": "farads", "H": "henries", "Ω": "ohms",
	"s": "seconds", "Hz": "hertz", "W": "watts", "J": "joules", "": "a plain number",
}

// number is a parsed numeric literal: its value in SI units and the unit
// symbol written after it ("" when none).
type number struct {
	val     float64
	unit    string
	percent bool
}

// parseNumber reads a number with an optional SI prefix and unit, or a
// trailing % when allowPercent is set. It returns a message fit for a user
// when the text is not a number.
func parseNumber(s string, allowPercent bool) (number, string) {
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
		return number{}, fmt.Sprintf("%q is not a number", s)
	}
	mant := s[:i]
	exp := 0
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
			if err != nil || e > 400 || e < -400 {
				return number{}, fmt.Sprintf("%q: exponent out of range", s)
			}
			exp = e
			i = k
		}
		// "1e" or "2E": fall through, the suffix check reports it.
	}
	suffix := s[i:]
	var n number
	if allowPercent && suffix == "%" {
		n.percent = true
		suffix = ""
	}
	if suffix != "" {
		if u, ok := units[suffix]; ok {
			n.unit = u
		} else {
			r, w := utf8.DecodeRuneInString(suffix)
			p, ok := prefixes[suffix[:w]]
			rest := suffix[w:]
			u, uok := units[rest]
			switch {
			case r == utf8.RuneError:
				return number{}, fmt.Sprintf("%q: unexpected character after the number", s)
			case strings.EqualFold(suffix, "meg") || (len(suffix) > 3 && strings.EqualFold(suffix[:3], "meg")):
				return number{}, fmt.Sprintf("%q: there is no MEG prefix; write M for mega (1M) and m for milli", s)
			case ok && (rest == "" || uok):
				exp += p
				n.unit = u
			case suffix == "%":
				return number{}, fmt.Sprintf("%q: percentages are only for tolerance lines", s)
			default:
				msg := fmt.Sprintf("%q: unknown prefix or unit %q", s, suffix)
				if hint := suggestSuffix(suffix); hint != "" {
					msg += " (did you mean " + hint + "?)"
				}
				return number{}, msg
			}
		}
	}
	// Parse mantissa and exponent together so that 4.7u is exactly the
	// float nearest 4.7e-6, as a user typing it would expect.
	v, err := strconv.ParseFloat(mant+"e"+strconv.Itoa(exp), 64)
	if err != nil && !isRangeErr(err) {
		return number{}, fmt.Sprintf("%q is not a number", s)
	}
	if math.IsInf(v, 0) {
		return number{}, fmt.Sprintf("%q is too large", s)
	}
	n.val = v
	return n, ""
}

func isRangeErr(err error) bool {
	ne, ok := err.(*strconv.NumError)
	return ok && ne.Err == strconv.ErrRange
}

// suggestSuffix proposes the suffix a user probably meant: the usual slips are
// the case of a prefix (K, N, U) and the spelling of ohm.
func suggestSuffix(s string) string {
	cands := []string{}
	for p := range prefixes {
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
	return suggest(s, cands)
}

// FormatSI renders v in engineering notation with an SI prefix and the unit,
// with up to four significant digits and trailing zeros trimmed:
// FormatSI(4.7e-9, "F") is "4.7 nF", FormatSI(0, "V") is "0 V". A value
// beyond the prefixes (below femto, above tera) keeps an exponent. With an
// empty unit the number is printed plainly ("0.001", "1e-14"), without a
// prefix, because a lone prefix reads badly.
func FormatSI(v float64, unit string) string {
	sep := " "
	if unit == "" {
		sep = ""
	}
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return strconv.FormatFloat(v, 'g', -1, 64) + sep + unit
	case v == 0:
		return "0" + sep + unit
	case unit == "":
		return strconv.FormatFloat(v, 'g', 4, 64)
	}
	sign := ""
	if v < 0 {
		sign = "-"
		v = -v
	}
	e := strconv.FormatFloat(v, 'e', 3, 64) // d.ddde±XX
	k := strings.IndexByte(e, 'e')
	digits := e[:1] + e[2:k]
	exp, _ := strconv.Atoi(e[k+1:])
	eng := exp - ((exp%3)+3)%3
	if eng < -15 || eng > 12 {
		return sign + trimZeros(e[:k]) + "e" + strconv.Itoa(exp) + sep + unit
	}
	intDigits := 1 + exp - eng
	num := trimZeros(digits[:intDigits] + "." + digits[intDigits:])
	prefix := ""
	for p, pe := range prefixes {
		if pe == eng && p != "µ" && p != "μ" {
			prefix = p
		}
	}
	if eng == -6 {
		prefix = "µ"
	}
	return sign + num + " " + prefix + unit
}

func trimZeros(s string) string {
	if strings.IndexByte(s, '.') < 0 {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// LevelUnit is the unit of a waveform's levels: volts for discharges and the
// voltage surge, amperes for the current surge and TLP, and none for a
// piecewise-linear file (a scale factor).
func LevelUnit(waveform string) string {
	switch waveform {
	case "iec61000-4-2", "iec61000-4-2-network", "iec61000-4-2-air", "hbm", "iso10605", "surge-1.2-50", "surge-cwg", "eft":
		return "V"
	case "surge-8-20", "tlp":
		return "A"
	}
	return ""
}

// ParamUnit is the unit symbol of a parameter of an element kind ("" for a
// dimensionless one or an unknown key). For a strike it covers the waveform
// parameters of every waveform; "level" has the unit of the waveform and is
// reported as "" here (see LevelUnit).
func ParamUnit(kind Kind, param string) string {
	if kind == Strike {
		if p, ok := strikeParams[param]; ok {
			return p.unit
		}
		return ""
	}
	if p := specOf(kind, param); p != nil {
		return p.unit
	}
	return ""
}
