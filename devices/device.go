// Package devices holds the device models of zapnet, one per file, behind the
// small Device interface that the engine in package mna drives.
//
// The engine solves F(x) + d/dt q(x) = 0 for the unknowns x: node voltages
// (one row of KCL each: the sum of currents leaving the node) and branch
// currents (one row each: the branch's defining equation). A device adds its
// static currents to F and its Jacobian to J, and declares charge-like states
// (charges of capacitors, fluxes of inductors) whose time derivative the
// engine forms with the integration rule in force. Models never allocate in
// Eval and never integrate anything themselves.
package devices

import (
	"fmt"
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// Ground is the index of the reference node; stamps on it are dropped.
const Ground = -1

// MaxUnknowns bounds the unknowns of a circuit (nodes, devices' internal
// nodes and branch currents). The engine needs about 8 kB of memory an
// unknown for a network of simple parts (a chain of a hundred thousand
// resistors peaks at 840 MB), so this is about 2 GB: past it a laptop
// would swap or kill the run [practice].
const MaxUnknowns = 250_000

// TooManyUnknowns is the error of a circuit of n unknowns past
// MaxUnknowns, nil otherwise.
func TooManyUnknowns(n int) error {
	if n <= MaxUnknowns {
		return nil
	}
	return fmt.Errorf("the circuit has %d unknowns; zapnet solves at most %d (about 8 kB of memory each): split the network, or replace repeated sections by their lumped equivalent", n, MaxUnknowns)
}

// Unknowns counts the unknowns the engine gives a layout beyond its
// terminals: its internal nodes and branch currents.
func (l Layout) Unknowns() int { return len(l.Internal) + len(l.Branches) }

// Layout is what a device asks of the engine before binding.
type Layout struct {
	Terminals []string // external node names, in the order Bind receives them
	Internal  []string // internal nodes, shown as NAME.suffix in messages
	Branches  []string // branch-current unknowns, shown as NAME.suffix
}

// Nodes are the unknown indices the engine assigned; Ground for gnd.
type Nodes struct {
	Terminals []int
	Internal  []int
	Branches  []int
}

// StateRows says where the time derivative of a state enters the system:
// +dq/dt on row Plus and −dq/dt on row Minus (either may be Ground). A
// capacitor between a and b is {a, b}; an inductor's flux on branch row br,
// whose equation is v(a) − v(b) − dλ/dt = 0, is {Ground, br}.
type StateRows struct{ Plus, Minus int }

// Device is one element of a compiled circuit.
type Device interface {
	// Name is the element's name in the deck.
	Name() string
	// Layout lists the terminals and the internal unknowns the device needs.
	Layout() Layout
	// Bind gives the device its indices and returns the states it uses, in
	// the order it addresses them in Eval (local state 0, 1, ...).
	Bind(n Nodes) []StateRows
	// Eval stamps the device at c.X into c. It must not allocate.
	Eval(c *Context)
}

// Optional behaviours, found by type assertion.
type (
	// Resetter clears per-run state (limiting memory, history) before a run.
	Resetter interface{ Reset() }
	// Acceptor is told every accepted solution point.
	Acceptor interface{ Accept(t float64, x []float64) }
	// StepLimiter bounds the time step (a line's delay).
	StepLimiter interface{ MaxStep() float64 }
	// RiseTaker is told, before each run, the shortest rise of the run's
	// stimulus (waveforms.Stimulus.Rise; 0 when unknown or off), so that it
	// can treat what is far faster as lumped.
	RiseTaker interface{ SetRise(rise float64) }
	// RunNoter has a remark for the report of the run it was last set up
	// for ("" for none): how it was solved, when that is not plain.
	RunNoter interface{ RunNote() string }
	// Prober reports named internal quantities at a solution point (for
	// example the current through a pin's internal clamp paths, in A).
	Prober interface {
		Probes() []Probe
		Probe(x []float64, dst []float64)
	}
)

// Context carries one evaluation. The engine owns every slice; devices use the
// methods. Fields are exported for the engine's sake only.
type Context struct {
	X  []float64 // the iterate being evaluated (read only)
	T  float64   // time of the point being solved, s
	DC bool      // operating point: strike off, d/dt q = 0

	F []float64 // residual, one entry per unknown (see Local)
	J []float64 // Jacobian, N×N row-major (see Local)
	N int

	// Local, when set, makes F and J the device's own: the engine sets
	// Local[u] to the place of unknown u among the rows the device being
	// evaluated may stamp (its terminals, internal nodes and branches), F
	// to that many entries and J to that many squared, row-major, with N
	// their count. The engine then adds them into its sparse matrix itself,
	// so that no dense N×N Jacobian is needed for a large deck. Devices
	// never see the difference: they stamp through the methods below.
	Local []int32

	// Integration: d/dt q_k ≈ Alpha·q_k + Hist[k]. Alpha is 0 at DC.
	Alpha     float64
	Q         []float64   // state values set by devices
	Rows      []StateRows // per global state
	StateBase int         // global index of the current device's state 0

	// Slopes, when it has room, receives every derivative given with
	// ChargeDeriv, in call order, and NSlopes counts them (past
	// len(Slopes) too): the engine moves the charges along them when it
	// takes an iterate one update beyond the point it evaluated.
	Slopes  []Slope
	NSlopes int

	// Limited is set by a device whose junction limiting changed the
	// iterate: the engine does not accept the iteration as converged.
	Limited bool
	// Gmin is the engine's tiny shunt conductance, for models that want it
	// across junctions, S.
	Gmin float64
	// SourceScale multiplies the value of every independent source that is
	// on at DC (supplies); the engine sets 1, and ramps it from 0 to 1 when
	// the operating point needs source stepping.
	SourceScale float64
}

// V is the value of unknown i (0 for Ground).
func (c *Context) V(i int) float64 {
	if i < 0 {
		return 0
	}
	return c.X[i]
}

// AddF adds v to the residual of row.
func (c *Context) AddF(row int, v float64) {
	if row >= 0 {
		if c.Local != nil {
			row = int(c.Local[row])
		}
		c.F[row] += v
	}
}

// AddJ adds v to the Jacobian entry (row, col).
func (c *Context) AddJ(row, col int, v float64) {
	if row >= 0 && col >= 0 {
		if c.Local != nil {
			row, col = int(c.Local[row]), int(c.Local[col])
		}
		c.J[row*c.N+col] += v
	}
}

// Current stamps a two-terminal current i flowing from a to b through the
// device, with g = di/du where u = v(a) − v(b).
func (c *Context) Current(a, b int, i, g float64) {
	if c.Local != nil {
		c.AddF(a, i)
		c.AddF(b, -i)
		c.AddJ(a, a, g)
		c.AddJ(a, b, -g)
		c.AddJ(b, a, -g)
		c.AddJ(b, b, g)
		return
	}
	// The engine's most frequent stamp, written out for the plain form.
	F, J, n := c.F, c.J, c.N
	if a >= 0 {
		F[a] += i
		J[a*n+a] += g
		if b >= 0 {
			J[a*n+b] -= g
			J[b*n+a] -= g
		}
	}
	if b >= 0 {
		F[b] -= i
		J[b*n+b] += g
	}
}

// Conductance stamps a linear conductance g between a and b.
func (c *Context) Conductance(a, b int, g float64) {
	c.Current(a, b, g*(c.V(a)-c.V(b)), g)
}

// Inject stamps an independent current i entering node a from outside and
// leaving through node b.
func (c *Context) Inject(a, b int, i float64) {
	c.AddF(a, -i)
	c.AddF(b, i)
}

// Charge sets local state k to q and its derivative with respect to the
// unknown col to dq. Call once per state with the value, then add further
// derivatives with ChargeDeriv.
func (c *Context) Charge(k int, q float64) { c.Q[c.StateBase+k] = q }

// Slope is one derivative given with ChargeDeriv: dq/dx_Col = D for the
// global state State.
type Slope struct {
	State, Col int32
	D          float64
}

// ChargeDeriv adds dq_k/dx_col = dq, stamping Alpha·dq on the state's rows.
func (c *Context) ChargeDeriv(k, col int, dq float64) {
	if col < 0 || c.Alpha == 0 {
		return
	}
	if n := c.NSlopes; n < len(c.Slopes) {
		c.Slopes[n] = Slope{State: int32(c.StateBase + k), Col: int32(col), D: dq}
	}
	c.NSlopes++
	r := c.Rows[c.StateBase+k]
	v := c.Alpha * dq
	c.AddJ(r.Plus, col, v)
	c.AddJ(r.Minus, col, -v)
}

// Capacitance is a charge q between a and b with dq/du = cap, u = v(a) − v(b).
func (c *Context) Capacitance(k, a, b int, q, cap float64) {
	c.Charge(k, q)
	c.ChargeDeriv(k, a, cap)
	c.ChargeDeriv(k, b, -cap)
}

// at is x[i], 0 for Ground: a probe reads a solution outside Eval.
func at(x []float64, i int) float64 {
	if i < 0 {
		return 0
	}
	return x[i]
}

// Probe names one internal quantity of a device and its unit.
type Probe struct {
	Name string // "ipath"; the engine reports it as "ELEMENT.ipath"
	Unit spec.Unit
}

// Striker is the strike device: the engine hands it each run's stimulus and
// the sign of its polarity (+1 pos, −1 neg). A nil stimulus switches it off.
type Striker interface {
	SetStimulus(s *waveforms.Stimulus, sign float64)
}
