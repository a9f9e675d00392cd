package signal

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"strconv"

	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/netlist"
)

// FromCircuit builds the request a deck describes: the drive at the
// strike's node; a target for every watched node and every protected pin
// (one per node, in deck order), with the signal-side limits the watch or
// the pin states (peaking=, cmax=, rise=); the ports (role Port) in deck
// order; the impedance of every bead and capacitor; and as damping
// candidates every capacitor's esr, bead's rdc and inductor's r.
func FromCircuit(c *netlist.Circuit) (*Request, error) {
	st := c.Strike()
	if st == nil {
		return nil, errors.New("the deck has no strike: its node is where the small-signal drive sits")
	}
	r := &Request{Drive: mna.Pair{Node: st.Nodes[0], Ref: st.Nodes[1]}}
	seen := map[string]int{}
	add := func(t Target) {
		k, ok := seen[t.Name]
		if !ok {
			seen[t.Name] = len(r.Targets)
			r.Targets = append(r.Targets, t)
			return
		}
		// A node both watched and a pin's: one target, the pin's voltage,
		// the tighter of each limit.
		x := &r.Targets[k]
		if t.Pin != "" && x.Pin == "" {
			x.Pin, x.Pair = t.Pin, t.Pair
		}
		x.PeakingDB = tighter(x.PeakingDB, t.PeakingDB)
		x.CMax = tighter(x.CMax, t.CMax)
		x.Rise = tighter(x.Rise, t.Rise)
	}
	for _, w := range c.Watches {
		add(Target{Name: w.Node, Pair: mna.Pair{Node: w.Node}, PeakingDB: w.Peaking, CMax: w.CMax, Rise: w.Rise})
	}
	for _, e := range c.Elements {
		switch e.Kind.Role {
		case spec.ProtectedPin:
			add(Target{Name: e.Nodes[0], Pair: mna.Pair{Node: e.Nodes[0], Ref: e.Nodes[1]}, Pin: e.Name,
				PeakingDB: e.Values.Num("peaking"), CMax: e.Values.Num("cmax"), Rise: e.Values.Num("rise")})
		case spec.Port:
			r.Ports = append(r.Ports, mna.Port{Name: e.Name, Pair: mna.Pair{Node: e.Nodes[0], Ref: e.Nodes[1]}, Z0: e.Values.Num("z0")})
		}
		switch e.Kind.Name {
		case "bead":
			r.Elements = append(r.Elements, e.Name)
			r.Knobs = append(r.Knobs, Knob{Element: e.Name, Param: "rdc", Value: e.Values.Num("rdc")})
		case "capacitor":
			r.Elements = append(r.Elements, e.Name)
			r.Knobs = append(r.Knobs, Knob{Element: e.Name, Param: "esr", Value: e.Values.Num("esr")})
		case "inductor":
			r.Knobs = append(r.Knobs, Knob{Element: e.Name, Param: "r", Value: e.Values.Num("r")})
		}
	}
	return r, nil
}

// tighter is the smaller of two limits, zero meaning none.
func tighter(a, b float64) float64 {
	switch {
	case a == 0:
		return b
	case b == 0:
		return a
	}
	return min(a, b)
}

// linearize compiles c and linearises it at its operating point.
func linearize(c *netlist.Circuit, set *mna.Settings) (*mna.AC, error) {
	sys, err := mna.Compile(c)
	if err != nil {
		return nil, err
	}
	return sys.Linearize(set)
}

// Analyse runs the analysis req describes on the circuit c.
func Analyse(c *netlist.Circuit, req *Request, opt *Options) (*Result, error) {
	o := opt.withDefaults()
	if !(o.To > o.From) {
		return nil, fmt.Errorf("the sweep must rise: from %s to %s", spec.FormatSI(o.From, spec.Hertz), spec.FormatSI(o.To, spec.Hertz))
	}
	a, err := linearize(c, o.Settings)
	if err != nil {
		return nil, err
	}
	freq := mna.LogFrequencies(o.From, o.To, o.PerDecade)
	outs := make([]mna.Pair, len(req.Targets))
	for k, t := range req.Targets {
		outs[k] = t.Pair
	}
	zin, h, err := a.Sweep(freq, req.Drive, req.Ports, outs)
	if err != nil {
		return nil, err
	}
	res := &Result{
		Drive:     Drive{Node: req.Drive.Node, Ref: req.Drive.RefNode(), Bias: bias(a, req.Drive)},
		Freq:      freq,
		Impedance: impedance(freq, zin),
		Edges:     []Edge{},
	}
	res.Nodes, res.Order = transfers(a, req.Targets, freq, h)
	if res.Elements, res.ElementOrder, err = elementImpedances(a, req.Elements, freq); err != nil {
		return nil, err
	}
	if res.Peaking, err = peakings(c, a, req, &o, freq, h); err != nil {
		return nil, err
	}
	if res.Loading, err = loadings(a, req, &o); err != nil {
		return nil, err
	}
	if len(req.Ports) == 2 {
		if res.TwoPort, err = twoPort(a, freq, [2]mna.Port{req.Ports[0], req.Ports[1]}); err != nil {
			return nil, err
		}
	}
	if res.Edges, err = Edges(c, req, opt); err != nil {
		return nil, err
	}
	if res.Edges == nil {
		res.Edges = []Edge{}
	}
	return res, nil
}

// bias is the operating point's voltage of p's node over its reference.
func bias(a *mna.AC, p mna.Pair) float64 {
	v := map[string]float64{}
	for i, n := range a.Nodes() {
		v[n] = a.OperatingPoint()[i]
	}
	return v[p.Node] - v[p.Ref]
}

// transfers are the targets' transfers from the drive, h[k] the k-th
// target's, by name and in the targets' order.
func transfers(a *mna.AC, targets []Target, freq []float64, h [][]complex128) (map[string]*Transfer, []string) {
	nodes := map[string]*Transfer{}
	var order []string
	for k, t := range targets {
		tr := &Transfer{Freq: freq, H: h[k], Bias: bias(a, t.Pair)}
		for _, v := range h[k] {
			tr.GainDB = append(tr.GainDB, db(v))
			tr.PhaseDeg = append(tr.PhaseDeg, deg(v))
		}
		nodes[t.Name] = tr
		order = append(order, t.Name)
	}
	return nodes, order
}

// elementImpedances are the named elements' own impedances, by name and in
// the order given.
func elementImpedances(a *mna.AC, names []string, freq []float64) (map[string]*Impedance, []string, error) {
	elements := map[string]*Impedance{}
	var order []string
	for _, name := range names {
		z := make([]complex128, len(freq))
		for k, f := range freq {
			var err error
			if z[k], err = a.ElementImpedance(name, f); err != nil {
				return nil, nil, err
			}
		}
		elements[name] = impedance(freq, z)
		order = append(order, name)
	}
	return elements, order, nil
}

// peakings finds each target's peaking above its low-frequency gain (h[k]
// the target's transfer) and, for one over its limit, the damping values
// that bring it under, unless o says not to look.
func peakings(c *netlist.Circuit, a *mna.AC, req *Request, o *options, freq []float64, h [][]complex128) ([]Peaking, error) {
	out := []Peaking{}
	for k, t := range req.Targets {
		p, ok, err := peaking(a, freq, req, t.Pair, h[k])
		if err != nil {
			return nil, err
		}
		if !ok {
			continue
		}
		lim := t.PeakingDB
		if lim <= 0 {
			lim = DefaultPeakingDB
		}
		pk := Peaking{Node: t.Name, GainDB: p.RiseDB, PeakGainDB: 20 * math.Log10(p.Gain), Freq: p.Freq,
			Q: p.Q, LimitDB: lim, Exceeds: p.RiseDB > lim, AtEnd: p.AtEnd}
		if pk.Exceeds && !o.NoDamping {
			if pk.Damping, err = damping(c, req, o, freq, t, lim); err != nil {
				return nil, err
			}
		}
		out = append(out, pk)
	}
	return out, nil
}

// loadings finds the capacitance each target sees, element by element;
// what the protection adds leaves out the protected pins' own.
func loadings(a *mna.AC, req *Request, o *options) ([]Loading, error) {
	pins := map[string]bool{}
	for _, t := range req.Targets {
		if t.Pin != "" {
			pins[t.Pin] = true
		}
	}
	out := []Loading{}
	for _, t := range req.Targets {
		tot, per, err := a.NodeCapacitance(t.Pair, o.LoadingFreq)
		if err != nil {
			return nil, err
		}
		l := Loading{Node: t.Name, Freq: o.LoadingFreq, Capacitance: tot, Added: tot, Limit: t.CMax,
			Budget: o.CBudget, Elements: []ElementCap{}}
		for _, e := range per {
			l.Elements = append(l.Elements, ElementCap{Element: e.Element, Capacitance: e.C})
			if pins[e.Element] {
				l.Added -= e.C
			}
		}
		l.Exceeds = (l.Limit > 0 && l.Capacitance > l.Limit) || (l.Budget > 0 && l.Added > l.Budget)
		out = append(out, l)
	}
	return out, nil
}

// twoPort finds the S-parameters between two ports at every frequency.
func twoPort(a *mna.AC, freq []float64, p [2]mna.Port) (*TwoPort, error) {
	tp := &TwoPort{Ports: [2]string{p[0].Name, p[1].Name}, Z0: [2]float64{p[0].Z0, p[1].Z0}, Freq: freq}
	for _, f := range freq {
		s, err := a.TwoPort(f, p)
		if err != nil {
			return nil, err
		}
		tp.S = append(tp.S, s)
		tp.S11DB, tp.S11Deg = append(tp.S11DB, db(s[0][0])), append(tp.S11Deg, deg(s[0][0]))
		tp.S21DB, tp.S21Deg = append(tp.S21DB, db(s[1][0])), append(tp.S21Deg, deg(s[1][0]))
		tp.S12DB, tp.S12Deg = append(tp.S12DB, db(s[0][1])), append(tp.S12Deg, deg(s[0][1]))
		tp.S22DB, tp.S22Deg = append(tp.S22DB, db(s[1][1])), append(tp.S22Deg, deg(s[1][1]))
	}
	return tp, nil
}

func db(v complex128) float64  { return 20 * math.Log10(cmplx.Abs(v)) }
func deg(v complex128) float64 { return cmplx.Phase(v) * 180 / math.Pi }

func impedance(freq []float64, z []complex128) *Impedance {
	im := &Impedance{Freq: freq, Z: z}
	for _, v := range z {
		im.MagOhm = append(im.MagOhm, cmplx.Abs(v))
		im.PhaseDeg = append(im.PhaseDeg, deg(v))
	}
	return im
}

// peaking finds the largest rise of the transfer h to out above its value
// at the sweep's lowest frequency, refining with further solves.
func peaking(a *mna.AC, freq []float64, req *Request, out mna.Pair, h []complex128) (mna.Peaking, bool, error) {
	mag := make([]float64, len(h))
	for k, v := range h {
		mag[k] = cmplx.Abs(v)
	}
	one := []mna.Pair{out}
	hk := make([]complex128, 1)
	return mna.FindPeaking(freq, mag, func(f float64) (float64, error) {
		_, err := a.Response(f, req.Drive, req.Ports, one, hk)
		return cmplx.Abs(hk[0]), err
	})
}

// Damping search bounds, Ω: a resistance below dampLow damps nothing a
// protection network can show, one above dampHigh is no longer a
// parasitic to adjust.
const (
	dampLow  = 1e-3
	dampHigh = 1e3
)

// damping finds, for each knob alone, the smallest value that brings the
// peaking of target t under lim, solving the circuit again at each trial:
// a scan upward from the knob's present value (at least dampLow) in steps
// of a quarter decade to dampHigh finds the first value that does, and
// bisection on log(value) narrows it to 0.5 %. The scan matters: the
// peaking need not fall steadily as the resistance grows (a large esr
// takes the capacitor away, and another resonance takes over), so the
// first crossing is searched, not the last. A knob that cannot do it
// within dampHigh is left out. The value is rounded up to two significant
// figures, and the peaking reported is the one at that value.
func damping(c *netlist.Circuit, req *Request, o *options, freq []float64, t Target, lim float64) ([]Damping, error) {
	rise := func(k Knob, v float64) (float64, error) {
		x, err := c.With(netlist.Setting{Element: k.Element, Param: k.Param, Text: spec.FormatSI(v, spec.Ohm), Num: v})
		if err != nil {
			return 0, err
		}
		a, err := linearize(x, o.Settings)
		if err != nil {
			return 0, err
		}
		_, h, err := a.Sweep(freq, req.Drive, req.Ports, []mna.Pair{t.Pair})
		if err != nil {
			return 0, err
		}
		p, ok, err := peaking(a, freq, req, t.Pair, h[0])
		if err != nil || !ok {
			return 0, err
		}
		return p.RiseDB, nil
	}
	step := math.Pow(10, 0.25)
	var out []Damping
	for _, k := range req.Knobs {
		prev := max(k.Value, dampLow)
		r, err := rise(k, prev)
		if err != nil {
			return nil, err
		}
		if r <= lim {
			// Already under at the floor of the search (a present value
			// below dampLow): dampLow is the answer.
			out = append(out, Damping{Element: k.Element, Param: k.Param, From: k.Value, Value: prev, GainDB: r})
			continue
		}
		found := 0.0
		for v := prev * step; v <= dampHigh*(1+1e-9); v *= step {
			if r, err = rise(k, v); err != nil {
				return nil, err
			}
			if r <= lim {
				found = v
				break
			}
			prev = v
		}
		if found == 0 {
			continue
		}
		lo, hi := prev, found
		for hi/lo > 1.005 {
			mid := math.Sqrt(lo * hi)
			r, err := rise(k, mid)
			if err != nil {
				return nil, err
			}
			if r > lim {
				lo = mid
			} else {
				hi = mid
			}
		}
		v := roundUp2(hi)
		if r, err = rise(k, v); err != nil {
			return nil, err
		}
		if r > lim {
			// Rounding up crossed back over (a narrow window): keep the
			// bisection's value.
			v = hi
			if r, err = rise(k, v); err != nil {
				return nil, err
			}
		}
		out = append(out, Damping{Element: k.Element, Param: k.Param, From: k.Value, Value: v, GainDB: r})
	}
	return out, nil
}

// roundUp2 rounds v > 0 up to two significant figures.
func roundUp2(v float64) float64 {
	e := math.Pow(10, math.Floor(math.Log10(v))-1)
	r := math.Ceil(v/e-1e-9) * e
	// Undo the representation error of the product (0.42 not 0.42000000000000004).
	x, _ := strconv.ParseFloat(strconv.FormatFloat(r, 'g', 2, 64), 64)
	if x < v {
		return r
	}
	return x
}
