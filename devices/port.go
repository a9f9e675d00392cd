package devices

import (
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// Port is a signal port between node and ref with a real impedance z0:
// where a signal enters or leaves the protected line. It stamps nothing
// until told otherwise, so a deck's strike runs see only the deck's own
// elements. The small-signal engine terminates ports itself; the edge check
// of the signal side makes one port the source (Drive: the stimulus's
// open-circuit voltage behind z0) and the others loads (Terminate: z0).
type Port struct {
	name  string
	nodes [2]string
	z0, g float64

	a, b int
	mode portMode
	st   *waveforms.Stimulus
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "port", Summary: "a signal port (small-signal study and edge check only): where a signal enters or leaves, with its impedance",
		Terminals: [2]string{"node", "ref"}, Role: spec.Port, Order: 95, DC: spec.Blocks,
		Table: spec.Table{Params: []spec.Param{
			// The signal system's impedance: a condition of the product,
			// not a part of the protection to vary.
			spec.Default("z0", spec.Ohm, spec.Positive, 50).As(spec.Condition),
		}},
	}, New: func(name string, nodes [2]string, v *spec.Values) (Device, error) {
		return NewPort(name, nodes, v.Num("z0")), nil
	}})
}

type portMode int

const (
	portOff portMode = iota
	portTerminated
	portDriven
)

// Porter is a port's control, found by type assertion.
type Porter interface {
	// Z0 is the port's impedance, Ω.
	Z0() float64
	// Off takes the port out of the circuit (the default).
	Off()
	// Terminate makes the port a resistance z0.
	Terminate()
	// Drive makes the port the stimulus's open-circuit voltage behind z0
	// (st.R is not used: the port's own z0 is the source's impedance).
	Drive(st *waveforms.Stimulus)
}

// NewPort builds a port between nodes[0] and nodes[1] with impedance z0 > 0.
func NewPort(name string, nodes [2]string, z0 float64) *Port {
	if !(z0 > 0) {
		panic("devices: NewPort: z0 must be positive")
	}
	return &Port{name: name, nodes: nodes, z0: z0, g: 1 / z0}
}

// Name implements Device.
func (d *Port) Name() string { return d.name }

// Layout implements Device.
func (d *Port) Layout() Layout { return Layout{Terminals: []string{d.nodes[0], d.nodes[1]}} }

// Bind implements Device.
func (d *Port) Bind(n Nodes) []StateRows {
	d.a, d.b = n.Terminals[0], n.Terminals[1]
	return nil
}

// Z0 implements Porter.
func (d *Port) Z0() float64 { return d.z0 }

// Off implements Porter.
func (d *Port) Off() { d.mode, d.st = portOff, nil }

// Terminate implements Porter.
func (d *Port) Terminate() { d.mode, d.st = portTerminated, nil }

// Drive implements Porter. The stimulus is kept, not copied.
func (d *Port) Drive(st *waveforms.Stimulus) { d.mode, d.st = portDriven, st }

// Eval implements Device. Driven, the port is the Norton form of its source:
// 1/z0 beside a current F(t)/z0 into node, none at the operating point
// (F(t) = 0 for t ≤ 0 in any case).
func (d *Port) Eval(c *Context) {
	if d.mode == portOff {
		return
	}
	c.Conductance(d.a, d.b, d.g)
	if d.mode == portDriven && !c.DC && d.st != nil && d.st.F != nil {
		c.Inject(d.a, d.b, d.st.F(c.T)*d.g)
	}
}
