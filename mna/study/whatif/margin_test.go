package whatif

import (
	"context"
	"math"
	"testing"

	"zapnet/mna/study"
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
	c := parse(t, "../../../testdata/demo-weak.zap")
	const top, step = 8000.0, 200.0
	var levels []float64
	for k := 1; float64(k)*step <= top; k++ {
		levels = append(levels, float64(k)*step)
	}
	jobs, err := study.Jobs(c, &study.Options{Levels: levels, Polarities: []string{"pos", "neg"}})
	if err != nil {
		t.Fatal(err)
	}
	runs, err := study.Execute(context.Background(), c, jobs, &study.Options{Levels: levels, Polarities: []string{"pos", "neg"}}, nil)
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
		// The curve is the search's own solves: one point per solve, in
		// rising level, each the worst margin the study finds at that level
		// on its own [calc].
		if len(m.Curve) != m.Solves {
			t.Errorf("%s: %d curve points for %d solves", m.Polarity, len(m.Curve), m.Solves)
		}
		for k, p := range m.Curve {
			if k > 0 && !(p.Level > m.Curve[k-1].Level) {
				t.Errorf("%s: curve levels not rising at %d: %g after %g", m.Polarity, k, p.Level, m.Curve[k-1].Level)
			}
			for _, r := range runs {
				if r.Polarity == m.Polarity && r.Level == p.Level {
					if math.Abs(r.Worst.Percent-p.Percent) > 1e-9 || p.Pass != (r.Verdict == study.Pass) {
						t.Errorf("%s %g V: curve %.6g %% pass %v, study %.6g %% %s", m.Polarity, p.Level, p.Percent, p.Pass, r.Worst.Percent, r.Verdict)
					}
				}
			}
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
	if !searchSerially(context.Background(), &m, 100, 16, 100, verdict) {
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
	searchSerially(context.Background(), &m, 100, 16, 100, func(float64) (outcome, error) { return outcome{}, nil })
	if m.MaxPass != nil || ptr(m.FirstFail) != 100 || !m.Monotonic {
		t.Errorf("always failing: pass %v fail %v monotonic %v; want none, 100, true", ptr(m.MaxPass), ptr(m.FirstFail), m.Monotonic)
	}
	// Always passing: the top of the range, no failure.
	m = Margin{LevelUnit: "V"}
	searchSerially(context.Background(), &m, 100, 16, 100, func(float64) (outcome, error) { return outcome{pass: true}, nil })
	if ptr(m.MaxPass) != 10000 || m.FirstFail != nil || m.Solves != 16 {
		t.Errorf("always passing: pass %v fail %v after %d solves; want 10000, none, 16", ptr(m.MaxPass), ptr(m.FirstFail), m.Solves)
	}
}

// TestSearchCurve drives the search with a made-up margin falling linearly
// from 100 % at no level to 0 at 4.25 kV [calc]: the curve holds every
// solve once, in rising level, with the margin of that level, and brackets
// the answer: not negative at the highest pass, negative at the first
// failure.
func TestSearchCurve(t *testing.T) {
	percent := func(level float64) float64 { return 100 * (4250 - level) / 4250 }
	m := Margin{LevelUnit: "V", Polarity: "pos"}
	searchSerially(context.Background(), &m, 100, 16, 100, func(level float64) (outcome, error) {
		p := percent(level)
		return outcome{pass: p >= 0, worst: &study.Limit{Element: "U1", Param: "vmax", Percent: p}}, nil
	})
	if ptr(m.MaxPass) != 4200 || ptr(m.FirstFail) != 4300 {
		t.Fatalf("pass %v fail %v, want 4200 and 4300", ptr(m.MaxPass), ptr(m.FirstFail))
	}
	if len(m.Curve) != m.Solves || m.Solves <= 16 {
		t.Errorf("%d curve points for %d solves; want one per solve, the scan of 16 and a bisection", len(m.Curve), m.Solves)
	}
	seen := map[float64]bool{}
	for k, p := range m.Curve {
		if k > 0 && !(p.Level > m.Curve[k-1].Level) {
			t.Errorf("levels not rising at %d: %g after %g", k, p.Level, m.Curve[k-1].Level)
		}
		if p.Percent != percent(p.Level) || p.Pass != (p.Percent >= 0) {
			t.Errorf("%g V: %g %% pass %v, want %g %%", p.Level, p.Percent, p.Pass, percent(p.Level))
		}
		seen[p.Level] = true
	}
	if !seen[4200] || !seen[4300] {
		t.Errorf("the curve lacks the highest pass or the first failure: %v", m.Curve)
	}

	// A deck without limits has no margin to draw: NaN, not zero.
	m = Margin{LevelUnit: "V"}
	searchSerially(context.Background(), &m, 10, 4, 100, func(float64) (outcome, error) { return outcome{pass: true}, nil })
	if len(m.Curve) != 4 || !math.IsNaN(m.Curve[0].Percent) {
		t.Errorf("no limits: curve %v, want 4 points of NaN", m.Curve)
	}
}

func TestMarginInterrupted(t *testing.T) {
	c := parse(t, "../../../testdata/demo-weak.zap")
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

// searchSerially is the scan and the bisection done one solve after the other,
// as the parallel search does them (finishSearch after the scan).
func searchSerially(ctx context.Context, m *Margin, steps, scan int, step float64, solveAt func(level float64) (outcome, error)) bool {
	grid := scanGrid(steps, scan)
	res := make([]scanned, len(grid))
	for i, g := range grid {
		if ctx.Err() != nil {
			return false
		}
		o, err := solveAt(float64(g) * step)
		res[i] = scanned{o, err}
	}
	return finishSearch(ctx, m, grid, res, step, solveAt)
}

// The check of a bracket solves its two levels again and says which verdict
// flipped; a bracket with no failure in range checks its pass only
// [practice: a verdict that flips with a tenfold tighter accuracy is
// within the solver's error].
func TestCheckBracket(t *testing.T) {
	pass, fail := 5300.0, 5400.0
	for _, c := range []struct {
		passes             func(float64) bool
		passHolds, failHol bool
	}{
		{func(l float64) bool { return l < 5350 }, true, true},
		{func(l float64) bool { return l < 5450 }, true, false},
		{func(l float64) bool { return l < 5250 }, false, true},
	} {
		m := &Margin{MaxPass: &pass, FirstFail: &fail, LevelUnit: "V"}
		var solved []float64
		err := checkBracket(m, 0.002, func(l float64) (outcome, error) {
			solved = append(solved, l)
			return outcome{pass: c.passes(l)}, nil
		})
		if err != nil || len(solved) != 2 || m.Check == nil || m.Check.Tighter != 0.0002 ||
			m.Check.PassHolds != c.passHolds || m.Check.FailHolds != c.failHol {
			t.Errorf("check %+v after solving %v (%v), want pass %v fail %v", m.Check, solved, err, c.passHolds, c.failHol)
		}
	}
	top := 16000.0
	m := &Margin{MaxPass: &top, LevelUnit: "V"}
	n := 0
	if err := checkBracket(m, 0.002, func(float64) (outcome, error) { n++; return outcome{pass: true}, nil }); err != nil || n != 1 || !m.Check.FailHolds {
		t.Errorf("no failure in range: %d solves, %+v", n, m.Check)
	}
}
