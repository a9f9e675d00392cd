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
	nodeNames   []string  // circuit nodes, in result order
	nodeIdx     []int     // unknown of each circuit node
	unknowns    []string  // display name of every unknown
	isNode      []bool    // KCL row (true) or branch row (false)
	nodeMask    []float64 // 1 for a KCL row, 0 for a branch row
	nodeRows    []int     // the KCL rows, which carry the shunt conductance
	owner       []int     // device owning an internal unknown, -1 for circuit nodes
	circuitNode []int     // circuit node of each unknown, -1 for internal ones
	nodeDevs    [][]int   // devices touching each circuit node, for hints
	devs        []device
	elements    []string
	probes      []devices.Probe

	striker devices.Striker
	stim    *waveforms.Stimulus // of the run under way: its breakpoints and span

	n    int
	ctx  devices.Context
	x    []float64 // iterate
	xAcc []float64 // last accepted solution
	dx   []float64
	f    []float64
	pat  *pattern
	jac  []float64 // the Jacobian's entries, in pat's order (local stamping)
	// The Jacobian as the factorisation and the residual test read it:
	// entry e of the pattern is jacBuf[jacSrc[e]], and row i's diagonal
	// jacBuf[jacDiag[i]] (jac with the identity, or the dense matrix).
	jacBuf          []float64
	jacSrc, jacDiag []int32
	lu              *sparseLU
	luOK            bool       // lu holds the factors of a recent matrix
	eta             [2]float64 // Newton's contraction factors θ/(1−θ), last measured and relaxed since (see newton)
	scale           []float64  // largest single contribution on each row, for the residual test (see setScale)
	scaleOK         bool       // scale belongs to the last evaluation
	noise           []float64  // size of the cancelling state terms on each row, for the same
	noiseOK         bool       // noise belongs to the history in force (see setNoise)
	// Devices stamp in one of two ways. A small circuit (n ≤ denseMax)
	// stamps into a dense n×n Jacobian, dense, from which the pattern's
	// entries are gathered: the fastest way for tens of unknowns. A large
	// one stamps each device's own block (Context.Local) and adds it in,
	// so that it never holds n² numbers.
	dense []float64 // n×n, or nil
	// contrib holds each device's own contribution to each of its rows
	// at the last evaluation, device by device (device.cLo), in the order
	// of its touched rows; while a device is evaluated densely, its
	// shared rows hold what the devices before it left there.
	contrib []float64
	local   []int32   // Context.Local: each unknown's place among the current device's rows
	floc    []float64 // the current device's residual rows (local)
	jloc    []float64 // ... and its Jacobian block

	// States: q set by the devices at the last evaluation, hist the
	// integration history, qdot the derivative formed at the last
	// evaluation, qAcc and qdotAcc at the last accepted point, qG and
	// qdotG at the trapezoidal stage of the step being taken.
	q, hist, qdot, qAcc, qdotAcc []float64
	qG                           []float64
	rows                         []devices.StateRows
	stateDev                     []int // device of each state
	stateTerm                    [][2]int
	lte                          []float64 // truncation error of each state at the last estimate
	errx                         []float64 // that error mapped onto the unknowns
	xScale                       []float64 // largest magnitude of each unknown so far (at least scaleFloor)
	xMax, xMin                   []float64
	// The voltage across each device, terminal pair by pair (first
	// terminal to each other one, neither at gnd), and the largest it has
	// reached: an energy is ∫ v·i across the device, and a small voltage
	// across a device between two nodes that swing high (a bead beside a
	// clamp) needs its own accuracy.
	pairs     [][2]int
	pairScale []float64
	// The devices with probes, and for each probe its highest and lowest
	// value so far and two scratch readings: a probe is a reported
	// quantity too (a pin's internal-path current, an exponential of its
	// voltage), and its error is held like an unknown's (errorRatio).
	probers            []int
	pHi, pLo, pAt, pEr []float64
	xe                 []float64 // the solution plus its estimated error
	xtol               []float64 // Newton's tolerance on each unknown, see setTolerances

	// The trapezoidal stage's solution and terminal currents, and its time.
	xG, termG []float64
	stageT    float64

	// The last reported points, for the predictor and the error estimate:
	// a ring of hLen points (since the last corner), the newest at hHead.
	hx, hq      [3][]float64
	ht          [3]float64
	hHead, hLen int

	termCur []float64 // current into every device terminal (flattened), A
	// termJ holds the derivatives of the terminal currents with respect to
	// their device's unknowns (the terminal's row of the device's own
	// Jacobian) at the last evaluation: entry e is d termCur[tjCur[e]] /
	// d x[tjCol[e]], a device's entries running from its tjLo to its tjHi,
	// terminal by terminal in the order of touched. jsnap is the scratch
	// that tells them apart from earlier devices' stamps.
	termJ, jsnap   []float64
	tjCur, tjCol   []int32
	termV, termI   []float64 // every terminal's voltage and current at the last accepted point
	stepEnergy     []float64 // each element's ledger entry over the last step, J
	power0         []float64 // each element's power at the operating point, W
	curTr          []waveforms.Tracker
	dcMethod       string // how the last operating point was found, for tests
	factorisations int    // LU factorisations of the transient, for Stats
	// lteWorst is the unknown of the largest error ratio at the last
	// estimate, or −1−k for state k when ChargeTol's test was the worst.
	lteWorst int

	pt       Point
	resRow   int     // row of the largest scaled residual in the last Newton iteration
	resValue float64 // its residual
}

// device is one compiled element with the engine's bookkeeping.
type device struct {
	dev      devices.Device
	nodes    devices.Nodes
	term     []int   // terminal rows (Ground allowed)
	touched  []int   // distinct rows the device may stamp
	jpos     []int32 // position in the Jacobian's entries of each (touched, touched) pair
	prior    []int   // indices in touched of the rows an earlier device stamps too
	shared   []bool  // for each row in touched, whether it is in prior
	termSnap []int   // for each terminal, its index in touched, or -1
	cLo      int     // the device's entries of contrib
	stateLo  int
	stateHi  int
	curBase  int
	tjLo     int // the device's entries of termJ
	tjHi     int
	// Dense stamping: the place in the dense Jacobian of each of the
	// device's entries of termJ, and those (counted from tjLo) that an
	// earlier device stamps too.
	tjPos     []int32
	tjPrior   []int32
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
	if err := s.buildDevices(c); err != nil {
		return nil, err
	}
	nTerm, errs := s.numberUnknowns()
	s.n = len(s.unknowns)
	if err := devices.TooManyUnknowns(s.n); err != nil {
		return nil, fmt.Errorf("mna: %w", err)
	}
	s.markShared()
	s.maskNodes()
	s.bindStates()
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	s.layStateTerms()
	s.x = make([]float64, s.n)
	s.xAcc = make([]float64, s.n)
	s.dx = make([]float64, s.n)
	s.f = make([]float64, s.n)
	s.checkStateRows()
	s.layStamping()
	s.allocate(nTerm)
	return s, nil
}

// buildDevices builds every element of c by its kind's constructor, and
// reports every element that cannot be built, not only the first.
func (s *System) buildDevices(c *netlist.Circuit) error {
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
		return errors.Join(errs...)
	}
	if len(s.devs) == 0 {
		return errors.New("mna: the circuit has no elements")
	}
	return nil
}

// numberUnknowns numbers the circuit's unknowns and lays out each device's
// rows, terminal currents and probes; it returns the number of terminals
// and the faults of the circuit's wiring (a terminal without a node, a
// second strike), which Compile reports once the states are bound.
//
// Unknowns are numbered as the elements are met: a new terminal node,
// then the element's internal nodes and branches. Unknowns that share
// an element stay close, which keeps the matrix of a chain (a ladder, a
// line of parts) banded and its factorisation cheap.
func (s *System) numberUnknowns() (nTerm int, errs []error) {
	nodeIndex := map[string]int{} // node name → unknown
	for di := range s.devs {
		d := &s.devs[di]
		lay := d.dev.Layout()
		name := d.dev.Name()
		errs = s.numberTerminals(di, lay.Terminals, nodeIndex, errs)
		for _, in := range lay.Internal {
			d.nodes.Internal = append(d.nodes.Internal, s.addUnknown(name+"."+in, true, di))
		}
		for _, br := range lay.Branches {
			d.nodes.Branches = append(d.nodes.Branches, s.addUnknown(name+"."+br, false, di))
		}
		d.layRows()
		d.curBase = nTerm
		nTerm += len(d.term)
		errs = s.takeRoles(di, errs)
	}
	return nTerm, errs
}

// numberTerminals numbers the nodes of device di's terminals that are new,
// records the device among those touching each node (for hints), and
// appends a fault for a terminal without a node to errs.
func (s *System) numberTerminals(di int, terminals []string, nodeIndex map[string]int, errs []error) []error {
	d := &s.devs[di]
	for k, t := range terminals {
		if t == "" {
			errs = append(errs, fmt.Errorf("mna: %s: terminal %d has no node", d.dev.Name(), k+1))
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
	return errs
}

// layRows lists the distinct rows the device may stamp, terminals first,
// and the place among them of each terminal's row.
func (d *device) layRows() {
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
}

// takeRoles notes what else device di does besides stamping (probes,
// acceptance of a point, a reset, a bound on the step, the strike) and
// names its probes; a second strike is a fault appended to errs.
func (s *System) takeRoles(di int, errs []error) []error {
	d := &s.devs[di]
	name := d.dev.Name()
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
	d.probeBase = len(s.probes)
	if d.prober != nil {
		for _, p := range d.prober.Probes() {
			p.Name = name + "." + p.Name
			s.probes = append(s.probes, p)
			d.nProbe++
		}
	}
	return errs
}

// markShared marks each device's rows that an earlier device stamps too.
// A row that no earlier device stamps holds zero when a device's Eval
// starts, so only the others need a snapshot to tell its contribution
// (dense stamping).
func (s *System) markShared() {
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
}

// maskNodes lists the KCL rows, which carry the shunt conductance.
func (s *System) maskNodes() {
	s.nodeMask = make([]float64, s.n)
	for i, node := range s.isNode {
		if node {
			s.nodeRows = append(s.nodeRows, i)
			s.nodeMask[i] = 1
		}
	}
}

// bindStates hands each device its unknowns and gathers the rows its
// charges and fluxes enter, device by device.
func (s *System) bindStates() {
	var rows []devices.StateRows
	var stateDev []int
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
	s.rows, s.stateDev = rows, stateDev
}

// layStateTerms finds the terminal current each state's rows carry.
func (s *System) layStateTerms() {
	s.stateTerm = make([][2]int, len(s.rows))
	for k, r := range s.rows {
		d := &s.devs[s.stateDev[k]]
		s.stateTerm[k] = [2]int{termOf(d, r.Plus), termOf(d, r.Minus)}
	}
}

// layStamping builds the matrix's pattern and the factorisation's storage,
// and lays out where each device's stamps and terminal-current derivatives
// go, for dense or local stamping (see System.dense).
func (s *System) layStamping() {
	n := s.n
	blocks := make([][]int, len(s.devs))
	for di := range s.devs {
		blocks[di] = s.devs[di].touched
	}
	s.pat = newPattern(n, blocks)
	maxTouched := s.layBlocks()
	tjRow := s.layTermJ()
	s.jsnap = make([]float64, maxTouched*maxTouched)
	s.jacSrc = make([]int32, s.pat.nnz())
	if n <= denseMax {
		s.layDense(tjRow)
	} else {
		s.layLocal(maxTouched)
	}
	s.jacDiag = make([]int32, n)
	for i := range s.jacDiag {
		s.jacDiag[i] = s.jacSrc[s.pat.diag[i]]
	}
	s.lu = newSparseLU(s.pat, s.jacSrc)
}

// layBlocks places each device's block of the Jacobian among the pattern's
// entries and its rows in contrib, and returns the largest block's size.
func (s *System) layBlocks() (maxTouched int) {
	nContrib := 0
	for di := range s.devs {
		d := &s.devs[di]
		m := len(d.touched)
		maxTouched = max(maxTouched, m)
		d.cLo = nContrib
		nContrib += m
		d.jpos = make([]int32, m*m)
		for k, r := range d.touched {
			for l, c := range d.touched {
				d.jpos[k*m+l] = int32(s.pat.at(r, c))
			}
		}
	}
	s.contrib = make([]float64, nContrib)
	return maxTouched
}

// layTermJ numbers the derivatives of each device's terminal currents by
// its unknowns (termJ), and returns the Jacobian row of each.
func (s *System) layTermJ() (tjRow []int32) {
	for di := range s.devs {
		d := &s.devs[di]
		d.tjLo = len(s.tjCur)
		for t, k := range d.termSnap {
			if k < 0 {
				continue
			}
			for _, c := range d.touched {
				s.tjCur = append(s.tjCur, int32(d.curBase+t))
				s.tjCol = append(s.tjCol, int32(c))
				tjRow = append(tjRow, int32(d.touched[k]))
			}
		}
		d.tjHi = len(s.tjCur)
	}
	s.termJ = make([]float64, len(s.tjCur))
	return tjRow
}

// layDense sets a small circuit up to stamp into the dense n×n Jacobian:
// the pattern's entries are gathered from it, and each device's
// terminal-current derivatives are read at their place in it, those that
// an earlier device stamps too from a snapshot.
func (s *System) layDense(tjRow []int32) {
	n := s.n
	s.dense = make([]float64, n*n)
	for i := 0; i < n; i++ {
		for e := s.pat.ptr[i]; e < s.pat.ptr[i+1]; e++ {
			s.jacSrc[e] = int32(i*n) + s.pat.col[e]
		}
	}
	s.jacBuf = s.dense
	both := make([]bool, n*n) // entries stamped by the devices so far
	for di := range s.devs {
		d := &s.devs[di]
		for e := d.tjLo; e < d.tjHi; e++ {
			p := tjRow[e]*int32(n) + s.tjCol[e]
			if both[p] {
				d.tjPrior = append(d.tjPrior, int32(e-d.tjLo))
			}
			d.tjPos = append(d.tjPos, p)
		}
		for _, r := range d.touched {
			for _, c := range d.touched {
				both[r*n+c] = true
			}
		}
	}
}

// layLocal sets a large circuit up to stamp each device's own block and
// add it into the pattern's entries.
func (s *System) layLocal(maxTouched int) {
	s.jac = make([]float64, s.pat.nnz())
	for e := range s.jacSrc {
		s.jacSrc[e] = int32(e)
	}
	s.jacBuf = s.jac
	s.local = make([]int32, s.n)
	s.floc = make([]float64, maxTouched)
	s.jloc = make([]float64, maxTouched*maxTouched)
}

// allocate makes every remaining buffer of a solution: the residual
// test's, the states and their history, the error estimate's, the
// ledger's, the reported point, and the devices' evaluation context.
func (s *System) allocate(nTerm int) {
	n, ns, nProbe := s.n, len(s.rows), len(s.probes)
	s.scale = make([]float64, n)
	s.noise = make([]float64, n)
	s.q = make([]float64, ns)
	s.hist = make([]float64, ns)
	s.qdot = make([]float64, ns)
	s.qdotAcc = make([]float64, ns)
	s.qAcc = make([]float64, ns)
	s.qG = make([]float64, ns)
	for i := range s.hx {
		s.hx[i] = make([]float64, n)
		s.hq[i] = make([]float64, ns)
	}
	s.xG = make([]float64, n)
	s.termG = make([]float64, nTerm)
	s.lte = make([]float64, ns)
	s.errx = make([]float64, n)
	s.xScale = make([]float64, n)
	s.xMax = make([]float64, n)
	s.xtol = make([]float64, n)
	s.layPairs()
	for di := range s.devs {
		if s.devs[di].prober != nil {
			s.probers = append(s.probers, di)
		}
	}
	s.pHi, s.pLo = make([]float64, nProbe), make([]float64, nProbe)
	s.pAt, s.pEr = make([]float64, nProbe), make([]float64, nProbe)
	s.xe = make([]float64, n)
	s.xMin = make([]float64, n)
	s.termCur = make([]float64, nTerm)
	s.termV = make([]float64, nTerm)
	s.termI = make([]float64, nTerm)
	s.stepEnergy = make([]float64, len(s.devs))
	s.power0 = make([]float64, len(s.devs))
	s.curTr = make([]waveforms.Tracker, len(s.devs))
	for i := range s.curTr {
		s.curTr[i].Refine = true
	}
	s.pt = Point{
		V: make([]float64, len(s.nodeNames)),
		I: make([]float64, len(s.devs)),
		W: make([]float64, len(s.devs)),
		P: make([]float64, nProbe),
	}
	nSlopes := 0
	for di := range s.devs {
		d := &s.devs[di]
		// Each state's derivatives by each of the device's unknowns, with
		// room for a device that gives some in parts.
		nSlopes += 2 * (d.stateHi - d.stateLo) * len(d.touched)
	}
	s.ctx = devices.Context{
		X: s.x, F: s.f, J: s.dense, N: n, Local: s.local,
		Q: s.q, Rows: s.rows, SourceScale: 1, Slopes: make([]devices.Slope, nSlopes),
	}
}

// layPairs lists each device's terminal pairs, whose voltages the error
// control holds to their own scale (see System.pairs).
func (s *System) layPairs() {
	for di := range s.devs {
		d := &s.devs[di]
		for t := 1; t < len(d.term); t++ {
			a, b := d.term[0], d.term[t]
			if a >= 0 && b >= 0 && a != b {
				s.pairs = append(s.pairs, [2]int{a, b})
			}
		}
	}
	s.pairScale = make([]float64, len(s.pairs))
}

// checkStateRows panics unless every state of a device enters only rows
// among the device's own unknowns: the matrix's pattern (and the engine's
// stamping of the state derivatives) rely on it.
func (s *System) checkStateRows() {
	for di := range s.devs {
		d := &s.devs[di]
		for k := d.stateLo; k < d.stateHi; k++ {
			for _, r := range [2]int{s.rows[k].Plus, s.rows[k].Minus} {
				if r >= 0 && !slices.Contains(d.touched, r) {
					panic(fmt.Sprintf("mna: %s: a state row outside the device's unknowns", d.dev.Name()))
				}
			}
		}
	}
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
// breakpoints and the default span. A generator circuit the strike was not
// built for (a stimulus of another waveform than the strike's) is refused.
func (s *System) setStimulus(st *waveforms.Stimulus, sign float64) error {
	if f, ok := s.striker.(fitter); ok {
		if err := f.Fits(st); err != nil {
			return err
		}
	}
	s.stim = st
	if s.striker != nil {
		s.striker.SetStimulus(st, sign)
	}
	rise := 0.0
	if st != nil {
		rise = st.Rise
	}
	for _, d := range s.devs {
		if r, ok := d.dev.(devices.RiseTaker); ok {
			r.SetRise(rise)
		}
	}
	return nil
}

// fitter is a strike that can tell whether a stimulus fits the unknowns it
// was built for.
type fitter interface {
	Fits(*waveforms.Stimulus) error
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
