package whatif

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/big"
	"slices"
)

// ExactCircuits is the number of solved circuits up to which a spread's
// percentiles are exact: up to it every value is kept (8 bytes per
// measurement and condition and circuit); above it they come from a Sketch
// within SketchAccuracy. At 5,000 circuits p1 rests on the 50 lowest, whose
// own scatter from one batch to the next is far wider than 0.1 %.
const ExactCircuits = 5000

// sumPrec holds any sum of float64 values exactly: each is a multiple of
// 2^−1074 below 2^1024, and a count below 2^63 adds 63 bits [calc].
const sumPrec = 1074 + 1024 + 64

// Tally is the distribution of one measurement over a spread's circuits:
// every value while there are at most its limit, above it a Sketch, with the
// extremes and the sum kept exactly. Its state depends only on the values
// added, not on their order or on how they were split and merged, so shards
// merged give the unsharded spread's statistics bit for bit.
type Tally struct {
	limit  int
	values []float64  // while at most limit
	sketch *Sketch    // above
	sum    *big.Float // above: the exact sum, for the mean
	x      big.Float  // scratch for add
}

func newTally(limit int) *Tally { return &Tally{limit: limit} }

// add counts x (finite).
func (t *Tally) add(x float64) {
	if t.sketch == nil {
		t.values = append(t.values, x)
		if len(t.values) > t.limit {
			t.toSketch()
		}
		return
	}
	t.sketched(x)
}

// sketched counts x into the sketch and the exact sum, which always move
// together.
func (t *Tally) sketched(x float64) {
	t.sketch.Add(x)
	t.sum.Add(t.sum, t.x.SetFloat64(x))
}

// toSketch moves the values into a sketch and the exact sum.
func (t *Tally) toSketch() {
	t.sketch = NewSketch(SketchAccuracy)
	t.sum = new(big.Float).SetPrec(sumPrec)
	for _, v := range t.values {
		t.sketched(v)
	}
	t.values = nil
}

// merge adds the values of o to t.
func (t *Tally) merge(o *Tally) error {
	if t.sketch == nil && o.sketch == nil && len(t.values)+len(o.values) <= t.limit {
		t.values = append(t.values, o.values...)
		return nil
	}
	if t.sketch == nil {
		t.toSketch()
	}
	if o.sketch == nil {
		for _, v := range o.values {
			t.sketched(v)
		}
		return nil
	}
	if err := t.sketch.Merge(o.sketch); err != nil {
		return err
	}
	t.sum.Add(t.sum, o.sum)
	return nil
}

// N is the number of values.
func (t *Tally) N() int {
	if t.sketch != nil {
		return t.sketch.Count()
	}
	return len(t.values)
}

// Exact reports whether the tally holds every value (Values), not a
// sketch.
func (t *Tally) Exact() bool { return t.sketch == nil }

// Values are the values in ascending order while the tally is exact, nil
// after. The slice is the tally's own.
func (t *Tally) Values() []float64 {
	t.sort()
	return t.values
}

// Sketch is the sketch of the values once there are more than the limit,
// nil before.
func (t *Tally) Sketch() *Sketch { return t.sketch }

// sort orders the values ascending with −0 before +0, so that their order,
// and so every bit computed from them, does not depend on the order they
// came in.
func (t *Tally) sort() {
	slices.SortFunc(t.values, func(a, b float64) int {
		switch {
		case a < b:
			return -1
		case a > b:
			return 1
		}
		sa, sb := math.Signbit(a), math.Signbit(b)
		switch {
		case sa && !sb:
			return -1
		case sb && !sa:
			return 1
		}
		return 0
	})
}

// Percentiles summarise the tally: exactly (Summarise) while it holds every
// value; from the sketch above, with N, Min, Max and Mean still exact (the
// mean is the exact sum divided by N, rounded once).
func (t *Tally) Percentiles() Percentiles {
	if t.sketch == nil {
		t.sort()
		return summariseSorted(t.values)
	}
	s := t.sketch
	n := s.Count()
	mean, _ := new(big.Float).Quo(t.sum, new(big.Float).SetInt64(int64(n))).Float64()
	return Percentiles{N: n, Min: s.Min(), Max: s.Max(),
		P1: s.Quantile(0.01), P5: s.Quantile(0.05), P50: s.Quantile(0.5),
		P95: s.Quantile(0.95), P99: s.Quantile(0.99), Mean: mean}
}

// CountAtMost counts the values at or below v: exactly (lo = hi) while the
// tally holds every value; from the sketch, between lo and hi, the two
// differing by the values of the one bucket around v (those within
// 2·SketchAccuracy of it).
func (t *Tally) CountAtMost(v float64) (lo, hi int) {
	if t.sketch == nil {
		for _, x := range t.values {
			if x <= v {
				lo++
			}
		}
		return lo, lo
	}
	for _, b := range t.sketch.Buckets() {
		switch {
		case b.Hi <= v:
			lo += b.Count
			hi += b.Count
		case b.Lo <= v:
			hi += b.Count
		}
	}
	return lo, hi
}

// tallyJSON is a tally in a shard's JSON: "values" (ascending) while
// exact, else "sketch" and "sum", the exact sum as a hexadecimal float
// (math/big's 'p' format, for example "0x.c8p+7" for 100).
type tallyJSON struct {
	Values []float64 `json:"values,omitempty"`
	Sum    string    `json:"sum,omitempty"`
	Sketch *Sketch   `json:"sketch,omitempty"`
}

// MarshalJSON writes the tally exactly.
func (t *Tally) MarshalJSON() ([]byte, error) {
	if t.sketch == nil {
		return json.Marshal(tallyJSON{Values: t.Values()})
	}
	return json.Marshal(tallyJSON{Sum: t.sum.Text('p', 0), Sketch: t.sketch})
}

// UnmarshalJSON reads a tally MarshalJSON wrote. Its limit is the
// spread's (SpreadResult.ExactUpTo), set by the merge that reads it.
func (t *Tally) UnmarshalJSON(b []byte) error {
	var j tallyJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*t = Tally{values: j.Values, sketch: j.Sketch}
	if j.Sketch == nil {
		if j.Sum != "" {
			return errors.New("a tally with a sum but no sketch")
		}
		return nil
	}
	if len(j.Values) > 0 {
		return errors.New("a tally with both values and a sketch")
	}
	sum, _, err := new(big.Float).SetPrec(sumPrec).Parse(j.Sum, 0)
	if err != nil {
		return fmt.Errorf("the sum %q of a tally: %w", j.Sum, err)
	}
	t.sum = sum
	return nil
}
