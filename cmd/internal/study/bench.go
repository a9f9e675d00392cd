package study

import (
	"fmt"
	"math"
	"strings"

	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// Bench is one variant of a circuit compiled once, ready to solve run after
// run. A Bench is not safe for concurrent use: give each goroutine its own.
type Bench struct {
	// Circuit is the variant's circuit (the deck with its settings applied).
	Circuit *netlist.Circuit
	Variant netlist.Variant

	sys    *mna.System
	strike *netlist.Element
	nodes  []string // System.Nodes
	elems  []string // System.Elements
	probes []string // System.Probes
	strIdx int      // the strike among elems

	// Streaming measurements, reset before every solve and fed by observe.
	first   bool
	nodeTr  []waveforms.Tracker // per node, its voltage
	node0   []float64           // per node, its value at t = 0
	elemTr  []waveforms.Tracker // per element, its current
	pins    []pinMeter
	caps    []capMeter
	observe func(p *mna.Point)
}

// pinMeter follows one protected pin.
type pinMeter struct {
	e        *netlist.Element
	p, r     int // node indices; −1 for gnd
	ipath    int // probe index of PIN.ipath, −1 when absent
	elem     int // element index
	res      waveforms.Tracker
	res0     float64
	ip       waveforms.Tracker
	ip0      float64
	vmax     float64
	vmin     float64
	hasVmax  bool
	hasVmin  bool
	hasIfail bool
}

// capMeter follows the voltage across one capacitor.
type capMeter struct {
	e    *netlist.Element
	a, b int
	tr   waveforms.Tracker
	v0   float64
}

// NewBench applies the variant to c and compiles the result.
func NewBench(c *netlist.Circuit, v netlist.Variant) (*Bench, error) {
	vc, err := applyVariant(c, v)
	if err != nil {
		return nil, err
	}
	strike := vc.Strike()
	if strike == nil {
		return nil, fmt.Errorf("%s: the deck has no strike: add a strike line", vc.File)
	}
	sys, err := mna.Compile(vc)
	if err != nil {
		return nil, err
	}
	b := &Bench{Circuit: vc, Variant: v, sys: sys, strike: strike,
		nodes: sys.Nodes(), elems: sys.Elements(), probes: sys.Probes(), strIdx: -1}
	nodeIdx := indexOf(b.nodes)
	elemIdx := indexOf(b.elems)
	probeIdx := indexOf(b.probes)
	node := func(n string) int {
		if n == netlist.Ground {
			return -1
		}
		if i, ok := nodeIdx[n]; ok {
			return i
		}
		return -1
	}
	if i, ok := elemIdx[strike.Name]; ok {
		b.strIdx = i
	}
	b.nodeTr = make([]waveforms.Tracker, len(b.nodes))
	b.node0 = make([]float64, len(b.nodes))
	b.elemTr = make([]waveforms.Tracker, len(b.elems))
	for _, e := range vc.Elements {
		switch e.Kind {
		case netlist.Pin:
			m := pinMeter{e: e, p: node(e.Nodes[0]), r: node(e.Nodes[1]), ipath: -1, elem: elemIdx[e.Name]}
			if i, ok := probeIdx[e.Name+".ipath"]; ok {
				m.ipath = i
			}
			m.vmax, m.hasVmax = e.Num["vmax"]
			m.vmin, m.hasVmin = e.Num["vmin"]
			_, m.hasIfail = e.Num["ifail"]
			// The width thresholds: without a rating the width is of no
			// interest, and an infinite threshold keeps it at zero.
			m.res.Above, m.res.Below = math.Inf(1), math.Inf(-1)
			if m.hasVmax {
				m.res.Above = m.vmax
			}
			if m.hasVmin {
				m.res.Below = m.vmin
			}
			b.pins = append(b.pins, m)
		case netlist.Capacitor:
			b.caps = append(b.caps, capMeter{e: e, a: node(e.Nodes[0]), b: node(e.Nodes[1])})
		}
	}
	b.observe = b.sample
	return b, nil
}

func indexOf(names []string) map[string]int {
	m := make(map[string]int, len(names))
	for i, n := range names {
		m[n] = i
	}
	return m
}

func volt(v []float64, i int) float64 {
	if i < 0 {
		return 0
	}
	return v[i]
}

// sample feeds one accepted point to every meter. It allocates nothing.
func (b *Bench) sample(p *mna.Point) {
	t := p.T
	for i := range b.nodeTr {
		b.nodeTr[i].Add(t, p.V[i])
	}
	for i := range b.elemTr {
		b.elemTr[i].Add(t, p.I[i])
	}
	for k := range b.pins {
		m := &b.pins[k]
		v := volt(p.V, m.p) - volt(p.V, m.r)
		m.res.Add(t, v)
		ip := p.I[m.elem]
		if m.ipath >= 0 {
			ip = p.P[m.ipath]
		}
		m.ip.Add(t, ip)
		if b.first {
			m.res0, m.ip0 = v, ip
		}
	}
	for k := range b.caps {
		m := &b.caps[k]
		v := volt(p.V, m.a) - volt(p.V, m.b)
		m.tr.Add(t, v)
		if b.first {
			m.v0 = v
		}
	}
	if b.first {
		copy(b.node0, p.V)
		b.first = false
	}
}

func (b *Bench) reset() {
	b.first = true
	for i := range b.nodeTr {
		b.nodeTr[i].Reset()
	}
	for i := range b.elemTr {
		b.elemTr[i].Reset()
	}
	for k := range b.pins {
		b.pins[k].res.Reset()
		b.pins[k].ip.Reset()
	}
	for k := range b.caps {
		b.caps[k].tr.Reset()
	}
}

// Solve runs the strike at level (in the waveform's unit) and polarity ("pos"
// or "neg"), measures the run and judges it. Of opt it uses Record, Window
// and Settings. The returned Run's Job has the variant, level and polarity
// set and Index zero. A solve failure is returned as an error that names the
// node or element, the time and what to try.
func (b *Bench) Solve(level float64, polarity string, opt *Options) (*Run, error) {
	if opt == nil {
		opt = &Options{}
	}
	var sign float64
	switch polarity {
	case "pos":
		sign = 1
	case "neg":
		sign = -1
	default:
		return nil, fmt.Errorf("polarity %q: use pos or neg", polarity)
	}
	wf := b.strike.Str["waveform"]
	st, err := waveforms.New(wf, level, b.strike.Num, b.strike.Str)
	if err != nil {
		return nil, fmt.Errorf("%s: strike %s: %v", b.strike.Pos, b.strike.Name, err)
	}
	b.sys.SetStimulus(st, sign)

	w := b.Circuit.Window
	if opt.Window.Stop > 0 {
		w.Stop = opt.Window.Stop
	}
	if opt.Window.MaxStep > 0 {
		w.MaxStep = opt.Window.MaxStep
	}
	if opt.Window.RelTol > 0 {
		w.RelTol = opt.Window.RelTol
	}
	if opt.Window.AbsTol > 0 {
		w.AbsTol = opt.Window.AbsTol
	}
	r := &Run{
		Job:       Job{Variant: b.Variant, Level: level, Polarity: polarity},
		Waveform:  wf,
		LevelUnit: levelUnit(wf),
	}
	explicit := w.Stop > 0
	stop := w.Stop
	limit := Cap(st.Stop)
	if !explicit {
		stop = DefaultStop(b.Circuit, st.Stop)
		r.Window.Default = true
	}
	first := stop
	var res *mna.Result
	var late []string
	for {
		var set mna.Settings
		if opt.Settings != nil {
			set = *opt.Settings
		}
		set.Stop, set.MaxStep, set.RelTol, set.AbsTol = stop, w.MaxStep, w.RelTol, w.AbsTol
		set.Record = opt.Record
		set.Observe = b.observe
		b.reset()
		res, err = b.sys.Transient(&set)
		if res != nil {
			r.Stats.Steps += res.Stats.Steps
			r.Stats.Rejected += res.Stats.Rejected
			r.Stats.Newton += res.Stats.Newton
			r.Stats.DCNewton += res.Stats.DCNewton
			r.Stats.Wall += res.Stats.Wall
		}
		if err != nil {
			return nil, explain(err, b.Circuit, w)
		}
		if res.Stop > 0 {
			stop = res.Stop
		}
		late = b.lateExtremes(stop)
		if len(late) == 0 || explicit || stop >= limit {
			break
		}
		stop = math.Min(2*stop, limit)
		r.Window.Extended++
	}
	r.Window.Stop = stop
	if r.Window.Extended > 0 {
		r.Notes = append(r.Notes, fmt.Sprintf("the default window was extended from %s to %s because the response was still developing at its end",
			formatSI(first, "s"), formatSI(stop, "s")))
	}
	if len(late) > 0 {
		what := strings.Join(late, ", ")
		if explicit {
			r.Window.Suggest = niceCeil(math.Max(2*stop, DefaultStop(b.Circuit, st.Stop)))
			r.Notes = append(r.Notes, fmt.Sprintf("%s: in the last %.0f %% of the window, possibly still rising, so not a peak; try window stop=%s",
				what, 100*EndFraction, deckNumber(r.Window.Suggest, "s")))
		} else {
			r.Notes = append(r.Notes, fmt.Sprintf("%s: in the last %.0f %% of the window even at the default's %s limit, possibly still rising; set a longer window stop= to see the peak",
				what, 100*EndFraction, formatSI(stop, "s")))
		}
	}
	b.measure(r, res)
	if opt.Record {
		r.Waves = b.waves(res)
	}
	Judge(r)
	if len(r.Limits) == 0 {
		r.Notes = append(r.Notes, "the deck gives no ratings (vmax, vmin, ifail, ipp, emax, rating, watch max/min): nothing was judged")
	}
	return r, nil
}

// lateExtremes names the reported extremes that sit in the last EndFraction
// of a window of length stop and stand out from the signal's start.
func (b *Bench) lateExtremes(stop float64) []string {
	var late []string
	edge := stop * (1 - EndFraction)
	check := func(name string, tr *waveforms.Tracker, v0 float64) {
		hi, thi := tr.Max()
		lo, tlo := tr.Min()
		span := math.Max(hi-v0, v0-lo)
		if !(span > 0) {
			return
		}
		if thi >= edge && hi-v0 >= Significance*span {
			late = append(late, name+" highest")
		}
		if tlo >= edge && v0-lo >= Significance*span {
			late = append(late, name+" lowest")
		}
	}
	watched := map[string]bool{}
	for _, wt := range b.Circuit.Watches {
		watched[wt.Node] = true
	}
	for i, n := range b.nodes {
		if watched[n] {
			check("node "+n, &b.nodeTr[i], b.node0[i])
		}
	}
	for k := range b.pins {
		m := &b.pins[k]
		check(m.e.Name+" residual", &m.res, m.res0)
		if m.hasIfail {
			check(m.e.Name+" internal clamp current", &m.ip, m.ip0)
		}
	}
	for k := range b.caps {
		m := &b.caps[k]
		if _, ok := m.e.Num["rating"]; ok {
			check(m.e.Name+" voltage", &m.tr, m.v0)
		}
	}
	return late
}

// measure fills the run's measurements and limits from the meters and the
// engine's ledger.
func (b *Bench) measure(r *Run, res *mna.Result) {
	isPin := map[string]bool{}
	for _, e := range b.Circuit.Elements {
		if e.Kind == netlist.Pin {
			isPin[e.Nodes[0]] = true
		}
	}
	watched := map[string]bool{}
	for _, wt := range b.Circuit.Watches {
		watched[wt.Node] = true
	}
	nodeIdx := indexOf(b.nodes)
	for i, n := range b.nodes {
		hi, thi := b.nodeTr[i].Max()
		lo, tlo := b.nodeTr[i].Min()
		r.Nodes = append(r.Nodes, NodeResult{Name: n, Max: hi, TMax: thi, Min: lo, TMin: tlo,
			Initial: b.node0[i], Watched: watched[n], Pin: isPin[n]})
	}
	elemIdx := indexOf(b.elems)
	kinds := map[string]netlist.Kind{}
	for _, e := range b.Circuit.Elements {
		kinds[e.Name] = e.Kind
	}
	if b.strIdx >= 0 {
		r.Ledger.Strike = -res.Energy[b.strIdx]
	}
	r.Ledger.Balance = res.Balance
	r.Ledger.Delivered = max(0, r.Ledger.Strike)
	for i := range b.elems {
		if i != b.strIdx {
			r.Ledger.Delivered += max(0, -res.Energy[i])
		}
	}
	for i, name := range b.elems {
		if i == b.strIdx {
			continue
		}
		pk, tpk := b.elemTr[i].AbsPeak()
		r.Elements = append(r.Elements, ElementResult{Name: name, Kind: kinds[name],
			PeakCurrent: pk, TPeak: tpk, Energy: res.Energy[i]})
		le := LedgerEntry{Name: name, Energy: res.Energy[i]}
		if r.Ledger.Delivered > 0 {
			le.Percent = 100 * le.Energy / r.Ledger.Delivered
		}
		r.Ledger.Entries = append(r.Ledger.Entries, le)
	}
	pinAt := map[string]*pinMeter{}
	for k := range b.pins {
		m := &b.pins[k]
		pinAt[m.e.Name] = m
		pk, tpk := m.res.Max()
		lo, tlo := m.res.Min()
		ip, tip := m.ip.AbsPeak()
		rd := Residual{Name: m.e.Name, Node: m.e.Nodes[0], Peak: pk, TPeak: tpk, Min: lo, TMin: tlo,
			Energy: res.Energy[m.elem], IPath: ip, TIPath: tip,
			HasVmax: m.hasVmax, HasVmin: m.hasVmin, HasIfail: m.hasIfail,
			Vmax: m.vmax, Vmin: m.vmin, Ifail: m.e.Num["ifail"]}
		if m.hasVmax {
			rd.AboveVmax = m.res.WidthAbove()
		}
		if m.hasVmin {
			rd.BelowVmin = m.res.WidthBelow()
		}
		r.Pins = append(r.Pins, rd)
	}
	capAt := map[string]*capMeter{}
	for k := range b.caps {
		m := &b.caps[k]
		capAt[m.e.Name] = m
		pk, tpk := m.tr.AbsPeak()
		rating, has := m.e.Num["rating"]
		r.Capacitors = append(r.Capacitors, CapacitorResult{Name: m.e.Name, Peak: pk, TPeak: tpk, Rating: rating, HasRating: has})
	}

	// Limits, in deck order, then the watches.
	for _, e := range b.Circuit.Elements {
		switch e.Kind {
		case netlist.Clamp:
			i := elemIdx[e.Name]
			if v, ok := e.Num["ipp"]; ok {
				pk, tpk := b.elemTr[i].AbsPeak()
				r.Limits = append(r.Limits, NewLimit(e.Name, "ipp", "A", v, pk, tpk, true))
			}
			if v, ok := e.Num["emax"]; ok {
				r.Limits = append(r.Limits, NewLimit(e.Name, "emax", "J", v, res.Energy[i], math.NaN(), true))
			}
		case netlist.Pin:
			m := pinAt[e.Name]
			if m.hasVmax {
				pk, tpk := m.res.Max()
				r.Limits = append(r.Limits, NewLimit(e.Name, "vmax", "V", m.vmax, pk, tpk, true))
			}
			if m.hasVmin {
				lo, tlo := m.res.Min()
				r.Limits = append(r.Limits, NewLimit(e.Name, "vmin", "V", m.vmin, lo, tlo, false))
			}
			if m.hasIfail {
				ip, tip := m.ip.AbsPeak()
				r.Limits = append(r.Limits, NewLimit(e.Name, "ifail", "A", e.Num["ifail"], ip, tip, true))
			}
		case netlist.Capacitor:
			if v, ok := e.Num["rating"]; ok {
				pk, tpk := capAt[e.Name].tr.AbsPeak()
				r.Limits = append(r.Limits, NewLimit(e.Name, "rating", "V", v, pk, tpk, true))
			}
		}
	}
	for _, wt := range b.Circuit.Watches {
		i, ok := nodeIdx[wt.Node]
		if !ok {
			continue
		}
		if wt.HasMax {
			hi, thi := b.nodeTr[i].Max()
			r.Limits = append(r.Limits, NewLimit(wt.Node, "max", "V", wt.Max, hi, thi, true))
		}
		if wt.HasMin {
			lo, tlo := b.nodeTr[i].Min()
			r.Limits = append(r.Limits, NewLimit(wt.Node, "min", "V", wt.Min, lo, tlo, false))
		}
	}
}

// waves copies the recorded waveforms of res into the study's shape.
func (b *Bench) waves(res *mna.Result) *Waves {
	w := &Waves{Time: res.Time, Nodes: b.nodes, V: res.V, Probes: b.probes, P: res.P}
	for i, name := range b.elems {
		if i == b.strIdx {
			// The engine reports the current into the strike's first
			// terminal; the strike drives the opposite into its node.
			s := make([]float64, len(res.I[i]))
			for k, v := range res.I[i] {
				s[k] = -v
			}
			w.Strike = s
			continue
		}
		w.Elements = append(w.Elements, name)
		w.I = append(w.I, res.I[i])
	}
	return w
}

// Solve compiles the variant of c and solves one run with it: the one-off
// form of NewBench followed by Bench.Solve.
func Solve(c *netlist.Circuit, v netlist.Variant, level float64, polarity string, opt *Options) (*Run, error) {
	b, err := NewBench(c, v)
	if err != nil {
		return nil, err
	}
	return b.Solve(level, polarity, opt)
}
