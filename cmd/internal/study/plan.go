package study

import (
	"errors"
	"fmt"

	"zapnet/netlist"
)

// planOf is the study the deck describes.
func planOf(c *netlist.Circuit) (netlist.Plan, error) {
	s := c.Strike()
	if s == nil {
		return netlist.Plan{}, errors.New("the deck has no strike: add a strike line")
	}
	p := netlist.Plan{Waveform: s.Str["waveform"], Levels: s.Levels}
	switch s.Str["polarity"] {
	case "neg":
		p.Polarities = []string{"neg"}
	case "both":
		p.Polarities = []string{"pos", "neg"}
	default:
		p.Polarities = []string{"pos"}
	}
	p.Variants = []netlist.Variant{nil}
	for _, v := range c.Vary {
		var next []netlist.Variant
		for _, base := range p.Variants {
			for _, val := range v.Values {
				nv := append(append(netlist.Variant(nil), base...), netlist.Setting{Element: v.Element, Param: v.Param, Value: val})
				next = append(next, nv)
			}
		}
		p.Variants = next
	}
	return p, nil
}

// applyVariant returns the circuit with the variant's settings applied; the
// deck as written when the variant is empty.
func applyVariant(c *netlist.Circuit, v netlist.Variant) (*netlist.Circuit, error) {
	if len(v) == 0 {
		return c, nil
	}
	return nil, fmt.Errorf("variant %s: variants are not supported yet", VariantString(v))
}

// levelUnit is the unit of a waveform's levels.
func levelUnit(waveform string) string {
	switch waveform {
	case "surge-8-20", "tlp":
		return "A"
	case "pwl":
		return ""
	}
	return "V"
}

// formatSI renders a value with its unit.
func formatSI(v float64, unit string) string {
	if unit == "" {
		return fmt.Sprintf("%.4g", v)
	}
	return fmt.Sprintf("%.4g %s", v, unit)
}
