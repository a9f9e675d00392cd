package whatif

import (
	"encoding/json"
	"math"
	"math/big"
	"sort"
	"testing"
)

func tallyOf(limit int, xs []float64) *Tally {
	t := newTally(limit)
	for _, x := range xs {
		t.add(x)
	}
	return t
}

// TestTallyExactThenSketch: up to its limit a tally gives Summarise's
// percentiles bit for bit [calc: the same definition-7 arithmetic on the
// same sorted values]; above it the sketch's, with the count, extremes and
// mean exact: the mean is the exact sum rounded once, checked against
// math/big's exact rational sum [calc].
func TestTallyExactThenSketch(t *testing.T) {
	xs := draws("energies", 3000)
	exact := tallyOf(3000, xs)
	if !exact.Exact() || exact.Percentiles() != Summarise(append([]float64(nil), xs...)) {
		t.Errorf("at its limit the tally must give Summarise's percentiles:\n%+v\n%+v", exact.Percentiles(), Summarise(append([]float64(nil), xs...)))
	}
	sk := tallyOf(2999, xs)
	if sk.Exact() || sk.Sketch() == nil || sk.Values() != nil {
		t.Fatal("one value over the limit must move the tally to a sketch")
	}
	p, e := sk.Percentiles(), exact.Percentiles()
	if p.N != e.N || p.Min != e.Min || p.Max != e.Max {
		t.Errorf("count and extremes must stay exact: %+v, want %+v", p, e)
	}
	sum := new(big.Rat)
	for _, x := range xs {
		sum.Add(sum, new(big.Rat).SetFloat64(x))
	}
	want, _ := sum.Quo(sum, big.NewRat(int64(len(xs)), 1)).Float64() // nearest float64
	if p.Mean != want {
		t.Errorf("mean %.17g, exact mean rounded %.17g", p.Mean, want)
	}
	sort.Float64s(xs)
	for _, c := range []struct {
		name string
		p    float64
		got  float64
	}{{"p1", 0.01, p.P1}, {"p5", 0.05, p.P5}, {"p50", 0.5, p.P50}, {"p95", 0.95, p.P95}, {"p99", 0.99, p.P99}} {
		ex := Quantile(xs, c.p)
		if math.Abs(c.got-ex) > SketchAccuracy*math.Abs(ex)*(1+1e-9) {
			t.Errorf("%s %.17g, exact %.17g: beyond %g of it", c.name, c.got, ex, SketchAccuracy)
		}
	}
	// Counting at or under a rating: exact while exact, else a range of
	// one bucket around it.
	v := xs[2000]
	if lo, hi := exact.CountAtMost(v); lo != 2001 || hi != 2001 {
		t.Errorf("exact count at or under the 2001st value: %d–%d", lo, hi)
	}
	near := 0 // the values a bucket around v can hold: within 2α of it
	for _, x := range xs {
		if math.Abs(x-v) <= 2*SketchAccuracy*v {
			near++
		}
	}
	if lo, hi := sk.CountAtMost(v); lo > 2001 || hi < 2001 || hi-lo > near {
		t.Errorf("sketch count at or under the 2001st value: %d–%d, want a range around 2001 of at most %d", lo, hi, near)
	}
}

// TestTallyMergeAnyOrder: a tally's JSON depends only on the values, not on
// their order, nor on how they were split and merged, in either regime
// and across the change from one to the other [practice: what merging
// shards needs].
func TestTallyMergeAnyOrder(t *testing.T) {
	xs := append(draws("normal", 900), 0, math.Copysign(0, -1), 0)
	for _, limit := range []int{10000, 500, 200} {
		want := jsonText(t, tallyOf(limit, xs))
		rev := newTally(limit)
		for i := len(xs) - 1; i >= 0; i-- {
			rev.add(xs[i])
		}
		if got := jsonText(t, rev); got != want {
			t.Errorf("limit %d: reversed order gave another tally", limit)
		}
		// Three parts of 301 (below the limit of 500, above 200), merged
		// in two groupings, one of them read back from JSON first.
		a, b, c := tallyOf(limit, xs[:301]), tallyOf(limit, xs[301:602]), tallyOf(limit, xs[602:])
		left := newTally(limit)
		for _, p := range []*Tally{a, b, c} {
			if err := left.merge(p); err != nil {
				t.Fatal(err)
			}
		}
		var back Tally
		if err := json.Unmarshal([]byte(jsonText(t, b)), &back); err != nil {
			t.Fatal(err)
		}
		right := newTally(limit)
		for _, p := range []*Tally{c, &back, a} {
			if err := right.merge(p); err != nil {
				t.Fatal(err)
			}
		}
		for what, x := range map[string]*Tally{"a+b+c": left, "c+b+a": right} {
			if got := jsonText(t, x); got != want {
				t.Errorf("limit %d: %s differs from the tally of every value", limit, what)
			}
			if x.Percentiles() != tallyOf(limit, xs).Percentiles() {
				t.Errorf("limit %d: %s gives other percentiles", limit, what)
			}
		}
	}
	for _, bad := range []string{`{"values": [1], "sketch": {"alpha": 0.001, "zeros": 1}, "sum": "0"}`, `{"sum": "0x.8p+1"}`, `{"sketch": {"alpha": 0.001}, "sum": "many"}`} {
		var x Tally
		if err := json.Unmarshal([]byte(bad), &x); err == nil {
			t.Errorf("%s read as a tally", bad)
		}
	}
}
