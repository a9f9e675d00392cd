package plots

import (
	"math/rand/v2"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// An invented deck for the ratings the histograms draw: vmax on the pin,
// emax on the clamp.
const spreadTestDeck = `title "Histogram test"
strike    zap   tip  gnd  waveform=iec61000-4-2 level=4k polarity=pos
inductor  Lpad  tip  n1   1n
clamp     D1    n1   gnd  vbr=6.8V rdyn=0.5ohm ls=1n cj=5p polarity=bi emax=1m
pin       U1    n1   gnd  cin=5p vmax=45V
`

// spreadOf builds a spread of the given per-circuit values, two conditions
// each, as whatif.Spreads would (measures in its order), its percentiles
// exact up to exact circuits (0: whatif's default).
func spreadOf(peaks, energies [][2]float64, exact int) *whatif.SpreadResult {
	res := &whatif.SpreadResult{Seed: 9, Runs: len(peaks), ExactUpTo: exact,
		Conditions: []whatif.Condition{{Level: 4e3, Polarity: "pos"}, {Level: 4e3, Polarity: "neg"}},
		Measures:   []string{"U1.residual.peak", "U1.residual.min", "D1.energy", "D1.peak_current", "worst_margin"}}
	for k := range peaks {
		s := whatif.Sample{Index: k, Verdicts: []string{"PASS", "PASS"}}
		for ci := 0; ci < 2; ci++ {
			s.Values = append(s.Values, []float64{peaks[k][ci], -1, energies[k][ci], 10, 5})
		}
		res.Samples = append(res.Samples, s)
	}
	whatif.SummariseSamples(res)
	// Half the circuits failed a limit drawn in none of the histograms
	// (the pin's vmin, say).
	res.Passed, res.PassFraction = len(peaks)/2, 0.5
	res.CI95[0], res.CI95[1] = whatif.Wilson95(len(peaks)/2, len(peaks))
	return res
}

// One histogram per pin peak and clamp energy, named as the files will be;
// each circuit counts with its worst strike (the spread's percentiles are of
// those, OUTPUT.md [practice]); a rating near the data is drawn, one far
// off is only named.
func TestSpreadHistograms(t *testing.T) {
	c, err := netlist.Parse("h.zap", []byte(spreadTestDeck))
	if err != nil {
		t.Fatal(err)
	}
	peaks := [][2]float64{{40, 41}, {42, 39}, {43.5, 38}, {41, 41.2}, {40.5, 44}, {39, 42.5}}
	energies := [][2]float64{{2e-6, 3e-6}, {4e-6, 1e-6}, {3.5e-6, 3e-6}, {2.5e-6, 5e-6}, {3e-6, 2e-6}, {1e-6, 4.5e-6}}
	res := spreadOf(peaks, energies, 0)

	// The worst of {40, 41}, {42, 39}, ... is the larger of each pair.
	if got, want := res.Worst("U1.residual.peak").Values(), []float64{41, 41.2, 42, 42.5, 43.5, 44}; !slices.Equal(got, want) {
		t.Errorf("worst peaks %v, want %v", got, want)
	}

	figs, err := SpreadHistograms(c.Title, c, res, nil)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, f := range figs {
		names = append(names, f.Name)
	}
	if want := []string{"spread-U1-peak", "spread-D1-energy"}; !slices.Equal(names, want) {
		t.Fatalf("figures %q, want %q", names, want)
	}
	peak, energy := figs[0], figs[1]
	// The median of the six worst peaks (41, 41.2, 42, 42.5, 43.5, 44) is
	// the mean of the middle two, 42.25 [calc: the sample median of an
	// even count].
	for _, w := range []string{"circuits (6)", "p50 42.25 V", "vmax 45 V"} {
		if !slices.Contains(peak.Series, w) {
			t.Errorf("peak series %q lack %q", peak.Series, w)
		}
	}
	texts, _ := svgText(t, "peak", peak.SVG)
	for _, w := range []string{"Histogram test", "Residual peak of U1, worst over each circuit's strikes", "residual peak (V)", "circuits", "vmax 45 V"} {
		if !slices.Contains(texts, w) {
			t.Errorf("peak figure: no text %q in %q", w, texts)
		}
	}
	// Every peak is within vmax = 45 V while the spread's circuits failed
	// elsewhere (PassFraction 0.5 here): the heading tells the two apart.
	if !slices.ContainsFunc(texts, func(s string) bool {
		return strings.HasPrefix(s, "6 circuits, seed 9; within vmax: 100.0 % (95 %: ") && strings.HasSuffix(s, "every limit met by 50.0 %")
	}) {
		t.Errorf("peak figure: the heading does not give the count, seed and the fractions: %q", texts)
	}
	// Energies of a few µJ against emax = 1 mJ: off the scale, named.
	texts, _ = svgText(t, "energy", energy.SVG)
	for _, w := range []string{"energy (µJ)", "emax 1 mJ, off scale right"} {
		if !slices.Contains(texts, w) {
			t.Errorf("energy figure: no text %q in %q", w, texts)
		}
	}

	// A rating far below every circuit lies off the scale on the left.
	if err := c.Element("U1").Values.Set("vmax", 5); err != nil {
		t.Fatal(err)
	}
	figs, err = SpreadHistograms("", c, res, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(figs[0].Series, "vmax 5 V, off scale left") {
		t.Errorf("peak series %q lack the vmax off scale on the left", figs[0].Series)
	}

	// Every circuit alike: the bins still get a width.
	same := spreadOf([][2]float64{{40, 40}, {40, 40}}, [][2]float64{{1e-6, 1e-6}, {1e-6, 1e-6}}, 0)
	if _, err := SpreadHistograms("", c, same, nil); err != nil {
		t.Errorf("identical circuits: %v", err)
	}
	if _, err := SpreadHistograms("", c, &whatif.SpreadResult{}, nil); err == nil {
		t.Error("a spread without solved circuits drew figures")
	}
}

// Above the spread's exact count the histogram is drawn from the sketch:
// every bar spans whole buckets, so its height is the exact count of the
// circuits between its edges [calc: counting the values themselves], the
// bars add up to every circuit, and a rating inside a bucket gives the
// fraction within it as a range that holds the exact fraction.
func TestSpreadHistogramsFromSketch(t *testing.T) {
	c, err := netlist.Parse("h.zap", []byte(spreadTestDeck))
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	var peaks, energies [][2]float64
	for range 400 {
		peaks = append(peaks, [2]float64{40 + 2*rng.NormFloat64(), 40 + 2*rng.NormFloat64()})
		energies = append(energies, [2]float64{3e-6 * (1 + 0.1*rng.NormFloat64()), 3e-6 * (1 + 0.1*rng.NormFloat64())})
	}
	res := spreadOf(peaks, energies, 50)
	worst := make([]float64, len(peaks))
	for k, p := range peaks {
		worst[k] = max(p[0], p[1])
	}
	slices.Sort(worst)
	tally := res.Worst("U1.residual.peak")
	if tally.Exact() || res.PercentileError == 0 {
		t.Fatal("400 circuits over an exact count of 50 must be a sketch")
	}
	bins, _ := spreadBins(tally, worst[0], worst[len(worst)-1], 1)
	total := 0.0
	for i, b := range bins {
		total += b.Weight
		if i > 0 && b.Weight > 0 && bins[i-1].Weight > 0 && b.Min < bins[i-1].Max {
			t.Errorf("bars %d and %d overlap: [%g, %g] and [%g, %g]", i-1, i, bins[i-1].Min, bins[i-1].Max, b.Min, b.Max)
		}
		if b.Weight == 0 {
			continue
		}
		n := 0
		for _, v := range worst {
			if v >= b.Min*(1-1e-12) && v <= b.Max*(1+1e-12) {
				n++
			}
		}
		if float64(n) != b.Weight {
			t.Errorf("bar %d [%g, %g] is %g high; %d circuits lie in it", i, b.Min, b.Max, b.Weight, n)
		}
	}
	if total != 400 {
		t.Errorf("the bars hold %g circuits, want 400", total)
	}

	// vmax at the median: the bucket around it leaves a range.
	median := worst[200]
	if err := c.Element("U1").Values.Set("vmax", median); err != nil {
		t.Fatal(err)
	}
	figs, err := SpreadHistograms("", c, res, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(figs[0].Series, "circuits (400)") || !strings.Contains(figs[0].Caption, "sketch's buckets") {
		t.Errorf("sketch histogram: series %q, caption %q", figs[0].Series, figs[0].Caption)
	}
	k := 0
	for _, v := range worst {
		if v <= median {
			k++
		}
	}
	m := regexp.MustCompile(`within vmax: ([0-9.]+)–([0-9.]+) %`).FindStringSubmatch(figs[0].Caption)
	if m == nil {
		t.Fatalf("the fraction within vmax is not a range: %q", figs[0].Caption)
	}
	lo, _ := strconv.ParseFloat(m[1], 64)
	hi, _ := strconv.ParseFloat(m[2], 64)
	if exact := 100 * float64(k) / 400; exact < lo-0.05 || exact > hi+0.05 {
		t.Errorf("within vmax %g–%g %%, the exact fraction %g %% outside", lo, hi, exact)
	}
}
