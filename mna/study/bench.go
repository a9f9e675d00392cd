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
	nodes  []string        // System.Nodes
	elems  []string        // System.Elements
	probes []devices.Probe // System.Probes
	strIdx int             // the strike among elems
	// Per node, whether a watch line names it and whether it is a
	// protected pin's line; per watch line, its node's index (−1: none).
	watched, pin []bool
	watchAt      []int

	// Streaming measurements, reset before every solve and fed by observe.
	first   bool
	nodeTr  []waveforms.Tracker // per node, its voltage
	node0   []float64           // per node, its value at t = 0
	w0      []float64           // per element, its power at t = 0 (the operating point), W
	i0      []float64           // per element, its current at t = 0, A
	meters  []elemMeter         // per element but the strike, deck order
	beyond  []beyondMeter       // per element with a table, its excursions beyond it
	caution []string            // notes every run carries (a word's Caution)
	observe func(p *mna.Point)
}

// elemMeter measures one element: its peak current (the engine tracks it),
// and what its ratings and role ask to be measured beyond it, streamed
// point by point: the voltage across it, its power, and the
// device probes its ratings name (a pin's internal-path current, a
// capacitor's dielectric voltage).
type elemMeter struct {
	e    *netlist.Element
	elem int // element index in the system
	a, b int // node indices of its terminals; −1 for gnd
	// pk is its largest |current| and tpk when, as the engine tracked
	// them (mna.Result.PeakCurrent): set by measure.
	pk, tpk float64
	across  bool
	v       waveforms.Tracker // v(a) − v(b), when across
	// peakV: its kind has a peak-voltage rating, so its largest |v(a) −
	// v(b)| is reported (ElementResult.PeakVoltage) whether or not this
	// element gives the rating.
	peakV  bool
	v0     float64
	power  bool
	w      waveforms.Tracker // Σ v·i into it, when power
	probes []probeMeter
	// ratings are the ratings the element has values for.
	ratings []spec.Param
}

// probeMeter follows one device probe.
type probeMeter struct {
	name string // the device's name for it: "ipath"
	unit spec.Unit
	idx  int // in System.Probes
	tr   waveforms.Tracker
	v0   float64
}

// probe returns the meter of the element's probe name, or nil.
func (m *elemMeter) probe(name string) *probeMeter {
	for k := range m.probes {
		if m.probes[k].name == name {
			return &m.probes[k]
		}
	}
	return nil
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
	probeIdx := map[string]int{}
	for i, p := range b.probes {
		probeIdx[p.Name] = i
	}
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
	b.w0 = make([]float64, len(b.elems))
	b.i0 = make([]float64, len(b.elems))
	b.watched, b.pin = make([]bool, len(b.nodes)), make([]bool, len(b.nodes))
	for _, wt := range vc.Watches {
		i, ok := nodeIdx[wt.Node]
		if ok {
			b.watched[i] = true
		} else {
			i = -1
		}
		b.watchAt = append(b.watchAt, i)
	}
	for _, e := range vc.Elements {
		if i, ok := nodeIdx[e.Nodes[0]]; ok && e.Kind.Role == spec.ProtectedPin {
			b.pin[i] = true
		}
		if !e.IsStrike() {
			b.meters = append(b.meters, newMeter(e, elemIdx[e.Name], node(e.Nodes[0]), node(e.Nodes[1]), b.probes))
			if i, ok := probeIdx[e.Name+".beyond"]; ok {
				b.beyond = append(b.beyond, beyondMeter{name: e.Name, probe: i})
			}
			for _, w := range e.Kind.Words {
				if w.Caution != "" && e.Values.Word(w.Key) != "" {
					b.caution = append(b.caution, fmt.Sprintf(w.Caution, e.Name))
				}
			}
		}
	}
	// Extremes are interpolated between the engine's points (the cubic
	// through the samples around each), which the engine's accuracy
	// assumes: a peak of a ringing sampled a few tens of times a period
	// reads low by a few tenths of a percent on the samples alone.
	b.eachTracker(func(tr *waveforms.Tracker) { tr.Refine = true })
	b.observe = b.sample
	return b, nil
}

// newMeter sets up what element e (index elem, terminal nodes a and b)
// needs measured: the voltage across a protected pin or an element rated on
// it, the power of one rated on it, and every probe a rating of its kind
// reads, whether or not this element gives that rating (the reports show
// the quantity either way).
func newMeter(e *netlist.Element, elem, a, b int, probes []devices.Probe) elemMeter {
	// The voltage across the terminals is a pin's residual, a protector's
	// voltage at rest (its stand-off, beside its leakage), and shown
	// beside every voltage rating, one read on a probe included.
	role := e.Kind.Role
	m := elemMeter{e: e, elem: elem, a: a, b: b, across: role == spec.ProtectedPin || role == spec.Protector}
	// Widths are of interest only against a rating; an infinite threshold
	// keeps them at zero.
	m.v.Above, m.v.Below = math.Inf(1), math.Inf(-1)
	for _, r := range e.Kind.Ratings() {
		switch r.Rates.Measure {
		case spec.PeakVoltage:
			m.across, m.peakV = true, true
		case spec.HighVoltage, spec.LowVoltage, spec.StandOff:
			m.across = true
		}
		switch {
		case r.Rates.Probe != "":
			if m.probe(r.Rates.Probe) == nil {
				for i, p := range probes {
					if p.Name == e.Name+"."+r.Rates.Probe {
						m.probes = append(m.probes, probeMeter{name: r.Rates.Probe, unit: p.Unit, idx: i})
					}
				}
			}
		case r.Rates.Measure == spec.PeakPower:
			m.power = true
		}
		val, ok := e.Values.Lookup(r.Key)
		if !ok {
			continue
		}
		m.ratings = append(m.ratings, r)
		if r.Rates.Probe == "" {
			switch r.Rates.Measure {
			case spec.HighVoltage:
				m.v.Above = val
			case spec.LowVoltage:
				m.v.Below = val
			}
		}
	}
	return m
}

// rating returns the element's value of its rating on measure meas of the
// probe named probe ("" for its terminals).
func (m *elemMeter) rating(meas spec.Measure, probe string) (float64, bool) {
	for _, r := range m.ratings {
		if r.Rates.Measure == meas && r.Rates.Probe == probe {
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
	for k := range b.meters {
		m := &b.meters[k]
		if m.across {
			v := volt(p.V, m.a) - volt(p.V, m.b)
			m.v.Add(t, v)
			if b.first {
				m.v0 = v
			}
		}
		if m.power {
			m.w.Add(t, p.W[m.elem])
		}
		for j := range m.probes {
			pm := &m.probes[j]
			pm.tr.Add(t, p.P[pm.idx])
			if b.first {
				pm.v0 = p.P[pm.idx]
			}
		}
	}
	for k := range b.beyond {
		b.beyond[k].add(t, p.P[b.beyond[k].probe])
	}
	if p.Corner {
		b.corner()
	}
	if b.first {
		copy(b.w0, p.W)
		copy(b.i0, p.I)
		copy(b.node0, p.V)
		b.first = false
	}
}

// corner tells every tracker that the last point is a corner of the
// stimulus (t = 0 or a breakpoint), where the waveforms may change slope:
// no interpolation of an extreme reaches across it.
func (b *Bench) corner() { b.eachTracker((*waveforms.Tracker).Corner) }

// eachTracker calls f on every tracker of the bench: the nodes', and each
// meter's voltage, power and probes.
func (b *Bench) eachTracker(f func(*waveforms.Tracker)) {
	for i := range b.nodeTr {
		f(&b.nodeTr[i])
	}
	for k := range b.meters {
		m := &b.meters[k]
		f(&m.v)
		f(&m.w)
		for j := range m.probes {
			f(&m.probes[j].tr)
		}
	}
}

// beyondMeter follows an element's "beyond" probe: how far the voltage
// across a table path lies outside its table (0 inside). It keeps the
// first few excursions, each from its first to its last point outside,
// and counts the rest, without allocating.
type beyondMeter struct {
	name     string
	probe    int
	in       bool
	n        int // excursions
	spans    [4][2]float64
	worst    float64 // signed, largest |beyond|
	lastT    float64
	tail     [2]float64 // the latest excursion, when past spans
	tailSeen bool
}

func (m *beyondMeter) add(t, v float64) {
	if v == 0 {
		m.in = false
		m.lastT = t
		return
	}
	if math.Abs(v) > math.Abs(m.worst) {
		m.worst = v
	}
	if !m.in {
		m.in = true
		m.n++
		if m.n <= len(m.spans) {
			m.spans[m.n-1] = [2]float64{t, t}
		} else {
			m.tail, m.tailSeen = [2]float64{t, t}, true
		}
	}
	if m.n <= len(m.spans) {
		m.spans[m.n-1][1] = t
	} else {
		m.tail[1] = t
	}
	m.lastT = t
}

func (m *beyondMeter) reset() { *m = beyondMeter{name: m.name, probe: m.probe} }

// note says when the element left its table, or "" when it never did.
func (m *beyondMeter) note() string {
	if m.n == 0 {
		return ""
	}
	var when []string
	for k := 0; k < m.n && k < len(m.spans); k++ {
		a, b := m.spans[k][0], m.spans[k][1]
		if a == b {
			when = append(when, "at "+spec.FormatSI(a, "s"))
		} else {
			when = append(when, "from "+spec.FormatSI(a, "s")+" to "+spec.FormatSI(b, "s"))
		}
	}
	if m.n > len(m.spans) {
		when = append(when, fmt.Sprintf("%d more times, the last from %s to %s", m.n-len(m.spans), spec.FormatSI(m.tail[0], "s"), spec.FormatSI(m.tail[1], "s")))
	}
	side := "above its highest"
	if m.worst < 0 {
		side = "below its lowest"
	}
	return fmt.Sprintf("%s: outside its I–V table %s, up to %s %s point: there the table's straight extension, not data, carried the solution",
		m.name, strings.Join(when, ", "), spec.FormatSI(math.Abs(m.worst), "V"), side)
}

func (b *Bench) reset() {
	b.first = true
	b.eachTracker((*waveforms.Tracker).Reset)
	for k := range b.beyond {
		b.beyond[k].reset()
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
	r.Notes = append(r.Notes, b.validity(r, st)...)
	for k := range b.beyond {
		if n := b.beyond[k].note(); n != "" {
			r.Notes = append(r.Notes, n)
		}
	}
	r.Notes = append(r.Notes, b.caution...)
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

// solveWindow solves the strike st over the run's window: the deck's, or
// the default span, doubled up to its cap while an extreme sits at its end.
// It records the window in r, with a note when the span was extended or an
// extreme may still be rising at its end.
func (b *Bench) solveWindow(r *Run, st *waveforms.Stimulus, sign float64, opt *Options) (*mna.Result, error) {
	w := windowOf(b.Circuit, opt)
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
		set.Stop, set.Resolve, set.Accuracy = stop, w.Resolve, w.Accuracy
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
		r.Window.Suggest = spec.NiceCeil(math.Max(2*stop, DefaultStop(b.Circuit, st.Stop)))
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
	for i, n := range b.nodes {
		if b.watched[i] {
			check("node "+n, &b.nodeTr[i], b.node0[i])
		}
	}
	for k := range b.meters {
		m := &b.meters[k]
		if m.e.Kind.Role == spec.ProtectedPin {
			check(m.e.Name+" residual", &m.v, m.v0)
		}
		for _, r := range m.ratings {
			switch {
			case r.Rates.Probe != "":
				pm := m.probe(r.Rates.Probe)
				check(m.e.Name+" "+r.Rates.Says, &pm.tr, pm.v0)
			case r.Rates.Measure == spec.PeakVoltage:
				check(m.e.Name+" voltage", &m.v, m.v0)
			}
		}
	}
	return late
}

// measure fills the run's measurements and limits from the meters and the
// engine's ledger.
func (b *Bench) measure(r *Run, res *mna.Result) {
	b.measureNodes(r)
	b.ledger(r, res)
	for k := range b.meters {
		m := &b.meters[k]
		m.pk, m.tpk = res.PeakCurrent[m.elem], res.TPeakCurrent[m.elem]
		pk, tpk := m.pk, m.tpk
		er := ElementResult{Name: m.e.Name, Kind: m.e.Kind.Name, Role: m.e.Kind.Role,
			PeakCurrent: quiet(pk, currentFloor), TPeak: tpk, Energy: r.Ledger.Entries[k].Energy,
			Quiescent: b.w0[m.elem]}
		if m.elem < len(res.Gross) {
			er.Gross = res.Gross[m.elem]
		}
		if m.e.Kind.Role == spec.ProtectedPin {
			er.Residual = m.residual(er.Energy)
		}
		if m.peakV {
			v, t := m.v.AbsPeak()
			v = quiet(v, voltageFloor)
			er.PeakVoltage, er.TPeakVoltage = &v, &t
		}
		for j := range m.probes {
			pm := &m.probes[j]
			pr := ProbeResult{Name: pm.name, Unit: pm.unit}
			pr.Max, pr.TMax = pm.tr.Max()
			pr.Min, pr.TMin = pm.tr.Min()
			pr.Peak, pr.TPeak = pm.tr.AbsPeak()
			floor := floorOf(pm.unit)
			pr.Max, pr.Min, pr.Peak = quiet(pr.Max, floor), quiet(pr.Min, floor), quiet(pr.Peak, floor)
			er.Probes = append(er.Probes, pr)
		}
		r.Elements = append(r.Elements, er)
	}
	// Powers at rest the solution cannot tell from zero (the engine's
	// shunt conductance across a biased node) are zero.
	most := 0.0
	for _, e := range r.Elements {
		most = max(most, math.Abs(e.Quiescent))
	}
	for i := range r.Elements {
		r.Elements[i].Quiescent = quiet(r.Elements[i].Quiescent, powerFloor*most)
	}
	b.limits(r)
}

// measureNodes fills the extremes of every node.
func (b *Bench) measureNodes(r *Run) {
	for i, n := range b.nodes {
		hi, thi := b.nodeTr[i].Max()
		lo, tlo := b.nodeTr[i].Min()
		r.Nodes = append(r.Nodes, NodeResult{Name: n, Max: quiet(hi, voltageFloor), TMax: thi, Min: quiet(lo, voltageFloor), TMin: tlo,
			Initial: b.node0[i], Watched: b.watched[i], Pin: b.pin[i]})
	}
}

// ledger books the strike's energy: each element's ∫ v·i dt over the
// window less what it took at its operating point for the same time
// (∫ (v·i − v₀·i₀) dt), so that a supply feeding a load at rest shows the
// strike's share, not its own DC power. The quiescent powers v₀·i₀ sum to
// zero (every watt a supply gives at rest a load takes), so the balance is
// the sum of the engine's entries either way.
func (b *Bench) ledger(r *Run, res *mna.Result) {
	stop := r.Window.Stop
	if b.strIdx >= 0 {
		r.Ledger.Strike = res.Energy[b.strIdx] - b.w0[b.strIdx]*stop
	}
	r.Ledger.Balance = r.Ledger.Strike
	for k := range b.meters {
		m := &b.meters[k]
		e := res.Energy[m.elem] - b.w0[m.elem]*stop
		r.Ledger.Entries = append(r.Ledger.Entries, LedgerEntry{Name: m.e.Name, Energy: e})
		r.Ledger.Balance += e
	}
	r.Ledger.share()
	// Entries the solution cannot tell from zero are zero.
	floor := energyFloor * r.Ledger.Delivered
	for i := range r.Ledger.Entries {
		r.Ledger.Entries[i].Energy = quiet(r.Ledger.Entries[i].Energy, floor)
	}
	r.Ledger.share()
}

// limits compares every element's ratings, in deck order, then the
// watches, with what the run measured.
func (b *Bench) limits(r *Run) {
	for k := range b.meters {
		m := &b.meters[k]
		for _, rt := range m.ratings {
			v, _ := m.e.Values.Lookup(rt.Key)
			meas, at, v0 := m.measured(rt, r.Ledger.Entries[k].Energy)
			var l Limit
			if isWindow(rt.Rates.Measure) {
				l = NewWindowLimit(m.e.Name, rt.Key, rt.Unit, v, meas, at, quiet(v0, voltageFloor), rt.Rates.Upper, rt.Rates.Says)
			} else {
				l = NewLimit(m.e.Name, rt.Key, rt.Unit, v, meas, at, rt.Rates.Upper, rt.Rates.Says)
			}
			l.Measure = rt.Rates.Measure
			r.Limits = append(r.Limits, l)
		}
	}
	for k, wt := range b.Circuit.Watches {
		i := b.watchAt[k]
		if i < 0 {
			continue
		}
		if wt.HasMax {
			hi, thi := b.nodeTr[i].Max()
			r.Limits = append(r.Limits, NewWindowLimit(wt.Node, "max", spec.Volt, wt.Max, quiet(hi, voltageFloor), thi, quiet(b.node0[i], voltageFloor), true, "highest voltage"))
		}
		if wt.HasMin {
			lo, tlo := b.nodeTr[i].Min()
			r.Limits = append(r.Limits, NewWindowLimit(wt.Node, "min", spec.Volt, wt.Min, quiet(lo, voltageFloor), tlo, quiet(b.node0[i], voltageFloor), false, "lowest voltage"))
		}
	}
}

// isWindow reports whether a measure is one side of a voltage window,
// whose margin is judged against the headroom from the operating point.
func isWindow(m spec.Measure) bool { return m == spec.HighVoltage || m == spec.LowVoltage }

// measured is the measurement a rating of the meter's element is compared
// with, its time (NaN for an energy or a stand-off) and its value at the
// operating point; energy is the element's entry in the ledger.
func (m *elemMeter) measured(rt spec.Param, energy float64) (meas, at, v0 float64) {
	tr, v0 := &m.v, m.v0 // the voltage across the element
	switch {
	case rt.Rates.Probe != "":
		pm := m.probe(rt.Rates.Probe)
		tr, v0 = &pm.tr, pm.v0
	case rt.Rates.Measure == spec.PeakCurrent:
		return quiet(m.pk, floorOf(rt.Unit)), m.tpk, v0
	case rt.Rates.Measure == spec.PeakPower:
		tr = &m.w
	}
	switch rt.Rates.Measure {
	case spec.Energy:
		return energy, math.NaN(), 0
	case spec.StandOff:
		return math.Abs(m.v0), math.NaN(), m.v0
	case spec.HighVoltage:
		meas, at = tr.Max()
	case spec.LowVoltage:
		meas, at = tr.Min()
	default:
		meas, at = tr.AbsPeak()
	}
	return quiet(meas, floorOf(rt.Unit)), at, v0
}

// Validity bounds [practice]: a protector that leaks more than leakNote at
// rest loads the line it protects; a protector driven past overdrive times
// its ipp, or a discharge above dischargeMax, is far outside the range its
// model (and any part's data) describe, whatever the verdict says.
const (
	leakNote     = 1e-6 // A
	overdrive    = 10
	dischargeMax = 30e3 // V, the highest level of the discharge standards
	// discharge currents stay far below overCurrent: 30 A at 8 kV contact,
	// about 3.75 A/kV [pub: IEC 61000-4-2 table].
	overCurrent = 1e3 // A
)

// validity says, in sentences, where a run left the range its models hold
// in, and which protectors leak at the operating point.
func (b *Bench) validity(r *Run, st *waveforms.Stimulus) []string {
	var notes []string
	wf := b.strike.Waveform
	if wf.Discharge && st.Level > dischargeMax {
		notes = append(notes, fmt.Sprintf("a %s discharge is beyond every discharge test standard (%s at most): treat the results as far outside the models' validity",
			spec.FormatSI(st.Level, wf.Unit), spec.FormatSI(dischargeMax, wf.Unit)))
	}
	for k := range b.meters {
		m := &b.meters[k]
		if m.e.Kind.Role != spec.Protector {
			continue
		}
		pk := m.pk
		if l := r.LimitOn(m.e.Name, spec.PeakCurrent); l != nil && pk > overdrive*l.Value {
			notes = append(notes, fmt.Sprintf("%s carried %s, %.0f times its ipp of %s: far outside the range any model of the part is valid in",
				m.e.Name, spec.FormatSI(pk, "A"), pk/l.Value, spec.FormatSI(l.Value, "A")))
		} else if l == nil && wf.Discharge && pk > overCurrent {
			notes = append(notes, fmt.Sprintf("%s carried %s, far more than any electrostatic discharge drives: the model is used far outside its valid range",
				m.e.Name, spec.FormatSI(pk, "A")))
		}
		if i0 := b.i0[m.elem]; math.Abs(i0) > leakNote {
			notes = append(notes, fmt.Sprintf("%s leaks %s at rest, with %s across it: it loads the line it protects (check its stand-off voltage)",
				m.e.Name, spec.FormatSI(math.Abs(i0), "A"), spec.FormatSI(math.Abs(m.v0), "V")))
		}
	}
	for _, e := range b.Circuit.Elements {
		if n, ok := b.sys.Device(e.Name).(devices.RunNoter); ok {
			if s := n.RunNote(); s != "" {
				notes = append(notes, s)
			}
		}
	}
	return notes
}

// residual is the pulse the meter of a protected pin saw; energy is its
// entry in the ledger.
func (m *elemMeter) residual(energy float64) *Residual {
	pk, tpk := m.v.Max()
	lo, tlo := m.v.Min()
	rd := &Residual{Name: m.e.Name, Node: m.e.Nodes[0], Peak: quiet(pk, voltageFloor), TPeak: tpk,
		Min: quiet(lo, voltageFloor), TMin: tlo, Energy: energy}
	if pm := m.probe("ipath"); pm != nil {
		rd.IPath, rd.TIPath = pm.tr.AbsPeak()
		rd.IPath = quiet(rd.IPath, currentFloor)
	}
	rd.Vmax, rd.HasVmax = m.rating(spec.HighVoltage, "")
	rd.Vmin, rd.HasVmin = m.rating(spec.LowVoltage, "")
	rd.Ifail, rd.HasIfail = m.rating(spec.PeakCurrent, "ipath")
	if rd.HasVmax {
		rd.AboveVmax = m.v.WidthAbove()
	}
	if rd.HasVmin {
		rd.BelowVmin = m.v.WidthBelow()
	}
	return rd
}

// The solver's noise: values smaller than these are not told apart from
// zero and are reported as zero. The engine settles node voltages to a
// microvolt and currents to a nanoampere (mna's tolerances); a thousandth of
// that is well inside its noise [practice].
const (
	voltageFloor = 1e-9  // V
	currentFloor = 1e-12 // A
	// powerFloor is relative to the largest power at rest.
	powerFloor = 1e-9
	// energyFloor is relative to the energy delivered.
	energyFloor = 1e-9
)

// floorOf is the noise floor of a quantity in unit.
func floorOf(u spec.Unit) float64 {
	switch u {
	case spec.Volt:
		return voltageFloor
	case spec.Ampere:
		return currentFloor
	}
	return 0
}

// quiet is v, or 0 when |v| is below floor.
func quiet(v, floor float64) float64 {
	if math.Abs(v) < floor {
		return 0
	}
	return v
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
	w := &Waves{Time: res.Time, Nodes: b.nodes, V: res.V, Probes: b.probes, P: res.P, StrikeName: b.strike.Name}
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
