package netlist

import (
	"fmt"
	"sort"
	"strings"
)

// rule says which values of a parameter are legal.
type rule int

const (
	anyValue   rule = iota
	positive        // > 0
	nonNeg          // >= 0
	fraction        // 0 <= m < 1
	atLeastOne      // a count: an integer >= 1
)

// param describes one numeric parameter of an element kind.
type param struct {
	key    string
	unit   string
	rule   rule
	def    float64
	hasDef bool
	// required: the element is unusable without it.
	required bool
	// only: the parameter is filled with its default only when this other
	// parameter is present (a pin's internal clamp).
	only string
}

func def(key, unit string, r rule, d float64) param {
	return param{key: key, unit: unit, rule: r, def: d, hasDef: true}
}
func opt(key, unit string, r rule) param { return param{key: key, unit: unit, rule: r} }
func req(key, unit string, r rule) param {
	return param{key: key, unit: unit, rule: r, required: true}
}

// kindSpec is what an element kind accepts.
type kindSpec struct {
	hasValue bool     // takes a positional value, addressed as "value"
	params   []param  // numeric parameters in display order ("value" first)
	words    []string // word parameters besides part
}

// specs follow MODELS.md: the defaults there are filled in here so that the
// models never guess.
var specs = map[Kind]*kindSpec{
	Resistor: {hasValue: true, params: []param{req("value", "Ω", positive)}},
	Capacitor: {hasValue: true, params: []param{
		req("value", "F", positive), def("esr", "Ω", nonNeg, 0), def("esl", "H", nonNeg, 0),
		opt("rating", "V", positive)}},
	Inductor: {hasValue: true, params: []param{req("value", "H", positive), def("r", "Ω", nonNeg, 0)}},
	Bead: {params: []param{
		def("rdc", "Ω", nonNeg, 0), def("rac", "Ω", nonNeg, 0), req("l", "H", positive),
		def("c", "F", nonNeg, 0), opt("isat", "A", positive)}},
	Clamp: {params: []param{
		req("vbr", "V", positive), def("it", "A", positive, 1e-3), def("nbr", "", positive, 1),
		def("rdyn", "Ω", nonNeg, 0), def("ls", "H", nonNeg, 0), def("cj", "F", nonNeg, 0),
		def("vj", "V", positive, 0.7), def("m", "", fraction, 0),
		def("is", "A", positive, 1e-14), def("n", "", positive, 1),
		opt("ipp", "A", positive), opt("emax", "J", positive)},
		words: []string{"polarity"}},
	Diode: {params: []param{
		def("is", "A", positive, 1e-14), def("n", "", positive, 1), def("rs", "Ω", nonNeg, 0),
		def("cj", "F", nonNeg, 0), opt("bv", "V", positive), def("ibv", "A", positive, 1e-3)}},
	Pin: {params: []param{
		def("cin", "F", nonNeg, 0), def("is", "A", positive, 1e-14), def("n", "", positive, 1),
		def("rs", "Ω", nonNeg, 1), opt("vbr", "V", positive),
		{key: "it", unit: "A", rule: positive, def: 1e-3, hasDef: true, only: "vbr"},
		{key: "nbr", unit: "", rule: positive, def: 1, hasDef: true, only: "vbr"},
		{key: "rdyn", unit: "Ω", rule: nonNeg, def: 0, hasDef: true, only: "vbr"},
		opt("vmax", "V", anyValue), opt("vmin", "V", anyValue), opt("ifail", "A", positive)},
		words: []string{"rail"}},
	Supply: {hasValue: true, params: []param{req("value", "V", anyValue), def("r", "Ω", nonNeg, 0)}},
	Line:   {params: []param{req("z0", "Ω", positive), req("delay", "s", positive)}},
}

// kindOrder lists the element kinds in the order the documentation uses.
var kindOrder = []Kind{Resistor, Capacitor, Inductor, Bead, Clamp, Diode, Pin, Supply, Line, Strike}

func specOf(k Kind, key string) *param {
	s := specs[k]
	if s == nil {
		return nil
	}
	for i := range s.params {
		if s.params[i].key == key {
			return &s.params[i]
		}
	}
	return nil
}

// waveformNames are the strike waveforms, in documentation order.
var waveformNames = []string{"iec61000-4-2", "iec61000-4-2-network", "iec61000-4-2-air", "hbm", "iso10605",
	"surge-8-20", "surge-1.2-50", "surge-cwg", "tlp", "eft", "pwl"}

// strikeParam is a numeric parameter of one or more waveforms.
type strikeParam struct {
	unit      string
	rule      rule
	waveforms map[string]float64 // waveform → default (NaN: no default)
}

const noDefault = -1.0 // marker inside strikeParams; every default is > 0

var strikeParams = map[string]strikeParam{
	"c":     {unit: "F", rule: positive, waveforms: map[string]float64{"iso10605": 150e-12}},
	"r":     {unit: "Ω", rule: positive, waveforms: map[string]float64{"iso10605": 330, "surge-1.2-50": 2}},
	"l":     {unit: "H", rule: nonNeg, waveforms: map[string]float64{"hbm": noDefault, "iso10605": noDefault}},
	"width": {unit: "s", rule: positive, waveforms: map[string]float64{"tlp": 100e-9}},
	"rise":  {unit: "s", rule: positive, waveforms: map[string]float64{"tlp": 1e-9}},
	"count": {unit: "", rule: atLeastOne, waveforms: map[string]float64{"eft": 1}},
	"rate":  {unit: "Hz", rule: positive, waveforms: map[string]float64{"eft": 5e3}},
	// burst: a standard burst at this repetition rate (5 kHz or 100 kHz,
	// checked by the waveform); approach: the fraction of the breakdown
	// gap left when an air discharge's spark forms.
	"burst":    {unit: "Hz", rule: positive, waveforms: map[string]float64{"eft": noDefault}},
	"approach": {unit: "", rule: positive, waveforms: map[string]float64{"iec61000-4-2-air": 1}},
}

// strikeParamOrder is the display order of strike parameters.
var strikeParamOrder = []string{"c", "r", "l", "width", "rise", "count", "rate", "burst", "approach"}

// waveformsTaking lists the waveforms that accept the strike parameter key.
func waveformsTaking(key string) []string {
	var out []string
	for _, w := range waveformNames {
		if _, ok := strikeParams[key].waveforms[w]; ok {
			out = append(out, w)
		}
	}
	if key == "file" {
		out = append(out, "pwl")
	}
	return out
}

// isDischarge reports whether a waveform is an electrostatic discharge, whose
// levels above about 30 kV are beyond any test standard.
func isDischarge(w string) bool {
	switch w {
	case "iec61000-4-2", "iec61000-4-2-network", "iec61000-4-2-air", "hbm", "iso10605":
		return true
	}
	return false
}

// strikeWords are the word parameters of waveforms: key → waveform →
// the words allowed, the first being the default.
var strikeWords = map[string]map[string][]string{
	"path": {"surge-cwg": {"direct", "line-line", "line-earth", "io"}},
}

// keysOf lists every key an element kind accepts, for suggestions.
func keysOf(k Kind) []string {
	if k == Strike {
		keys := []string{"waveform", "level", "polarity", "file", "path"}
		return append(keys, strikeParamOrder...)
	}
	s := specs[k]
	var keys []string
	for _, p := range s.params {
		keys = append(keys, p.key)
	}
	keys = append(keys, s.words...)
	return append(keys, "part")
}

// checkRule returns a message when v breaks the rule, or "".
func checkRule(r rule, v float64) string {
	switch r {
	case positive:
		if !(v > 0) {
			return "must be positive"
		}
	case nonNeg:
		if !(v >= 0) {
			return "must not be negative"
		}
	case fraction:
		if !(v >= 0 && v < 1) {
			return "must be at least 0 and below 1"
		}
	case atLeastOne:
		if !(v >= 1) || v != float64(int64(v)) || v > 1e6 {
			return "must be a whole number from 1 to 1000000"
		}
	}
	return ""
}

// statementWords are the keywords that start a statement.
var statementWords = []string{"title", "part", "include", "watch", "vary", "tolerance", "window",
	"resistor", "capacitor", "inductor", "bead", "clamp", "diode", "pin", "supply", "line", "strike"}

// suggest returns the candidate closest to s by edit distance when it is
// close enough to be a likely slip, or "".
func suggest(s string, cands []string) string {
	best, bestD := "", 1<<30
	sorted := append([]string(nil), cands...)
	sort.Strings(sorted)
	for _, c := range sorted {
		d := editDistance(strings.ToLower(s), strings.ToLower(c))
		if d < bestD {
			best, bestD = c, d
		}
	}
	limit := 2
	if len([]rune(s)) <= 3 {
		limit = 1
	}
	if bestD <= limit && bestD < len([]rune(best)) {
		return best
	}
	return ""
}

// didYouMean renders the suggestion clause of a message.
func didYouMean(s string, cands []string) string {
	if g := suggest(s, cands); g != "" {
		return fmt.Sprintf(" (did you mean %s?)", g)
	}
	return ""
}

// editDistance is the optimal-string-alignment distance between a and b in
// runes: insertions, deletions, substitutions and swaps of neighbours each
// count one, since a swap (tsv for tvs) is the commonest slip.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	if len(ra) > 64 || len(rb) > 64 {
		return 1 << 20 // names this long are no slip of the keyboard
	}
	w := len(rb) + 1
	d := make([]int, (len(ra)+1)*w)
	for i := 0; i <= len(ra); i++ {
		d[i*w] = i
	}
	for j := 0; j <= len(rb); j++ {
		d[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			v := min(d[(i-1)*w+j]+1, d[i*w+j-1]+1, d[(i-1)*w+j-1]+cost)
			if i > 1 && j > 1 && ra[i-1] == rb[j-2] && ra[i-2] == rb[j-1] {
				v = min(v, d[(i-2)*w+j-2]+1)
			}
			d[i*w+j] = v
		}
	}
	return d[len(ra)*w+len(rb)]
}

// ParamOrder lists the numeric parameters of a kind in the order of the
// language reference ("value" first where there is one), for listings. For
// a strike it lists the parameters of every waveform.
func ParamOrder(k Kind) []string {
	if k == Strike {
		return append([]string(nil), strikeParamOrder...)
	}
	s := specs[k]
	if s == nil {
		return nil
	}
	out := make([]string, len(s.params))
	for i, p := range s.params {
		out[i] = p.key
	}
	return out
}
