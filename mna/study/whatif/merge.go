package whatif

import (
	"errors"
	"fmt"
	"sort"
	"strings"
	"zapnet/mna/study"
)

// MergeMargins joins the shards of one margin search into the result the
// unsharded search gives.
func MergeMargins(parts []*MarginResult) (*MarginResult, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("nothing to merge")
	}
	out := *parts[0]
	out.Shard, out.Interrupted, out.Margins = nil, false, []Margin{}
	var infos []*study.ShardInfo
	var idx []int
	for _, p := range parts {
		if p.Waveform != out.Waveform || p.Max != out.Max || p.Resolution != out.Resolution || p.Total != out.Total {
			return nil, fmt.Errorf("the margin searches differ in waveform, range or resolution: they are not shards of one search")
		}
		infos = append(infos, p.Shard)
		for _, m := range p.Margins {
			out.Margins = append(out.Margins, m)
			idx = append(idx, m.Index)
		}
	}
	if err := study.Joined(infos, idx, out.Total, "searches"); err != nil {
		return nil, err
	}
	sort.Slice(out.Margins, func(a, b int) bool { return out.Margins[a].Index < out.Margins[b].Index })
	return &out, nil
}

// MergeSensitivities joins the shards of one sensitivity study.
func MergeSensitivities(parts []*SensitivityResult) (*SensitivityResult, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("nothing to merge")
	}
	out := *parts[0]
	out.Shard, out.Interrupted = nil, false
	out.Parameters, out.Skipped = []ParamEffect{}, []Skipped{}
	var infos []*study.ShardInfo
	var idx []int
	for _, p := range parts {
		if p.Baseline != out.Baseline || p.Step != out.Step || p.Total != out.Total || fmt.Sprint(p.Variant) != fmt.Sprint(out.Variant) {
			return nil, fmt.Errorf("the sensitivity studies differ in baseline, step or parameters: they are not shards of one study")
		}
		infos = append(infos, p.Shard)
		for _, e := range p.Parameters {
			out.Parameters = append(out.Parameters, e)
			idx = append(idx, e.Index)
		}
		for _, s := range p.Skipped {
			out.Skipped = append(out.Skipped, s)
			idx = append(idx, s.Index)
		}
	}
	if err := study.Joined(infos, idx, out.Total, "parameters"); err != nil {
		return nil, err
	}
	SortEffects(out.Parameters)
	sort.Slice(out.Skipped, func(a, b int) bool { return out.Skipped[a].Index < out.Skipped[b].Index })
	return &out, nil
}

// MergeSpreads joins the shards of one spread: the counts add and the
// shards' summaries merge (SpreadSummary: values while few, sketches
// above, whose buckets add), so the result equals the unsharded spread's
// bit for bit. The samples are joined too when every shard kept them.
// Shards written before spreads kept a summary are summarised from their
// samples.
func MergeSpreads(parts []*SpreadResult) (*SpreadResult, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("nothing to merge")
	}
	if len(parts) == 1 && parts[0].Shard == nil && !parts[0].Interrupted {
		// A whole spread is its own merge.
		out := *parts[0]
		return &out, nil
	}
	out := *parts[0]
	if out.ExactUpTo == 0 {
		out.ExactUpTo = ExactCircuits
	}
	out.Shard, out.Interrupted, out.Summary, out.Samples = nil, false, nil, nil
	out.Conditions = append([]Condition(nil), parts[0].Conditions...)
	out.begin()
	sig := spreadSignature(&out)
	var infos []*study.ShardInfo
	circuits, withSamples := 0, 0
	var samples []Sample
	for _, part := range parts {
		p, err := mergeable(part)
		if err != nil {
			return nil, err
		}
		if spreadSignature(p) != sig {
			return nil, fmt.Errorf("the spreads differ in runs, seed, tolerances, levels, measurements or exact count: they are not shards of one spread")
		}
		name, want := "the whole spread", p.Runs
		if p.Shard != nil {
			name = fmt.Sprintf("shard %d/%d", p.Shard.Index, p.Shard.Count)
			want = study.Shard{Index: p.Shard.Index, Count: p.Shard.Count}.Len(p.Runs)
		}
		got := p.Solved + p.Unsolved
		if p.Interrupted || got != want {
			return nil, fmt.Errorf("%s holds %d of its %d circuits (interrupted?): run it again and merge", name, got, want)
		}
		infos = append(infos, p.Shard)
		circuits += got
		out.Solved += p.Solved
		out.Unsolved += p.Unsolved
		out.Passed += p.Passed
		for ci := range out.Conditions {
			out.Conditions[ci].Passed += p.Conditions[ci].Passed
		}
		if err := out.summary.merge(p.summary); err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		for _, e := range p.UnsolvedCircuits {
			out.noteUnsolved(e)
		}
		if len(p.Samples) == got {
			withSamples++
			samples = append(samples, p.Samples...)
		}
	}
	if err := study.AllShards(infos, out.Runs); err != nil {
		return nil, err
	}
	if circuits != out.Runs {
		return nil, fmt.Errorf("the shards hold %d circuits, the spread %d: give each shard once", circuits, out.Runs)
	}
	switch withSamples {
	case len(parts):
		out.Samples = samples
	case 0:
	default:
		out.Notes = append(append([]string(nil), out.Notes...),
			"samples left out: not every shard was run with them")
	}
	out.finish()
	return &out, nil
}

// mergeable returns p with its summary in memory, read from its JSON
// (Summary) or, for JSON written before spreads kept one, recomputed from
// its samples; and checks that the summary fits p's measures and counts.
func mergeable(p *SpreadResult) (*SpreadResult, error) {
	q := *p
	if q.ExactUpTo == 0 {
		q.ExactUpTo = ExactCircuits
	}
	switch {
	case q.summary != nil:
	case q.Summary != nil:
		q.summary = q.Summary
	case len(q.Samples) > 0:
		q.Conditions = append([]Condition(nil), p.Conditions...)
		SummariseSamples(&q)
		return &q, nil
	default:
		return nil, errors.New("a spread without its summary or samples cannot be merged: run the shards with --shard, which writes the summary")
	}
	s := q.summary
	ok := len(s.Worst) == len(q.Measures) && len(s.Conditions) == len(q.Conditions)
	for _, ts := range append([][]*Tally{s.Worst}, s.Conditions...) {
		ok = ok && len(ts) == len(q.Measures)
		for _, t := range ts {
			ok = ok && t != nil && t.N() == q.Solved && (t.Exact() == (t.N() <= q.ExactUpTo))
		}
	}
	if !ok {
		return nil, errors.New("a spread's summary does not match its measures and counts: the file is damaged")
	}
	return &q, nil
}

// merge adds the tallies of o to s's (of the same shape, as mergeable
// checks).
func (s *SpreadSummary) merge(o *SpreadSummary) error {
	pairs := [][2][]*Tally{{s.Worst, o.Worst}}
	for ci := range s.Conditions {
		pairs = append(pairs, [2][]*Tally{s.Conditions[ci], o.Conditions[ci]})
	}
	for _, p := range pairs {
		for i, t := range p[0] {
			if err := t.merge(p[1][i]); err != nil {
				return err
			}
		}
	}
	return nil
}

// spreadSignature is what the shards of one spread share.
func spreadSignature(r *SpreadResult) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d|%d|%s|%s|%q|%v|%d|", r.Runs, r.Seed, r.Waveform, r.LevelUnit, r.Measures, r.Variant, r.ExactUpTo)
	for _, t := range r.Tolerances {
		fmt.Fprintf(&b, "%s %v %v %s;", t.Param, t.Nominal, t.Percent, t.Dist)
	}
	for _, c := range r.Conditions {
		fmt.Fprintf(&b, "%v %s;", c.Level, c.Polarity)
	}
	return b.String()
}
