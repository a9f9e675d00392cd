package fit

import (
	"math"
	"strconv"
	"strings"
)

// Part is a set of model parameters as a deck's part line states them.
type Part struct {
	Name  string
	Kind  string // the deck's element kind: clamp, bead, pin, snapback
	Num   []Num  // numeric parameters, in the order they are printed
	Words []Word // word parameters (polarity, table, ...)
}

// Num is one numeric parameter of a part.
type Num struct {
	Key   string
	Value float64 // SI
	Unit  string  // "V", "A", "F", "H", "Ω", "s" or "" for a plain number
}

// Word is one word parameter of a part; Quote prints it in quotes (a path).
type Word struct {
	Key, Value string
	Quote      bool
}

// Line is the part line: "part NAME KIND key=value ...".
func (p Part) Line() string { return "part " + p.Name + " " + p.Kind + p.params() }

// Element is the part written as an element statement of its kind between
// the nodes a and b, for a deck built in code.
func (p Part) Element(name, a, b string) string {
	return p.Kind + " " + name + " " + a + " " + b + p.params()
}

func (p Part) params() string {
	var b strings.Builder
	for _, n := range p.Num {
		b.WriteString(" " + n.Key + "=" + FormatValue(n.Value, n.Unit))
	}
	for _, w := range p.Words {
		v := w.Value
		if w.Quote {
			v = strconv.Quote(v)
		}
		b.WriteString(" " + w.Key + "=" + v)
	}
	return b.String()
}

// FormatValue writes v the way a deck reads it, with an SI prefix and the
// unit and six significant digits (so that a part line reproduces the fit
// to better than 1e-5): 6.62431V, 1mA, 38pF, 0.45ohm, 1e-14A.
func FormatValue(v float64, unit string) string {
	if unit == "Ω" {
		unit = "ohm"
	}
	if v == 0 || unit == "" || math.IsNaN(v) || math.IsInf(v, 0) {
		return strconv.FormatFloat(v, 'g', 6, 64) + unit
	}
	a := math.Abs(v)
	exp := int(math.Floor(math.Log10(a)))
	eng := exp - ((exp%3)+3)%3
	if eng < -15 || eng > 12 {
		return strconv.FormatFloat(v, 'g', 6, 64) + unit
	}
	m := v / math.Pow10(eng)
	s := strconv.FormatFloat(m, 'g', 6, 64)
	if strings.ContainsAny(s, "e") {
		// Rounding carried the mantissa to 1000: step to the next prefix.
		eng += 3
		s = strconv.FormatFloat(v/math.Pow10(eng), 'g', 6, 64)
	}
	if f, _ := strconv.ParseFloat(s, 64); math.Abs(f) >= 1000 {
		eng += 3
		s = strconv.FormatFloat(v/math.Pow10(eng), 'g', 6, 64)
	}
	prefix := map[int]string{-15: "f", -12: "p", -9: "n", -6: "u", -3: "m", 0: "", 3: "k", 6: "M", 9: "G", 12: "T"}[eng]
	return s + prefix + unit
}
