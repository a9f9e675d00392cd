package whatif

import (
	"context"
	"encoding/json"
	"math"
	"math/rand/v2"
	"runtime"
	"strings"
	"testing"

	"zapnet/mna/study"
)

// throughJSON writes a result and reads it back, as zapnet merge reads a
// shard's file.
func throughJSON(t testing.TB, r *SpreadResult) *SpreadResult {
	t.Helper()
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	var back SpreadResult
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	return &back
}

func spreadOf(t testing.TB, deck string, opt SpreadOptions) *SpreadResult {
	t.Helper()
	opt.Study.Polarities = []string{"pos", "neg"} // two conditions
	opt.Study.Workers = 2
	r, err := Spreads(context.Background(), parse(t, deck), &opt)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestSpreadShardsMergeExactAndSketch: shards merged through their JSON
// give the unsharded spread's JSON byte for byte, when every count stays
// exact, when every shard is already a sketch, and when exact shards join
// into a sketch [practice: the contract of --shard and merge]. Without
// samples the statistics are those with them.
func TestSpreadShardsMergeExactAndSketch(t *testing.T) {
	const deck = "testdata/small-spread.zap"
	for _, c := range []struct {
		name                string
		runs, exact, shards int
		sketch              bool
	}{
		{"exact", 12, 0, 3, false},
		{"every shard a sketch", 12, 2, 3, true},
		{"exact shards, a sketch joined", 12, 5, 3, true},
		{"uneven shards at the limit", 11, 6, 4, true},
	} {
		whole := spreadOf(t, deck, SpreadOptions{Runs: c.runs, Seed: 4, ExactUpTo: c.exact})
		want := jsonText(t, whole)
		if (whole.PercentileError != 0) != c.sketch || whole.Summary != nil || whole.Samples != nil {
			t.Errorf("%s: percentile error %g, summary %v, %d samples in the whole spread's result",
				c.name, whole.PercentileError, whole.Summary != nil, len(whole.Samples))
		}
		var parts []*SpreadResult
		for i := c.shards; i >= 1; i-- {
			p := spreadOf(t, deck, SpreadOptions{Runs: c.runs, Seed: 4, ExactUpTo: c.exact, Shard: study.Shard{Index: i, Count: c.shards}})
			if p.Summary == nil {
				t.Fatalf("%s: shard %d/%d carries no summary", c.name, i, c.shards)
			}
			parts = append(parts, throughJSON(t, p))
		}
		merged, err := MergeSpreads(parts)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if got := jsonText(t, merged); got != want {
			t.Errorf("%s: merged shards differ from the whole:\n%s\n%s", c.name, got, want)
		}
		// The same spread with every circuit's record: the same
		// statistics, and the samples besides.
		with := spreadOf(t, deck, SpreadOptions{Runs: c.runs, Seed: 4, ExactUpTo: c.exact, Samples: true})
		if len(with.Samples) != c.runs {
			t.Fatalf("%s: %d samples of %d circuits", c.name, len(with.Samples), c.runs)
		}
		with.Samples = nil
		if got := jsonText(t, with); got != want {
			t.Errorf("%s: keeping the samples changed the statistics", c.name)
		}
		if _, err := MergeSpreads(parts[1:]); err == nil || !strings.Contains(err.Error(), "missing") {
			t.Errorf("%s: a missing shard: %v", c.name, err)
		}
		if _, err := MergeSpreads(append(parts, parts[0])); err == nil {
			t.Errorf("%s: a shard given twice merged", c.name)
		}
	}
}

// TestSpreadSketchWithinBound: the percentiles of a spread above its exact
// count are within the sketch's bound of the exact ones over the same
// circuits, per circuit's worst case and per condition, and every count,
// extreme and interval is unchanged [pub: the α-accuracy of Masson, Rim
// and Lee 2019; the exact values are the same circuits' sorted values].
func TestSpreadSketchWithinBound(t *testing.T) {
	const deck = "testdata/small-spread.zap"
	exact := spreadOf(t, deck, SpreadOptions{Runs: 40, Seed: 8})
	sk := spreadOf(t, deck, SpreadOptions{Runs: 40, Seed: 8, ExactUpTo: 10})
	if exact.PercentileError != 0 || sk.PercentileError != SketchAccuracy {
		t.Fatalf("percentile errors %g and %g, want 0 and %g", exact.PercentileError, sk.PercentileError, SketchAccuracy)
	}
	if sk.Solved != exact.Solved || sk.Passed != exact.Passed || sk.CI95 != exact.CI95 {
		t.Errorf("counts changed with the sketch: %d/%d %v, want %d/%d %v", sk.Passed, sk.Solved, sk.CI95, exact.Passed, exact.Solved, exact.CI95)
	}
	check := func(where, m string, got, want Percentiles, values []float64) {
		if got.N != want.N || got.Min != want.Min || got.Max != want.Max || math.Abs(got.Mean-want.Mean) > 1e-15*math.Abs(want.Mean) {
			t.Errorf("%s %s: n, min, max, mean %d %g %g %g; exact %d %g %g %g", where, m, got.N, got.Min, got.Max, got.Mean, want.N, want.Min, want.Max, want.Mean)
		}
		for _, q := range []struct {
			p        float64
			got, ex  float64
			nickname string
		}{{0.01, got.P1, want.P1, "p1"}, {0.05, got.P5, want.P5, "p5"}, {0.5, got.P50, want.P50, "p50"}, {0.95, got.P95, want.P95, "p95"}, {0.99, got.P99, want.P99, "p99"}} {
			h := float64(len(values)-1) * q.p
			lo := int(h)
			hi := min(lo+1, len(values)-1)
			bound := SketchAccuracy * math.Max(math.Abs(values[lo]), math.Abs(values[hi])) * (1 + 1e-9)
			if math.Abs(q.got-q.ex) > bound {
				t.Errorf("%s %s %s: %.17g, exact %.17g, bound ±%.3g", where, m, q.nickname, q.got, q.ex, bound)
			}
		}
	}
	for mi, m := range exact.Measures {
		check("worst", m, sk.Percentiles[m], exact.Percentiles[m], exact.Worst(m).Values())
		for ci := range exact.Conditions {
			check(exact.Conditions[ci].Polarity, m, sk.Conditions[ci].Percentiles[m], exact.Conditions[ci].Percentiles[m],
				exact.summary.Conditions[ci][mi].Values())
		}
	}
}

// TestSpreadOldShardsMerge: shards written with their samples and without
// a summary (as spreads wrote before keeping one) still merge into the
// whole spread [practice: files already on disk keep working].
func TestSpreadOldShardsMerge(t *testing.T) {
	const deck = "testdata/small-spread.zap"
	whole := spreadOf(t, deck, SpreadOptions{Runs: 7, Seed: 2, ExactUpTo: 3, Samples: true})
	var parts []*SpreadResult
	for i := 1; i <= 2; i++ {
		p := throughJSON(t, spreadOf(t, deck, SpreadOptions{Runs: 7, Seed: 2, ExactUpTo: 3, Samples: true, Shard: study.Shard{Index: i, Count: 2}}))
		p.Summary, p.Unsolved, p.Solved, p.Passed = nil, 0, 0, 0
		parts = append(parts, p)
	}
	merged, err := MergeSpreads(parts)
	if err != nil {
		t.Fatal(err)
	}
	if a, b := jsonText(t, merged), jsonText(t, whole); a != b {
		t.Errorf("old shards merged differ from the whole:\n%s\n%s", a, b)
	}
	// A shard with neither summary nor samples cannot be merged; one
	// whose summary does not match its counts is damaged.
	bare := *parts[0]
	bare.Samples = nil
	if _, err := MergeSpreads([]*SpreadResult{&bare, parts[1]}); err == nil {
		t.Error("a shard with neither summary nor samples merged")
	}
	good := throughJSON(t, spreadOf(t, deck, SpreadOptions{Runs: 7, Seed: 2, ExactUpTo: 3, Shard: study.Shard{Index: 1, Count: 2}}))
	good.Solved++
	if _, err := MergeSpreads([]*SpreadResult{good, parts[1]}); err == nil || !strings.Contains(err.Error(), "damaged") {
		t.Errorf("a summary that does not match its count: %v", err)
	}
}

// TestSpreadJSONSmall: the statistics of a 20,000-circuit spread of four
// conditions take a few kilobytes of JSON, where every circuit's record
// took about 770 bytes each (15 MB) [practice: the JSON must not grow with
// the count of circuits]. The circuits are fed to the summary as Spreads
// does, with measures drawn at random, so the test needs no engine.
func TestSpreadJSONSmall(t *testing.T) {
	r := &SpreadResult{Runs: 20000, Seed: 1, ExactUpTo: ExactCircuits,
		Measures: []string{"U1.residual.peak", "U1.residual.min", "D1.energy", "D1.peak_current", "worst_margin"},
		Conditions: []Condition{{Level: 2000, Polarity: "pos"}, {Level: 2000, Polarity: "neg"},
			{Level: 4000, Polarity: "pos"}, {Level: 4000, Polarity: "neg"}}}
	r.begin()
	rng := rand.New(rand.NewPCG(1, 2))
	for k := range r.Runs {
		s := Sample{Index: k}
		for range r.Conditions {
			z := rng.NormFloat64()
			s.Verdicts = append(s.Verdicts, "PASS")
			s.Values = append(s.Values, []float64{41 + 0.3*z, -12.7 + 0.05*z, 2e-6 * (1 + 0.03*z), 15.6 + 0.02*z, 8.6 + 0.5*z})
		}
		r.add(s)
	}
	r.finish()
	b, err := json.MarshalIndent(SpreadDocument{SpreadResult: r}, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	if r.PercentileError != SketchAccuracy || r.Solved != 20000 || len(b) > 16000 {
		t.Errorf("20,000 circuits: %d bytes of JSON, percentile error %g, %d solved", len(b), r.PercentileError, r.Solved)
	}
	t.Logf("20,000 circuits of 4 conditions: %d bytes of JSON", len(b))
}

// BenchmarkSpreadMemory solves N and 10·N circuits of a small invented deck
// with the exact count at 100, so that both are sketches. live-B is the
// heap the finished result holds (after a collection): it must not grow
// with the count of circuits. B/op counts every allocation, each circuit's
// compiled network included (freed as soon as it is solved), so it grows
// with the circuits; B/circuit shows that cost per circuit is constant.
// With samples the live heap grows with the circuits, as it must.
//
//	go test ./mna/study/whatif -run '^$' -bench SpreadMemory -benchtime 1x -benchmem
func BenchmarkSpreadMemory(b *testing.B) {
	for _, c := range []struct {
		runs    int
		samples bool
	}{{300, false}, {3000, false}, {3000, true}} {
		name := "runs=" + strings.TrimPrefix(sizeName(c.runs), "n=")
		if c.samples {
			name += "/samples"
		}
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			c0 := parse(b, "testdata/small-spread.zap")
			opt := &SpreadOptions{Runs: c.runs, Seed: 1, ExactUpTo: 100, Samples: c.samples}
			opt.Study.Workers = 1
			var live, total uint64
			for b.Loop() {
				var before, after runtime.MemStats
				runtime.GC()
				runtime.ReadMemStats(&before)
				r, err := Spreads(context.Background(), c0, opt)
				if err != nil || r.Solved != c.runs {
					b.Fatalf("%v, %d of %d circuits solved", err, r.Solved, c.runs)
				}
				runtime.GC()
				runtime.ReadMemStats(&after)
				runtime.KeepAlive(r)
				live = after.HeapAlloc - min(after.HeapAlloc, before.HeapAlloc)
				total = after.TotalAlloc - before.TotalAlloc
			}
			b.ReportMetric(float64(live), "live-B")
			b.ReportMetric(float64(total)/float64(c.runs), "B/circuit")
		})
	}
}
