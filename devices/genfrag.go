package devices

import "zapnet/waveforms"

// genNet stamps a generator's circuit fragment (waveforms.Fragment) for the
// strike. The fragment's shape is fixed when the strike is built, so that
// one compiled system runs every level of a study; each run brings a
// fragment of that shape with its own values.
//
// Unknowns: one per internal node; one branch current per inductor and per
// switch; one more per spark gap, its scaled conductance g = G·R0.
//
// Equations, u = v(A) − v(B), i the branch current from A to B:
//
//	resistor   i = u/R
//	capacitor  q = C·u (a state on rows A, B)
//	inductor   u − R·i − dλ/dt = 0, λ = L·i (a state on the branch row)
//	switch     before t = 0: i = 0; after: u − (R + Rs)·i − dλ/dt = 0,
//	           λ = L·i, Rs = R0/g with a spark, else 0
//	spark      before t = 0: g = 1; after: d(g²)/dt − k·i² = 0,
//	           k = (2a/d²)·R0² (Spark.Rate), g² a state on its own row
//	source     i = (u − s·F(t))/R from A to B, F = 0 before t = 0
//
// Before t = 0 every held node is held at s·V0 relative to the strike's ref
// by 1 S from a source of s·V0 A (the charged generator), and the parts
// between held nodes (Fragment.Frozen) stamp nothing but their states.
// sparkFloor is the smallest scaled spark conductance g a Newton iterate is
// evaluated at.
const sparkFloor = 0.5

type genNet struct {
	shape *waveforms.Fragment
	node  int // the struck node's unknown
	ref   int // the reference's unknown
	nodes []int
	br    []int // per part: its branch unknown, or -1
	sp    []int // per part: its spark unknown, or -1
	st    []int // per part: its first local state, or -1
	nst   int   // states in all
}

func newGenNet(shape *waveforms.Fragment) *genNet {
	return &genNet{shape: shape}
}

// layout lists the fragment's internal nodes and branch unknowns by the
// names of its nodes and parts.
func (g *genNet) layout() (internal, branches []string) {
	for _, n := range g.shape.Nodes {
		internal = append(internal, n.Name)
	}
	for _, p := range g.shape.Parts {
		switch p.Kind {
		case waveforms.PartInductor, waveforms.PartSwitch:
			branches = append(branches, p.Name)
			if p.Spark != nil {
				branches = append(branches, p.Name+"_g")
			}
		}
	}
	return internal, branches
}

// bind takes the strike's indices and returns the fragment's states in
// part order: a capacitor's charge, an inductor's or switch's flux, then a
// spark's g².
func (g *genNet) bind(node, ref int, n Nodes) []StateRows {
	g.node, g.ref = node, ref
	g.nodes = n.Internal[:len(g.shape.Nodes)]
	np := len(g.shape.Parts)
	g.br, g.sp, g.st = make([]int, np), make([]int, np), make([]int, np)
	var rows []StateRows
	nb := 0
	for k, p := range g.shape.Parts {
		g.br[k], g.sp[k], g.st[k] = -1, -1, -1
		switch p.Kind {
		case waveforms.PartCapacitor:
			g.st[k] = len(rows)
			rows = append(rows, StateRows{Plus: g.index(p.A), Minus: g.index(p.B)})
		case waveforms.PartInductor, waveforms.PartSwitch:
			g.br[k] = n.Branches[nb]
			nb++
			g.st[k] = len(rows)
			rows = append(rows, StateRows{Plus: Ground, Minus: g.br[k]})
			if p.Spark != nil {
				g.sp[k] = n.Branches[nb]
				nb++
				rows = append(rows, StateRows{Plus: g.sp[k], Minus: Ground})
			}
		}
	}
	g.nst = len(rows)
	return rows
}

// index is the unknown of a fragment node index.
func (g *genNet) index(k int) int {
	switch k {
	case waveforms.Out:
		return g.node
	case waveforms.Ref:
		return g.ref
	}
	return g.nodes[k]
}

// idle stamps the unknowns of a strike whose stimulus is no circuit: each
// node tied to gnd through 1 S, each branch unknown held at 0, every state
// zero. It keeps the matrix regular and costs nothing.
func (g *genNet) idle(c *Context) {
	for _, k := range g.nodes {
		c.Conductance(k, Ground, 1)
	}
	for k := range g.br {
		for _, b := range [2]int{g.br[k], g.sp[k]} {
			if b >= 0 {
				c.AddF(b, c.V(b))
				c.AddJ(b, b, 1)
			}
		}
	}
	for k := 0; k < g.nst; k++ {
		c.Charge(k, 0)
	}
}

// eval stamps fragment f (of the bound shape) with polarity sign at c.
func (g *genNet) eval(c *Context, f *waveforms.Fragment, sign float64) {
	if c.DC {
		for k, n := range f.Nodes {
			if n.Held {
				c.Conductance(g.nodes[k], g.ref, 1)
				c.Inject(g.nodes[k], g.ref, sign*n.V0)
			}
		}
	}
	for k := range f.Parts {
		p := &f.Parts[k]
		a, b := g.index(p.A), g.index(p.B)
		frozen := c.DC && f.Frozen(p)
		switch p.Kind {
		case waveforms.PartResistor:
			if !frozen {
				c.Conductance(a, b, 1/p.Value)
			}
		case waveforms.PartCapacitor:
			u := c.V(a) - c.V(b)
			c.Capacitance(g.st[k], a, b, p.Value*u, p.Value)
		case waveforms.PartInductor:
			br := g.br[k]
			i := c.V(br)
			if frozen {
				c.AddF(br, i)
				c.AddJ(br, br, 1)
				c.Charge(g.st[k], 0)
				continue
			}
			branchKCL(c, a, b, br)
			c.AddF(br, -p.R*i)
			c.AddJ(br, br, -p.R)
			c.Charge(g.st[k], p.Value*i)
			c.ChargeDeriv(g.st[k], br, p.Value)
		case waveforms.PartSwitch:
			g.evalSwitch(c, p, k, a, b)
		case waveforms.PartSource:
			c.Conductance(a, b, 1/p.Value)
			if !c.DC {
				c.Inject(a, b, sign*p.F(c.T)/p.Value)
			}
		}
	}
}

// evalSwitch stamps a switch, and its spark gap when it has one.
func (g *genNet) evalSwitch(c *Context, p *waveforms.Part, k, a, b int) {
	br, sp, st := g.br[k], g.sp[k], g.st[k]
	i := c.V(br)
	if c.DC {
		c.AddF(br, i)
		c.AddJ(br, br, 1)
		c.Charge(st, 0)
		if sp >= 0 {
			// g = 1: the spark forms with R0.
			c.AddF(sp, c.V(sp)-1)
			c.AddJ(sp, sp, 1)
			c.Charge(st+1, 1)
		}
		return
	}
	branchKCL(c, a, b, br)
	r := p.R
	if sp >= 0 {
		s := p.Spark
		gv := c.V(sp)
		// g never falls below 1 (g² only grows), but a Newton iterate may
		// undershoot; one far below (where R0/g would blow up or turn
		// negative) is evaluated at sparkFloor with the linearisation
		// taken there. The floor sits well below 1 so that a converged
		// g of 1 − ε is never flagged.
		gl := gv
		if gl < sparkFloor {
			gl = sparkFloor
			c.Limited = true
		}
		rs := s.R0 / gl
		r += rs
		// Branch row: −Rs(g)·i, dRs/dg = −R0/g².
		c.AddF(br, rs*i/gl*(gv-gl))
		c.AddJ(br, sp, s.R0/(gl*gl)*i)
		// Spark row: d(g²)/dt − k·i² = 0.
		rate := s.Rate()
		c.AddF(sp, -rate*i*i)
		c.AddJ(sp, br, -2*rate*i)
		c.Charge(st+1, gl*gl+2*gl*(gv-gl))
		c.ChargeDeriv(st+1, sp, 2*gl)
	}
	c.AddF(br, -r*i)
	c.AddJ(br, br, -r)
	c.Charge(st, p.L*i)
	if p.L > 0 {
		c.ChargeDeriv(st, br, p.L)
	}
}

// NewStrikeFor builds a strike between nodes whose unknowns fit the
// generator circuits of shape (any circuit of one's own, not only those of
// the waveform catalogue). It runs stimuli whose Gen has that shape, and
// the ideal-current and Thevenin forms.
func NewStrikeFor(name string, nodes [2]string, shape *waveforms.Fragment) *Strike {
	return &Strike{name: name, nodes: nodes, gen: newGenNet(shape)}
}
