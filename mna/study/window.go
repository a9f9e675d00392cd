package study

import (
	"math"

	"zapnet/devices/spec"
	"zapnet/netlist"
)

// Window heuristics (see the package documentation).
const (
	// DefaultCap is the longest default span, s, unless CapSpans spans of
	// the stimulus are longer (a surge).
	DefaultCap = 20e-6
	CapSpans   = 4
	// EndFraction is the tail of the window in which an extreme is
	// suspect: the signal may still be rising.
	EndFraction = 0.05
	// Significance is how much of a signal's largest excursion an extreme
	// at the end must reach to count.
	Significance = 0.01
	// LCPeriods and RCTaus are how much of the circuit's slowest natural
	// responses a default span covers.
	LCPeriods = 1.0
	RCTaus    = 3.0
)

// windowOf is the deck's window with the fields opt.Window sets replaced
// (opt may be nil).
func windowOf(c *netlist.Circuit, opt *Options) netlist.Window {
	w := c.Window
	if opt == nil {
		return w
	}
	if opt.Window.Stop > 0 {
		w.Stop = opt.Window.Stop
	}
	if opt.Window.Resolve > 0 {
		w.Resolve = opt.Window.Resolve
	}
	if opt.Window.Accuracy > 0 {
		w.Accuracy = opt.Window.Accuracy
	}
	return w
}

// DefaultStop is the default span for circuit c struck by a stimulus whose
// own span is stimStop: the longest of that span, LCPeriods periods
// 2π√(L·C) of the largest inductance with the largest capacitance, and RCTaus
// time constants of each resistance with the largest capacitance on its
// nodes; no longer than Cap(stimStop). The inductances, capacitances and
// resistances are the parameters each kind marks as one of the circuit's
// time scales (spec.Param.Scale).
func DefaultStop(c *netlist.Circuit, stimStop float64) float64 {
	lMax, cMax := 0.0, 0.0
	capAt := map[string]float64{} // largest capacitance touching each node
	touch := func(n string, v float64) {
		if n != netlist.Ground && v > capAt[n] {
			capAt[n] = v
		}
	}
	scales := func(e *netlist.Element, unit spec.Unit, f func(v float64)) {
		for _, p := range e.Kind.Params {
			if v, ok := e.Values.Lookup(p.Key); ok && p.Scale && p.Unit == unit {
				f(v)
			}
		}
	}
	for _, e := range c.Elements {
		if e.IsStrike() {
			continue
		}
		scales(e, spec.Henry, func(v float64) { lMax = math.Max(lMax, v) })
		scales(e, spec.Farad, func(v float64) {
			cMax = math.Max(cMax, v)
			touch(e.Nodes[0], v)
			touch(e.Nodes[1], v)
		})
	}
	stop := stimStop
	if lMax > 0 && cMax > 0 {
		stop = math.Max(stop, LCPeriods*2*math.Pi*math.Sqrt(lMax*cMax))
	}
	for _, e := range c.Elements {
		if e.IsStrike() {
			continue
		}
		scales(e, spec.Ohm, func(r float64) {
			cap := math.Max(capAt[e.Nodes[0]], capAt[e.Nodes[1]])
			stop = math.Max(stop, RCTaus*r*cap)
		})
	}
	return math.Min(stop, Cap(stimStop))
}

// Cap is the longest default span for a stimulus whose own span is stimStop.
func Cap(stimStop float64) float64 {
	return math.Max(DefaultCap, CapSpans*stimStop)
}
