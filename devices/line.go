package devices

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

// Line is the lossless transmission line of MODELS.md between the ports in
// and out, each referred to gnd, with characteristic impedance z0 and
// one-way delay T, solved by the method of characteristics. With i1, i2 the
// currents into the line at in and out, the waves leaving each end arrive
// unchanged at the other one delay later:
//
//	i1(t) = v1(t)/z0 − [v2(t−T)/z0 + i2(t−T)]
//	i2(t) = v2(t)/z0 − [v1(t−T)/z0 + i1(t−T)]
//
// so in the transient each port is a conductance 1/z0 to gnd beside a
// current fixed by the stored history. The time step never exceeds T
// (MaxStep), so t − T always falls inside the stored history. The history is
// interpolated by the parabola through the two accepted points around t − T
// and the next one (the previous one at the newest end): linear
// interpolation smooths the waves a little on every transit, which drains a
// ringing line's energy visibly when the step is a sizeable fraction of T;
// the parabola cuts that loss by more than an order of magnitude at the
// same steps.
//
// At the operating point a lossless line is a wire: its steady state has
// v1 = v2 and i1 = −i2, which the two equations above cannot fix by
// themselves (with the history equal to the present values they collapse
// into one). The line therefore owns a branch current: at DC it carries the
// wire's current with the branch equation v1 − v2 = 0; in the transient it
// is unused and held at 0. The accepted operating point (t = 0) seeds the
// history, which is held constant before it: the line starts in its DC
// steady state. A line evaluated before any accepted point sees a history at
// rest (all zero).
//
// A line whose delay is far below the shortest rise of the run's stimulus
// (LumpRatio: a 1 ps trace under an 8/20 µs surge) is solved as its lumped
// equivalent instead, the π section of series inductance z0·T and half its
// capacitance T/z0 at each end, which needs no step as short as T: its
// error against the exact line is of the order of (T/rise)², far below
// the accuracy of any run [mem: the lumped-Pi model of an electrically
// short line, as in C. R. Paul, "Analysis of Multiconductor Transmission
// Lines"]. The branch then carries the inductance's current.
type Line struct {
	name  string
	nodes [2]string
	z0, g float64 // Ω, 1/z0
	delay float64 // s

	in, out, br int

	// History ring: accepted points, oldest at head.
	ht, hv1, hv2, hi1, hi2 []float64
	head, size             int

	lumped bool    // solved as the π section (SetRise)
	rise   float64 // the stimulus's shortest rise, s (SetRise)
	l, ch  float64 // the π section: series inductance, H, and each end's capacitance, F

	lastDC  bool    // the last Eval was an operating-point one
	cacheT  float64 // time of the cached history
	cacheOK bool
	h1, h2  float64 // history currents at cacheT − delay
}

func init() {
	Register(&Kind{Kind: spec.Kind{
		Name: "line", Summary: "a lossless transmission line whose return is gnd",
		Terminals: [2]string{"in", "out"}, Role: spec.Carrier, Order: 90, DC: spec.ToReference,
		Table: spec.Table{Params: []spec.Param{
			spec.Required("z0", spec.Ohm, spec.Positive),
			spec.Required("delay", spec.Second, spec.Positive),
		}},
	}, New: newLine})
}

// lineHistoryCap is the initial history capacity; it grows (outside Eval)
// when a run keeps more points within one delay.
const lineHistoryCap = 256

// newLine builds a line from its checked values.
func newLine(name string, nodes [2]string, v *spec.Values) (Device, error) {
	z0, delay := v.Num("z0"), v.Num("delay")
	d := &Line{name: name, nodes: nodes, z0: z0, g: 1 / z0, delay: delay, l: z0 * delay, ch: delay / z0 / 2}
	d.allocHistory(lineHistoryCap)
	return d, nil
}

func (d *Line) allocHistory(n int) {
	d.ht = make([]float64, n)
	d.hv1 = make([]float64, n)
	d.hv2 = make([]float64, n)
	d.hi1 = make([]float64, n)
	d.hi2 = make([]float64, n)
}

// Name implements Device.
func (d *Line) Name() string { return d.name }

// Layout implements Device.
func (d *Line) Layout() Layout {
	return Layout{Terminals: []string{d.nodes[0], d.nodes[1]}, Branches: []string{"dc"}}
}

// Bind implements Device. The states are the π section's: the flux on
// the branch and the charge at each end; the characteristic form holds
// them at zero.
func (d *Line) Bind(n Nodes) []StateRows {
	d.in, d.out, d.br = n.Terminals[0], n.Terminals[1], n.Branches[0]
	return []StateRows{{Plus: Ground, Minus: d.br}, {Plus: d.in, Minus: Ground}, {Plus: d.out, Minus: Ground}}
}

// LumpRatio is how many times the shortest rise of a stimulus must exceed
// a line's delay for the line to be solved lumped: (T/rise)² is then below
// 1e-4 [practice].
const LumpRatio = 100

// SetRise implements RiseTaker: the line is lumped for a stimulus whose
// shortest rise is at least LumpRatio times its delay.
func (d *Line) SetRise(rise float64) {
	d.lumped = rise > 0 && rise >= LumpRatio*d.delay
	d.rise = rise
}

// RunNote implements RunNoter: a lumped line says so.
func (d *Line) RunNote() string {
	if !d.lumped {
		return ""
	}
	return fmt.Sprintf("%s's delay of %s is far below the stimulus's shortest rise of %s: it was solved as its lumped series inductance (%s) and capacitance (%s)",
		d.name, spec.FormatSI(d.delay, spec.Second), spec.FormatSI(d.rise, spec.Second), spec.FormatSI(d.l, spec.Henry), spec.FormatSI(2*d.ch, spec.Farad))
}

// Lumped says whether the line is solved as its π section in this run.
func (d *Line) Lumped() bool { return d.lumped }

// MaxStep implements StepLimiter: the delay, which the characteristic
// form's history needs; none for the π section.
func (d *Line) MaxStep() float64 {
	if d.lumped {
		return 0
	}
	return d.delay
}

// Reset implements Resetter: the history is emptied, its storage kept.
func (d *Line) Reset() {
	d.head, d.size = 0, 0
	d.cacheOK = false
	d.lastDC = false
}

// Eval implements Device.
func (d *Line) Eval(c *Context) {
	d.lastDC = c.DC
	if d.lumped {
		// At the operating point the flux's derivative is off and the
		// branch is the wire; the charges start where it leaves them.
		stampBranch(c, 0, d.in, d.out, d.br, d.l)
		c.Capacitance(1, d.in, Ground, d.ch*c.V(d.in), d.ch)
		c.Capacitance(2, d.out, Ground, d.ch*c.V(d.out), d.ch)
		return
	}
	c.Charge(0, 0)
	c.Charge(1, 0)
	c.Charge(2, 0)
	if c.DC {
		branchKCL(c, d.in, d.out, d.br)
		return
	}
	if !d.cacheOK || d.cacheT != c.T {
		d.h1, d.h2 = d.history(c.T)
		d.cacheT, d.cacheOK = c.T, true
	}
	c.Current(d.in, Ground, d.g*c.V(d.in)-d.h1, d.g)
	c.Current(d.out, Ground, d.g*c.V(d.out)-d.h2, d.g)
	c.AddF(d.br, c.V(d.br))
	c.AddJ(d.br, d.br, 1)
}

// history returns the history currents of both ports for time t:
// v2(t−T)/z0 + i2(t−T) and v1(t−T)/z0 + i1(t−T).
func (d *Line) history(t float64) (h1, h2 float64) {
	v1, v2, i1, i2 := d.at(t - d.delay)
	return d.g*v2 + i2, d.g*v1 + i1
}

// at interpolates the stored port values at time tq (quadratic, linear with
// two points); before the first point the first point holds, after the last
// the last one does.
func (d *Line) at(tq float64) (v1, v2, i1, i2 float64) {
	if d.size == 0 {
		return 0, 0, 0, 0
	}
	n := len(d.ht)
	// Binary search for the first point later than tq.
	lo, hi := 0, d.size
	for lo < hi {
		mid := (lo + hi) / 2
		if d.ht[(d.head+mid)%n] > tq {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	if lo == 0 || lo == d.size {
		j := d.head % n
		if lo == d.size {
			j = (d.head + d.size - 1) % n
		}
		return d.hv1[j], d.hv2[j], d.hi1[j], d.hi2[j]
	}
	a, b := (d.head+lo-1)%n, (d.head+lo)%n
	third := -1
	switch {
	case lo+1 < d.size:
		third = (d.head + lo + 1) % n
	case lo-2 >= 0:
		third = (d.head + lo - 2) % n
	}
	if third < 0 {
		w := (tq - d.ht[a]) / (d.ht[b] - d.ht[a])
		return d.hv1[a] + w*(d.hv1[b]-d.hv1[a]), d.hv2[a] + w*(d.hv2[b]-d.hv2[a]),
			d.hi1[a] + w*(d.hi1[b]-d.hi1[a]), d.hi2[a] + w*(d.hi2[b]-d.hi2[a])
	}
	ta, tb, tc := d.ht[a], d.ht[b], d.ht[third]
	wa := (tq - tb) * (tq - tc) / ((ta - tb) * (ta - tc))
	wb := (tq - ta) * (tq - tc) / ((tb - ta) * (tb - tc))
	wc := (tq - ta) * (tq - tb) / ((tc - ta) * (tc - tb))
	return wa*d.hv1[a] + wb*d.hv1[b] + wc*d.hv1[third], wa*d.hv2[a] + wb*d.hv2[b] + wc*d.hv2[third],
		wa*d.hi1[a] + wb*d.hi1[b] + wc*d.hi1[third], wa*d.hi2[a] + wb*d.hi2[b] + wc*d.hi2[third]
}

// Accept implements Acceptor: it stores the port voltages and currents of
// an accepted point. The point counts as the operating point when the last
// evaluation was one; its currents are then the wire's branch current.
func (d *Line) Accept(t float64, x []float64) {
	if d.lumped {
		return
	}
	v1, v2 := at(x, d.in), at(x, d.out)
	var i1, i2 float64
	if d.lastDC {
		i1 = at(x, d.br)
		i2 = -i1
	} else {
		h1, h2 := d.history(t)
		i1 = d.g*v1 - h1
		i2 = d.g*v2 - h2
	}
	// A point at or before the newest one replaces what it overtakes (an
	// engine that re-accepts a time, or restarts without Reset).
	n := len(d.ht)
	for d.size > 0 && d.ht[(d.head+d.size-1)%n] >= t {
		d.size--
	}
	// Drop points no future query (at or after t − T) needs: keep the
	// newest one at or before t − T.
	for d.size >= 2 && d.ht[(d.head+1)%n] <= t-d.delay {
		d.head = (d.head + 1) % n
		d.size--
	}
	if d.size == n {
		d.grow()
		n = len(d.ht)
	}
	j := (d.head + d.size) % n
	d.ht[j], d.hv1[j], d.hv2[j], d.hi1[j], d.hi2[j] = t, v1, v2, i1, i2
	d.size++
	d.cacheOK = false
}

// grow doubles the history storage, oldest point first.
func (d *Line) grow() {
	old := [][]float64{d.ht, d.hv1, d.hv2, d.hi1, d.hi2}
	n := len(d.ht)
	d.allocHistory(2 * n)
	for s, dst := range [][]float64{d.ht, d.hv1, d.hv2, d.hi1, d.hi2} {
		for k := range d.size {
			dst[k] = old[s][(d.head+k)%n]
		}
	}
	d.head = 0
}

// StampAC implements SmallSignal with the line's exact frequency-domain
// equations. With e = e^(−jωT) the characteristic equations above read
//
//	i1 = v1/z0 − e·(v2/z0 + i2),   i2 = v2/z0 − e·(v1/z0 + i1).
//
// The branch unknown carries i1; eliminating i2 from the first equation
// gives the branch row
//
//	z0·(1 − e²)·i1 − (1 + e²)·v1 + 2e·v2 = 0
//
// and the second is the current into the out port. Unlike the admittance
// parameters (−j·cot(ωT)/z0 and j/(z0·sin ωT), which they equal), these
// stay finite at every frequency: where ωT is a multiple of π the branch row
// becomes v1 = ±v2 and i1 is fixed by the rest of the circuit. At ω = 0 they
// are the wire of the operating point.
func (d *Line) StampAC(c *ACContext) {
	e := complex(math.Cos(c.Omega*d.delay), -math.Sin(c.Omega*d.delay))
	e2 := e * e
	g := complex(d.g, 0)
	c.Add(d.in, d.br, 1)
	c.Add(d.out, d.out, g)
	c.Add(d.out, d.in, -e*g)
	c.Add(d.out, d.br, -e)
	c.Add(d.br, d.br, complex(d.z0, 0)*(1-e2))
	c.Add(d.br, d.in, -(1 + e2))
	c.Add(d.br, d.out, 2*e)
}
