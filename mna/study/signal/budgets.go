package signal

import "strings"

// Budget is what an interface tolerates from its protection: the
// capacitance the protection and the layout may add to one line of it (the
// protected pin's own cin excluded), and the 10–90 % rise time the network
// may add to an ideal step between its ports. README.md carries the same
// table with the source of every value (a test keeps the two equal); edit
// both together.
type Budget struct {
	Name string  // as given to --interface
	Rate float64 // signalling rate, symbols/s
	CMax float64 // F
	Rise float64 // s
}

// riseFraction is the rise-time budget as a fraction of the unit
// interval: a rule of thumb [practice] that leaves the driver's own edge
// (up to 0.3 UI, the limit TIA/EIA-485-A sets for its drivers [mem]) most
// of the budget.
const riseFraction = 0.1

func budget(name string, rate, cmax float64) Budget {
	return Budget{Name: name, Rate: rate, CMax: cmax, Rise: riseFraction / rate}
}

// Budgets is the table of interface budgets, in README order.
var Budgets = []Budget{
	budget("usb2-fs", 12e6, 20e-12),
	budget("usb2-hs", 480e6, 3e-12),
	budget("usb3-gen1", 5e9, 0.5e-12),
	budget("usb3-gen2", 10e9, 0.3e-12),
	budget("hdmi-1.4", 3.4e9, 0.5e-12),
	budget("hdmi-2.0", 6e9, 0.3e-12),
	budget("100base-tx", 125e6, 5e-12),
	budget("1000base-t", 125e6, 3e-12),
	budget("can", 1e6, 50e-12),
	budget("rs-485", 10e6, 50e-12),
}

// LookupBudget finds an interface's budget by name (case-insensitive).
func LookupBudget(name string) (Budget, bool) {
	for _, b := range Budgets {
		if strings.EqualFold(b.Name, name) {
			return b, true
		}
	}
	return Budget{}, false
}

// BudgetNames lists the interface names, in table order.
func BudgetNames() []string {
	n := make([]string, len(Budgets))
	for i, b := range Budgets {
		n[i] = b.Name
	}
	return n
}
