package signal

import (
	"fmt"
	"math"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// Edge check defaults.
const (
	// DefaultStepLevel is the step's open-circuit amplitude, V. Junction
	// capacitances depend on the swing, so a deck whose signal swings
	// otherwise should say so (Options.StepLevel).
	DefaultStepLevel = 1
	// edgeFirstSpan and edgeMaxSpan bound the simulated span: it starts
	// at the first and doubles until every measured node has settled.
	edgeFirstSpan = 2e-9
	edgeMaxSpan   = 2e-6
	// edgeSettled is how little a node may still move over the last fifth
	// of the span, as a fraction of its swing, to count as settled.
	edgeSettled = 1e-3
)

// Edges runs the edge check the request describes: a step from the first
// port (its open-circuit voltage behind the port's z0, rising linearly over
// the step's ramp), every other port terminated in its z0 and the strike
// off, solved in the transient engine so that junction capacitances count
// as they vary with the swing. It measures the 10–90 % rise between each
// node's operating point and its settled value at every other port's node
// and at every target with a rise limit. Nothing is done without a port.
func Edges(c *netlist.Circuit, req *Request, opt *Options) ([]Edge, error) {
	o := opt.withDefaults()
	if len(req.Ports) == 0 {
		return nil, nil
	}
	probes := edgeProbes(req, o)
	if len(probes) == 0 {
		return nil, nil
	}
	sys, err := mna.Compile(c)
	if err != nil {
		return nil, err
	}
	src := req.Ports[0]
	for i, p := range req.Ports {
		d, ok := sys.Device(p.Name).(devices.Porter)
		if !ok {
			return nil, fmt.Errorf("edge check: %s is not a port of the circuit", p.Name)
		}
		if i > 0 {
			d.Terminate()
		}
	}
	drive := sys.Device(src.Name).(devices.Porter)
	nodeIdx := map[string]int{}
	for i, n := range sys.Nodes() {
		nodeIdx[n] = i
	}
	for span := edgeFirstSpan; ; span *= 2 {
		st, err := waveforms.Step(o.StepLevel, o.StepRise, src.Z0, span)
		if err != nil {
			return nil, err
		}
		drive.Drive(st)
		// Femtofarads at a volt hold femtocoulombs: the charge tolerance
		// must sit far below them for a rise good to 0.1 %.
		set := mna.Settings{Stop: span, MaxStep: span / 2000, RelTol: 1e-6, ChargeTol: 1e-19, Record: true}
		if o.Settings != nil {
			set.Gmin = o.Settings.Gmin
		}
		res, err := sys.Transient(nil, 0, &set)
		if err != nil {
			return nil, fmt.Errorf("edge check from %s: %w", src.Name, err)
		}
		out, settled, err := measureProbes(res, nodeIdx, probes, o)
		if err != nil {
			return nil, err
		}
		if settled || span*2 > edgeMaxSpan {
			if !settled {
				for i := range out {
					if out[i].Note == "" {
						out[i].Note = fmt.Sprintf("not settled within %s", spec.FormatSI(span, spec.Second))
					}
				}
			}
			return out, nil
		}
	}
}

// edgeProbe is a node the edge check measures, with its limits.
type edgeProbe struct {
	from, to string
	pair     mna.Pair
	limit    float64
	budget   float64
}

// edgeProbes lists the nodes the edge check measures: every port but the
// first, judged against the rise budget, and every target with a rise
// limit.
func edgeProbes(req *Request, o options) []edgeProbe {
	var probes []edgeProbe
	src := req.Ports[0]
	for _, p := range req.Ports[1:] {
		probes = append(probes, edgeProbe{from: src.Name, to: p.Name, pair: p.Pair, budget: o.RiseBudget})
	}
	for _, t := range req.Targets {
		if !(t.Rise > 0) {
			continue
		}
		// A target at another port's node is that port's probe, judged
		// against the target's limit too.
		merged := false
		for i := range probes {
			if probes[i].pair == t.Pair || (probes[i].pair.Node == t.Pair.Node && probes[i].pair.RefNode() == t.Pair.RefNode()) {
				probes[i].limit = tighter(probes[i].limit, t.Rise)
				merged = true
			}
		}
		if !merged {
			probes = append(probes, edgeProbe{from: src.Name, to: t.Name, pair: t.Pair, limit: t.Rise})
		}
	}
	return probes
}

// measureProbes measures the edge at every probe of a solved span and
// says whether every node had settled.
func measureProbes(res *mna.Result, nodeIdx map[string]int, probes []edgeProbe, o options) ([]Edge, bool, error) {
	var out []Edge
	settled := true
	for _, p := range probes {
		v, err := pairVoltage(res, nodeIdx, p.pair)
		if err != nil {
			return nil, false, err
		}
		e := Edge{From: p.from, To: p.to, Node: p.pair.Node, Level: o.StepLevel, Step: 0.8 * o.StepRise,
			Limit: p.limit, Budget: p.budget}
		ok := measureEdge(res.Time, v, &e)
		if !ok {
			settled = false
		}
		if e.Note == "" {
			e.Delay -= o.StepRise / 2
		}
		e.Exceeds = (e.Limit > 0 && !(e.Rise <= e.Limit)) || (e.Budget > 0 && !(e.Added <= e.Budget))
		out = append(out, e)
	}
	return out, settled, nil
}

// pairVoltage is the voltage of a pair's node over its reference at every
// solved time.
func pairVoltage(res *mna.Result, nodeIdx map[string]int, p mna.Pair) ([]float64, error) {
	get := func(n string) ([]float64, error) {
		if n == "" || n == netlist.Ground {
			return nil, nil
		}
		i, ok := nodeIdx[n]
		if !ok {
			return nil, fmt.Errorf("edge check: no node %s", n)
		}
		return res.V[i], nil
	}
	a, err := get(p.Node)
	if err != nil {
		return nil, err
	}
	b, err := get(p.Ref)
	if err != nil {
		return nil, err
	}
	v := make([]float64, len(res.Time))
	for k := range v {
		v[k] = a[k]
		if b != nil {
			v[k] -= b[k]
		}
	}
	return v, nil
}

// measureEdge fills e's Rise, Added and Delay (from t = 0) from the
// samples of one node, between its first value and its last. It reports
// whether the node had settled: it moved less than edgeSettled of its swing
// over the last fifth of the span.
func measureEdge(t, v []float64, e *Edge) (settled bool) {
	n := len(v)
	v0, v1 := v[0], v[n-1]
	swing := v1 - v0
	tail := t[n-1] - (t[n-1]-t[0])/5
	lo, hi := v1, v1
	for k := n - 1; k >= 0 && t[k] >= tail; k-- {
		lo, hi = min(lo, v[k]), max(hi, v[k])
	}
	if !(math.Abs(swing) > 1e-9*max(math.Abs(v0), math.Abs(v1), 1e-3)) {
		e.Note = "no edge arrives"
		return true
	}
	settled = hi-lo <= edgeSettled*math.Abs(swing)
	t10, ok1 := waveforms.FirstCrossing(t, v, v0+0.1*swing)
	t50, ok2 := waveforms.FirstCrossing(t, v, v0+0.5*swing)
	t90, ok3 := waveforms.FirstCrossing(t, v, v0+0.9*swing)
	if !ok1 || !ok2 || !ok3 {
		return false
	}
	e.Rise = t90 - t10
	e.Added = math.Sqrt(max(0, e.Rise*e.Rise-e.Step*e.Step))
	e.Delay = t50
	return settled
}
