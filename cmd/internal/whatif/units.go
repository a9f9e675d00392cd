package whatif

import "zapnet/netlist"

// paramUnits are the SI units of the numeric parameters of LANGUAGE.md, for
// printing perturbed and drawn values ("1 nH", not "1e-09"). netlist knows
// them too but does not export them; this table follows its language
// reference and is checked against every kind's parameter list in a test.
var paramUnits = map[netlist.Kind]map[string]string{
	netlist.Resistor:  {"value": "Ω"},
	netlist.Capacitor: {"value": "F", "esr": "Ω", "esl": "H", "rating": "V"},
	netlist.Inductor:  {"value": "H", "r": "Ω"},
	netlist.Bead:      {"rdc": "Ω", "rac": "Ω", "l": "H", "c": "F", "isat": "A"},
	netlist.Clamp: {"vbr": "V", "it": "A", "nbr": "", "rdyn": "Ω", "ls": "H", "cj": "F", "vj": "V",
		"m": "", "is": "A", "n": "", "ipp": "A", "emax": "J"},
	netlist.Diode: {"is": "A", "n": "", "rs": "Ω", "cj": "F", "bv": "V", "ibv": "A"},
	netlist.Pin: {"cin": "F", "is": "A", "n": "", "rs": "Ω", "vbr": "V", "it": "A", "nbr": "", "rdyn": "Ω",
		"vmax": "V", "vmin": "V", "ifail": "A"},
	netlist.Supply: {"value": "V", "r": "Ω"},
	netlist.Line:   {"z0": "Ω", "delay": "s"},
	netlist.Strike: {"c": "F", "r": "Ω", "l": "H", "width": "s", "rise": "s", "count": "", "rate": "Hz", "burst": "Hz", "approach": ""},
}

// ParamUnit is the unit of ELEMENT.PARAM in c, "" for a pure number or an
// unknown parameter.
func ParamUnit(c *netlist.Circuit, element, param string) string {
	e := c.Element(element)
	if e == nil {
		return ""
	}
	return paramUnits[e.Kind][param]
}
