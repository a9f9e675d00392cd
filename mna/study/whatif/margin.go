package whatif

import (
	"cmp"
	"context"
	"fmt"
	"math"
	"slices"
	"strings"
	"sync"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// MarginOptions tune a margin search. A nil *MarginOptions means every
// default; a zero field means that field's default.
type MarginOptions struct {
	// Study chooses the variants (Variants; nil: the deck's), the
	// polarities (nil: the deck's), the window, the engine settings and the
	// workers (zero: every core). Its Levels, when set, replace the deck's
	// levels in choosing the default range.
	Study study.Options
	// Max is the top of the searched range, in the waveform's unit (V for
	// discharges). Zero: twice the highest of the deck's levels.
	Max float64
	// Resolution is the step of the search: levels are multiples of it,
	// and the search ends when the highest pass and the first failure are
	// one step apart. Zero: 100 V (0.1 kV) for waveforms whose level is in
	// volts, Max/200 otherwise.
	Resolution float64
	// Scan is how many evenly spaced levels up to Max are solved before
	// the bisection; they bracket the first failure and check that the
	// verdict is monotonic in level. Zero: 16.
	Scan int
	// Shard selects the searches (one per variant and polarity, in plan
	// order) this process runs. Zero: all.
	Shard study.Shard
	// Verify solves the two levels around each failure (the highest pass
	// and the first fail) again at a tenth of the accuracy and says
	// whether their verdicts hold (Margin.Check).
	Verify bool
	// Progress, when set, is told after each solve, against an estimate of
	// the solves of the whole search (the scan and a full bisection of each
	// search; a search that fails nowhere needs no bisection and finishes
	// early, and the last call then says done = total).
	Progress Progress
}

// Margin is the result of one search, one variant and one polarity. Its
// JSON is the "margins" entry of OUTPUT.md, with additions.
type Margin struct {
	// Index is the search's place in plan order (variant-major, then
	// polarity), stable across shards.
	Index     int             `json:"index"`
	Variant   netlist.Variant `json:"variant"`
	Polarity  string          `json:"polarity"`
	LevelUnit spec.Unit       `json:"level_unit"`
	// MaxPass is the highest level found passing with every level below it
	// that was solved passing too; null when even the lowest level, one
	// Resolution, fails.
	MaxPass *float64 `json:"max_pass_level"`
	// FirstFail is the lowest failing level, one Resolution above MaxPass;
	// null when the whole range passes.
	FirstFail *float64 `json:"first_fail_level"`
	// Limiting names the limit that fails first ("U1 vmax"); when the
	// whole range passes, the limit with the least margin at its top.
	Limiting string `json:"limiting"`
	// Monotonic is false when a level above the first failure passes
	// again: then "the highest passing level" is not one number, and
	// PassesAbove lists the levels that passed above the failure.
	Monotonic   bool      `json:"monotonic"`
	PassesAbove []float64 `json:"passes_above_failure,omitempty"`
	// Note says in a sentence what the numbers mean when it is not plain.
	Note string `json:"note,omitempty"`
	// Solves is the number of transient solutions the search took.
	Solves int `json:"solves"`
	// Error is why the search stopped: a solve failure at one level.
	Error string `json:"error,omitempty"`
	// Check is, with MarginOptions.Verify, the bracket solved again at a
	// tenth of the accuracy; nil otherwise.
	Check *MarginCheck `json:"check,omitempty"`
	// Curve is every level the search solved with its worst margin, in
	// rising level: what "margin against level" draws. It stays out of
	// the JSON so that the document keeps the contract's shape; a merge
	// of shards does not need it.
	Curve []CurvePoint `json:"-"`
}

// MarginCheck is a margin's bracket solved again at a tenfold tighter
// accuracy: when a verdict flips, the failure level is within the
// solver's error and the margin is one resolution step less certain.
type MarginCheck struct {
	Tighter float64 `json:"tighter"` // the accuracy of the check
	// PassHolds and FailHolds: the highest pass still passes, the first
	// fail still fails (true when there is no such level).
	PassHolds bool `json:"pass_holds"`
	FailHolds bool `json:"fail_holds"`
	// Error says why a check solve failed.
	Error string `json:"error,omitempty"`
}

// checkBracket solves m's highest pass and first fail at accuracy acc/10
// with solve and says whether their verdicts hold.
func checkBracket(m *Margin, acc float64, solve func(level float64) (outcome, error)) error {
	ck := &MarginCheck{Tighter: acc / 10, PassHolds: true, FailHolds: true}
	m.Check = ck
	for _, lv := range []struct {
		level *float64
		pass  bool
	}{{m.MaxPass, true}, {m.FirstFail, false}} {
		if lv.level == nil {
			continue
		}
		o, err := solve(*lv.level)
		if err != nil {
			ck.Error = fmt.Sprintf("%s: %v", spec.FormatSI(*lv.level, m.LevelUnit), err)
			return err
		}
		if o.pass != lv.pass {
			if lv.pass {
				ck.PassHolds = false
			} else {
				ck.FailHolds = false
			}
		}
	}
	return nil
}

// CurvePoint is one solve of a search.
type CurvePoint struct {
	Level float64 // in the waveform's unit
	// Percent is the worst margin, percent of its limit
	// (study.Limit.Percent): not negative when the level passes, ±Inf for
	// a limit of zero, NaN when the deck sets no limit.
	Percent float64
	Pass    bool
}

// MarginResult is a margin search over the variants and polarities of a
// study.
type MarginResult struct {
	Waveform   string    `json:"waveform"`
	LevelUnit  spec.Unit `json:"level_unit"`
	Max        float64   `json:"range_max"` // top of the searched range
	Resolution float64   `json:"resolution"`
	// Margins are the shard's searches, in plan order.
	Margins []Margin `json:"margins"`
	// Total is the number of searches of the whole study.
	Total int              `json:"total"`
	Shard *study.ShardInfo `json:"shard,omitempty"`
	// Interrupted says that the context was cancelled: Margins holds the
	// searches that finished.
	Interrupted bool `json:"interrupted,omitempty"`
}

// setRange sets the searched range and its resolution from opt (or from
// the plan's levels) and returns the number of steps in it.
func (res *MarginResult) setRange(opt *MarginOptions, levels []float64) (int, error) {
	unit := res.LevelUnit
	res.Max, res.Resolution = opt.Max, opt.Resolution
	if res.Max == 0 {
		if len(levels) == 0 {
			return 0, fmt.Errorf("no level to choose the range from: give the top of the range")
		}
		res.Max = 2 * slices.Max(levels)
	}
	if res.Resolution == 0 {
		res.Resolution = res.Max / 200
		if unit == "V" {
			res.Resolution = 100
		}
	}
	if !(res.Max > 0) || !(res.Resolution > 0) || math.IsInf(res.Max, 0) {
		return 0, fmt.Errorf("margin search: range top %g and resolution %g must be positive", res.Max, res.Resolution)
	}
	steps := int(math.Floor(res.Max/res.Resolution + 1e-9))
	if steps < 1 {
		return 0, fmt.Errorf("margin search: the range top %s is below the resolution %s",
			spec.FormatSI(res.Max, unit), spec.FormatSI(res.Resolution, unit))
	}
	if steps > 1e7 {
		return 0, fmt.Errorf("margin search: %d steps of %s up to %s is too fine; use a coarser resolution",
			steps, spec.FormatSI(res.Resolution, unit), spec.FormatSI(res.Max, unit))
	}
	return steps, nil
}

// DefaultScan is the number of levels of the coarse scan.
const DefaultScan = 16

// Margins searches, for every variant and polarity of the study of c, the
// highest level that still passes.
//
// Levels are the multiples m·Resolution, m = 1…M, M·Resolution ≤ Max. The
// search solves Scan evenly spaced multiples first (always M itself), takes
// the lowest failing one and the scan level below it as a bracket and
// bisects it until the two are one step apart. Bisection is only right when
// the verdict changes once, from PASS to FAIL, as the level rises; the scan
// is the check of that: a scan level above the first failure that passes
// again marks the search non-monotonic (a clamp that only turns on hard
// enough at high levels can do that to a residual limit).
func Margins(ctx context.Context, c *netlist.Circuit, opt *MarginOptions) (*MarginResult, error) {
	if opt == nil {
		opt = &MarginOptions{}
	}
	plan, err := study.PlanOf(c, &opt.Study)
	if err != nil {
		return nil, err
	}
	pols, variants := plan.Polarities, plan.Variants
	unit := plan.Waveform.Unit
	res := &MarginResult{Waveform: plan.Waveform.Name, LevelUnit: unit, Margins: []Margin{}}
	steps, err := res.setRange(opt, plan.Levels)
	if err != nil {
		return nil, err
	}
	scan := opt.Scan
	if scan <= 0 {
		scan = DefaultScan
	}

	mine, all := shardSearches(len(variants), pols, opt.Shard)
	res.Total = all
	res.Shard = opt.Shard.Info(all)
	out := make([]Margin, len(mine))
	for i, sr := range mine {
		out[i] = Margin{Index: sr.index, Variant: variants[sr.variant], Polarity: sr.polarity, LevelUnit: unit}
	}
	sopt := *opt.Study.WithContext(ctx)
	sopt.Record = false
	grid := scanGrid(steps, scan)
	// The scans are the largest pool; the bisections use no more workers.
	workers := study.PoolSize(opt.Study.Workers, len(mine)*len(grid))
	total := (len(grid) + bisections(steps, scan)) * len(mine)
	if opt.Verify {
		total += 2 * len(mine)
	}
	counter := &progressCounter{report: opt.Progress, total: total}
	compileErr := compileErrors(c, variants, mine)
	benches := study.NewBenches(c, workers)
	tight := study.Tighter(c, &sopt)
	solverWith := func(w int, sr search, o *study.Options) func(float64) (outcome, error) {
		return func(level float64) (outcome, error) {
			defer counter.tick()
			b, err := benches.Get(w, sr.variant, variants[sr.variant])
			if err != nil {
				return outcome{}, err
			}
			r, err := b.Solve(level, sr.polarity, o)
			if err != nil {
				return outcome{}, err
			}
			return outcome{pass: r.Verdict == study.Pass, worst: r.Worst}, nil
		}
	}
	solver := func(w int, sr search) func(float64) (outcome, error) { return solverWith(w, sr, &sopt) }

	// The scans of every search at once, so that one search alone still
	// keeps every worker busy; then each search's bisection.
	scans := make([]scanned, len(mine)*len(grid))
	scanDone := study.ForEach(ctx, workers, len(scans), nil, func(w, it int) {
		sr := mine[it/len(grid)]
		if compileErr[sr.variant] != nil {
			return
		}
		o, err := solver(w, sr)(float64(grid[it%len(grid)]) * res.Resolution)
		scans[it] = scanned{o, err}
	})
	complete := make([]bool, len(mine))
	finished := study.ForEach(ctx, workers, len(mine), nil, func(w, i int) {
		sr := mine[i]
		if err := compileErr[sr.variant]; err != nil {
			out[i].Error = err.Error()
			complete[i] = true
			return
		}
		for it := i * len(grid); it < (i+1)*len(grid); it++ {
			if !scanDone[it] {
				return
			}
		}
		complete[i] = finishSearch(ctx, &out[i], grid, scans[i*len(grid):(i+1)*len(grid)], res.Resolution, solver(w, sr))
		if complete[i] && opt.Verify && out[i].Error == "" {
			err := checkBracket(&out[i], study.Accuracy(c, &sopt), solverWith(w, sr, tight))
			complete[i] = !study.Interrupted(err)
		}
	})
	if opt.Progress != nil && !ctxDone(ctx) {
		opt.Progress(total, total)
	}
	for i := range mine {
		if finished[i] && complete[i] {
			res.Margins = append(res.Margins, out[i])
		} else {
			res.Interrupted = true
		}
	}
	return res, nil
}

func ctxDone(ctx context.Context) bool { return ctx.Err() != nil }

// search is one margin search: a variant at a polarity, in plan order.
type search struct {
	index, variant int
	polarity       string
}

// shardSearches lists the searches of the shard (variant-major, then
// polarity) and counts those of the whole study.
func shardSearches(variants int, pols []string, shard study.Shard) (mine []search, all int) {
	for vi := range variants {
		for _, p := range pols {
			if shard.Has(all) {
				mine = append(mine, search{all, vi, p})
			}
			all++
		}
	}
	return mine, all
}

// compileErrors compiles each variant of the searches once: a variant that
// does not compile fails its searches before any solve.
func compileErrors(c *netlist.Circuit, variants []netlist.Variant, mine []search) map[int]error {
	errs := map[int]error{}
	for _, sr := range mine {
		if _, done := errs[sr.variant]; !done {
			_, err := study.NewBench(c, variants[sr.variant])
			errs[sr.variant] = err
		}
	}
	return errs
}

// progressCounter tells report (when set) of each solve against an
// estimated total, never saying done before the end.
type progressCounter struct {
	report        Progress
	mu            sync.Mutex
	solved, total int
}

func (p *progressCounter) tick() {
	if p.report == nil {
		return
	}
	p.mu.Lock()
	p.solved++
	p.report(min(p.solved, p.total-1), p.total)
	p.mu.Unlock()
}

// outcome is what a search needs of one solve.
type outcome struct {
	pass  bool
	worst *study.Limit
}

// scanned is one solve of the scan.
type scanned struct {
	o   outcome
	err error
}

// finishSearch reads the scan, checks that the verdict is monotonic on it,
// and bisects the bracket of the first failure. It returns false when ctx
// stopped it before the end.
func finishSearch(ctx context.Context, m *Margin, grid []int, scan []scanned, step float64, solveAt func(level float64) (outcome, error)) bool {
	level := func(k int) float64 { return float64(k) * step }
	fail := func(k int, err error) {
		m.Error = fmt.Sprintf("%s %s: %v", spec.FormatSI(level(k), m.LevelUnit), m.Polarity, err)
	}
	m.Solves = len(grid)
	m.Curve = m.Curve[:0]
	record := func(k int, o outcome) {
		p := CurvePoint{Level: level(k), Percent: math.NaN(), Pass: o.pass}
		if o.worst != nil {
			p.Percent = o.worst.Percent
		}
		m.Curve = append(m.Curve, p)
	}
	// The bisection only ever solves levels strictly inside the bracket,
	// none of them a scan level, so sorting once at the end is enough.
	defer func() {
		slices.SortFunc(m.Curve, func(a, b CurvePoint) int { return cmp.Compare(a.Level, b.Level) })
	}()
	results := make([]outcome, len(grid))
	first := -1
	for i, sc := range scan {
		if sc.err == nil {
			record(grid[i], sc.o)
		}
	}
	for i, sc := range scan {
		if study.Interrupted(sc.err) {
			return false
		}
		if sc.err != nil {
			fail(grid[i], sc.err)
			return true
		}
		results[i] = sc.o
		if !sc.o.pass && first < 0 {
			first = i
		}
	}
	m.Monotonic = true
	if first < 0 {
		top := level(grid[len(grid)-1])
		m.MaxPass = &top
		if w := results[len(results)-1].worst; w != nil {
			m.Limiting = w.Name()
		}
		m.Note = fmt.Sprintf("passes up to the top of the searched range, %s: raise the range to find the failure",
			spec.FormatSI(top, m.LevelUnit))
		return true
	}
	for i := first + 1; i < len(grid); i++ {
		if results[i].pass {
			m.Monotonic = false
			m.PassesAbove = append(m.PassesAbove, level(grid[i]))
		}
	}

	// Bisection between the scan level below the first failure (0: no
	// strike, which passes) and the first failure.
	lo, hi := 0, grid[first]
	if first > 0 {
		lo = grid[first-1]
	}
	failing := results[first]
	for hi-lo > 1 {
		if ctx.Err() != nil {
			return false
		}
		mid := lo + (hi-lo)/2
		m.Solves++
		o, err := solveAt(level(mid))
		if study.Interrupted(err) {
			return false
		}
		if err != nil {
			fail(mid, err)
			return true
		}
		record(mid, o)
		if o.pass {
			lo = mid
		} else {
			hi, failing = mid, o
		}
	}
	if lo > 0 {
		v := level(lo)
		m.MaxPass = &v
	}
	ff := level(hi)
	m.FirstFail = &ff
	if failing.worst != nil {
		m.Limiting = failing.worst.Name()
	}
	switch {
	case !m.Monotonic:
		var s []string
		for _, l := range m.PassesAbove {
			s = append(s, spec.FormatSI(l, m.LevelUnit))
		}
		m.Note = fmt.Sprintf("the verdict is not monotonic in level: it fails at %s but passes again at %s; the highest level with every lower level passing is reported",
			spec.FormatSI(ff, m.LevelUnit), strings.Join(s, ", "))
	case lo == 0:
		m.Note = fmt.Sprintf("fails even at the lowest level searched, %s", spec.FormatSI(ff, m.LevelUnit))
	}
	return true
}

// scanGrid is the scan's multiples ⌈k·steps/scan⌉, k = 1…scan, without
// repeats; the last is steps itself.
func scanGrid(steps, scan int) []int {
	var grid []int
	for k := 1; k <= scan; k++ {
		g := (k*steps + scan - 1) / scan
		if len(grid) == 0 || g > grid[len(grid)-1] {
			grid = append(grid, g)
		}
	}
	return grid
}

// bisections is the number of solves that bisect the widest bracket of the
// scan down to one step.
func bisections(steps, scan int) int {
	grid := scanGrid(steps, scan)
	widest, prev := 0, 0
	for _, g := range grid {
		widest, prev = max(widest, g-prev), g
	}
	n := 0
	for w := widest; w > 1; w = (w + 1) / 2 {
		n++
	}
	return n
}
