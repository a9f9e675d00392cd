package whatif

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// SensitivityOptions tune a sensitivity study. A nil *SensitivityOptions
// means every default; a zero field means that field's default.
type SensitivityOptions struct {
	// Study chooses the levels and polarities over which the worst margin
	// is taken (nil: the deck's), the window, the engine settings and the
	// workers (zero: every core). Its Variants and Record are ignored.
	Study study.Options
	// Params name the parameters to perturb, "ELEMENT.PARAM". Nil: every
	// design parameter of every element but the strike (a part's value, a
	// clamp's vbr, a trace's inductance: spec.Design), the ones the circuit
	// does not state left out.
	Params []string
	// All adds to the default list the models' constants (saturation
	// currents, emission coefficients) and the operating conditions (a
	// supply's voltage): they are not choices of the protection's design.
	// Ratings are never in the default list: they move the limit, not the
	// circuit.
	All bool
	// Step is the relative perturbation. Zero: 0.10 (±10 %).
	Step float64
	// Limit names the one limit whose margin ranks the parameters, as
	// "ELEMENT PARAM" or "ELEMENT.PARAM" ("U1 vmax", "D1.ipp"): the
	// smallest margin of that limit over every level and polarity. Empty:
	// the worst margin over every limit. A limit such as a clamp's ipp is
	// set almost wholly by the strike current, so while it is the worst the
	// ranking says little about the rest of the design; naming the pin's
	// limit asks what buys margin there.
	Limit string
	// Shard selects the parameters (by index in Params order) this process
	// perturbs. Zero: all.
	Shard study.Shard
	// Progress, when set, is told after each perturbed circuit.
	Progress Progress
}

// ParamEffect is what a ±Step change of one parameter does to the worst
// margin of the study (the smallest percentage margin over every limit,
// level and polarity).
type ParamEffect struct {
	// Index is the parameter's place in the list studied, stable across
	// shards.
	Index   int       `json:"index"`
	Param   string    `json:"param"` // "D1.ls"
	Nominal float64   `json:"nominal"`
	Unit    spec.Unit `json:"unit"` // of Nominal: "H", "Ω", "" for a pure number
	// Minus10 and Plus10 are the worst margins, %, with the parameter at
	// (1 − Step) and (1 + Step) times its nominal value.
	Minus10 float64 `json:"minus10"`
	Plus10  float64 `json:"plus10"`
	// Effect is (Plus10 − Minus10)/2: percentage points of worst margin
	// gained by raising the parameter by Step. Positive: more of it buys
	// margin; negative: less of it does.
	Effect        float64 `json:"effect"`
	LimitingMinus string  `json:"limiting_minus"`
	LimitingPlus  string  `json:"limiting_plus"`
	// Error is why a perturbed circuit could not be built or solved; the
	// parameter then ranks last.
	Error string `json:"error,omitempty"`
}

// Skipped is a parameter left out of the study, with the reason.
type Skipped struct {
	Index  int    `json:"index"`
	Param  string `json:"param"`
	Reason string `json:"reason"`
}

// SensitivityResult ranks parameters by their effect on the worst margin.
type SensitivityResult struct {
	// Baseline is the worst margin of the unperturbed circuit, %, at
	// BaselineLimiting ("U1 vmax at 8 kV pos").
	Baseline float64 `json:"baseline_margin"`
	// Variant is the design studied: the command line's settings over the
	// deck ({} for the deck as written). The caller sets it.
	Variant          netlist.Variant `json:"variant"`
	BaselineLimiting string          `json:"baseline_limiting"`
	// Limit is the limit that ranks, as asked (SensitivityOptions.Limit);
	// empty for the worst over every limit.
	Limit       string           `json:"limit,omitempty"`
	Step        float64          `json:"step"`
	Parameters  []ParamEffect    `json:"parameters"` // by |Effect|, largest first
	Skipped     []Skipped        `json:"skipped"`
	Total       int              `json:"total"` // parameters of the whole study
	Notes       []string         `json:"notes,omitempty"`
	Shard       *study.ShardInfo `json:"shard,omitempty"`
	Interrupted bool             `json:"interrupted,omitempty"`
}

// Sensitivities perturbs each parameter of c by ±Step (one at a time, the
// others at their nominal values), solves the study for each perturbed
// circuit and ranks the parameters by |Effect|.
func Sensitivities(ctx context.Context, c *netlist.Circuit, opt *SensitivityOptions) (*SensitivityResult, error) {
	if opt == nil {
		opt = &SensitivityOptions{}
	}
	step := opt.Step
	if step == 0 {
		step = 0.10
	}
	if !(step > 0 && step < 1) {
		return nil, fmt.Errorf("sensitivity: step %g: give a fraction between 0 and 1", step)
	}
	if c.Strike() == nil {
		return nil, errors.New("the deck has no strike: add a strike line")
	}
	if !hasLimits(c) {
		return nil, errors.New("the deck gives no ratings, so there is no margin to rank parameters by")
	}
	params, skipped, err := paramList(c, opt.Params, opt.All)
	if err != nil {
		return nil, err
	}
	jobs, err := study.Jobs(c, &study.Options{Levels: opt.Study.Levels, Polarities: opt.Study.Polarities,
		Variants: []netlist.Variant{nil}})
	if err != nil {
		return nil, err
	}
	res := &SensitivityResult{Variant: netlist.Variant{}, Step: step, Limit: opt.Limit, Total: len(params) + len(skipped), Parameters: []ParamEffect{}, Skipped: []Skipped{}}
	res.Shard = opt.Shard.Info(res.Total)
	if len(c.Vary) > 0 {
		res.Notes = append(res.Notes, "the deck's vary lines are left out: a sensitivity perturbs one design (choose it with --set)")
	}
	for _, s := range skipped {
		if opt.Shard.Has(s.Index) {
			res.Skipped = append(res.Skipped, s)
		}
	}
	sopt := *opt.Study.WithContext(ctx)
	sopt.Record = false
	rk := &ranker{jobs: jobs, opt: &sopt, limit: limitName(opt.Limit), asked: opt.Limit, unit: c.Strike().Waveform.Unit}
	worstOf := rk.worstOf
	base, where, err := worstOf(c)
	if err != nil {
		return nil, fmt.Errorf("the deck as written: %w", err)
	}
	res.Baseline, res.BaselineLimiting = base, where

	var mine []param
	for _, p := range params {
		if opt.Shard.Has(p.index) {
			mine = append(mine, p)
		}
	}
	halves := make([]half, 2*len(mine))
	finished := study.ForEach(ctx, opt.Study.Workers, 2*len(mine), opt.Progress, func(_ int, i int) {
		p := mine[i/2]
		f := 1 - step
		if i%2 == 1 {
			f = 1 + step
		}
		v := p.nominal * f
		set := netlist.Setting{Element: p.elem, Param: p.param, Num: v, Text: strconv.FormatFloat(v, 'g', -1, 64)}
		x, err := c.With(set)
		if err != nil {
			halves[i] = half{err: err}
			return
		}
		m, w, err := worstOf(x)
		halves[i] = half{m, w, err}
	})
	for k, p := range mine {
		lo, hi := halves[2*k], halves[2*k+1]
		if !finished[2*k] || !finished[2*k+1] || study.Interrupted(lo.err) || study.Interrupted(hi.err) {
			res.Interrupted = true
			continue
		}
		res.add(c, p, lo, hi, step)
	}
	SortEffects(res.Parameters)
	sort.Slice(res.Skipped, func(a, b int) bool { return res.Skipped[a].Index < res.Skipped[b].Index })
	return res, nil
}

// half is the worst margin with a parameter moved one way, and where.
type half struct {
	margin float64
	where  string
	err    error
}

// add books parameter p's two halves: as an effect, or as skipped when
// neither moved the margin.
func (res *SensitivityResult) add(c *netlist.Circuit, p param, lo, hi half, step float64) {
	if lo.err == nil && hi.err == nil && math.Abs(hi.margin-lo.margin) < 2*stillEffect {
		res.Skipped = append(res.Skipped, Skipped{p.index, p.elem + "." + p.param,
			fmt.Sprintf("±%g %% moves no margin", 100*step)})
		return
	}
	e := ParamEffect{Index: p.index, Param: p.elem + "." + p.param, Nominal: p.nominal, Unit: c.Element(p.elem).Unit(p.param),
		Minus10: lo.margin, Plus10: hi.margin, LimitingMinus: lo.where, LimitingPlus: hi.where}
	switch {
	case lo.err != nil:
		e.Error = fmt.Sprintf("at −%g %%: %v", 100*step, lo.err)
	case hi.err != nil:
		e.Error = fmt.Sprintf("at +%g %%: %v", 100*step, hi.err)
	default:
		e.Effect = (hi.margin - lo.margin) / 2
	}
	res.Parameters = append(res.Parameters, e)
}

// ranker finds the margin a sensitivity ranks by on a circuit: the worst
// over the jobs, of every limit or of the one named.
type ranker struct {
	jobs         []study.Job
	opt          *study.Options
	limit, asked string // the limit as "ELEMENT PARAM", and as the user gave it
	unit         spec.Unit
}

// marginOf is the margin that ranks in a run: its worst, or the named
// limit's.
func (k *ranker) marginOf(r *study.Run) *study.Limit {
	if k.limit == "" {
		return r.Worst
	}
	for i := range r.Limits {
		if r.Limits[i].Name() == k.limit {
			return &r.Limits[i]
		}
	}
	return nil
}

// worstOf solves every job on circuit x and returns the smallest
// percentage margin with its place.
func (k *ranker) worstOf(x *netlist.Circuit) (float64, string, error) {
	b, err := study.NewBench(x, nil)
	if err != nil {
		return 0, "", err
	}
	best, where := math.Inf(1), ""
	for _, j := range k.jobs {
		r, err := b.Solve(j.Level, j.Polarity, k.opt)
		if err != nil {
			return 0, "", fmt.Errorf("%s %s: %w", spec.FormatSI(j.Level, k.unit), j.Polarity, err)
		}
		if m := k.marginOf(r); m != nil && (where == "" || m.Percent < best) {
			best = m.Percent
			where = fmt.Sprintf("%s at %s %s", m.Name(), spec.FormatSI(j.Level, r.LevelUnit), j.Polarity)
		}
	}
	if where == "" && k.limit != "" {
		return 0, "", fmt.Errorf("no limit %q in the deck (name one as ELEMENT PARAM, e.g. \"U1 vmax\")", k.asked)
	}
	return jsonSafe(best), where, nil
}

// limitName reads the name of a limit as "ELEMENT PARAM" or
// "ELEMENT.PARAM" (split at the last dot, as element names may hold dots)
// and returns the first form.
func limitName(s string) string {
	s = strings.TrimSpace(s)
	if s == "" || strings.Contains(s, " ") {
		return s
	}
	if elem, param, ok := netlist.SplitTarget(s); ok {
		return elem + " " + param
	}
	return s
}

// SortEffects orders parameters by |Effect|, largest first, those with an
// error last, ties in study order.
func SortEffects(ps []ParamEffect) {
	sort.SliceStable(ps, func(a, b int) bool {
		ea, eb := ps[a].Error != "", ps[b].Error != ""
		if ea != eb {
			return !ea
		}
		ma, mb := math.Abs(ps[a].Effect), math.Abs(ps[b].Effect)
		if ma != mb {
			return ma > mb
		}
		return ps[a].Index < ps[b].Index
	})
}

// param is one parameter to perturb.
type param struct {
	index       int
	elem, param string
	nominal     float64
}

// stillEffect is an effect, in points of margin, that a perturbation does
// not tell from none: the engine's tolerances move a margin by about that
// much between two solves [practice: measured on the demo decks].
const stillEffect = 5e-4

// paramList is the parameters of a sensitivity study, in deck order then
// each kind's parameter order, with the ones that cannot be perturbed: the
// named ones, or every design parameter (with all, every parameter but the
// ratings).
func paramList(c *netlist.Circuit, named []string, all bool) ([]param, []Skipped, error) {
	var ps []param
	var skipped []Skipped
	add := func(e *netlist.Element, key string) {
		i := len(ps) + len(skipped)
		v, ok := e.Values.Lookup(key)
		switch {
		case !ok:
			skipped = append(skipped, Skipped{i, e.Name + "." + key, "not set (an optional parameter without a default)"})
		case v == 0:
			skipped = append(skipped, Skipped{i, e.Name + "." + key, "zero: ±10 % of nothing is still nothing"})
		default:
			ps = append(ps, param{i, e.Name, key, v})
		}
	}
	if named != nil {
		var errs []string
		for _, n := range named {
			en, key, ok := netlist.SplitTarget(n)
			e := c.Element(en)
			switch {
			case !ok:
				errs = append(errs, fmt.Sprintf("parameter %q: write ELEMENT.PARAM, for example D1.ls", n))
			case e == nil:
				errs = append(errs, fmt.Sprintf("parameter %s: no element %s in the deck", n, en))
			case e.IsStrike():
				errs = append(errs, fmt.Sprintf("parameter %s: the strike is the test, not the design", n))
			case e.Kind.Param(key) == nil:
				errs = append(errs, fmt.Sprintf("parameter %s: a %s has no numeric parameter %s (it has %s)", n, e.Kind.Name, key,
					strings.Join(e.Kind.Numeric(), ", ")))
			default:
				add(e, key)
			}
		}
		if len(errs) > 0 {
			return nil, nil, fmt.Errorf("%s", strings.Join(errs, "; "))
		}
		return ps, skipped, nil
	}
	for _, e := range c.Elements {
		if e.IsStrike() {
			continue
		}
		for _, p := range e.Kind.Params {
			if p.Class == spec.Rating || (p.Class != spec.Design && !all) || !e.Values.Has(p.Key) {
				continue // a rating moves the limit, not the circuit; an absent optional has nothing to perturb
			}
			add(e, p.Key)
		}
	}
	return ps, skipped, nil
}
