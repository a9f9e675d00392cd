package whatif

import (
	"testing"

	"zapnet/netlist"
)

// TestParamUnitsCoverTheLanguage keeps the unit table in step with the
// language's parameter lists [LANGUAGE.md, element table].
func TestParamUnitsCoverTheLanguage(t *testing.T) {
	for _, k := range []netlist.Kind{netlist.Resistor, netlist.Capacitor, netlist.Inductor, netlist.Bead,
		netlist.Clamp, netlist.Diode, netlist.Pin, netlist.Supply, netlist.Line, netlist.Strike} {
		for _, p := range netlist.ParamOrder(k) {
			if _, ok := paramUnits[k][p]; !ok {
				t.Errorf("%s %s has no unit in the table", k, p)
			}
		}
	}
}
