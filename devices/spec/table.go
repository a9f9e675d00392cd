package spec

import "fmt"

// Table lists the parameters of a kind or a waveform, numeric ones in the
// order listings show them, then the word parameters.
type Table struct {
	Params []Param
	Words  []Word
}

// MaxParams and MaxWords bound a table, so that a Values is a plain value
// that copies without sharing.
const (
	MaxParams = 24
	MaxWords  = 6
)

// Param returns the numeric parameter key, or nil.
func (t *Table) Param(key string) *Param {
	if i := t.index(key); i >= 0 {
		return &t.Params[i]
	}
	return nil
}

// Word returns the word parameter key, or nil.
func (t *Table) Word(key string) *Word {
	if i := t.wordIndex(key); i >= 0 {
		return &t.Words[i]
	}
	return nil
}

// Keys lists every key of the table, numeric ones first.
func (t *Table) Keys() []string {
	keys := make([]string, 0, len(t.Params)+len(t.Words))
	for _, p := range t.Params {
		keys = append(keys, p.Key)
	}
	for _, w := range t.Words {
		keys = append(keys, w.Key)
	}
	return keys
}

// Numeric lists the numeric keys in order.
func (t *Table) Numeric() []string {
	keys := make([]string, len(t.Params))
	for i, p := range t.Params {
		keys[i] = p.Key
	}
	return keys
}

// Ratings lists the numeric parameters that are ratings, in order.
func (t *Table) Ratings() []Param {
	var out []Param
	for _, p := range t.Params {
		if p.Rates != nil {
			out = append(out, p)
		}
	}
	return out
}

// Positional is the parameter written after the nodes without a key
// ("value"), or nil when the kind takes none.
func (t *Table) Positional() *Param { return t.Param("value") }

func (t *Table) index(key string) int {
	for i := range t.Params {
		if t.Params[i].Key == key {
			return i
		}
	}
	return -1
}

func (t *Table) wordIndex(key string) int {
	for i := range t.Words {
		if t.Words[i].Key == key {
			return i
		}
	}
	return -1
}

// Values is a set of values for one table, each checked against its rule
// when it is set: a Values never holds an illegal value. The zero Values
// belongs to no table and holds nothing. A Values is a plain value: copies
// share nothing.
type Values struct {
	t    *Table
	num  [MaxParams]float64
	set  [MaxParams]bool
	word [MaxWords]string
}

// Values returns an empty value set of the table.
func (t *Table) Values() Values {
	if len(t.Params) > MaxParams || len(t.Words) > MaxWords {
		panic(fmt.Sprintf("spec: a table of %d parameters and %d words is larger than a Values holds", len(t.Params), len(t.Words)))
	}
	return Values{t: t}
}

// Defaults returns the table's values with every default filled in.
func (t *Table) Defaults() Values {
	v := t.Values()
	v.FillDefaults()
	return v
}

// Table is the table the values belong to.
func (v *Values) Table() *Table { return v.t }

// must returns the index of key, panicking when the table lacks it: asking
// for a key a kind does not have is a programming error.
func (v *Values) must(key string) int {
	if v.t != nil {
		if i := v.t.index(key); i >= 0 {
			return i
		}
	}
	panic("spec: no parameter " + key + " in this table")
}

// Has reports whether the numeric parameter key has a value.
func (v *Values) Has(key string) bool {
	if v.t == nil {
		return false
	}
	i := v.t.index(key)
	return i >= 0 && v.set[i]
}

// Lookup returns the numeric parameter key and whether it has a value.
func (v *Values) Lookup(key string) (float64, bool) {
	if v.t == nil {
		return 0, false
	}
	i := v.t.index(key)
	if i < 0 || !v.set[i] {
		return 0, false
	}
	return v.num[i], true
}

// Num returns the numeric parameter key, 0 when it has no value.
func (v *Values) Num(key string) float64 {
	i := v.must(key)
	return v.num[i]
}

// Word returns the word parameter key, "" when it has none.
func (v *Values) Word(key string) string {
	if v.t == nil {
		return ""
	}
	if i := v.t.wordIndex(key); i >= 0 {
		return v.word[i]
	}
	panic("spec: no word " + key + " in this table")
}

// RuleError is a value that breaks its parameter's rule.
type RuleError struct {
	Key   string
	Value float64
	Says  string // "must be positive"
}

func (e *RuleError) Error() string { return fmt.Sprintf("%s %s, have %g", e.Key, e.Says, e.Value) }

// Set gives the numeric parameter key the value x, checked against its
// rule; a value that breaks it is refused with a *RuleError and not stored.
func (v *Values) Set(key string, x float64) error {
	i := v.must(key)
	if m := v.t.Params[i].Rule.Check(x); m != "" {
		return &RuleError{Key: key, Value: x, Says: m}
	}
	v.num[i], v.set[i] = x, true
	return nil
}

// SetWord gives the word parameter key the word w; a word that is not one
// of its choices is refused.
func (v *Values) SetWord(key, w string) error {
	if v.t == nil {
		panic("spec: a value set of no table")
	}
	i := v.t.wordIndex(key)
	if i < 0 {
		panic("spec: no word " + key + " in this table")
	}
	if c := v.t.Words[i].Choices; c != nil && !contains(c, w) {
		return fmt.Errorf("%s is one of %v, not %s", key, c, w)
	}
	v.word[i] = w
	return nil
}

// Unset removes the value of the numeric parameter key.
func (v *Values) Unset(key string) {
	i := v.must(key)
	v.num[i], v.set[i] = 0, false
}

// FillDefaults gives every parameter without a value its default, where it
// has one (and where the parameter it depends on has a value), and every
// word without one its default word.
func (v *Values) FillDefaults() {
	for i, p := range v.t.Params {
		if v.set[i] || !p.HasDefault {
			continue
		}
		if p.OnlyWith != "" && !v.Has(p.OnlyWith) {
			continue
		}
		v.num[i], v.set[i] = p.Default, true
	}
	for i, w := range v.t.Words {
		if v.word[i] == "" {
			v.word[i] = w.Default
		}
	}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// Kind describes an element kind of the deck language.
type Kind struct {
	// Name is the kind's keyword in a deck: "clamp".
	Name string
	// Summary is a one-line description for listings.
	Summary string
	// Terminals names the two nodes, for usage lines: "line ref".
	Terminals [2]string
	Role      Role
	// Order places the kind in listings and documentation.
	Order int
	// DC says how the element conducts at DC, for the deck checker's
	// search for nodes without a DC path to gnd.
	DC DCPath
	// IdealWithout names the series resistance whose zero value makes the
	// element an ideal voltage branch at DC (a supply's r, an inductor's
	// r, a bead's rdc): a loop of such branches has no DC solution. ""
	// for kinds that are never one.
	IdealWithout string
	// Renamed maps the retired spellings of parameters to their names
	// now: a deck that uses one is told the new name.
	Renamed map[string]string
	Table
}

// DCPath is how an element conducts at DC.
type DCPath int

const (
	// Conducts: a DC path between the two terminals (and to any node word).
	Conducts DCPath = iota
	// Blocks: no DC path (a capacitor, the strike).
	Blocks
	// ToReference: each terminal has a DC path to gnd through the element
	// (a transmission line's ports, through its impedance).
	ToReference
)

// Article is "a" or "an" before the kind's name.
func (k *Kind) Article() string {
	switch k.Name[0] {
	case 'a', 'e', 'i', 'o', 'u':
		return "an"
	}
	return "a"
}
