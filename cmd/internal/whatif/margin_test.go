package whatif

import (
	"context"
	"math"
	"testing"

	"zapnet/cmd/internal/study"
	"zapnet/netlist"
)

func parse(t testing.TB, path string) *netlist.Circuit {
	t.Helper()
	c, err := netlist.ParseFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestMarginAgainstBruteForce checks the scan-and-bisect search against the
// verdict at every level of the grid, solved one by one by the study
// itself [calc]: the highest passing level is the last level before the
// first failure, whatever path the bisection took.
func TestMarginAgainstBruteForce(t *testing.T) {
	c := parse(t, "../../../testdata/demo.zap")
	const top, step = 8000.0, 200.0
	var levels []float64
	for k := 1; float64(k)*step <= top; k++ {
		levels = append(levels, float64(k)*step)
	}
	runs, err := study.Execute(c, &study.Options{Levels: levels, Polarities: []string{"pos", "neg"}})
	if err != nil {
		t.Fatal(err)
	}
	// Scan = 5 leaves a bracket of 8 steps, so the bisection does real work.
	res, err := Margins(context.Background(), c, &MarginOptions{Max: top, Resolution: step, Scan: 5})
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Margins) != 2 {
		t.Fatalf("%d searches, want 2 (pos and neg)", len(res.Margins))
	}
	for _, m := range res.Margins {
		var maxPass, firstFail float64
		limiting, monotonic := "", true
		for _, r := range runs {
			if r.Polarity != m.Polarity {
				continue
			}
			switch {
			case r.Verdict != study.Pass && firstFail == 0:
				firstFail, limiting = r.Level, r.Worst.Name()
			case r.Verdict == study.Pass && firstFail == 0:
				maxPass = r.Level
			case r.Verdict == study.Pass:
				monotonic = false
			}
		}
		if firstFail == 0 {
			t.Fatalf("%s: the demo deck passes up to %g V; the test needs a failure", m.Polarity, top)
		}
		if m.MaxPass == nil || *m.MaxPass != maxPass || m.FirstFail == nil || *m.FirstFail != firstFail {
			t.Errorf("%s: search gives pass %v fail %v, brute force %g and %g", m.Polarity, ptr(m.MaxPass), ptr(m.FirstFail), maxPass, firstFail)
		}
		if m.Limiting != limiting {
			t.Errorf("%s: limiting %q, brute force %q", m.Polarity, m.Limiting, limiting)
		}
		if !monotonic || !m.Monotonic {
			t.Errorf("%s: monotonic: search %v, brute force %v", m.Polarity, m.Monotonic, monotonic)
		}
		// A bisection needs far fewer solves than the scan of 40 levels.
		if m.Solves >= len(levels) {
			t.Errorf("%s: %d solves, no better than brute force", m.Polarity, m.Solves)
		}
	}
}

func ptr(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

// TestSearchFindsNonMonotonic drives the search with made-up verdicts
// [calc]: pass up to 3.0 kV, fail above, pass again between 6.0 and 6.5 kV.
func TestSearchFindsNonMonotonic(t *testing.T) {
	verdict := func(level float64) (outcome, error) {
		pass := level <= 3000 || (level >= 6000 && level <= 6500)
		return outcome{pass: pass, worst: &study.Limit{Element: "U1", Param: "vmax"}}, nil
	}
	var m Margin
	m.LevelUnit, m.Polarity = "V", "pos"
	// 100 steps of 100 V, a scan of 16: levels 700, 1300, …, 6300, … 10000.
	if !search(context.Background(), &m, 100, 16, 100, verdict) {
		t.Fatal("search reported an interruption")
	}
	if ptr(m.MaxPass) != 3000 || ptr(m.FirstFail) != 3100 {
		t.Errorf("pass %v fail %v, want 3000 and 3100", ptr(m.MaxPass), ptr(m.FirstFail))
	}
	if m.Monotonic || len(m.PassesAbove) != 1 || m.PassesAbove[0] != 6300 {
		t.Errorf("monotonic %v, passes above %v; want false and [6300]", m.Monotonic, m.PassesAbove)
	}
	if m.Note == "" {
		t.Error("a non-monotonic search must say so")
	}

	// Monotonic, failing from the lowest level: no passing level at all.
	m = Margin{LevelUnit: "V"}
	search(context.Background(), &m, 100, 16, 100, func(float64) (outcome, error) { return outcome{}, nil })
	if m.MaxPass != nil || ptr(m.FirstFail) != 100 || !m.Monotonic {
		t.Errorf("always failing: pass %v fail %v monotonic %v; want none, 100, true", ptr(m.MaxPass), ptr(m.FirstFail), m.Monotonic)
	}
	// Always passing: the top of the range, no failure.
	m = Margin{LevelUnit: "V"}
	search(context.Background(), &m, 100, 16, 100, func(float64) (outcome, error) { return outcome{pass: true}, nil })
	if ptr(m.MaxPass) != 10000 || m.FirstFail != nil || m.Solves != 16 {
		t.Errorf("always passing: pass %v fail %v after %d solves; want 10000, none, 16", ptr(m.MaxPass), ptr(m.FirstFail), m.Solves)
	}
}

func TestMarginInterrupted(t *testing.T) {
	c := parse(t, "../../../testdata/demo.zap")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	res, err := Margins(ctx, c, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Interrupted || len(res.Margins) != 0 {
		t.Errorf("cancelled before the start: interrupted %v with %d searches; want true and 0", res.Interrupted, len(res.Margins))
	}
}
