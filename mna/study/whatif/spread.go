package whatif

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strconv"
	"strings"
	"sync"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// SpreadOptions tune a statistical spread. A nil *SpreadOptions means every
// default; a zero field means that field's default.
type SpreadOptions struct {
	// Study chooses the levels and polarities each drawn circuit is struck
	// with (nil: the deck's), the window, the engine settings and the
	// workers (zero: every core). Its Variants and Record are ignored.
	Study study.Options
	// Runs is the number of circuits drawn. Zero: 1000.
	Runs int
	// Seed seeds the draws; every seed, zero included, is a valid one.
	Seed uint64
	// Tolerances replace the deck's tolerance lines. Nil: the deck's.
	Tolerances []netlist.Tolerance
	// Shard selects the drawn circuits (by index) this process solves.
	// Zero: all.
	Shard study.Shard
	// Progress, when set, is told after each finished circuit.
	Progress Progress
	// Samples keeps every drawn circuit's verdicts and measurements in
	// SpreadResult.Samples; memory and JSON then grow with Runs. Without
	// it the result holds the statistics only, in memory that does not
	// grow with Runs.
	Samples bool
	// ExactUpTo is the count of solved circuits up to which the
	// percentiles are exact; above it they come from a Sketch. Zero:
	// ExactCircuits.
	ExactUpTo int
}

// DefaultRuns is the number of circuits drawn when SpreadOptions.Runs is 0.
const DefaultRuns = 1000

// SpreadResult is the distribution of a spread. Its JSON is the "spread"
// object of OUTPUT.md with additions. The statistics are kept in a summary
// whose size does not grow with the count of circuits (SpreadSummary):
// exact percentiles up to ExactUpTo solved circuits, a Sketch above. A
// shard's result writes that summary so that MergeSpreads joins shards into
// the unsharded result bit for bit.
type SpreadResult struct {
	// Runs is the number of circuits of the whole study (all shards).
	Runs int    `json:"runs"`
	Seed uint64 `json:"seed"`
	// Variant is the design the draws are around: the command line's
	// settings over the deck ({} for the deck as written). The caller sets
	// it.
	Variant netlist.Variant `json:"variant"`
	// Solved counts the circuits whose every strike was solved; the
	// statistics are over those. Unsolved counts the others (their first
	// few are UnsolvedCircuits). Passed counts the solved circuits that
	// passed at every level and polarity.
	Solved       int     `json:"solved"`
	Unsolved     int     `json:"unsolved"`
	Passed       int     `json:"passed"`
	PassFraction float64 `json:"pass_fraction"`
	// CI95 is the Wilson score interval of the pass fraction (Wilson95).
	CI95 [2]float64 `json:"ci95"`
	// ExactUpTo is the count of solved circuits up to which the
	// percentiles are exact (SpreadOptions.ExactUpTo).
	ExactUpTo int `json:"exact_up_to"`
	// PercentileError is 0 when every percentile is exact (Solved ≤
	// ExactUpTo). Above, it is the bound α on the relative error of p1 …
	// p99 read from the sketch (SketchAccuracy): each is within α·|p| of
	// the exact percentile, or within α times the larger magnitude of the
	// two circuits' values it lies between when those have opposite signs.
	// n, min, max and mean stay exact, as do every count and interval.
	PercentileError float64 `json:"percentile_error"`
	// Percentiles are per measure, of each circuit's worst case over
	// its levels and polarities: the highest residual peak, the lowest
	// residual low, the largest clamp energy and current, the smallest
	// worst margin (percent of the limit).
	Percentiles map[string]Percentiles `json:"percentiles"`
	// Conditions are the same statistics per level and polarity.
	Conditions []Condition    `json:"conditions"`
	Tolerances []ToleranceUse `json:"tolerances"`
	Waveform   string         `json:"waveform"`
	LevelUnit  spec.Unit      `json:"level_unit"`
	// Measures name the columns of Sample.Values and the order of the
	// summary's tallies.
	Measures []string `json:"measures"`
	// Samples are every circuit's record, in index order, only when
	// SpreadOptions.Samples asked for them.
	Samples []Sample `json:"samples,omitempty"`
	// UnsolvedCircuits are the unsolved circuits of lowest index, at most
	// MaxUnsolvedListed, with why each could not be solved.
	UnsolvedCircuits []CircuitError `json:"unsolved_circuits,omitempty"`
	Notes            []string       `json:"notes,omitempty"`
	// Shard is set on the output of one shard: its statistics are of its
	// own circuits only, until merged.
	Shard *study.ShardInfo `json:"shard,omitempty"`
	// Summary is the summary of a shard's circuits, what MergeSpreads
	// joins; nil on the whole study's result (see Worst).
	Summary *SpreadSummary `json:"summary,omitempty"`
	// Interrupted says the context was cancelled: the statistics are of
	// the Solved + Unsolved circuits that finished.
	Interrupted bool `json:"interrupted,omitempty"`

	summary *SpreadSummary // always, while in memory
}

// MaxUnsolvedListed is the number of unsolved circuits a spread names.
const MaxUnsolvedListed = 10

// CircuitError is a drawn circuit that could not be solved.
type CircuitError struct {
	Index int    `json:"index"`
	Error string `json:"error"`
}

// SpreadSummary is what a spread keeps of its circuits' measurements: per
// measure (in Measures order) the Tally of each circuit's worst case, and
// per condition (in Conditions order) the Tally of each measure. Its size
// is bounded by ExactUpTo values per tally, then by the sketches' span.
type SpreadSummary struct {
	Worst      []*Tally   `json:"worst"`
	Conditions [][]*Tally `json:"conditions"`
}

// Worst is the distribution of each solved circuit's worst case of measure
// m (the values Percentiles[m] summarises); nil for a measure the spread
// does not have or a result read back from the whole study's JSON, which
// carries statistics only.
func (r *SpreadResult) Worst(m string) *Tally {
	s := r.summary
	if s == nil {
		s = r.Summary
	}
	for i, x := range r.Measures {
		if x == m && s != nil && i < len(s.Worst) {
			return s.Worst[i]
		}
	}
	return nil
}

// Condition is one level and polarity of a spread.
type Condition struct {
	Level        float64                `json:"level"`
	Polarity     string                 `json:"polarity"`
	Passed       int                    `json:"passed"`
	PassFraction float64                `json:"pass_fraction"`
	CI95         [2]float64             `json:"ci95"`
	Percentiles  map[string]Percentiles `json:"percentiles"`
}

// ToleranceUse is one tolerance as the spread applied it.
type ToleranceUse struct {
	Param   string    `json:"param"` // "D1.vbr"
	Nominal float64   `json:"nominal"`
	Unit    spec.Unit `json:"unit"` // of Nominal
	Percent float64   `json:"percent"`
	Dist    string    `json:"dist"`
}

// Sample is one drawn circuit: per condition (in Conditions order) its
// verdict and its measurements (in Measures order).
type Sample struct {
	Index    int         `json:"index"`
	Verdicts []string    `json:"verdicts"`
	Values   [][]float64 `json:"values"`
	// Error is why a strike of this circuit could not be solved; the
	// circuit is then left out of the statistics.
	Error string `json:"error,omitempty"`
}

// measure is one column of a sample: its name and how to read it from a
// run. How its worst case over conditions combines follows from the name
// (worstIsHighest), which is all a spread read back from JSON has.
type measure struct {
	name string
	read func(r *study.Run) float64
}

// worstIsHighest says whether the worst case of measure m is its highest
// value: true for peaks, energies and currents, false for a residual's low
// and the worst margin (measuresOf).
func worstIsHighest(m string) bool {
	return !(m == "worst_margin" || strings.HasSuffix(m, ".residual.min"))
}

// Spreads draws opt.Runs circuits from the tolerances around c, strikes
// each at every level and polarity of the study and summarises the
// results.
//
// Circuit k draws its values from its own generator, PCG seeded by a hash of
// (Seed, k), one draw per tolerance in deck order; so circuit k is the same
// whatever the number of workers, the shard that solves it or the number of
// circuits before it. A uniform tolerance of x % gives the nominal value
// times 1 + x/100·u, u uniform on [−1, 1). A normal one gives 1 + x/100·z/3,
// z standard normal truncated to |z| ≤ 3 by drawing again: x % is three
// standard deviations (the deck language's convention), and a part outside
// its stated tolerance is one a supplier screens out, so none is drawn
// (truncation also keeps a positive parameter positive).
func Spreads(ctx context.Context, c *netlist.Circuit, opt *SpreadOptions) (*SpreadResult, error) {
	if opt == nil {
		opt = &SpreadOptions{}
	}
	if c.Strike() == nil {
		return nil, errors.New("the deck has no strike: add a strike line")
	}
	n := opt.Runs
	if n == 0 {
		n = DefaultRuns
	}
	if n < 0 {
		return nil, fmt.Errorf("spread: %d runs: give a positive number", n)
	}
	tols := opt.Tolerances
	if tols == nil {
		tols = c.Tolerances
	}
	if len(tols) == 0 {
		return nil, errors.New("the deck has no tolerance line: nothing to spread (add for example tolerance C1.value=10%)")
	}
	res := &SpreadResult{Runs: n, Seed: opt.Seed, Variant: netlist.Variant{}, Shard: opt.Shard.Info(n),
		ExactUpTo: opt.ExactUpTo}
	if res.ExactUpTo == 0 {
		res.ExactUpTo = ExactCircuits
	}
	if res.ExactUpTo < 0 {
		return nil, fmt.Errorf("spread: exact percentiles up to %d circuits: give a positive count", res.ExactUpTo)
	}
	for _, t := range tols {
		e := c.Element(t.Element)
		if e == nil || !e.Values.Has(t.Param) {
			return nil, fmt.Errorf("tolerance %s.%s: the circuit has no such number", t.Element, t.Param)
		}
		if t.Dist != "uniform" && t.Dist != "normal" {
			return nil, fmt.Errorf("tolerance %s.%s: distribution %q: use uniform or normal", t.Element, t.Param, t.Dist)
		}
		res.Tolerances = append(res.Tolerances, ToleranceUse{Param: t.Element + "." + t.Param,
			Nominal: e.Values.Num(t.Param), Unit: e.Unit(t.Param), Percent: t.Percent, Dist: t.Dist})
	}
	if len(c.Vary) > 0 {
		res.Notes = append(res.Notes, "the deck's vary lines are left out: a spread draws around one design (choose it with --set)")
	}

	jobs, err := study.Jobs(c, &study.Options{Levels: opt.Study.Levels, Polarities: opt.Study.Polarities,
		Variants: []netlist.Variant{nil}})
	if err != nil {
		return nil, err
	}
	res.Waveform = c.Strike().Waveform.Name
	res.LevelUnit = c.Strike().Waveform.Unit
	for _, j := range jobs {
		res.Conditions = append(res.Conditions, Condition{Level: j.Level, Polarity: j.Polarity})
	}
	ms := measuresOf(c)
	for _, m := range ms {
		res.Measures = append(res.Measures, m.name)
	}

	res.begin()
	mine := opt.Shard.Len(n)
	sopt := *opt.Study.WithContext(ctx)
	sopt.Record = false
	var mu sync.Mutex
	cut := 0 // circuits the context stopped midway: no result
	finished := study.Each(ctx, opt.Study.Workers, mine, opt.Progress, func(_ int, i int) {
		s, err := solveDrawn(c, tols, jobs, ms, opt.Seed, opt.Shard.Item(i), &sopt, res.LevelUnit)
		mu.Lock()
		if study.Interrupted(err) {
			cut++
			mu.Unlock()
			return
		}
		defer mu.Unlock()
		res.add(s)
		if opt.Samples {
			res.Samples = append(res.Samples, s)
		}
	})
	res.Interrupted = finished-cut < mine
	res.finish()
	if res.Shard != nil {
		res.Summary = res.summary
	}
	return res, nil
}

// solveDrawn draws circuit k and strikes it at every condition. The error
// is that of a solve the context stopped (study.Interrupted); any other
// failure is the sample's Error.
func solveDrawn(c *netlist.Circuit, tols []netlist.Tolerance, jobs []study.Job, ms []measure, seed uint64, k int, sopt *study.Options, unit spec.Unit) (Sample, error) {
	s := Sample{Index: k}
	dc, err := c.With(Draw(c, tols, seed, k)...)
	if err != nil {
		s.Error = err.Error()
		return s, nil
	}
	b, err := study.NewBench(dc, nil)
	if err != nil {
		s.Error = err.Error()
		return s, nil
	}
	for _, j := range jobs {
		r, err := b.Solve(j.Level, j.Polarity, sopt)
		if study.Interrupted(err) {
			return s, err
		}
		if err != nil {
			s.Error = fmt.Sprintf("%s %s: %v", spec.FormatSI(j.Level, unit), j.Polarity, err)
			return s, nil
		}
		s.Verdicts = append(s.Verdicts, string(r.Verdict))
		row := make([]float64, len(ms))
		for mi, m := range ms {
			row[mi] = jsonSafe(m.read(r))
		}
		s.Values = append(s.Values, row)
	}
	return s, nil
}

// Draw returns the settings of drawn circuit k: one value per tolerance,
// from the nominal value of c (see Spreads for the distributions).
func Draw(c *netlist.Circuit, tols []netlist.Tolerance, seed uint64, k int) []netlist.Setting {
	a, b := drawSeeds(seed, k)
	rng := rand.New(rand.NewPCG(a, b))
	out := make([]netlist.Setting, 0, len(tols))
	for _, t := range tols {
		nominal := c.Element(t.Element).Values.Num(t.Param)
		var f float64
		switch t.Dist {
		case "normal":
			z := rng.NormFloat64()
			for math.Abs(z) > 3 {
				z = rng.NormFloat64()
			}
			f = 1 + t.Percent/100*z/3
		default:
			f = 1 + t.Percent/100*(2*rng.Float64()-1)
		}
		v := nominal * f
		out = append(out, netlist.Setting{Element: t.Element, Param: t.Param, Num: v,
			Text: strconv.FormatFloat(v, 'g', -1, 64)})
	}
	return out
}

// drawSeeds derives the two PCG seeds of circuit k from the study's seed
// with SplitMix64's finaliser (Steele, Lea and Flood, "Fast splittable
// pseudorandom number generators", OOPSLA 2014), so that neighbouring
// indices and seeds give unrelated streams.
func drawSeeds(seed uint64, k int) (uint64, uint64) {
	a := splitmix(seed ^ splitmix(uint64(k)+0x632be59bd9b4e019))
	return a, splitmix(a ^ 0x9e3779b97f4a7c15)
}

func splitmix(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

// measuresOf lists what a spread records for c: each protected pin's
// residual peak and low, each clamp's energy and peak current, and the worst
// margin when the circuit has limits.
func measuresOf(c *netlist.Circuit) []measure {
	var ms []measure
	for _, e := range c.Elements {
		name := e.Name
		find := func(r *study.Run) *study.ElementResult {
			for j := range r.Elements {
				if r.Elements[j].Name == name {
					return &r.Elements[j]
				}
			}
			return &study.ElementResult{}
		}
		residual := func(r *study.Run) *study.Residual {
			if p := find(r).Residual; p != nil {
				return p
			}
			return &study.Residual{}
		}
		switch e.Kind.Role {
		case spec.ProtectedPin:
			ms = append(ms,
				measure{name + ".residual.peak", func(r *study.Run) float64 { return residual(r).Peak }},
				measure{name + ".residual.min", func(r *study.Run) float64 { return residual(r).Min }})
		case spec.Protector:
			ms = append(ms,
				measure{name + ".energy", func(r *study.Run) float64 { return find(r).Energy }},
				measure{name + ".peak_current", func(r *study.Run) float64 { return find(r).PeakCurrent }})
		}
	}
	if hasLimits(c) {
		ms = append(ms, measure{"worst_margin", func(r *study.Run) float64 {
			if r.Worst == nil {
				return math.NaN()
			}
			return r.Worst.Percent
		}})
	}
	return ms
}

// hasLimits reports whether c rates anything (study.Run.Limits would be
// non-empty).
func hasLimits(c *netlist.Circuit) bool {
	for _, w := range c.Watches {
		if w.HasMax || w.HasMin {
			return true
		}
	}
	for _, e := range c.Elements {
		if e.IsStrike() {
			continue
		}
		for _, r := range e.Kind.Ratings() {
			if e.Values.Has(r.Key) {
				return true
			}
		}
	}
	return false
}

// jsonSafe maps values JSON cannot hold: ±Inf (a margin to a zero limit)
// to the largest float of its sign, as the run JSON does; NaN to 0.
func jsonSafe(v float64) float64 {
	switch {
	case math.IsNaN(v):
		return 0
	case math.IsInf(v, 0):
		return math.Copysign(math.MaxFloat64, v)
	}
	return v
}

// begin sets the counts to zero and starts an empty summary, for circuits
// to be added.
func (r *SpreadResult) begin() {
	r.Solved, r.Unsolved, r.Passed = 0, 0, 0
	r.UnsolvedCircuits = nil
	s := &SpreadSummary{Worst: r.tallies(), Conditions: make([][]*Tally, len(r.Conditions))}
	for ci := range r.Conditions {
		r.Conditions[ci].Passed = 0
		s.Conditions[ci] = r.tallies()
	}
	r.summary = s
}

func (r *SpreadResult) tallies() []*Tally {
	ts := make([]*Tally, len(r.Measures))
	for i := range ts {
		ts[i] = newTally(r.ExactUpTo)
	}
	return ts
}

// add counts circuit s into the statistics.
func (r *SpreadResult) add(s Sample) {
	if s.Error != "" || !r.fits(s) {
		r.Unsolved++
		why := s.Error
		if why == "" {
			why = "its values do not match the spread's conditions and measures"
		}
		r.noteUnsolved(CircuitError{s.Index, why})
		return
	}
	r.Solved++
	pass := true
	for ci, v := range s.Verdicts {
		if v == string(study.Pass) {
			r.Conditions[ci].Passed++
		} else {
			pass = false
		}
	}
	if pass {
		r.Passed++
	}
	for mi, m := range r.Measures {
		higher := worstIsHighest(m)
		w := s.Values[0][mi]
		for ci, row := range s.Values {
			x := row[mi]
			r.summary.Conditions[ci][mi].add(x)
			if (higher && x > w) || (!higher && x < w) {
				w = x
			}
		}
		r.summary.Worst[mi].add(w)
	}
}

// fits reports whether s has a verdict and a row of measures for every
// condition.
func (r *SpreadResult) fits(s Sample) bool {
	if len(s.Verdicts) != len(r.Conditions) || len(s.Values) != len(r.Conditions) {
		return false
	}
	for _, row := range s.Values {
		if len(row) != len(r.Measures) {
			return false
		}
	}
	return true
}

// noteUnsolved keeps e among the unsolved circuits of lowest index.
func (r *SpreadResult) noteUnsolved(e CircuitError) {
	r.UnsolvedCircuits = append(r.UnsolvedCircuits, e)
	sort.Slice(r.UnsolvedCircuits, func(a, b int) bool { return r.UnsolvedCircuits[a].Index < r.UnsolvedCircuits[b].Index })
	if len(r.UnsolvedCircuits) > MaxUnsolvedListed {
		r.UnsolvedCircuits = r.UnsolvedCircuits[:MaxUnsolvedListed]
	}
}

// finish derives the fractions, intervals and percentiles from the counts
// and the summary, and puts the samples in index order.
func (r *SpreadResult) finish() {
	sort.Slice(r.Samples, func(a, b int) bool { return r.Samples[a].Index < r.Samples[b].Index })
	r.PassFraction = fraction(r.Passed, r.Solved)
	r.CI95[0], r.CI95[1] = Wilson95(r.Passed, r.Solved)
	exact := true
	r.Percentiles = map[string]Percentiles{}
	for mi, m := range r.Measures {
		t := r.summary.Worst[mi]
		r.Percentiles[m] = t.Percentiles()
		exact = exact && t.Exact()
	}
	for ci := range r.Conditions {
		cd := &r.Conditions[ci]
		cd.PassFraction = fraction(cd.Passed, r.Solved)
		cd.CI95[0], cd.CI95[1] = Wilson95(cd.Passed, r.Solved)
		cd.Percentiles = map[string]Percentiles{}
		for mi, m := range r.Measures {
			cd.Percentiles[m] = r.summary.Conditions[ci][mi].Percentiles()
		}
	}
	r.PercentileError = 0
	if !exact {
		r.PercentileError = SketchAccuracy
	}
}

// SummariseSamples recomputes every count and statistic of r from its
// Samples: those of a spread run with SpreadOptions.Samples, or JSON
// written before spreads kept a summary.
func SummariseSamples(r *SpreadResult) {
	if r.ExactUpTo == 0 {
		r.ExactUpTo = ExactCircuits
	}
	r.begin()
	for _, s := range r.Samples {
		r.add(s)
	}
	r.finish()
}

func fraction(k, n int) float64 {
	if n == 0 {
		return 0
	}
	return float64(k) / float64(n)
}
