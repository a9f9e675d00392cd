package waveforms

import (
	"math"
	"sort"
	"testing"
)

func TestNamesAndLookup(t *testing.T) {
	names := Names()
	if !sort.StringsAreSorted(names) || len(names) != len(Catalogue()) {
		t.Fatalf("names %v", names)
	}
	for _, n := range names {
		w := Lookup(n)
		if w == nil || w.Name != n || w.Summary == "" || !(w.Level > 0) {
			t.Errorf("%s: %+v", n, w)
		}
	}
	if Lookup("nope") != nil {
		t.Error("unknown name found")
	}
}

// Absent keys take the documented defaults: the same stimulus as giving
// them explicitly.
func TestDefaultsEqualExplicit(t *testing.T) {
	for _, c := range []struct {
		name string
		num  map[string]float64
	}{
		{"iso10605", map[string]float64{"c": 150e-12, "r": 330, "l": 0}},
		{"hbm", map[string]float64{"l": hbmL}},
		{"surge-1.2-50", map[string]float64{"r": 2}},
		{"tlp", map[string]float64{"width": 100e-9, "rise": 1e-9}},
		{"eft", map[string]float64{"count": 1, "rate": 5e3}},
	} {
		a, err1 := mk(c.name, 1000, nil, nil)
		b, err2 := mk(c.name, 1000, c.num, nil)
		if err1 != nil || err2 != nil {
			t.Fatal(err1, err2)
		}
		if a.R != b.R || a.C != b.C || a.L != b.L || a.Stop != b.Stop || len(a.Breakpoints) != len(b.Breakpoints) {
			t.Errorf("%s: defaults %+v differ from explicit %+v", c.name, a, b)
		}
		for _, x := range []float64{1e-9, 3e-8, 1e-6} {
			if a.F != nil && a.F(x) != b.F(x) {
				t.Errorf("%s: F(%g) differs", c.name, x)
			}
		}
	}
}

// Every stimulus keeps the contract of Stimulus: F is 0 for t <= 0,
// breakpoints ascend from 0, the span is positive, and the check points at
// the default level and load are all met except the one the surge-1.2-50
// note documents [pub/mem/calc: CHECKS.md, per check].
func TestEveryWaveformContract(t *testing.T) {
	for _, n := range Names() {
		if n == "pwl" {
			continue
		}
		info := Lookup(n)
		s, err := mk(n, info.Level, nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		if s.Form != Network && s.Form != Generator && (s.F(0) != 0 || s.F(-1e-9) != 0) {
			t.Errorf("%s: F not zero at t <= 0", n)
		}
		if s.Breakpoints[0] != 0 || !sort.Float64sAreSorted(s.Breakpoints) || !(s.Stop > s.Breakpoints[len(s.Breakpoints)-1]) {
			t.Errorf("%s: breakpoints %v, stop %g", n, s.Breakpoints, s.Stop)
		}
		if s.Form == Generator {
			// Solved by the engine: SolvedChecks, tested in package mna.
			if err := s.Gen.Check(); err != nil {
				t.Errorf("%s: %v", n, err)
			}
			if _, err := Checks(s, DefaultLoad); err == nil {
				t.Errorf("%s: a generator circuit checked in closed form", n)
			}
			continue
		}
		cs, err := Checks(s, DefaultLoad)
		if err != nil || len(cs) == 0 {
			t.Fatalf("%s: %v, %d checks", n, err, len(cs))
		}
		for _, c := range cs {
			if c.Source == "" || c.Ref == "" || c.Tol == "" || math.IsNaN(c.Computed) {
				t.Errorf("%s: incomplete check %+v", n, c)
			}
			if !c.Within && !(n == "surge-1.2-50" && c.Quantity == "short-circuit front (8/20)") {
				t.Errorf("%s: %s = %s outside %s %s", n, c.Quantity, FormatValue(c.Computed, c.Unit), FormatValue(c.Published, c.Unit), c.Tol)
			}
		}
	}
	if _, err := Checks(nil, 0); err == nil {
		t.Error("nil stimulus checked")
	}
}

// Sample keeps every breakpoint and its chords stay within the tolerance
// of the function between samples [calc: the refinement rule].
func TestSampleAccuracy(t *testing.T) {
	for _, n := range []string{"iec61000-4-2", "hbm", "tlp", "eft", "surge-8-20"} {
		info := Lookup(n)
		s, _ := mk(n, info.Level, nil, nil)
		load := PrescribedLoad(n)
		ts, is, _ := Sample(s, load, 1e-4)
		pk, _ := AbsPeak(ts, is)
		for _, b := range append(s.Breakpoints, s.Stop) {
			k := sort.SearchFloat64s(ts, b)
			if k == len(ts) || ts[k] != b {
				t.Errorf("%s: breakpoint %g not sampled", n, b)
			}
		}
		worst := 0.0
		for k := 1; k < len(ts); k++ {
			for _, f := range []float64{0.25, 0.5, 0.75} {
				x := ts[k-1] + f*(ts[k]-ts[k-1])
				i, _ := s.Into(load, x)
				worst = math.Max(worst, math.Abs(i-ValueAt(ts, is, x)))
			}
		}
		// Midpoints are held to 1e-4; quarter points of a convex piece
		// can be up to 3/4 of that error, so 2e-4 bounds both.
		if worst > 2e-4*pk {
			t.Errorf("%s: interpolation error %.3g of the peak with %d samples", n, worst/pk, len(ts))
		}
		if len(ts) > 5000 {
			t.Errorf("%s: %d samples for a 1e-4 tolerance", n, len(ts))
		}
	}
}

func TestFormatValue(t *testing.T) {
	for _, c := range []struct {
		v    float64
		unit string
		want string
	}{
		{14.9213, "A", "14.92 A"},
		{8.1102e-10, "s", "811 ps"},
		{2.5e-6, "H", "2.5 µH"},
		{4000, "V", "4 kV"},
		{0, "V", "0 V"},
		{math.NaN(), "V", "-"},
		{math.Inf(1), "Ω", "inf Ω"},
		{-0.5, "A", "-500 mA"},
		{999.99, "V", "1 kV"},
		{12.5, "%", "12.5 %"},
	} {
		if got := FormatValue(c.v, c.unit); got != c.want {
			t.Errorf("FormatValue(%g, %q) = %q, want %q", c.v, c.unit, got, c.want)
		}
	}
}
