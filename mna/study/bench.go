package study

import (
	"fmt"
	"math"
	"strings"

	"zapnet/devices"
	"zapnet/devices/spec"
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
	meters  []elemMeter         // per element but the strike, deck order
	observe func(p *mna.Point)
}

// elemMeter follows what the ratings and the role of one element ask to be
// measured beyond its current: the voltage across it and the current in its
// internal paths.
type elemMeter struct {
	e       *netlist.Element
	elem    int // element index in the system
	a, b    int // node indices of its terminals; −1 for gnd
	across  bool
	v       waveforms.Tracker // v(a) − v(b), when across
	v0      float64
	path    bool
	probe   int               // probe index of ELEMENT.ipath, −1: the element's current
	ip      waveforms.Tracker // internal-path current, when path
	ip0     float64
	ratings []spec.Param // the ratings the element has values for
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
		if i, ok := nodeIdx[n]; ok && n != netlist.Ground {
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
		if e.IsStrike() {
			continue
		}
		m := elemMeter{e: e, elem: elemIdx[e.Name], a: node(e.Nodes[0]), b: node(e.Nodes[1]), probe: -1,
			across: e.Kind.Role == spec.ProtectedPin}
		// Widths are of interest only against a rating; an infinite
		// threshold keeps them at zero.
		m.v.Above, m.v.Below = math.Inf(1), math.Inf(-1)
		for _, r := range e.Kind.Ratings() {
			switch r.Rates.Measure {
			case spec.PeakVoltage, spec.HighVoltage, spec.LowVoltage:
				m.across = true
			case spec.PathCurrent:
				m.path = true
			}
			val, ok := e.Values.Lookup(r.Key)
			if !ok {
				continue
			}
			m.ratings = append(m.ratings, r)
			switch r.Rates.Measure {
			case spec.HighVoltage:
				m.v.Above = val
			case spec.LowVoltage:
				m.v.Below = val
			}
		}
		if i, ok := probeIdx[e.Name+".ipath"]; ok {
			m.probe = i
		}
		b.meters = append(b.meters, m)
	}
	b.observe = b.sample
	return b, nil
}

// rating returns the element's value of the rating on measure m.
func (m *elemMeter) rating(meas spec.Measure) (float64, bool) {
	for _, r := range m.ratings {
		if r.Rates.Measure == meas {
			return m.e.Values.Lookup(r.Key)
		}
	}
	return 0, false
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
	for k := range b.meters {
		m := &b.meters[k]
		if m.across {
			v := volt(p.V, m.a) - volt(p.V, m.b)
			m.v.Add(t, v)
			if b.first {
				m.v0 = v
			}
		}
		if m.path {
			ip := p.I[m.elem]
			if m.probe >= 0 {
				ip = p.P[m.probe]
			}
			m.ip.Add(t, ip)
			if b.first {
				m.ip0 = ip
			}
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
	for k := range b.meters {
		b.meters[k].v.Reset()
		b.meters[k].ip.Reset()
	}
}

// Solve runs the strike at level (in the waveform's unit) and polarity ("pos"
// or "neg"), measures the run and judges it. Of opt it uses Record, Window
// and Settings. The returned Run has the variant, level and polarity set and
// Index zero. A solve failure is returned as an error that names the
// node or element, the time and what to try.
func (b *Bench) Solve(level float64, polarity string, opt *Options) (*Run, error) {
	if opt == nil {
		opt = &Options{}
	}
	sign, err := polaritySign(polarity)
	if err != nil {
		return nil, err
	}
	wf := b.strike.Waveform
	st, err := wf.New(level, &b.strike.Values)
	if err != nil {
		return nil, fmt.Errorf("%s: strike %s: %v", b.strike.Pos, b.strike.Name, err)
	}
	run := newRun(Job{Variant: b.Variant, Level: level, Polarity: polarity})
	r := &run
	r.Waveform, r.LevelUnit = wf.Name, wf.Unit
	var res *mna.Result
	if st.Burst != nil {
		res, err = b.solveBurst(r, st, sign, opt)
	} else {
		res, err = b.solveWindow(r, st, sign, opt)
	}
	if err != nil {
		return nil, err
	}
	b.measure(r, res)
	if opt.Record {
		r.Waves = b.waves(res)
	}
	Judge(r)
	if len(r.Limits) == 0 {
		r.Notes = append(r.Notes, "the deck gives no ratings ("+strings.Join(ratingKeys(), ", ")+", watch max/min): nothing was judged")
	}
	return r, nil
}

// polaritySign is +1 for "pos" and −1 for "neg".
func polaritySign(polarity string) (float64, error) {
	switch polarity {
	case "pos":
		return 1, nil
	case "neg":
		return -1, nil
	}
	return 0, fmt.Errorf("polarity %q: use pos or neg", polarity)
}

// window is the deck's window with the fields Options.Window sets replaced.
func (b *Bench) window(opt *Options) netlist.Window {
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
	if w.RelTol == 0 {
		w.RelTol = DefaultRelTol
	}
	return w
}

// solveWindow solves the strike st over the run's window: the deck's, or
// the default span, doubled up to its cap while an extreme sits at its end.
// It records the window in r, with a note when the span was extended or an
// extreme may still be rising at its end.
func (b *Bench) solveWindow(r *Run, st *waveforms.Stimulus, sign float64, opt *Options) (*mna.Result, error) {
	w := b.window(opt)
	explicit := w.Stop > 0
	stop, limit := w.Stop, Cap(st.Stop)
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
		var err error
		res, err = b.sys.Transient(st, sign, &set)
		if res != nil {
			r.Stats.add(res.Stats)
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
			spec.FormatSI(first, "s"), spec.FormatSI(stop, "s")))
	}
	if len(late) == 0 {
		return res, nil
	}
	what := strings.Join(late, ", ")
	if explicit {
		r.Window.Suggest = niceCeil(math.Max(2*stop, DefaultStop(b.Circuit, st.Stop)))
		r.Notes = append(r.Notes, fmt.Sprintf("%s: in the last %.0f %% of the window, possibly still rising, so not a peak; try window stop=%s",
			what, 100*EndFraction, spec.DeckNumber(r.Window.Suggest, "s")))
	} else {
		r.Notes = append(r.Notes, fmt.Sprintf("%s: in the last %.0f %% of the window even at the default's %s limit, possibly still rising; set a longer window stop= to see the peak",
			what, 100*EndFraction, spec.FormatSI(stop, "s")))
	}
	return res, nil
}

// lateExtremes names the reported extremes that sit in the last EndFraction
// of a window of length stop and stand out from the signal's start: those of
// the watched nodes, the pins' residuals and every rated voltage and
// internal-path current.
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
	for k := range b.meters {
		m := &b.meters[k]
		if m.e.Kind.Role == spec.ProtectedPin {
			check(m.e.Name+" residual", &m.v, m.v0)
		}
		for _, r := range m.ratings {
			switch r.Rates.Measure {
			case spec.PathCurrent:
				check(m.e.Name+" internal clamp current", &m.ip, m.ip0)
			case spec.PeakVoltage:
				check(m.e.Name+" voltage", &m.v, m.v0)
			}
		}
	}
	return late
}

// measure fills the run's measurements and limits from the meters and the
// engine's ledger.
func (b *Bench) measure(r *Run, res *mna.Result) {
	isPin := map[string]bool{}
	for k := range b.meters {
		if m := &b.meters[k]; m.e.Kind.Role == spec.ProtectedPin {
			isPin[m.e.Nodes[0]] = true
		}
	}
	watched := map[string]bool{}
	for _, wt := range b.Circuit.Watches {
		watched[wt.Node] = true
	}
	for i, n := range b.nodes {
		hi, thi := b.nodeTr[i].Max()
		lo, tlo := b.nodeTr[i].Min()
		r.Nodes = append(r.Nodes, NodeResult{Name: n, Max: hi, TMax: thi, Min: lo, TMin: tlo,
			Initial: b.node0[i], Watched: watched[n], Pin: isPin[n]})
	}
	if b.strIdx >= 0 {
		r.Ledger.Strike = res.Energy[b.strIdx]
	}
	r.Ledger.Balance = res.Balance
	for k := range b.meters {
		m := &b.meters[k]
		pk, tpk := b.elemTr[m.elem].AbsPeak()
		er := ElementResult{Name: m.e.Name, Kind: m.e.Kind.Name, Role: m.e.Kind.Role,
			PeakCurrent: pk, TPeak: tpk, Energy: res.Energy[m.elem]}
		if m.e.Kind.Role == spec.ProtectedPin {
			er.Residual = m.residual(res.Energy[m.elem])
		}
		if hasMeasure(m.e, spec.PeakVoltage) {
			v, t := m.v.AbsPeak()
			er.PeakVoltage, er.TPeakVoltage = &v, &t
		}
		r.Elements = append(r.Elements, er)
		r.Ledger.Entries = append(r.Ledger.Entries, LedgerEntry{Name: m.e.Name, Energy: res.Energy[m.elem]})
	}
	r.Ledger.share()

	// Limits: every element's ratings in deck order, then the watches.
	for k := range b.meters {
		m := &b.meters[k]
		for _, rt := range m.ratings {
			v, _ := m.e.Values.Lookup(rt.Key)
			var meas, at float64
			switch rt.Rates.Measure {
			case spec.PeakCurrent:
				meas, at = b.elemTr[m.elem].AbsPeak()
			case spec.Energy:
				meas, at = res.Energy[m.elem], math.NaN()
			case spec.PeakVoltage:
				meas, at = m.v.AbsPeak()
			case spec.HighVoltage:
				meas, at = m.v.Max()
			case spec.LowVoltage:
				meas, at = m.v.Min()
			case spec.PathCurrent:
				meas, at = m.ip.AbsPeak()
			}
			l := NewLimit(m.e.Name, rt.Key, rt.Unit, v, meas, at, rt.Rates.Upper, rt.Rates.Says)
			l.Measure = rt.Rates.Measure
			r.Limits = append(r.Limits, l)
		}
	}
	nodeIdx := indexOf(b.nodes)
	for _, wt := range b.Circuit.Watches {
		i, ok := nodeIdx[wt.Node]
		if !ok {
			continue
		}
		if wt.HasMax {
			hi, thi := b.nodeTr[i].Max()
			r.Limits = append(r.Limits, NewLimit(wt.Node, "max", spec.Volt, wt.Max, hi, thi, true, "highest voltage"))
		}
		if wt.HasMin {
			lo, tlo := b.nodeTr[i].Min()
			r.Limits = append(r.Limits, NewLimit(wt.Node, "min", spec.Volt, wt.Min, lo, tlo, false, "lowest voltage"))
		}
	}
}

// residual is the pulse the meter of a protected pin saw; energy is the
// engine's ledger entry of the pin.
func (m *elemMeter) residual(energy float64) *Residual {
	pk, tpk := m.v.Max()
	lo, tlo := m.v.Min()
	ip, tip := m.ip.AbsPeak()
	rd := &Residual{Name: m.e.Name, Node: m.e.Nodes[0], Peak: pk, TPeak: tpk, Min: lo, TMin: tlo,
		Energy: energy, IPath: ip, TIPath: tip}
	rd.Vmax, rd.HasVmax = m.rating(spec.HighVoltage)
	rd.Vmin, rd.HasVmin = m.rating(spec.LowVoltage)
	rd.Ifail, rd.HasIfail = m.rating(spec.PathCurrent)
	if rd.HasVmax {
		rd.AboveVmax = m.v.WidthAbove()
	}
	if rd.HasVmin {
		rd.BelowVmin = m.v.WidthBelow()
	}
	return rd
}

// hasMeasure reports whether the element's kind declares a rating judged
// against meas (whether or not this element gives it a value).
func hasMeasure(e *netlist.Element, meas spec.Measure) bool {
	for _, r := range e.Kind.Ratings() {
		if r.Rates.Measure == meas {
			return true
		}
	}
	return false
}

// ratingKeys lists every rating of every kind, in catalogue order.
func ratingKeys() []string {
	var keys []string
	seen := map[string]bool{}
	for _, k := range devices.Catalogue() {
		for _, r := range k.Ratings() {
			if !seen[r.Key] {
				seen[r.Key] = true
				keys = append(keys, r.Key)
			}
		}
	}
	return keys
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
