package mna

import (
	"fmt"
	"math"
	"math/cmplx"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/netlist"
)

// AC is a compiled circuit linearised at its DC operating point (strike
// off, supplies on): the small-signal admittance
//
//	Y(jω) = G + jω·C
//
// where G = ∂F/∂x and C holds the derivatives of every charge and flux on
// the rows of its state, both read from the devices' own Eval stamps at the
// operating point, so the transient and the small-signal system share one
// model of every device: a junction's capacitance is the one at its bias, a
// bead is its rdc–(l ∥ rac ∥ c), a capacitor its esr–esl–C chain, an
// inductor a branch whose equation is v(a) − v(b) − jωL·i = 0. A device
// that implements devices.SmallSignal (the lossless line) stamps its exact
// equations at each frequency instead. The engine's shunt conductance Gmin
// stays on every node row, as at the operating point. Supplies are AC
// ground (their value is a constant); the strike is absent: every
// small-signal drive is an argument of the solve.
//
// An AC is independent of its System once built (it keeps copies of G and
// C), holds its own storage and is not safe for concurrent use.
type AC struct {
	n     int
	names []string       // display name of every unknown
	index map[string]int // circuit node → unknown
	nodes []string
	vop   []float64 // node voltages of the operating point, in nodes order
	gmin  float64

	g, c []float64 // n×n row-major
	devs []acDevice
	own  []int // devices that stamp their own small-signal equations
	elem map[string]int

	y   []complex128
	lu  *clu
	b   []complex128
	ctx devices.ACContext
}

// acDevice is one device's part of the small-signal system.
type acDevice struct {
	name  string
	dev   devices.SmallSignal // nil: G + jωC of its Eval stamps
	term  []int
	rows  []int     // every unknown the device stamps
	g, c  []acEntry // its own entries of G and C
	isCap bool      // it has states (for the loading breakdown)
}

type acEntry struct {
	i int // row*n + col
	v float64
}

// acScale is the integration coefficient with which the devices are
// evaluated a second time to read their capacitances: Eval then stamps
// acScale·dq/dx on top of the conductances, and C = (J − G)/acScale. A
// power of two keeps the scaling exact, and one this large makes the
// capacitive part dwarf any conductance of a circuit, so that the
// subtraction leaves C with the rounding of its own size (a femtofarad
// beside a 1 kS conductance keeps about 13 digits).
const acScale = 0x1p64

// Pair is a voltage v(Node) − v(Ref) between two circuit nodes; an empty
// Ref is gnd.
type Pair struct{ Node, Ref string }

// RefNode is the pair's reference by name: gnd when Ref is empty.
func (p Pair) RefNode() string {
	if p.Ref == "" {
		return netlist.Ground
	}
	return p.Ref
}

// Port is a small-signal port: a pair of nodes and the real impedance Z0
// that terminates it (and that its S-parameters are referred to), Ω.
type Port struct {
	Name string
	Pair
	Z0 float64
}

// ACError is a small-signal solve that has no answer, told as something a
// user can act on.
type ACError struct {
	Freq   float64 // Hz
	Where  string  // the node, branch or element most involved
	Reason string
	Hint   string
}

func (e *ACError) Error() string {
	msg := fmt.Sprintf("small-signal solve at %s: %s near %s", spec.FormatSI(e.Freq, spec.Hertz), e.Reason, e.Where)
	if e.Hint != "" {
		msg += "; " + e.Hint
	}
	return msg
}

// Linearize solves the operating point with the strike off and builds the
// small-signal system there. The System serves transient runs afterwards
// as before (each Transient sets its own stimulus).
func (s *System) Linearize(set *Settings) (*AC, error) {
	s.setStimulus(nil, 0)
	vop, err := s.OperatingPoint(set)
	if err != nil {
		return nil, err
	}
	t := tolerances(set)
	n := s.n
	a := &AC{
		n: n, names: s.unknowns, nodes: s.nodeNames, vop: vop, gmin: t.gmin,
		index: make(map[string]int, len(s.nodeNames)),
		g:     make([]float64, n*n), c: make([]float64, n*n),
		elem: make(map[string]int, len(s.devs)),
		y:    make([]complex128, n*n), lu: newCLU(n), b: make([]complex128, n),
	}
	a.ctx = devices.ACContext{Y: a.y, N: n}
	for i, name := range s.nodeNames {
		a.index[name] = s.nodeIdx[i]
	}

	x := append([]float64(nil), s.x...)
	jg := make([]float64, n*n)
	jc := make([]float64, n*n)
	ctx := devices.Context{
		X: x, F: make([]float64, n), N: n, Q: make([]float64, len(s.rows)), Rows: s.rows,
		Gmin: t.gmin, SourceScale: 1,
	}
	for di := range s.devs {
		d := &s.devs[di]
		ad := acDevice{name: s.elements[di], term: d.term, rows: d.touched, isCap: d.stateHi > d.stateLo}
		a.elem[ad.name] = di
		if own, ok := d.dev.(devices.SmallSignal); ok {
			ad.dev = own
			a.devs = append(a.devs, ad)
			a.own = append(a.own, di)
			continue
		}
		ctx.StateBase = d.stateLo
		clear(jg)
		ctx.J, ctx.Alpha = jg, 0
		d.dev.Eval(&ctx)
		clear(jc)
		ctx.J, ctx.Alpha = jc, acScale
		d.dev.Eval(&ctx)
		for _, r := range d.touched {
			for _, col := range d.touched {
				k := r*n + col
				gv := jg[k]
				cv := (jc[k] - gv) / acScale
				if gv != 0 {
					ad.g = append(ad.g, acEntry{k, gv})
					a.g[k] += gv
				}
				if cv != 0 {
					ad.c = append(ad.c, acEntry{k, cv})
					a.c[k] += cv
				}
			}
		}
		a.devs = append(a.devs, ad)
	}
	for _, i := range s.nodeRows {
		a.g[i*n+i] += t.gmin
	}
	return a, nil
}

// Nodes are the circuit's node names, in System.Nodes order.
func (a *AC) Nodes() []string { return a.nodes }

// OperatingPoint is the node voltages the system is linearised at, V, in
// Nodes order.
func (a *AC) OperatingPoint() []float64 { return a.vop }

// node is the unknown of a circuit node, Ground for gnd or "".
func (a *AC) node(name string) (int, error) {
	if name == "" || name == netlist.Ground {
		return devices.Ground, nil
	}
	if i, ok := a.index[name]; ok {
		return i, nil
	}
	return 0, fmt.Errorf("mna: no node %q in the circuit", name)
}

func (a *AC) pair(p Pair) (int, int, error) {
	i, err := a.node(p.Node)
	if err != nil {
		return 0, 0, err
	}
	j, err := a.node(p.Ref)
	if err != nil {
		return 0, 0, err
	}
	if i == j {
		return 0, 0, fmt.Errorf("mna: %s and %s are the same node", p.Node, p.RefNode())
	}
	return i, j, nil
}

// assemble forms Y at omega with the given ports terminated. skip, when a
// device index, leaves that device's reactance out (its capacitances and
// inductances; a line becomes the wire of its operating point).
func (a *AC) assemble(omega float64, loads []Port, skip int) error {
	for k, gv := range a.g {
		a.y[k] = complex(gv, omega*a.c[k])
	}
	if skip >= 0 && a.devs[skip].dev == nil {
		for _, e := range a.devs[skip].c {
			a.y[e.i] -= complex(0, omega*e.v)
		}
	}
	for _, di := range a.own {
		a.ctx.Omega = omega
		if di == skip {
			a.ctx.Omega = 0
		}
		a.devs[di].dev.StampAC(&a.ctx)
	}
	for _, p := range loads {
		i, j, err := a.pair(p.Pair)
		if err != nil {
			return err
		}
		if !(p.Z0 > 0) || math.IsInf(p.Z0, 0) {
			return fmt.Errorf("mna: port %s: impedance must be positive and finite, have %g Ω", p.Name, p.Z0)
		}
		stampY(a.y, a.n, i, j, complex(1/p.Z0, 0))
	}
	return nil
}

// stampY adds an admittance y between unknowns i and j (either may be Ground).
func stampY(m []complex128, n, i, j int, y complex128) {
	if i >= 0 {
		m[i*n+i] += y
	}
	if j >= 0 {
		m[j*n+j] += y
	}
	if i >= 0 && j >= 0 {
		m[i*n+j] -= y
		m[j*n+i] -= y
	}
}

// solveAt factors the assembled Y and solves for a unit current into i and
// out of j, leaving the unknowns in a.b.
func (a *AC) solveAt(f float64, i, j int) error {
	if k := a.lu.factor(a.y); k >= 0 {
		return &ACError{Freq: f, Where: a.where(k), Reason: "the small-signal matrix is singular",
			Hint: "a node or branch that nothing fixes at this frequency; connect it through a resistor"}
	}
	a.inject(i, j, 1)
	a.lu.solve(a.b)
	return nil
}

func (a *AC) inject(i, j int, v complex128) {
	clear(a.b)
	if i >= 0 {
		a.b[i] = v
	}
	if j >= 0 {
		a.b[j] = -v
	}
}

func (a *AC) where(k int) string {
	if k < 0 || k >= len(a.names) {
		return "an unknown"
	}
	for _, name := range a.nodes {
		if a.index[name] == k {
			return "node " + name
		}
	}
	return a.names[k]
}

// v is the solved voltage of unknowns i − j.
func (a *AC) v(i, j int) complex128 {
	var v complex128
	if i >= 0 {
		v = a.b[i]
	}
	if j >= 0 {
		v -= a.b[j]
	}
	return v
}

// heldBelow is the impedance, Ω, below which a drive's node counts as held
// at AC ground: an ideal supply leaves only the rounding of the solve there
// (about 1e-16 Ω), while the smallest impedance a real network shows (an
// ideal 0.1 F at 6 GHz) is above 1e-10 Ω.
const heldBelow = 1e-12

// Response drives a 1 A test current into in.Node (out of in.Ref) at
// frequency f with the loads terminated, and returns the impedance seen
// there, zin = v(in)/1 A, and in h the transfer v(out)/v(in) of every out.
// The transfer is the one an ideal voltage source at in would see (the
// circuit is linear, so a current that sets v(in) sets every other voltage
// alike), and the impedance is the one that source drives. h must have
// len(outs).
func (a *AC) Response(f float64, in Pair, loads []Port, outs []Pair, h []complex128) (zin complex128, err error) {
	if len(h) != len(outs) {
		panic("mna: Response: len(h) != len(outs)")
	}
	i, j, err := a.pair(in)
	if err != nil {
		return 0, err
	}
	if err := a.assemble(2*math.Pi*f, loads, -1); err != nil {
		return 0, err
	}
	if err := a.solveAt(f, i, j); err != nil {
		return 0, err
	}
	zin = a.v(i, j)
	if !(cmplx.Abs(zin) > heldBelow) || cmplx.IsInf(zin) {
		return 0, &ACError{Freq: f, Where: "node " + in.Node,
			Reason: "the drive's node is held at AC ground, so nothing passes from it",
			Hint:   "an ideal supply there is a short at every frequency; give it a source resistance r="}
	}
	for k, o := range outs {
		p, q, err := a.pair(o)
		if err != nil {
			return 0, err
		}
		h[k] = a.v(p, q) / zin
	}
	return zin, nil
}

// Sweep is Response at every frequency of freq (Hz): zin[k] and h[o][k].
func (a *AC) Sweep(freq []float64, in Pair, loads []Port, outs []Pair) (zin []complex128, h [][]complex128, err error) {
	zin = make([]complex128, len(freq))
	h = make([][]complex128, len(outs))
	for o := range h {
		h[o] = make([]complex128, len(freq))
	}
	hk := make([]complex128, len(outs))
	for k, f := range freq {
		z, err := a.Response(f, in, loads, outs, hk)
		if err != nil {
			return nil, nil, err
		}
		zin[k] = z
		for o := range outs {
			h[o][k] = hk[o]
		}
	}
	return zin, h, nil
}

// TwoPort is the scattering matrix at f of the two ports p[0] and p[1],
// each terminated by its Z0 and referred to it (power waves on a real
// reference impedance): with a source Vs behind Z0j at port j and the
// other port terminated, S_jj = 2·Vj/Vs − 1 and
// S_ij = 2·(Vi/Vs)·√(Z0j/Z0i). S[1][0] is S21, the transmission from port 1
// to port 2.
func (a *AC) TwoPort(f float64, p [2]Port) (S [2][2]complex128, err error) {
	if err := a.assemble(2*math.Pi*f, p[:], -1); err != nil {
		return S, err
	}
	var idx [2][2]int
	for k := range p {
		if idx[k][0], idx[k][1], err = a.pair(p[k].Pair); err != nil {
			return S, err
		}
	}
	if k := a.lu.factor(a.y); k >= 0 {
		return S, &ACError{Freq: f, Where: a.where(k), Reason: "the small-signal matrix is singular",
			Hint: "a node or branch that nothing fixes at this frequency; connect it through a resistor"}
	}
	for j := range p {
		// A 1 V source behind Z0j is a current 1/Z0j beside Z0j (Norton).
		a.inject(idx[j][0], idx[j][1], complex(1/p[j].Z0, 0))
		a.lu.solve(a.b)
		for i := range p {
			vi := a.v(idx[i][0], idx[i][1])
			if i == j {
				S[i][j] = 2*vi - 1
			} else {
				S[i][j] = 2 * vi * complex(math.Sqrt(p[j].Z0/p[i].Z0), 0)
			}
		}
	}
	return S, nil
}

// ElementImpedance is the small-signal impedance at f of one element alone,
// at its operating point, between its first two terminals: the bead's
// rdc–(l ∥ rac ∥ c), a capacitor's esr–esl–C, a clamp's junction at its
// bias behind ls and rdyn.
func (a *AC) ElementImpedance(name string, f float64) (complex128, error) {
	di, ok := a.elem[name]
	if !ok {
		return 0, fmt.Errorf("mna: no element %q", name)
	}
	d := &a.devs[di]
	if len(d.term) < 2 {
		return 0, fmt.Errorf("mna: %s has fewer than two terminals", name)
	}
	ta, tb := d.term[0], d.term[1]
	if ta < 0 {
		ta, tb = tb, ta
	}
	if ta < 0 || ta == tb {
		return 0, fmt.Errorf("mna: %s: both terminals on one node", name)
	}
	n := a.n
	omega := 2 * math.Pi * f
	clear(a.y)
	if d.dev != nil {
		a.ctx.Omega = omega
		d.dev.StampAC(&a.ctx)
	} else {
		for _, e := range d.g {
			a.y[e.i] += complex(e.v, 0)
		}
		for _, e := range d.c {
			a.y[e.i] += complex(0, omega*e.v)
		}
	}
	// Every unknown outside the element, and its second terminal, is held
	// at zero by an identity row.
	mine := make([]bool, n)
	for _, r := range d.rows {
		mine[r] = true
	}
	if tb >= 0 {
		mine[tb] = false
	}
	for r := 0; r < n; r++ {
		if !mine[r] {
			row := a.y[r*n : r*n+n]
			clear(row)
			row[r] = 1
			for k := 0; k < n; k++ {
				if k != r {
					a.y[k*n+r] = 0
				}
			}
		}
	}
	if err := a.solveAt(f, ta, devices.Ground); err != nil {
		return 0, err
	}
	return a.b[ta], nil
}

// ElementCap is one element's share of the capacitance a node sees, F.
type ElementCap struct {
	Element string
	C       float64
}

// NodeCapacitance is the capacitance the node pair p sees into the circuit
// at f: Im(Y)/ω of the admittance Y = 1/Z seen there (no ports
// terminated). A negative value means the node looks inductive at f (a bead
// in front of a large capacitor). per lists, for every element with
// capacitance, inductance or delay, how much the total falls when that
// element's reactance is taken out (a line becomes a wire): for elements
// side by side on the node these shares add up to the total.
func (a *AC) NodeCapacitance(p Pair, f float64) (total float64, per []ElementCap, err error) {
	i, j, err := a.pair(p)
	if err != nil {
		return 0, nil, err
	}
	omega := 2 * math.Pi * f
	at := func(skip int) (float64, error) {
		if err := a.assemble(omega, nil, skip); err != nil {
			return 0, err
		}
		if err := a.solveAt(f, i, j); err != nil {
			return 0, err
		}
		return imag(1/a.v(i, j)) / omega, nil
	}
	if total, err = at(-1); err != nil {
		return 0, nil, err
	}
	for di := range a.devs {
		d := &a.devs[di]
		if d.dev == nil && !d.isCap {
			continue
		}
		c, err := at(di)
		if err != nil {
			return 0, nil, err
		}
		if share := total - c; share != 0 {
			per = append(per, ElementCap{Element: d.name, C: share})
		}
	}
	return total, per, nil
}

// LogFrequencies is a log sweep from from to to (Hz) with perDecade
// points a decade on a grid aligned to the decades, 10^(m/perDecade), so
// that every decade (and with 10 or 20 a decade every 2-5 step, nearly)
// is a point of its own; from and to are added when they are off the grid,
// unless a grid point lies within 1e-9 of them.
func LogFrequencies(from, to float64, perDecade int) []float64 {
	if !(from > 0) || !(to >= from) || math.IsInf(to, 0) || perDecade < 1 {
		panic("mna: LogFrequencies: need 0 < from ≤ to < ∞ and perDecade ≥ 1")
	}
	n := float64(perDecade)
	lo := int(math.Ceil(math.Log10(from)*n - 1e-9))
	hi := int(math.Floor(math.Log10(to)*n + 1e-9))
	f := []float64{from}
	for m := lo; m <= hi; m++ {
		v := math.Pow(10, float64(m)/n)
		if v/f[len(f)-1]-1 > 1e-9 && 1-v/to > -1e-9 {
			f = append(f, v)
		} else if math.Abs(v/f[len(f)-1]-1) <= 1e-9 {
			f[len(f)-1] = v
		}
	}
	if to/f[len(f)-1]-1 > 1e-9 {
		f = append(f, to)
	}
	return f
}
