package whatif

import (
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

// MergeSpreads joins the shards of one spread and recomputes every
// statistic from the joined samples, so the result equals the unsharded
// spread's bit for bit.
func MergeSpreads(parts []*SpreadResult) (*SpreadResult, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("nothing to merge")
	}
	out := *parts[0]
	out.Shard, out.Interrupted, out.Samples = nil, false, []Sample{}
	out.Conditions = append([]Condition(nil), parts[0].Conditions...)
	sig := spreadSignature(&out)
	var infos []*study.ShardInfo
	var idx []int
	for _, p := range parts {
		if spreadSignature(p) != sig {
			return nil, fmt.Errorf("the spreads differ in runs, seed, tolerances, levels or measurements: they are not shards of one spread")
		}
		infos = append(infos, p.Shard)
		for _, s := range p.Samples {
			out.Samples = append(out.Samples, s)
			idx = append(idx, s.Index)
		}
	}
	if err := study.Joined(infos, idx, out.Runs, "circuits"); err != nil {
		return nil, err
	}
	out.summarise()
	return &out, nil
}

// spreadSignature is what the shards of one spread share.
func spreadSignature(r *SpreadResult) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d|%d|%s|%s|%q|%v|", r.Runs, r.Seed, r.Waveform, r.LevelUnit, r.Measures, r.Variant)
	for _, t := range r.Tolerances {
		fmt.Fprintf(&b, "%s %v %v %s;", t.Param, t.Nominal, t.Percent, t.Dist)
	}
	for _, c := range r.Conditions {
		fmt.Fprintf(&b, "%v %s;", c.Level, c.Polarity)
	}
	return b.String()
}
