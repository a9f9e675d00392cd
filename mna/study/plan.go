package study

import (
	"errors"
	"fmt"

	"zapnet/netlist"
)

// PlanOf is the study of c that opt selects: the deck's plan with the
// levels, polarities and variants Options overrides (at least the empty
// variant). It checks what a caller may have set by hand: positive levels,
// pos or neg polarities; a plan without levels is an error only for Jobs.
func PlanOf(c *netlist.Circuit, opt *Options) (netlist.Plan, error) {
	if c.Strike() == nil {
		return netlist.Plan{}, errors.New("the deck has no strike: add a strike line")
	}
	pl := c.Plan()
	if opt != nil {
		if opt.Levels != nil {
			pl.Levels = opt.Levels
		}
		if opt.Polarities != nil {
			pl.Polarities = opt.Polarities
		}
		if opt.Variants != nil {
			pl.Variants = opt.Variants
		}
	}
	if len(pl.Variants) == 0 {
		pl.Variants = []netlist.Variant{nil}
	}
	for _, l := range pl.Levels {
		if !(l > 0) {
			return netlist.Plan{}, fmt.Errorf("level %g: levels must be positive", l)
		}
	}
	for _, p := range pl.Polarities {
		if _, err := polaritySign(p); err != nil {
			return netlist.Plan{}, err
		}
	}
	return pl, nil
}

// applyVariant returns the circuit with the variant's settings applied; the
// deck as written when the variant is empty.
func applyVariant(c *netlist.Circuit, v netlist.Variant) (*netlist.Circuit, error) {
	if len(v) == 0 {
		return c, nil
	}
	return c.With(v...)
}
