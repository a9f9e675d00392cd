package whatif

import (
	"errors"
	"fmt"
	"strings"

	"zapnet/netlist"
)

// ParseSets reads command-line what-ifs, each ELEMENT.PARAM=v1,v2,...
// written as on a vary line, against the circuit c: every value is read as
// the deck would read it (its unit, its rule, a part of the right kind) and
// applied to c once, so that a value that does not fit is reported before
// any solve, all of them together. A target given twice is an error.
func ParseSets(c *netlist.Circuit, flags []string) ([]netlist.Vary, error) {
	var sets []netlist.Vary
	var errs []error
	seen := map[string]bool{}
	for _, f := range flags {
		target, list, ok := strings.Cut(f, "=")
		elem, param, dot := netlist.SplitTarget(target)
		if !ok || !dot || list == "" {
			errs = append(errs, fmt.Errorf("--set %q: write ELEMENT.PARAM=v1,v2,... (for example C1.value=10n,100n)", f))
			continue
		}
		if seen[target] {
			errs = append(errs, fmt.Errorf("--set %s is given twice", target))
			continue
		}
		seen[target] = true
		vy := netlist.Vary{Element: elem, Param: param}
		for _, text := range strings.Split(list, ",") {
			if text == "" {
				errs = append(errs, fmt.Errorf("--set %q: an empty value in the list", f))
				continue
			}
			s, err := c.Setting(target, text)
			if err == nil {
				_, err = c.With(s)
			}
			if err != nil {
				errs = append(errs, fmt.Errorf("--set %w", unplaced(err)))
				continue
			}
			vy.Values = append(vy.Values, s)
		}
		sets = append(sets, vy)
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	return sets, nil
}

// unplaced drops the deck positions of an error list: the value came from
// the command line, not from the deck's line that it changes.
func unplaced(err error) error {
	var l netlist.ErrorList
	if !errors.As(err, &l) {
		return err
	}
	msgs := make([]string, len(l))
	for i, e := range l {
		msgs[i] = e.Msg
	}
	return errors.New(strings.Join(msgs, "; "))
}

// Variants is the variant list of a study: the cartesian product of the
// deck's vary lines and the command-line sets (ParseSets), the first line
// varying slowest, as a deck's own vary lines combine (netlist.Product). A
// set on a target the deck already varies replaces that vary line in its
// place; other sets follow the deck's lines. The product is bounded by
// netlist.MaxVariants.
func Variants(c *netlist.Circuit, sets []netlist.Vary) ([]netlist.Variant, error) {
	lines := append([]netlist.Vary(nil), c.Vary...)
	for _, s := range sets {
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
	}
	if err := netlist.CheckProduct(lines); err != nil {
		return nil, fmt.Errorf("--set: %w", err)
	}
	return netlist.Product(lines), nil
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
		v = append(v, s.Values[0])
	}
	if len(v) == 0 {
		return c, nil, nil
	}
	b, err := c.With(v...)
	if err != nil {
		return nil, nil, fmt.Errorf("--set: %w", unplaced(err))
	}
	return b, v, nil
}
