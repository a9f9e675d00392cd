package whatif

import (
	"math"
	"sort"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// VariantRank is one variant of a finished sweep judged over all its levels
// and polarities.
type VariantRank struct {
	Rank         int // 1 is the variant with the most margin
	VariantIndex int
	Variant      netlist.Variant
	// Worst is the smallest percentage margin over every run of the
	// variant, nil when its runs have no limits or none was solved.
	Worst *study.Limit
	// WorstLevel and WorstPolarity are the run where Worst was found.
	WorstLevel    float64
	LevelUnit     spec.Unit
	WorstPolarity string
	Runs          int
	Passed        int
	Failed        int
	Unsolved      int
}

// RankVariants orders the variants of runs by their worst-case margin over
// every level and polarity, the most margin first. A variant with a run
// that could not be solved ranks below every fully solved one (its worst
// case is unknown), and a variant without limits below those too; ties keep
// plan order.
func RankVariants(runs []study.Run) []VariantRank {
	byIndex := map[int]*VariantRank{}
	var order []int
	for i := range runs {
		r := &runs[i]
		v := byIndex[r.VariantIndex]
		if v == nil {
			v = &VariantRank{VariantIndex: r.VariantIndex, Variant: r.Variant, LevelUnit: r.LevelUnit}
			byIndex[r.VariantIndex] = v
			order = append(order, r.VariantIndex)
		}
		v.Runs++
		switch r.Verdict {
		case study.Pass:
			v.Passed++
		case study.Fail:
			v.Failed++
		default:
			v.Unsolved++
			continue
		}
		if r.Worst != nil && (v.Worst == nil || r.Worst.Percent < v.Worst.Percent) {
			w := *r.Worst
			v.Worst, v.WorstLevel, v.WorstPolarity = &w, r.Level, r.Polarity
		}
	}
	out := make([]VariantRank, 0, len(order))
	for _, vi := range order {
		out = append(out, *byIndex[vi])
	}
	key := func(v *VariantRank) (int, float64) {
		switch {
		case v.Unsolved > 0:
			return 2, 0
		case v.Worst == nil:
			return 1, 0
		}
		return 0, -v.Worst.Percent
	}
	sort.SliceStable(out, func(a, b int) bool {
		ca, pa := key(&out[a])
		cb, pb := key(&out[b])
		if ca != cb {
			return ca < cb
		}
		if pa != pb && !(math.IsNaN(pa) || math.IsNaN(pb)) {
			return pa < pb
		}
		return out[a].VariantIndex < out[b].VariantIndex
	})
	for i := range out {
		out[i].Rank = i + 1
	}
	return out
}
