package mna_test

import (
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"zapnet/internal/refdata"
	"zapnet/mna"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// The decks and the expected values of this file are an independent
// solution of the same networks: hand-written ODEs from MODELS.md and the
// stimuli of CHECKS.md, integrated with SciPy's Radau at rtol 1e-10 ([calc]
// SciPy Radau reference, testdata/reference/README.md, which gives the
// exact command, versions and equations). Its own error, estimated by
// repeating the solve at rtol 1e-8, is below 1e-7 relative on every
// quantity compared here, so the budgets below are the engine's.

const refDir = "../testdata/reference"

// refNetworks are the decks of testdata/reference.
var refNetworks = []string{"net-a", "net-b", "net-c", "net-d", "net-e"}

// The agreement asked of the engine at its default settings: every extreme
// and peak current and every energy within the default accuracy of 0.2 %,
// the pins' internal-path currents within 1 % (see mna.PinCurrentFactor)
// [practice: the accuracy a report promises, DefaultAccuracy].
const (
	refTol      = mna.DefaultAccuracy
	refPathTol  = mna.PinCurrentFactor * mna.DefaultAccuracy
	refMinShare = 1e-3 // ledger entries below this share of the strike's energy are listed, not compared
)

// refRow is one line of summary.csv.
type refRow struct {
	network, quantity, unit string
	value, time, change     float64
}

func readSummary(t *testing.T) []refRow {
	t.Helper()
	head, recs := refdata.Read(t, filepath.Join(refDir, "summary.csv"))
	if len(head) != 6 || head[0] != "network" || len(recs) == 0 {
		t.Fatalf("summary.csv: no header line of six fields, or no rows")
	}
	var rows []refRow
	for _, rec := range recs {
		var num [3]float64
		for k, s := range []string{rec[2], rec[4], rec[5]} {
			var err error
			if num[k], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("summary.csv: %v", err)
			}
		}
		rows = append(rows, refRow{network: rec[0], quantity: rec[1], unit: rec[3],
			value: num[0], time: num[1], change: num[2]})
	}
	return rows
}

// refRun is one solve of a reference deck, measured as a report measures
// it: every node's and probe's extremes refined between points by a
// waveforms.Tracker that is told the stimulus's corners, the elements' peak
// currents and energies from the engine.
type refRun struct {
	sys    *mna.System
	res    *mna.Result
	nodes  []waveforms.Tracker
	probes []waveforms.Tracker
}

// solveDeck solves a reference deck as the command would: the deck's strike
// at its first level and polarity, over its window, with set's accuracy.
func solveDeck(t *testing.T, name string, set mna.Settings) *refRun {
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
	r := &refRun{sys: sys,
		nodes:  make([]waveforms.Tracker, len(sys.Nodes())),
		probes: make([]waveforms.Tracker, len(sys.Probes()))}
	for i := range r.nodes {
		r.nodes[i].Refine = true
	}
	for i := range r.probes {
		r.probes[i].Refine = true
	}
	set.Stop = c.Window.Stop
	set.Observe = func(p *mna.Point) {
		for i, v := range p.V {
			r.nodes[i].Add(p.T, v)
			if p.Corner {
				r.nodes[i].Corner()
			}
		}
		for i, v := range p.P {
			r.probes[i].Add(p.T, v)
			if p.Corner {
				r.probes[i].Corner()
			}
		}
	}
	r.res, err = sys.Transient(st, sign, &set)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.res.Stop-c.Window.Stop) > 1e-15 {
		t.Fatalf("%s: simulated %g s, want the deck's window %g s", name, r.res.Stop, c.Window.Stop)
	}
	return r
}

func indexOf(list []string, name string) int {
	for i, n := range list {
		if n == name {
			return i
		}
	}
	return -1
}

// value is the engine's counterpart of a summary quantity, or ok = false
// when the summary names something the comparison leaves out.
func (r *refRun) value(t *testing.T, q string) (v float64, ok bool) {
	t.Helper()
	find := func(list []string, name string) int {
		i := indexOf(list, name)
		if i < 0 {
			t.Fatalf("%s: no %q in %v", q, name, list)
		}
		return i
	}
	switch {
	case strings.HasPrefix(q, "max v(") || strings.HasPrefix(q, "min v("):
		i := find(r.sys.Nodes(), strings.TrimSuffix(q[len("max v("):], ")"))
		if q[:3] == "max" {
			v, _ = r.nodes[i].Max()
		} else {
			v, _ = r.nodes[i].Min()
		}
		return v, true
	case strings.HasPrefix(q, "peak |ipath(") && strings.HasSuffix(q, ")|"):
		var probes []string
		for _, p := range r.sys.Probes() {
			probes = append(probes, p.Name)
		}
		i := find(probes, strings.TrimSuffix(q[len("peak |ipath("):], ")|")+".ipath")
		v, _ = r.probes[i].AbsPeak()
		return v, true
	case strings.HasPrefix(q, "peak |i(") && strings.HasSuffix(q, ")|"):
		i := find(r.sys.Elements(), strings.TrimSuffix(q[len("peak |i("):], ")|"))
		return r.res.PeakCurrent[i], true
	case strings.HasPrefix(q, "energy ") && q != "energy balance":
		i := find(r.sys.Elements(), strings.TrimPrefix(q, "energy "))
		return r.res.Energy[i], true
	}
	return 0, false
}

// compared is one quantity of one network: the reference, the engine's
// value and the relative difference (against the magnitude of the
// reference, or for a voltage or current a millivolt or a milliampere when
// that is larger: an extreme that is the operating point's zero is compared
// absolutely).
type compared struct {
	row  refRow
	got  float64
	diff float64
	tol  float64
}

// compareRun compares every quantity of one network's summary with run,
// budgets scaled by scale (1 for the default settings).
func compareRun(t *testing.T, rows []refRow, name string, run *refRun, scale float64) []compared {
	t.Helper()
	strikeE := 0.0
	for _, r := range rows {
		if r.network == name && r.quantity == "energy zap" {
			strikeE = math.Abs(r.value)
		}
	}
	if strikeE == 0 {
		t.Fatalf("summary.csv: no strike energy for %s", name)
	}
	var out []compared
	for _, r := range rows {
		if r.network != name {
			continue
		}
		got, ok := run.value(t, r.quantity)
		if !ok {
			continue
		}
		if r.unit == "J" && math.Abs(r.value) < refMinShare*strikeE {
			t.Logf("%-18s reference %.6g J, zapnet %.6g J (not compared: under %g of the strike's energy)",
				r.quantity, r.value, got, refMinShare)
			continue
		}
		if r.change > 1e-6*math.Abs(r.value)+1e-9 {
			t.Errorf("summary.csv: %s %s changes by %.3g between rtol 1e-8 and 1e-10: the reference is not converged",
				name, r.quantity, r.change)
		}
		tol := refTol
		if strings.Contains(r.quantity, "ipath") {
			tol = refPathTol
		}
		floor := 1e-3 // V or A
		if r.unit == "J" {
			floor = 0
		}
		out = append(out, compared{row: r, got: got, tol: tol * scale,
			diff: math.Abs(got-r.value) / math.Max(math.Abs(r.value), floor)})
	}
	if len(out) < 10 {
		t.Errorf("%s: only %d quantities compared", name, len(out))
	}
	return out
}

// TestAgainstRadauReference holds the engine at its default settings (only
// the deck's window given) to the accuracy a report promises, on every
// quantity of every reference network.
func TestAgainstRadauReference(t *testing.T) {
	rows := readSummary(t)
	for _, name := range refNetworks {
		t.Run(name, func(t *testing.T) {
			run := solveDeck(t, name, mna.Settings{})
			s := run.res.Stats
			t.Logf("%d steps, %d rejected, %d Newton iterations, %d factorisations", s.Steps, s.Rejected, s.Newton, s.Factorisations)
			for _, c := range compareRun(t, rows, name, run, 1) {
				t.Logf("%-18s reference %.9g %s, zapnet %.9g %s, difference %.3g %%",
					c.row.quantity, c.row.value, c.row.unit, c.got, c.row.unit, 100*c.diff)
				if c.diff > c.tol {
					t.Errorf("%s %s: zapnet %.6g %s, reference %.6g %s (at %.4g s): %.3g %% apart, want under %.2g %%",
						name, c.row.quantity, c.got, c.row.unit, c.row.value, c.row.unit, c.row.time, 100*c.diff, 100*c.tol)
				}
			}
		})
	}
}

// A tenfold tighter accuracy comes about tenfold closer to the reference:
// within a fifth of the default budgets, and at least four times closer on
// every quantity whose default error is large enough to measure the
// change. The difference between a run and one at a tenth of its accuracy
// is then the first run's error to within a quarter, which is what lets a
// report show that difference as its error bar.
func TestTighterAccuracyConverges(t *testing.T) {
	rows := readSummary(t)
	for _, name := range refNetworks {
		t.Run(name, func(t *testing.T) {
			base := compareRun(t, rows, name, solveDeck(t, name, mna.Settings{}), 1)
			tight := compareRun(t, rows, name, solveDeck(t, name, mna.Settings{Accuracy: mna.DefaultAccuracy / 10}), 0.2)
			for k, c := range tight {
				b := base[k]
				t.Logf("%-18s default %.3g %%, tenfold tighter %.3g %%", c.row.quantity, 100*b.diff, 100*c.diff)
				if c.diff > c.tol {
					t.Errorf("%s %s at a tenth of the accuracy: %.3g %% from the reference, want under %.2g %%",
						name, c.row.quantity, 100*c.diff, 100*c.tol)
				}
				if b.diff > b.tol/10 && c.diff > b.diff/4 {
					t.Errorf("%s %s: the tenfold tighter run is %.3g %% off against %.3g %%: want at most a quarter",
						name, c.row.quantity, 100*c.diff, 100*b.diff)
				}
			}
		})
	}
}
