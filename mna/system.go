package mna

import (
	"errors"
	"fmt"
	"slices"
	"strings"

	"zapnet/devices"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// System is a compiled circuit: the numbering of its unknowns, its devices
// and every buffer a solution needs. It is reused across runs (the runs of a
// sweep) and is not safe for concurrent use: give each goroutine its own.
type System struct {
	nodeNames   []string // circuit nodes, in result order
	nodeIdx     []int    // unknown of each circuit node
	unknowns    []string // display name of every unknown
	isNode      []bool   // KCL row (true) or branch row (false)
	nodeRows    []int    // the KCL rows, which carry the shunt conductance
	rowCols     [][]int  // for a branch row, the columns its device can stamp
	owner       []int    // device owning an internal unknown, -1 for circuit nodes
	circuitNode []int    // circuit node of each unknown, -1 for internal ones
	nodeDevs    [][]int  // devices touching each circuit node, for hints
	devs        []device
	elements    []string
	probes      []devices.Probe

	striker devices.Striker
	stim    *waveforms.Stimulus // of the run under way: its breakpoints and span

	n     int
	ctx   devices.Context
	x     []float64 // iterate
	xAcc  []float64 // last accepted solution
	dx    []float64
	f     []float64
	jac   []float64
	lu    *lu
	scale []float64 // largest single contribution on each row, for the residual test
	noise []float64 // size of the cancelling state terms on each row, for the same
	snap  []float64 // per-device scratch: rows before its Eval

	// States: q set by the devices at the last evaluation, hist the
	// integration history, qdot the derivative formed at the last
	// evaluation, qdotAcc at the last accepted point.
	q, hist, qdot, qdotAcc []float64
	rows                   []devices.StateRows
	stateDev               []int // device of each state
	stateTerm              [][2]int
	hq                     [3][]float64 // accepted charge history (ring)
	ht                     [3]float64

	termCur        []float64 // current into every device terminal (flattened), A
	power          []float64 // per element at the last accepted point, W
	dcMethod       string    // how the last operating point was found, for tests
	factorisations int       // LU factorisations of the transient, for Stats
	lteWorst       int       // state of the largest truncation error at the last estimate

	pt       Point
	resRow   int     // row of the largest scaled residual in the last Newton iteration
	resValue float64 // its residual
}

// device is one compiled element with the engine's bookkeeping.
type device struct {
	dev       devices.Device
	nodes     devices.Nodes
	term      []int  // terminal rows (Ground allowed)
	touched   []int  // distinct rows the device may stamp
	prior     []int  // indices in touched of the rows an earlier device stamps too
	shared    []bool // for each row in touched, whether it is in prior
	termSnap  []int  // for each terminal, its index in touched, or -1
	stateLo   int
	stateHi   int
	curBase   int
	probeBase int
	nProbe    int
	prober    devices.Prober
	acceptor  devices.Acceptor
	resetter  devices.Resetter
	limiter   devices.StepLimiter
}

// Compile numbers the nodes of c, builds its devices and allocates every
// buffer a solution needs.
//
// Nodes() lists the circuit nodes in order of first appearance among the
// elements' terminals (deck order). Every element, the strike included, is
// built by its kind's constructor (devices.Kind.New).
func Compile(c *netlist.Circuit) (*System, error) {
	s := &System{}
	var errs []error
	for _, e := range c.Elements {
		d, err := e.Kind.New(e.Name, e.Nodes, &e.Values)
		if err != nil {
			errs = append(errs, fmt.Errorf("%s: %s %s: %w", e.Pos, e.Kind.Name, e.Name, err))
			continue
		}
		s.devs = append(s.devs, device{dev: d})
		s.elements = append(s.elements, e.Name)
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	if len(s.devs) == 0 {
		return nil, errors.New("mna: the circuit has no elements")
	}

	// Unknowns are numbered as the elements are met: a new terminal node,
	// then the element's internal nodes and branches. Unknowns that share
	// an element stay close, which keeps the matrix of a chain (a ladder, a
	// line of parts) banded and its factorisation cheap.
	nodeIndex := map[string]int{} // node name → unknown
	var rows []devices.StateRows
	var stateDev []int
	nTerm, nProbe := 0, 0
	for di := range s.devs {
		d := &s.devs[di]
		lay := d.dev.Layout()
		name := d.dev.Name()
		for k, t := range lay.Terminals {
			if t == "" {
				errs = append(errs, fmt.Errorf("mna: %s: terminal %d has no node", name, k+1))
			}
			idx := devices.Ground
			if t != netlist.Ground && t != "" {
				var ok bool
				if idx, ok = nodeIndex[t]; !ok {
					idx = s.addUnknown(t, true, -1)
					nodeIndex[t] = idx
					s.nodeNames = append(s.nodeNames, t)
					s.nodeIdx = append(s.nodeIdx, idx)
					s.nodeDevs = append(s.nodeDevs, nil)
				}
				cn := s.circuitNode[idx]
				if k := len(s.nodeDevs[cn]); k == 0 || s.nodeDevs[cn][k-1] != di {
					s.nodeDevs[cn] = append(s.nodeDevs[cn], di)
				}
			}
			d.nodes.Terminals = append(d.nodes.Terminals, idx)
		}
		for _, in := range lay.Internal {
			d.nodes.Internal = append(d.nodes.Internal, s.addUnknown(name+"."+in, true, di))
		}
		for _, br := range lay.Branches {
			d.nodes.Branches = append(d.nodes.Branches, s.addUnknown(name+"."+br, false, di))
		}
		d.term = d.nodes.Terminals
		for _, r := range d.nodes.Terminals {
			d.termSnap = append(d.termSnap, addRow(&d.touched, r))
		}
		// A device with a terminal twice on one node gets that row's current
		// on its first terminal only.
		for t := range d.termSnap {
			for u := 0; u < t; u++ {
				if d.termSnap[u] == d.termSnap[t] {
					d.termSnap[t] = -1
				}
			}
		}
		for _, r := range d.nodes.Internal {
			addRow(&d.touched, r)
		}
		for _, r := range d.nodes.Branches {
			addRow(&d.touched, r)
		}
		d.curBase = nTerm
		nTerm += len(d.term)
		d.prober, _ = d.dev.(devices.Prober)
		d.acceptor, _ = d.dev.(devices.Acceptor)
		d.resetter, _ = d.dev.(devices.Resetter)
		d.limiter, _ = d.dev.(devices.StepLimiter)
		if st, ok := d.dev.(devices.Striker); ok {
			if s.striker != nil {
				errs = append(errs, fmt.Errorf("mna: more than one strike (%s)", name))
			}
			s.striker = st
		}
		d.probeBase = nProbe
		if d.prober != nil {
			for _, p := range d.prober.Probes() {
				p.Name = name + "." + p.Name
				s.probes = append(s.probes, p)
				nProbe++
				d.nProbe++
			}
		}
	}
	s.n = len(s.unknowns)
	// A branch row belongs to one device, which alone stamps it, and only
	// in its own unknowns' columns.
	s.rowCols = make([][]int, s.n)
	for i, node := range s.isNode {
		if !node {
			s.rowCols[i] = s.devs[s.owner[i]].touched
		}
	}
	// A row that no earlier device stamps holds zero when a device's Eval
	// starts, so only the others need a snapshot to tell its contribution.
	stamped := make([]bool, s.n)
	for di := range s.devs {
		d := &s.devs[di]
		d.shared = make([]bool, len(d.touched))
		for k, r := range d.touched {
			if stamped[r] {
				d.prior = append(d.prior, k)
				d.shared[k] = true
			}
		}
		for _, r := range d.touched {
			stamped[r] = true
		}
	}
	for i, node := range s.isNode {
		if node {
			s.nodeRows = append(s.nodeRows, i)
		}
	}
	for di := range s.devs {
		d := &s.devs[di]
		sr := d.dev.Bind(d.nodes)
		d.stateLo = len(rows)
		for _, r := range sr {
			if r.Plus >= s.n || r.Minus >= s.n || r.Plus < devices.Ground || r.Minus < devices.Ground {
				panic(fmt.Sprintf("mna: %s: state row out of range", d.dev.Name()))
			}
			rows = append(rows, r)
			stateDev = append(stateDev, di)
		}
		d.stateHi = len(rows)
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	s.rows, s.stateDev = rows, stateDev
	s.stateTerm = make([][2]int, len(rows))
	for k, r := range rows {
		d := &s.devs[stateDev[k]]
		s.stateTerm[k] = [2]int{termOf(d, r.Plus), termOf(d, r.Minus)}
	}

	n, ns := s.n, len(rows)
	s.x = make([]float64, n)
	s.xAcc = make([]float64, n)
	s.dx = make([]float64, n)
	s.f = make([]float64, n)
	s.jac = make([]float64, n*n)
	first, last := s.structure()
	s.lu = newLU(n, first, last)
	s.scale = make([]float64, n)
	s.noise = make([]float64, n)
	maxTouched := 0
	for _, d := range s.devs {
		maxTouched = max(maxTouched, len(d.touched))
	}
	s.snap = make([]float64, maxTouched)
	s.q = make([]float64, ns)
	s.hist = make([]float64, ns)
	s.qdot = make([]float64, ns)
	s.qdotAcc = make([]float64, ns)
	for i := range s.hq {
		s.hq[i] = make([]float64, ns)
	}
	s.termCur = make([]float64, nTerm)
	s.power = make([]float64, len(s.devs))
	s.pt = Point{
		V: make([]float64, len(s.nodeNames)),
		I: make([]float64, len(s.devs)),
		W: make([]float64, len(s.devs)),
		P: make([]float64, nProbe),
	}
	s.ctx = devices.Context{
		X: s.x, F: s.f, J: s.jac, N: n,
		Q: s.q, Rows: s.rows, SourceScale: 1,
	}
	return s, nil
}

// structure is the first and last column each row of the Jacobian can
// reach: a device stamps only among its own unknowns, the engine only on the
// diagonal. The structure is symmetric, so it bounds the columns too.
func (s *System) structure() (first, last []int) {
	first, last = make([]int, s.n), make([]int, s.n)
	for i := range last {
		first[i], last[i] = i, i
	}
	for di := range s.devs {
		d := &s.devs[di]
		lo, hi := s.n, -1
		for _, r := range d.touched {
			lo, hi = min(lo, r), max(hi, r)
		}
		for _, r := range d.touched {
			first[r], last[r] = min(first[r], lo), max(last[r], hi)
		}
		for k := d.stateLo; k < d.stateHi; k++ {
			for _, r := range [2]int{s.rows[k].Plus, s.rows[k].Minus} {
				if r >= 0 && !slices.Contains(d.touched, r) {
					panic(fmt.Sprintf("mna: %s: a state row outside the device's unknowns", d.dev.Name()))
				}
			}
		}
	}
	return first, last
}

// addUnknown numbers a new unknown.
func (s *System) addUnknown(name string, node bool, owner int) int {
	i := len(s.unknowns)
	s.unknowns = append(s.unknowns, name)
	s.isNode = append(s.isNode, node)
	s.owner = append(s.owner, owner)
	cn := -1
	if owner < 0 {
		cn = len(s.nodeNames)
	}
	s.circuitNode = append(s.circuitNode, cn)
	return i
}

// addRow appends r to rows unless it is Ground or already there, and
// returns its index (-1 for Ground).
func addRow(rows *[]int, r int) int {
	if r < 0 {
		return -1
	}
	for i, v := range *rows {
		if v == r {
			return i
		}
	}
	*rows = append(*rows, r)
	return len(*rows) - 1
}

// termOf is the flattened terminal-current index of the terminal of d on
// row r, or -1.
func termOf(d *device, r int) int {
	if r < 0 {
		return -1
	}
	for t, tr := range d.term {
		if tr == r && d.termSnap[t] >= 0 {
			return d.curBase + t
		}
	}
	return -1
}

// Nodes are the circuit's node names (gnd excluded), in result order: order
// of first appearance among the elements' terminals.
func (s *System) Nodes() []string { return s.nodeNames }

// Elements are the element names, in result order (deck order).
func (s *System) Elements() []string { return s.elements }

// Probes are the devices' probes, named "ELEMENT.probe", in result order.
func (s *System) Probes() []devices.Probe { return s.probes }

// setStimulus hands the run's stimulus to the strike; it also supplies the
// breakpoints and the default span.
func (s *System) setStimulus(st *waveforms.Stimulus, sign float64) {
	s.stim = st
	if s.striker != nil {
		s.striker.SetStimulus(st, sign)
	}
}

// hintFor suggests what to try when the solution is stuck at unknown i.
func (s *System) hintFor(i int, transient bool) string {
	var names []string
	if i >= 0 && i < len(s.owner) && s.owner[i] >= 0 {
		names = append(names, s.elements[s.owner[i]])
	} else if i >= 0 && i < len(s.circuitNode) && s.circuitNode[i] >= 0 {
		for _, di := range s.nodeDevs[s.circuitNode[i]] {
			names = append(names, s.elements[di])
		}
	}
	who := "the elements there"
	if len(names) > 0 {
		who = strings.Join(names, ", ")
	}
	if transient {
		return "try a smaller maxstep in the window statement, or add series resistance to " + who
	}
	return "check the DC paths through " + who + " (a supply across a junction needs series resistance)"
}
