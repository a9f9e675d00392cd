package devices

import (
	"errors"
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// TablePath is a clamp or a protected pin whose conduction is given by
// tables (IVTable) rather than by junction equations: a TLP curve, a pin's
// measured I–V, an IBIS input's clamp tables. Between the terminal t and
// the reference r:
//
//	t –ls– m –rs– j,   j the die node;
//	low:  current i_low(v(j) − v(r)) from j to r (required; both polarities);
//	up:   current i_up(v(j) − v(rail)) from j to the rail node, or, without
//	      a rail node, i_up(v(j) − v(r) − upref) from j to r (an IBIS POWER
//	      clamp referred to a supply of upref volts that the deck does not
//	      draw);
//	c:    a linear capacitance from j to r (a clamp's junction capacitance,
//	      a pin's C_comp);
//	cpkg: a linear capacitance from t to r (an IBIS package's C_pkg).
//
// ls and rs are the series path of series.go, as the clamp's (a zero one
// adds no unknown). Each table path carries the engine's gmin in parallel.
//
// Probes: "ipath" is the current through the table paths (low plus up,
// out of the die), the current a pin's ifail is judged on; "beyond" is how
// far the voltage across a table lies outside that table's points (see
// IVTable.Beyond; the larger of the two paths', signed), 0 while every path
// is inside its table, so that a report can say when the solution rested
// on the tables' straight extensions.
type TablePath struct {
	name  string
	nodes []string
	low   *IVTable
	up    *IVTable
	upRef float64
	rail  bool
	c     float64
	cpkg  float64
	series

	r, rl    int
	kC, kPkg int
	gmin     float64
}

// TableSpec describes a table path in plain values (SI units).
type TableSpec struct {
	Name  string
	Nodes [2]string // the terminal (line or pin) and the reference
	Rail  string    // the up path's node; "" when the up path is referred to the reference
	Low   *IVTable  // required
	Up    *IVTable  // optional
	UpRef float64   // with Up and no Rail: the up path's reference above r, V
	C     float64   // die to reference, F
	Rs    float64   // series resistance terminal to die, Ω
	Ls    float64   // series inductance terminal to die, H
	Cpkg  float64   // terminal to reference, F
}

// NewTablePath builds a table path; every problem is reported at once.
func NewTablePath(s TableSpec) (*TablePath, error) {
	var errs []error
	bad := func(format string, args ...any) { errs = append(errs, fmt.Errorf(format, args...)) }
	if s.Low == nil {
		bad("a table path needs its table")
	}
	for _, p := range []struct {
		key string
		v   float64
	}{{"c", s.C}, {"rs", s.Rs}, {"ls", s.Ls}, {"cpkg", s.Cpkg}} {
		if !(p.v >= 0) || math.IsInf(p.v, 0) {
			bad("%s must be >= 0, got %g", p.key, p.v)
		}
	}
	if math.IsNaN(s.UpRef) || math.IsInf(s.UpRef, 0) {
		bad("the up path's reference voltage must be finite, got %g", s.UpRef)
	}
	if s.Rail != "" && s.Up == nil {
		bad("a rail node needs an up table")
	}
	if err := errors.Join(errs...); err != nil {
		return nil, fmt.Errorf("%s: %w", s.Name, err)
	}
	d := &TablePath{name: s.Name, nodes: []string{s.Nodes[0], s.Nodes[1]}, low: s.Low, up: s.Up,
		upRef: s.UpRef, c: s.C, cpkg: s.Cpkg, series: newSeries(s.Ls, s.Rs)}
	if s.Up != nil && s.Rail != "" {
		d.rail = true
		d.nodes = append(d.nodes, s.Rail)
	}
	return d, nil
}

// Name implements Device.
func (d *TablePath) Name() string { return d.name }

// Layout implements Device.
func (d *TablePath) Layout() Layout {
	l := Layout{Terminals: d.nodes}
	d.layout(&l, "die")
	return l
}

// Bind implements Device.
func (d *TablePath) Bind(n Nodes) []StateRows {
	d.r, d.rl = n.Terminals[1], Ground
	if d.rail {
		d.rl = n.Terminals[2]
	}
	d.bind(n.Terminals[0], n)
	var rows []StateRows
	d.kC, d.kPkg = -1, -1
	if d.c > 0 {
		d.kC = len(rows)
		rows = append(rows, StateRows{Plus: d.j, Minus: d.r})
	}
	if d.cpkg > 0 {
		d.kPkg = len(rows)
		rows = append(rows, StateRows{Plus: d.t, Minus: d.r})
	}
	return d.fluxRow(rows)
}

// Eval implements Device.
func (d *TablePath) Eval(c *Context) {
	d.gmin = c.Gmin
	d.stamp(c)
	u := c.V(d.j) - c.V(d.r)
	i, g := d.low.Eval(u)
	c.Current(d.j, d.r, i+c.Gmin*u, g+c.Gmin)
	if d.up != nil {
		if d.rail {
			w := c.V(d.j) - c.V(d.rl)
			i, g := d.up.Eval(w)
			c.Current(d.j, d.rl, i+c.Gmin*w, g+c.Gmin)
		} else {
			i, g := d.up.Eval(u - d.upRef)
			c.Current(d.j, d.r, i, g)
		}
	}
	if d.kC >= 0 {
		c.Capacitance(d.kC, d.j, d.r, d.c*u, d.c)
	}
	if d.kPkg >= 0 {
		w := c.V(d.t) - c.V(d.r)
		c.Capacitance(d.kPkg, d.t, d.r, d.cpkg*w, d.cpkg)
	}
}

// The optional behaviours the engine finds by type assertion: a mismatch
// would silently drop them.
var _ Prober = (*TablePath)(nil)

// Probes implements Prober.
func (d *TablePath) Probes() []Probe {
	return []Probe{{Name: "ipath", Unit: spec.Ampere}, {Name: "beyond", Unit: spec.Volt}}
}

// Probe implements Prober: dst[0] is ipath, dst[1] beyond, at x.
func (d *TablePath) Probe(x []float64, dst []float64) {
	u := at(x, d.j) - at(x, d.r)
	i, _ := d.low.Eval(u)
	ipath := i + d.gmin*u
	beyond := d.low.Beyond(u)
	if d.up != nil {
		w := u - d.upRef
		if d.rail {
			w = at(x, d.j) - at(x, d.rl)
		}
		iu, _ := d.up.Eval(w)
		if d.rail {
			iu += d.gmin * w
		}
		ipath += iu
		if b := d.up.Beyond(w); math.Abs(b) > math.Abs(beyond) {
			beyond = b
		}
	}
	dst[0], dst[1] = ipath, beyond
}
