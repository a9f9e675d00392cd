package netlist

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// prefixes are the SI prefixes a number may carry (spec.Prefixes).
var prefixes = spec.Prefixes

// units maps a unit as written in a deck to its symbol.
var units = map[string]spec.Unit{
	"V": spec.Volt, "A": spec.Ampere, "F": spec.Farad, "H": spec.Henry, "Ω": spec.Ohm, "ohm": spec.Ohm,
	"s": spec.Second, "Hz": spec.Hertz, "W": spec.Watt, "J": spec.Joule,
}

// number is a parsed numeric literal: its value in SI units and the unit
// symbol written after it ("" when none).
type number struct {
	val     float64
	unit    spec.Unit
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
				return number{}, fmt.Sprintf("%q: the prefixes are f, p, n, u (µ), m, k, M, G and T; mega is M (1M) and milli is m", s)
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

// ParseValue reads text as the deck reads a parameter's value: a number with
// an optional SI prefix and unit, where a unit written must be unit and the
// value must keep rule. what names the value in the error ("--max").
// Values from the command line go through it, so that they follow the
// deck's rules exactly.
func ParseValue(what, text string, unit spec.Unit, rule spec.Rule) (float64, error) {
	v, msg := numValue(what, unit, rule, strings.TrimSpace(text))
	if msg != "" {
		return 0, errors.New(msg)
	}
	return v, nil
}

// ParseLevels reads a comma-separated list of levels of waveform w as the
// strike's level= reads them: positive numbers in the waveform's unit.
func ParseLevels(list string, w *waveforms.Waveform) ([]float64, error) {
	var out []float64
	var errs []error
	for _, text := range strings.Split(list, ",") {
		v, msg := levelValue(strings.TrimSpace(text), w)
		if msg != "" {
			errs = append(errs, errors.New(msg))
			continue
		}
		out = append(out, v)
	}
	return out, errors.Join(errs...)
}

// levelValue reads one level of waveform w (nil: unknown, any unit).
func levelValue(text string, w *waveforms.Waveform) (float64, string) {
	n, msg := parseNumber(text, false)
	switch {
	case msg != "":
		return 0, msg
	case n.unit != "" && w != nil && n.unit != w.Unit:
		if w.Unit == "" {
			return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are plain scale factors", text, n.unit.Word(), w.Name)
		}
		return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are in %s", text, n.unit.Word(), w.Name, w.Unit.Word())
	case !(n.val > 0) || math.IsInf(n.val, 0):
		return 0, fmt.Sprintf("level %s must be positive (polarity= gives the sign)", text)
	}
	return n.val, ""
}
