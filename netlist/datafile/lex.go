package datafile

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// field is one word of a line with the rune column where it starts.
type field struct {
	text string
	col  int
}

// line is one line of a file, split into its number and text, the comment
// already removed.
type line struct {
	no   int
	text string
}

// lines splits src into lines, dropping the text from the first comment
// rune on (comment == 0: no comments) and a trailing carriage return.
func lines(src []byte, comment rune) []line {
	var out []line
	for i, s := range strings.Split(string(src), "\n") {
		s = strings.TrimSuffix(s, "\r")
		if comment != 0 {
			if k := strings.IndexRune(s, comment); k >= 0 {
				s = s[:k]
			}
		}
		out = append(out, line{no: i + 1, text: s})
	}
	return out
}

// words splits a line at white space.
func words(s string) []field {
	var out []field
	col, start, startCol := 1, -1, 0
	for i, r := range s {
		space := r == ' ' || r == '\t'
		switch {
		case space && start >= 0:
			out = append(out, field{s[start:i], startCol})
			start = -1
		case !space && start < 0:
			start, startCol = i, col
		}
		col++
	}
	if start >= 0 {
		out = append(out, field{s[start:], startCol})
	}
	return out
}

// splitSep splits a line at sep (a comma, semicolon or tab), trimming the
// white space around each field; a field in double quotes may hold sep.
func splitSep(s string, sep rune) []field {
	var out []field
	col := 1
	cur := strings.Builder{}
	curCol, inQuote, started := 1, false, false
	flush := func() {
		out = append(out, field{strings.TrimSpace(cur.String()), curCol})
		cur.Reset()
		started = false
	}
	for _, r := range s {
		switch {
		case r == '"':
			inQuote = !inQuote
		case r == sep && !inQuote:
			flush()
			curCol = col + 1
		default:
			if !started && (r == ' ' || r == '\t') {
				curCol = col + 1
			} else {
				started = true
				cur.WriteRune(r)
			}
		}
		col++
	}
	flush()
	return out
}

// prefixes are the SI prefixes a quantity may carry, as in the deck
// language: m is milli and M mega, there is no MEG.
var prefixes = map[string]int{
	"f": -15, "p": -12, "n": -9, "u": -6, "µ": -6, "μ": -6,
	"m": -3, "k": 3, "M": 6, "G": 9, "T": 12,
}

// units maps a unit as written to its symbol.
var units = map[string]string{
	"V": "V", "A": "A", "F": "F", "H": "H", "Ω": "Ω", "ohm": "Ω", "Ohm": "Ω",
	"s": "s", "Hz": "Hz", "W": "W", "J": "J",
}

// unitNames names the units in messages.
var unitNames = map[string]string{
	"V": "volts", "A": "amperes", "F": "farads", "H": "henries", "Ω": "ohms",
	"s": "seconds", "Hz": "hertz", "W": "watts", "J": "joules",
}

// mantissa returns the length of the leading decimal number of s (sign,
// digits, point, exponent), 0 when s does not start with one.
func mantissa(s string) int {
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
		return 0
	}
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
			i = k
		}
	}
	return i
}

// quantity reads a number with an optional SI prefix and unit, such as
// 6.8V, 1mA, 12p, 0.4nH or 25ohm. want is the unit the quantity must have
// when it carries one ("" for a plain number). It returns a message fit for
// a user when the text is not such a quantity.
func quantity(s, want string) (float64, string) {
	n := mantissa(s)
	if n == 0 {
		return 0, fmt.Sprintf("%q is not a number", s)
	}
	v, err := strconv.ParseFloat(s[:n], 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Sprintf("%q is not a finite number", s)
	}
	suffix := s[n:]
	if suffix == "" {
		return v, ""
	}
	unit, exp := "", 0
	if u, ok := units[suffix]; ok {
		unit = u
	} else {
		_, w := utf8.DecodeRuneInString(suffix)
		p, ok := prefixes[suffix[:w]]
		u, uok := units[suffix[w:]]
		switch {
		case strings.EqualFold(suffix, "meg") || (len(suffix) > 3 && strings.EqualFold(suffix[:3], "meg")):
			return 0, fmt.Sprintf("%q: there is no MEG prefix; write M for mega and m for milli", s)
		case ok && (suffix[w:] == "" || uok):
			exp, unit = p, u
		default:
			return 0, fmt.Sprintf("%q: unknown prefix or unit %q", s, suffix)
		}
	}
	if unit != "" && unit != want {
		if want == "" {
			return 0, fmt.Sprintf("%q: a plain number takes no unit", s)
		}
		return 0, fmt.Sprintf("%q: wants %s (%s), not %s", s, unitNames[want], want, unitNames[unit])
	}
	// Parse mantissa and exponent together, so that 4.7u is the float
	// nearest 4.7e-6.
	v, err = strconv.ParseFloat(s[:n]+"e"+strconv.Itoa(exp), 64)
	if err != nil && !strings.Contains(s[:n], "e") && !strings.Contains(s[:n], "E") {
		return 0, fmt.Sprintf("%q is not a number", s)
	}
	if err != nil {
		// An exponent in the mantissa as well as a prefix: scale instead.
		v, _ = strconv.ParseFloat(s[:n], 64)
		v *= math.Pow10(exp)
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Sprintf("%q is too large", s)
	}
	return v, ""
}

// plain reads a plain decimal number (exponent allowed, nothing after it).
func plain(s string) (float64, string) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, fmt.Sprintf("%q is not a number", s)
	}
	return v, ""
}

// plainExp parses a mantissa without exponent scaled by 10^exp, as the
// float nearest the decimal value.
func plainExp(m string, exp int) float64 {
	v, _ := strconv.ParseFloat(m+"e"+strconv.Itoa(exp), 64)
	return v
}
