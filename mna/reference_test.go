package mna_test

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"zapnet/mna"
	"zapnet/netlist"
)

// The decks and the expected values of this file are an independent
// solution of the same networks: hand-written ODEs from MODELS.md and the
// IEC 61000-4-2 annex current of CHECKS.md, integrated with SciPy's Radau at
// rtol 1e-10 ([calc] SciPy Radau reference, testdata/reference/README.md,
// which gives the exact command, versions and equations). Its own error,
// estimated by repeating the solve at rtol 1e-8, is below 1e-7 relative on
// every quantity compared here, so the 0.5 % budget is the engine's.

const refDir = "../testdata/reference"

// refTol is the agreement asked of the engine on every compared quantity
// [practice: 0.5 % is the budget of issue 3 for the engine against an
// independent stiff solver].
const refTol = 0.005

// refRow is one line of summary.csv.
type refRow struct {
	network, quantity, unit string
	value, time, change     float64
}

func readSummary(t *testing.T) []refRow {
	t.Helper()
	f, err := os.Open(filepath.Join(refDir, "summary.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	r.FieldsPerRecord = 6
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) < 2 || recs[0][0] != "network" {
		t.Fatalf("summary.csv: no header line")
	}
	var rows []refRow
	for _, rec := range recs[1:] {
		var num [3]float64
		for k, s := range []string{rec[2], rec[4], rec[5]} {
			if num[k], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("summary.csv: %v", err)
			}
		}
		rows = append(rows, refRow{network: rec[0], quantity: rec[1], unit: rec[3],
			value: num[0], time: num[1], change: num[2]})
	}
	return rows
}

// runDeck solves a reference deck as the command would: the deck's strike
// at its first level and polarity, over its window.
func runDeck(t *testing.T, name string, set mna.Settings) (*mna.System, *mna.Result) {
	t.Helper()
	c, err := netlist.ParseFile(filepath.Join(refDir, name+".zap"))
	if err != nil {
		t.Fatal(err)
	}
	strike := c.Strike()
	if strike == nil || len(strike.Levels) != 1 {
		t.Fatalf("%s: want one strike with one level", name)
	}
	st, err := strike.Waveform.New(strike.Levels[0], &strike.Values)
	if err != nil {
		t.Fatal(err)
	}
	sign := 1.0
	switch strike.Polarity {
	case "pos":
	case "neg":
		sign = -1
	default:
		t.Fatalf("%s: polarity %q, want pos or neg", name, strike.Polarity)
	}
	sys, err := mna.Compile(c)
	if err != nil {
		t.Fatal(err)
	}
	set.Stop, set.Record = c.Window.Stop, true
	res, err := sys.Transient(st, sign, &set)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(res.Stop-c.Window.Stop) > 1e-15 {
		t.Fatalf("%s: simulated %g s, want the deck's window %g s", name, res.Stop, c.Window.Stop)
	}
	return sys, res
}

func indexOf(list []string, name string) int {
	for i, n := range list {
		if n == name {
			return i
		}
	}
	return -1
}

// engineValue is the engine's counterpart of a summary quantity, or ok =
// false when the summary names something the test does not compare.
func engineValue(t *testing.T, sys *mna.System, res *mna.Result, q string) (v float64, ok bool) {
	t.Helper()
	switch {
	case strings.HasPrefix(q, "max v(") || strings.HasPrefix(q, "min v("):
		node := strings.TrimSuffix(q[len("max v("):], ")")
		i := indexOf(sys.Nodes(), node)
		if i < 0 {
			t.Fatalf("%s: no node %q in %v", q, node, sys.Nodes())
		}
		v = res.V[i][0]
		for _, x := range res.V[i] {
			if q[:3] == "max" {
				v = math.Max(v, x)
			} else {
				v = math.Min(v, x)
			}
		}
		return v, true
	case strings.HasPrefix(q, "peak |i(") && strings.HasSuffix(q, ")|"):
		el := strings.TrimSuffix(q[len("peak |i("):], ")|")
		i := indexOf(sys.Elements(), el)
		if i < 0 {
			t.Fatalf("%s: no element %q in %v", q, el, sys.Elements())
		}
		return res.PeakCurrent[i], true
	case strings.HasPrefix(q, "energy ") && q != "energy balance":
		el := strings.TrimPrefix(q, "energy ")
		i := indexOf(sys.Elements(), el)
		if i < 0 {
			t.Fatalf("%s: no element %q in %v", q, el, sys.Elements())
		}
		return res.Energy[i], true
	}
	return 0, false
}

// compare runs both decks with set and checks every compared quantity of
// summary.csv against the engine: voltages and currents within peakTol,
// energies within energyTol (relative).
func compare(t *testing.T, set mna.Settings, peakTol, energyTol float64) {
	rows := readSummary(t)
	for _, name := range []string{"net-a", "net-b"} {
		t.Run(name, func(t *testing.T) {
			sys, res := runDeck(t, name, set)
			t.Logf("%d steps, %d rejected, %d Newton iterations", res.Stats.Steps, res.Stats.Rejected, res.Stats.Newton)
			strikeE := 0.0
			for _, r := range rows {
				if r.network == name && r.quantity == "energy zap" {
					strikeE = math.Abs(r.value)
				}
			}
			if strikeE == 0 {
				t.Fatalf("summary.csv: no strike energy for %s", name)
			}
			n := 0
			for _, r := range rows {
				if r.network != name {
					continue
				}
				got, ok := engineValue(t, sys, res, r.quantity)
				if !ok {
					continue
				}
				if r.unit == "J" && math.Abs(r.value) < 1e-3*strikeE {
					t.Logf("%-16s reference %.6g J, zapnet %.6g J (not compared: under 0.1 %% of the strike's energy)",
						r.quantity, r.value, got)
					continue
				}
				n++
				if r.change > 1e-6*math.Abs(r.value) {
					t.Errorf("summary.csv: %s %s changes by %.3g between rtol 1e-8 and 1e-10: the reference is not converged",
						name, r.quantity, r.change)
				}
				tol := peakTol
				if r.unit == "J" {
					tol = energyTol
				}
				t.Run(r.quantity, func(t *testing.T) {
					rel := math.Abs(got-r.value) / math.Abs(r.value)
					t.Logf("reference %.9g %s, zapnet %.9g %s, difference %.3g %%",
						r.value, r.unit, got, r.unit, 100*rel)
					if rel <= tol {
						return
					}
					t.Errorf("%s %s: zapnet %.6g %s, reference %.6g %s (at %.4g s): %.3g %% apart, want under %.2g %%",
						name, r.quantity, got, r.unit, r.value, r.unit, r.time, 100*rel, 100*tol)
				})
			}
			if n < 8 {
				t.Errorf("%s: only %d quantities compared", name, n)
			}
		})
	}
}

// TestAgainstRadauReference is the agreement asked by issue 3: peak
// voltages, the clamp's peak current and the energies within 0.5 % with a
// tight relative tolerance and the engine's other defaults.
func TestAgainstRadauReference(t *testing.T) {
	compare(t, mna.Settings{RelTol: 1e-5}, refTol, refTol)
}

// TestAgainstRadauReferenceTight asks more of a tighter run (charge
// tolerance 3 fC, steps of at most 0.1 ns, so a first step of 0.1 ps): the
// energies within 0.01 % and the extremes within 0.2 %. Both solutions
// implement the same equations, so the gap must close as the engine's
// tolerances tighten; a model that differs in a detail hidden under 0.5 %
// would show here.
func TestAgainstRadauReferenceTight(t *testing.T) {
	compare(t, mna.Settings{RelTol: 1e-6, ChargeTol: 3e-15, MaxStep: 0.1e-9}, 0.002, 1e-4)
}
