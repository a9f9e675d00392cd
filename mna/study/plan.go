package study

import (
	"errors"

	"zapnet/netlist"
)

// planOf is the study the deck describes.
func planOf(c *netlist.Circuit) (netlist.Plan, error) {
	if c.Strike() == nil {
		return netlist.Plan{}, errors.New("the deck has no strike: add a strike line")
	}
	return c.Plan(), nil
}

// applyVariant returns the circuit with the variant's settings applied; the
// deck as written when the variant is empty.
func applyVariant(c *netlist.Circuit, v netlist.Variant) (*netlist.Circuit, error) {
	if len(v) == 0 {
		return c, nil
	}
	return c.With(v...)
}
