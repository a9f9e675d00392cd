package spec

import (
	"math"
	"strconv"
	"strings"
)

// Prefixes maps an SI prefix to its power of ten. Both the micro sign
// (U+00B5) and the Greek mu (U+03BC) are accepted because keyboards produce
// either; u is the ASCII spelling.
var Prefixes = map[string]int{
	"f": -15, "p": -12, "n": -9, "u": -6, "µ": -6, "μ": -6,
	"m": -3, "k": 3, "M": 6, "G": 9, "T": 12,
}

// prefixOf is the prefix printed for each power of ten.
var prefixOf = map[int]string{-15: "f", -12: "p", -9: "n", -6: "µ", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T"}

// FormatSI renders v in engineering notation with an SI prefix and the unit,
// with up to four significant digits and trailing zeros trimmed:
// FormatSI(4.7e-9, "F") is "4.7 nF", FormatSI(0, "V") is "0 V". A value
// beyond the prefixes (below femto, above tera) keeps an exponent. With an
// empty unit the number is printed plainly ("0.001", "1e-14"), without a
// prefix, because a lone prefix reads badly.
func FormatSI(v float64, unit Unit) string {
	sep := " "
	if unit == "" {
		sep = ""
	}
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return strconv.FormatFloat(v, 'g', -1, 64) + sep + string(unit)
	case v == 0:
		return "0" + sep + string(unit)
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
		return sign + trimZeros(e[:k]) + "e" + strconv.Itoa(exp) + sep + string(unit)
	}
	intDigits := 1 + exp - eng
	num := trimZeros(digits[:intDigits] + "." + digits[intDigits:])
	return sign + num + " " + prefixOf[eng] + string(unit)
}

func trimZeros(s string) string {
	if strings.IndexByte(s, '.') < 0 {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// DeckNumber renders a value as a user would type it in a deck: "4us".
func DeckNumber(v float64, unit Unit) string {
	s := FormatSI(v, unit)
	s = strings.ReplaceAll(s, " ", "")
	return strings.ReplaceAll(s, "µ", "u")
}

// FormatFraction writes a fraction as a percentage with the digits it
// needs: 0.002 is "0.2 %".
func FormatFraction(f float64) string {
	return strconv.FormatFloat(100*f, 'g', 6, 64) + " %"
}

// NiceCeil is the smallest of 1, 2 or 5 times a power of ten not below
// v > 0 (to a part in a billion): a suggested window stop or an axis
// span that reads well. v ≤ 0 comes back unchanged.
func NiceCeil(v float64) float64 {
	if !(v > 0) {
		return v
	}
	p := math.Pow(10, math.Floor(math.Log10(v)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= v*(1-1e-9) {
			return m * p
		}
	}
	return 10 * p
}
