package report

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/study/whatif"
)

func init() {
	// The what-if tables' word columns, aligned left like the others.
	for _, h := range []string{"param", "limiting", "at accuracy/10", "measure", "monotonic", "note", "worst at", "distribution", "condition"} {
		textColumns[h] = true
	}
}

// heading prints the title and deck line the run tables start with.
func heading(w io.Writer, title, deck, what string) {
	if s := titleLine(title, deck); s != "" {
		fmt.Fprintln(w, s)
	}
	fmt.Fprintf(w, "\n%s\n", what)
}

// rankingTitle heads the ranking of variants, in the terminal and the page.
const rankingTitle = "Variants ranked by worst margin over every level and polarity"

// VariantRanking prints the variants of a sweep ranked by their worst margin
// over every level and polarity, the most margin first.
func VariantRanking(w io.Writer, ranks []whatif.VariantRank) error {
	ew := &CheckedWriter{W: w}
	fmt.Fprintln(ew, "\n"+rankingTitle)
	head, rows := rankingRows(ranks)
	writeTable(ew, head, rows)
	return ew.Err
}

// rankingRows are the ranking's table, one row per variant.
func rankingRows(ranks []whatif.VariantRank) (head []string, rows [][]string) {
	head = []string{"rank", "variant", "worst margin", "worst at", "PASS", "FAIL"}
	for _, r := range ranks {
		worst, at := "no limits", "-"
		switch {
		case r.Unsolved > 0:
			worst = fmt.Sprintf("%d runs not solved", r.Unsolved)
		case r.Worst != nil:
			worst = r.Worst.String()
			at = si(r.WorstLevel, r.LevelUnit) + " " + r.WorstPolarity
		}
		rows = append(rows, []string{fmt.Sprint(r.Rank), r.Variant.String(), worst, at,
			fmt.Sprint(r.Passed), fmt.Sprint(r.Failed)})
	}
	return head, rows
}

// MarginTable prints a margin search: per variant and polarity the highest
// passing level, the first failing one and the limit that fails.
func MarginTable(w io.Writer, r *whatif.MarginResult, title, deck string) error {
	ew := &CheckedWriter{W: w}
	heading(ew, title, deck, fmt.Sprintf("Margin search: %s up to %s in steps of %s", r.Waveform,
		si(r.Max, r.LevelUnit), si(r.Resolution, r.LevelUnit)))
	head := []string{"variant", "polarity", "highest pass", "first fail", "limiting", "monotonic", "solves"}
	checked := false
	for _, m := range r.Margins {
		checked = checked || m.Check != nil
	}
	if checked {
		head = append(head, "at accuracy/10")
	}
	var rows [][]string
	var notes []string
	for _, m := range r.Margins {
		pass, fail, mono := "none", "none in range", "yes"
		if m.MaxPass != nil {
			pass = si(*m.MaxPass, m.LevelUnit)
		}
		if m.FirstFail != nil {
			fail = si(*m.FirstFail, m.LevelUnit)
		}
		if !m.Monotonic {
			mono = "NO"
		}
		limiting := m.Limiting
		if m.Error != "" {
			pass, fail, mono, limiting = "-", "-", "-", "not solved"
			notes = append(notes, fmt.Sprintf("%s %s: %s", m.Variant.String(), m.Polarity, m.Error))
		} else if m.Note != "" {
			notes = append(notes, fmt.Sprintf("%s %s: %s", m.Variant.String(), m.Polarity, m.Note))
		}
		row := []string{m.Variant.String(), m.Polarity, pass, fail, limiting, mono, fmt.Sprint(m.Solves)}
		if checked {
			check, note := marginCheckText(m.Check)
			row = append(row, check)
			if note != "" {
				notes = append(notes, fmt.Sprintf("%s %s: %s", m.Variant.String(), m.Polarity, note))
			}
		}
		rows = append(rows, row)
	}
	writeTable(ew, head, rows)
	for _, n := range notes {
		fmt.Fprintf(ew, "Note: %s\n", n)
	}
	if r.Interrupted {
		fmt.Fprintln(ew, "Interrupted: the searches above finished; the others did not run.")
	}
	fmt.Fprintln(ew)
	fmt.Fprintln(ew, Caution)
	return ew.Err
}

// marginCheckText is a margin's check column and, when a verdict flips or
// the check failed, a note.
func marginCheckText(c *whatif.MarginCheck) (col, note string) {
	switch {
	case c == nil:
		return "-", ""
	case c.Error != "":
		return "not solved", "the check at a tenth of the accuracy failed: " + c.Error
	case c.PassHolds && c.FailHolds:
		return "holds", ""
	}
	return "FLIPS", "at a tenth of the accuracy the bracket's verdicts change: the failure level is within the solver's error; tighten the window's accuracy= and search again"
}

// SensitivityTable prints the parameters ranked by what ±step does to the
// worst margin.
func SensitivityTable(w io.Writer, r *whatif.SensitivityResult, title, deck string) error {
	ew := &CheckedWriter{W: w}
	pct := spec.FormatFraction(r.Step)
	which := "worst margin"
	if r.Limit != "" {
		which = "margin of " + strings.Replace(r.Limit, ".", " ", 1)
	}
	heading(ew, title, deck, fmt.Sprintf("Sensitivity: each parameter ±%s, effect on the %s", pct, which))
	if len(r.Variant) > 0 {
		fmt.Fprintf(ew, "Design: %s\n", r.Variant.String())
	}
	fmt.Fprintf(ew, "Baseline %s: %s (%s)\n", which, percentText(r.Baseline), r.BaselineLimiting)
	head := []string{"rank", "param", "nominal", "−" + pct, "+" + pct, "effect", "limiting"}
	t := newTable(ew, head)
	t.Header(toAny(head)...)
	for i, p := range r.Parameters {
		if p.Error != "" {
			t.Append(toAny([]string{fmt.Sprint(i + 1), p.Param, si(p.Nominal, p.Unit), "-", "-", "-", "not solved: " + p.Error})...)
			continue
		}
		lim := p.LimitingPlus
		if p.LimitingMinus != p.LimitingPlus {
			lim = p.LimitingMinus + " / " + p.LimitingPlus
		}
		t.Append(toAny([]string{fmt.Sprint(i + 1), p.Param, si(p.Nominal, p.Unit),
			percentText(p.Minus10), percentText(p.Plus10), signedPoints(p.Effect), lim})...)
	}
	t.Render()
	fmt.Fprintf(ew, "effect: percentage points of %s gained by raising the parameter %s (negative: lowering it buys margin).\n", which, pct)
	fmt.Fprintln(ew, "Effects of a few hundredths of a point are within the solver's tolerance.")
	for _, s := range r.Skipped {
		fmt.Fprintf(ew, "Skipped %s: %s\n", s.Param, s.Reason)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(ew, "Note: %s\n", n)
	}
	if r.Interrupted {
		fmt.Fprintln(ew, "Interrupted: the parameters above finished; the others did not run.")
	}
	fmt.Fprintln(ew)
	fmt.Fprintln(ew, Caution)
	return ew.Err
}

func signedPoints(v float64) string {
	if math.Abs(v) < 0.0005 {
		v = 0
	}
	return fmt.Sprintf("%+.3f", v)
}

// SpreadTable prints a spread: the tolerances drawn, the pass fraction with
// its 95 % interval, and the percentiles of every measurement, over all
// conditions and per level and polarity.
func SpreadTable(w io.Writer, r *whatif.SpreadResult, title, deck string) error {
	ew := &CheckedWriter{W: w}
	heading(ew, title, deck, fmt.Sprintf("Spread: %d circuits drawn with seed %d", r.Runs, r.Seed))
	if len(r.Variant) > 0 {
		fmt.Fprintf(ew, "Design: %s\n", r.Variant.String())
	}
	var tol [][]string
	for _, t := range r.Tolerances {
		tol = append(tol, []string{t.Param, si(t.Nominal, t.Unit), fmt.Sprintf("±%s %%", strconv.FormatFloat(t.Percent, 'g', 6, 64)), t.Dist})
	}
	section(ew, "Tolerances", []string{"param", "nominal", "tolerance", "distribution"}, tol)

	fmt.Fprintf(ew, "Passed at every level and polarity: %d of %d solved (%s), 95 %% interval %s to %s (Wilson)\n",
		r.Passed, r.Solved, fractionText(r.PassFraction), fractionText(r.CI95[0]), fractionText(r.CI95[1]))
	if r.Unsolved > 0 {
		fmt.Fprintf(ew, "%d circuits could not be solved and are left out.\n", r.Unsolved)
	}
	fmt.Fprintln(ew)
	section(ew, "Worst case over the levels and polarities, per circuit", percentileHead(), percentileRows(r.Measures, r.Percentiles))
	if r.PercentileError > 0 {
		fmt.Fprintf(ew, "Above %d circuits the percentiles are read from a sketch: each within %s %% of its exact value (max and the counts are exact).\n\n",
			r.ExactUpTo, strconv.FormatFloat(100*r.PercentileError, 'g', -1, 64))
	}
	if len(r.Conditions) > 1 {
		var rows [][]string
		for _, c := range r.Conditions {
			rows = append(rows, []string{si(c.Level, r.LevelUnit) + " " + c.Polarity, fmt.Sprint(c.Passed),
				fractionText(c.PassFraction), fractionText(c.CI95[0]) + " to " + fractionText(c.CI95[1])})
		}
		section(ew, "Per level and polarity", []string{"condition", "passed", "pass fraction", "95 % interval"}, rows)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(ew, "Note: %s\n", n)
	}
	if r.Shard != nil {
		fmt.Fprintf(ew, "Shard %d/%d: these statistics are of this shard's circuits only; merge the shards for the study's.\n", r.Shard.Index, r.Shard.Count)
	}
	if r.Interrupted {
		fmt.Fprintf(ew, "Interrupted: %d of %d circuits finished; the statistics are of those.\n", r.Solved+r.Unsolved, r.Runs)
	}
	fmt.Fprintln(ew, Caution)
	return ew.Err
}

// fractionText renders a fraction as a percentage that keeps two significant
// digits near 0 % and 100 %, where a spread's interval bounds sit: the upper
// bound of 0 passes in 10,000 is 0.038 %, not "0.0 %".
func fractionText(f float64) string {
	p := 100 * f
	switch {
	case p > 0 && p < 1:
		return fmt.Sprintf("%.2g %%", p)
	case p > 99 && p < 100:
		return fmt.Sprintf("%.*f %%", max(1, int(math.Ceil(-math.Log10(100-p)))+1), p)
	}
	return fmt.Sprintf("%.1f %%", p)
}

func percentileHead() []string {
	return []string{"measure", "p1", "p5", "p50", "p95", "p99", "max"}
}

func percentileRows(measures []string, ps map[string]whatif.Percentiles) [][]string {
	var rows [][]string
	for _, m := range measures {
		p := ps[m]
		f := func(v float64) string {
			if p.N == 0 {
				return "-"
			}
			if m == "worst_margin" {
				return percentText(v)
			}
			return si(v, measureUnit(m))
		}
		rows = append(rows, []string{m, f(p.P1), f(p.P5), f(p.P50), f(p.P95), f(p.P99), f(p.Max)})
	}
	return rows
}

// measureUnit is the SI unit of a spread measurement by its name.
func measureUnit(m string) spec.Unit {
	switch {
	case strings.HasSuffix(m, ".energy"):
		return "J"
	case strings.HasSuffix(m, ".peak_current"):
		return "A"
	case strings.Contains(m, ".residual."):
		return "V"
	}
	return ""
}
