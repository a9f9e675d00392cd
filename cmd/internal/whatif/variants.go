package whatif

import (
	"errors"
	"fmt"
	"strings"

	"zapnet/netlist"
)

// ParseSet reads a command-line what-if, ELEMENT.PARAM=v1,v2,..., written as
// on a vary line. Values keep their deck spelling ("100n", "4.7uF", a part
// name); whether they fit the parameter is checked against the circuit by
// Variants.
func ParseSet(s string) (netlist.Vary, error) {
	target, list, ok := strings.Cut(s, "=")
	elem, param, dot := strings.Cut(target, ".")
	if !ok || !dot || elem == "" || param == "" || list == "" {
		return netlist.Vary{}, fmt.Errorf("--set %q: write ELEMENT.PARAM=v1,v2,... (for example C1.value=10n,100n)", s)
	}
	var vals []string
	for _, v := range strings.Split(list, ",") {
		if v == "" {
			return netlist.Vary{}, fmt.Errorf("--set %q: an empty value in the list", s)
		}
		vals = append(vals, v)
	}
	return netlist.Vary{Element: elem, Param: param, Values: vals}, nil
}

// Variants is the variant list of a study: the cartesian product of the
// deck's vary lines and the command-line sets, the first line varying
// slowest, as a deck's own vary lines combine (netlist.Circuit.Plan). A set
// on a target the deck already varies replaces that vary line in its place;
// other sets follow the deck's lines. Every value is applied to the circuit
// once, so a value that does not fit is reported before any solve, all of
// them together.
func Variants(c *netlist.Circuit, sets []netlist.Vary) ([]netlist.Variant, error) {
	lines := make([]netlist.Vary, 0, len(c.Vary)+len(sets))
	lines = append(lines, c.Vary...)
	var errs []error
	seen := map[string]bool{}
	for _, s := range sets {
		target := s.Element + "." + s.Param
		if seen[target] {
			errs = append(errs, fmt.Errorf("--set %s is given twice", target))
			continue
		}
		seen[target] = true
		replaced := false
		for i := range lines[:len(c.Vary)] {
			if lines[i].Element == s.Element && lines[i].Param == s.Param {
				lines[i] = s
				replaced = true
			}
		}
		if !replaced {
			lines = append(lines, s)
		}
		for _, v := range s.Values {
			set := netlist.Setting{Element: s.Element, Param: s.Param, Value: v}
			if _, err := c.With(set); err != nil {
				errs = append(errs, fmt.Errorf("--set %s: %w", set, err))
			}
		}
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	out := []netlist.Variant{{}}
	for _, l := range lines {
		next := make([]netlist.Variant, 0, len(out)*len(l.Values))
		for _, base := range out {
			for _, v := range l.Values {
				x := make(netlist.Variant, len(base), len(base)+1)
				copy(x, base)
				next = append(next, append(x, netlist.Setting{Element: l.Element, Param: l.Param, Value: v}))
			}
		}
		out = next
	}
	return out, nil
}

// Base is the one circuit a sensitivity or spread study starts from: the
// deck with single-valued sets applied. Those studies perturb one design, so
// a set with several values is an error; the deck's vary lines are left out
// (the caller tells the user so).
func Base(c *netlist.Circuit, sets []netlist.Vary) (*netlist.Circuit, netlist.Variant, error) {
	var v netlist.Variant
	for _, s := range sets {
		if len(s.Values) != 1 {
			return nil, nil, fmt.Errorf("--set %s.%s: this study perturbs one design; give one value, not %d", s.Element, s.Param, len(s.Values))
		}
		v = append(v, netlist.Setting{Element: s.Element, Param: s.Param, Value: s.Values[0]})
	}
	if len(v) == 0 {
		return c, nil, nil
	}
	b, err := c.With(v...)
	if err != nil {
		return nil, nil, fmt.Errorf("--set: %w", err)
	}
	return b, v, nil
}

// VariantMap is a variant as the JSON of OUTPUT.md writes it: {"C1.value": "100n"}.
func VariantMap(v netlist.Variant) map[string]string {
	m := map[string]string{}
	for _, s := range v {
		m[s.Element+"."+s.Param] = s.Value
	}
	return m
}
