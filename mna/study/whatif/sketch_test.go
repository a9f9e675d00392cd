package whatif

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"sort"
	"testing"
)

// draws returns n values of a known distribution from a fixed seed.
func draws(dist string, n int) []float64 {
	rng := rand.New(rand.NewPCG(20190828, uint64(len(dist))))
	out := make([]float64, n)
	for i := range out {
		switch dist {
		case "uniform": // on [0, 1)
			out[i] = rng.Float64()
		case "log-normal": // μ = 0, σ = 1: spans about four decades at 200,000
			out[i] = math.Exp(rng.NormFloat64())
		case "normal": // both signs and values near zero
			out[i] = rng.NormFloat64()
		case "energies": // a clamp energy: a few µJ with a 5 % spread
			out[i] = 4e-6 * (1 + 0.05*rng.NormFloat64())
		}
	}
	return out
}

func sketchOf(alpha float64, xs []float64) *Sketch {
	s := NewSketch(alpha)
	for _, x := range xs {
		s.Add(x)
	}
	return s
}

// TestSketchAccuracy checks the published bound of the log-bucketed sketch
// against the exact order statistics of large samples [pub: Masson, Rim and
// Lee, PVLDB 12(12) 2019, the α-accuracy of a bucket's value 2γ^i/(γ+1)
// for every item of bucket i; the exact values are the sorted samples,
// calc]: the value read for rank r is within α·|x_r|, and the quantile
// interpolated as definition 7 within α·max(|x_lo|, |x_hi|) of the exact
// quantile. The bound must also be nearly reached (a sketch that returned
// the exact values would pass the first part for the wrong reason).
func TestSketchAccuracy(t *testing.T) {
	const n = 200000
	const slack = 1 + 1e-9 // the logarithm and power are rounded
	for _, dist := range []string{"uniform", "log-normal", "normal", "energies"} {
		xs := draws(dist, n)
		s := sketchOf(SketchAccuracy, xs)
		sort.Float64s(xs)
		if s.Count() != n || s.Min() != xs[0] || s.Max() != xs[n-1] {
			t.Fatalf("%s: count %d, min %g, max %g; want %d, %g, %g", dist, s.Count(), s.Min(), s.Max(), n, xs[0], xs[n-1])
		}
		worst := 0.0
		for r := 0; r < n; r += 37 {
			got, want := s.Rank(r), xs[r]
			err := math.Abs(got - want)
			if err > SketchAccuracy*math.Abs(want)*slack {
				t.Fatalf("%s: rank %d reads %.17g, exact %.17g: error %.3g of the value, bound %g",
					dist, r, got, want, err/math.Abs(want), SketchAccuracy)
			}
			if want != 0 {
				worst = math.Max(worst, err/math.Abs(want))
			}
		}
		if worst < 0.9*SketchAccuracy {
			t.Errorf("%s: the largest relative error over the ranks is %.3g, far inside the bound %g: is the sketch reading exact values?", dist, worst, SketchAccuracy)
		}
		for k := 0; k <= 1000; k++ {
			p := float64(k) / 1000
			exact := Quantile(xs, p)
			h := float64(n-1) * p
			lo := int(math.Floor(h))
			hi := min(lo+1, n-1)
			bound := SketchAccuracy * math.Max(math.Abs(xs[lo]), math.Abs(xs[hi])) * slack
			if got := s.Quantile(p); math.Abs(got-exact) > bound {
				t.Errorf("%s: p = %g reads %.17g, exact %.17g, bound ±%.3g", dist, p, got, exact, bound)
			}
		}
		for _, p := range []float64{0, 1} {
			if got := s.Quantile(p); got != Quantile(xs, p) {
				t.Errorf("%s: p = %g reads %g; the extremes are kept exactly (%g)", dist, p, got, Quantile(xs, p))
			}
		}
		// The memory is the span of the values in buckets of ratio γ:
		// at most log_γ(max/min) + 1 of each sign [calc].
		spanBound := func(lo, hi float64) int {
			g := (1 + SketchAccuracy) / (1 - SketchAccuracy)
			return int(math.Log(hi/lo)/math.Log(g)) + 2
		}
		pos, neg := len(s.pos), len(s.neg)
		var lo, hi, nlo, nhi float64 = math.Inf(1), 0, math.Inf(1), 0
		for _, x := range xs {
			switch {
			case x > 0:
				lo, hi = math.Min(lo, x), math.Max(hi, x)
			case x < 0:
				nlo, nhi = math.Min(nlo, -x), math.Max(nhi, -x)
			}
		}
		if pos > 0 && pos > spanBound(lo, hi) || neg > 0 && neg > spanBound(nlo, nhi) {
			t.Errorf("%s: %d positive and %d negative buckets for spans %g–%g and %g–%g", dist, pos, neg, lo, hi, nlo, nhi)
		}
		t.Logf("%s: %d items in %d buckets, largest relative error %.4g", dist, n, pos+neg, worst)
	}
}

// TestSketchBuckets: every item lies within the bounds of the bucket the
// sketch counts it in, and the counts add up [calc: the definition of the
// buckets].
func TestSketchBuckets(t *testing.T) {
	xs := append(draws("normal", 5000), 0, 0, math.Copysign(0, -1))
	s := sketchOf(0.01, xs)
	sort.Float64s(xs)
	bs := s.Buckets()
	total, j := 0, 0
	for k, b := range bs {
		if k > 0 && !(b.Lo >= bs[k-1].Hi) {
			t.Fatalf("bucket %d [%g, %g] overlaps the one before [%g, %g]", k, b.Lo, b.Hi, bs[k-1].Lo, bs[k-1].Hi)
		}
		for range b.Count {
			x := xs[j]
			if x < b.Lo-1e-12*math.Abs(b.Lo) || x > b.Hi+1e-12*math.Abs(b.Hi) {
				t.Fatalf("item %d, %g, counted in the bucket [%g, %g]", j, x, b.Lo, b.Hi)
			}
			j++
		}
		total += b.Count
	}
	if total != len(xs) || bs[0].Lo != xs[0] || bs[len(bs)-1].Hi != xs[len(xs)-1] {
		t.Errorf("buckets hold %d of %d items, from %g to %g (want %g to %g)", total, len(xs), bs[0].Lo, bs[len(bs)-1].Hi, xs[0], xs[len(xs)-1])
	}
}

// TestSketchMergeExact: the sketch of joined streams is the sketch of all
// their items, whatever the split, the order and the grouping of the merges
// (associative and commutative), and survives its JSON [practice: what
// merging shards needs to give the unsharded result bit for bit].
func TestSketchMergeExact(t *testing.T) {
	xs := append(draws("normal", 30000), draws("log-normal", 30000)...)
	whole := sketchOf(SketchAccuracy, xs)
	want := jsonText(t, whole)

	// Three parts by index modulo 3, as shards split, and three uneven
	// contiguous blocks; each merged in two groupings and another order.
	var mod [3][]float64
	for i, x := range xs {
		mod[i%3] = append(mod[i%3], x)
	}
	blocks := [3][]float64{xs[:7], xs[7:41000], xs[41000:]}
	for name, parts := range map[string][3][]float64{"modulo": mod, "blocks": blocks} {
		a, b, c := sketchOf(SketchAccuracy, parts[0]), sketchOf(SketchAccuracy, parts[1]), sketchOf(SketchAccuracy, parts[2])
		left := a.Clone() // (a + b) + c
		mustMerge(t, left, b)
		mustMerge(t, left, c)
		right := b.Clone() // a + (b + c)
		mustMerge(t, right, c)
		r := a.Clone()
		mustMerge(t, r, right)
		other := c.Clone() // (c + a) + b
		mustMerge(t, other, a)
		mustMerge(t, other, b)
		for what, s := range map[string]*Sketch{"(a+b)+c": left, "a+(b+c)": r, "(c+a)+b": other} {
			if got := jsonText(t, s); got != want {
				t.Errorf("%s %s differs from the sketch of every item:\n%s\n%s", name, what, got, want)
			}
		}
	}
	// Items in another order give the same sketch.
	rev := NewSketch(SketchAccuracy)
	for i := len(xs) - 1; i >= 0; i-- {
		rev.Add(xs[i])
	}
	if got := jsonText(t, rev); got != want {
		t.Error("the items in reverse order gave another sketch")
	}
	// Read back from its JSON, the sketch reads the same quantiles.
	var back Sketch
	if err := json.Unmarshal([]byte(want), &back); err != nil {
		t.Fatal(err)
	}
	for _, p := range []float64{0, 0.01, 0.5, 0.99, 1} {
		if a, b := whole.Quantile(p), back.Quantile(p); a != b {
			t.Errorf("p = %g: %g before the JSON, %g after", p, a, b)
		}
	}
	if jsonText(t, &back) != want {
		t.Error("the JSON of the sketch read back differs")
	}
	if err := whole.Merge(NewSketch(0.01)); err == nil {
		t.Error("sketches of different accuracy merged")
	}
	for _, bad := range []string{
		`{"alpha": 0}`,
		`{"alpha": 0.001, "positive": [[3, 1], [2, 1]]}`,
		`{"alpha": 0.001, "positive": [[3, 0]]}`,
		`{"alpha": 0.001, "zeros": 1, "min": 1, "max": -1}`,
	} {
		if err := json.Unmarshal([]byte(bad), &back); err == nil {
			t.Errorf("%s read as a sketch", bad)
		}
	}
}

func mustMerge(t *testing.T, s, o *Sketch) {
	t.Helper()
	if err := s.Merge(o); err != nil {
		t.Fatal(err)
	}
}

// BenchmarkSketchMemory adds N and 10·N values of one log-normal
// distribution: B/op is the sketch's size, which grows with the span of the
// values seen (a little, as the tails reach further) and not with their
// count.
func BenchmarkSketchMemory(b *testing.B) {
	for _, n := range []int{100000, 1000000} {
		xs := draws("log-normal", n)
		b.Run(sizeName(n), func(b *testing.B) {
			b.ReportAllocs()
			var s *Sketch
			for b.Loop() {
				s = sketchOf(SketchAccuracy, xs)
			}
			b.ReportMetric(float64(len(s.pos)+len(s.neg)), "buckets")
		})
	}
}

func sizeName(n int) string {
	b, _ := json.Marshal(n)
	return "n=" + string(b)
}
