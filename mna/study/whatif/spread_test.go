package whatif

import (
	"context"
	"encoding/json"
	"math"
	"reflect"
	"testing"

	"zapnet/mna/study"
	"zapnet/netlist"
)

// jsonText is v's JSON: results that must be equal bit for bit are
// compared by it.
func jsonText(t testing.TB, v any) string {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestSpreadReproducible: the same seed gives the same result bit for bit
// with one worker and with two, a different seed a different one, and the
// shards merged give exactly the whole [practice: the determinism the
// command promises].
func TestSpreadReproducible(t *testing.T) {
	c := parse(t, "testdata/net-a-spread.zap")
	run := func(seed uint64, workers int, sh study.Shard) *SpreadResult {
		opt := &SpreadOptions{Runs: 6, Seed: seed, Shard: sh, Samples: true}
		opt.Study.Workers = workers
		r, err := Spreads(context.Background(), c, opt)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	one := run(42, 1, study.Shard{})
	two := run(42, 2, study.Shard{})
	if a, b := jsonText(t, one), jsonText(t, two); a != b {
		t.Fatalf("1 and 2 workers differ:\n%s\n%s", a, b)
	}
	if one.Solved != 6 || len(one.Samples) != 6 {
		t.Fatalf("solved %d of %d samples, want 6 of 6", one.Solved, len(one.Samples))
	}
	other := run(43, 2, study.Shard{})
	if reflect.DeepEqual(one.Samples, other.Samples) {
		t.Error("seeds 42 and 43 gave the same circuits")
	}
	var parts []*SpreadResult
	for i := 1; i <= 4; i++ { // 4 shards of 6: two of them hold one circuit
		parts = append(parts, run(42, 1, study.Shard{Index: i, Count: 4}))
	}
	merged, err := MergeSpreads([]*SpreadResult{parts[2], parts[0], parts[3], parts[1]})
	if err != nil {
		t.Fatal(err)
	}
	if a, b := jsonText(t, one), jsonText(t, merged); a != b {
		t.Fatalf("merged shards differ from the whole:\n%s\n%s", a, b)
	}
	if _, err := MergeSpreads(parts[:3]); err == nil {
		t.Error("a missing shard must be an error")
	}
	// The percentiles are of the drawn values: the residual spreads.
	p := one.Percentiles["U1.residual.peak"]
	if p.N != 6 || !(p.Max > p.Min) {
		t.Errorf("residual percentiles %+v: want 6 distinct-ish values", p)
	}
}

// TestDrawDistributions checks the draws against their definitions with
// many samples [calc]: a uniform ±10 % stays inside, has mean 1 and
// standard deviation 0.1/√3; a normal 9 % (σ = 3 %) truncated at 3σ stays
// inside ±9 % and has standard deviation σ·√(1 − 2·3·φ(3)/(2Φ(3)−1)) =
// 0.98658·σ (moments of the truncated normal, Johnson, Kotz and
// Balakrishnan, Continuous Univariate Distributions, vol. 1, ch. 13).
func TestDrawDistributions(t *testing.T) {
	c := parse(t, "testdata/net-a-spread.zap")
	tols := []netlist.Tolerance{
		{Element: "C1", Param: "value", Percent: 10, Dist: "uniform"},
		{Element: "D1", Param: "vbr", Percent: 9, Dist: "normal"},
	}
	nomC, nomV := c.Element("C1").Values.Num("value"), c.Element("D1").Values.Num("vbr")
	const n = 20000
	var su, su2, sn, sn2 float64
	for k := range n {
		s := Draw(c, tols, 7, k)
		u := s[0].Num/nomC - 1
		z := s[1].Num/nomV - 1
		if math.Abs(u) > 0.1+1e-12 || math.Abs(z) > 0.09+1e-12 {
			t.Fatalf("draw %d outside its tolerance: %g, %g", k, u, z)
		}
		su += u
		su2 += u * u
		sn += z
		sn2 += z * z
	}
	sdU := math.Sqrt(su2/n - (su/n)*(su/n))
	sdN := math.Sqrt(sn2/n - (sn/n)*(sn/n))
	// Standard errors at n = 20000 are below 1 % of each; allow 3 %.
	if math.Abs(su/n) > 0.002 || math.Abs(sdU/(0.1/math.Sqrt(3))-1) > 0.03 {
		t.Errorf("uniform: mean %g, sd %g; want 0 and %g", su/n, sdU, 0.1/math.Sqrt(3))
	}
	if math.Abs(sn/n) > 0.002 || math.Abs(sdN/(0.98658*0.03)-1) > 0.03 {
		t.Errorf("normal: mean %g, sd %g; want 0 and %g", sn/n, sdN, 0.98658*0.03)
	}
	// The same (seed, index) gives the same draw, another index another.
	if a, b := Draw(c, tols, 7, 5), Draw(c, tols, 7, 5); !reflect.DeepEqual(a, b) {
		t.Error("the same seed and index drew different values")
	}
	if a, b := Draw(c, tols, 7, 5), Draw(c, tols, 7, 6); reflect.DeepEqual(a, b) {
		t.Error("indices 5 and 6 drew the same values")
	}
}

func TestSpreadNeedsTolerances(t *testing.T) {
	c := parse(t, "../../../testdata/demo-weak.zap")
	if _, err := Spreads(context.Background(), c, nil); err == nil {
		t.Error("a deck without tolerance lines must be an error")
	}
}

// TestSpreadPassFraction draws the clamp-path inductance of a clamp at the
// pin ±20 % (uniform). The sensitivity table gives 8.6 % of margin at the
// nominal value and 0.7 % at +10 %; extrapolated, the margin reaches zero
// near +11 %, so circuits above it fail: about (20−11)/40, a fifth [calc]. The counts must agree with the samples'
// verdicts, each verdict with the sign of its worst margin, and the
// interval with Wilson95 of the counts.
func TestSpreadPassFraction(t *testing.T) {
	c := parse(t, "testdata/clamp-at-pin.zap")
	opt := &SpreadOptions{Runs: 40, Seed: 9, Samples: true,
		Tolerances: []netlist.Tolerance{{Element: "D1", Param: "ls", Percent: 20, Dist: "uniform"}}}
	r, err := Spreads(context.Background(), c, opt)
	if err != nil {
		t.Fatal(err)
	}
	wm := -1
	for i, m := range r.Measures {
		if m == "worst_margin" {
			wm = i
		}
	}
	passed := 0
	for _, s := range r.Samples {
		pass := s.Verdicts[0] == "PASS"
		if pass != (s.Values[0][wm] >= 0) {
			t.Errorf("circuit %d: verdict %s with worst margin %g %%", s.Index, s.Verdicts[0], s.Values[0][wm])
		}
		if pass {
			passed++
		}
	}
	if r.Passed != passed || r.Solved != 40 || r.PassFraction != float64(passed)/40 {
		t.Errorf("passed %d of %d (fraction %g); the samples say %d of 40", r.Passed, r.Solved, r.PassFraction, passed)
	}
	if !(passed > 20 && passed < 40) {
		t.Errorf("%d of 40 passed; expected most but not all", passed)
	}
	lo, hi := Wilson95(passed, 40)
	if r.CI95 != [2]float64{lo, hi} || !(lo < r.PassFraction && r.PassFraction < hi) {
		t.Errorf("interval %v, want [%g, %g] around %g", r.CI95, lo, hi, r.PassFraction)
	}
}
