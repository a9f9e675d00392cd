package fit

import (
	"math"
	"os"
	"strings"
	"testing"

	"zapnet/netlist/datafile"
)

// The invented demo data of testdata/fit (written by make-demo-data.py
// from invented parameters) run through the fits the README shows. These
// guard the worked examples; the checks of the fits themselves against
// outside sources are the round-trip and SciPy tests.

func demo(t *testing.T, name string) []byte {
	t.Helper()
	b, err := os.ReadFile("../../testdata/fit/" + name)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestDemoClampTLP(t *testing.T) {
	tl, err := datafile.ReadTLP("tvs5-tlp.csv", demo(t, "tvs5-tlp.csv"))
	if err != nil {
		t.Fatal(err)
	}
	data, it2, notes := TLPData(tl)
	if it2 < 27 || it2 > 29 || !strings.Contains(strings.Join(notes, " "), "leakage jumps") {
		t.Errorf("It2 %g, notes %q", it2, notes)
	}
	fit, err := FitClamp(data, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The invented part behind the file: vbr 6.6 V, nbr 6.25, rdyn 0.233 Ω.
	within(t, "vbr", fit.Params.Vbr, 6.6, 0.02)
	within(t, "rdyn", fit.Params.Rdyn, 0.233, 0.05)
	if fit.Params.Bi {
		t.Error("read as bi")
	}
}

func TestDemoClampDatasheet(t *testing.T) {
	d, err := datafile.ReadDatasheet("tvs5-uni.points", demo(t, "tvs5-uni.points"))
	if err != nil {
		t.Fatal(err)
	}
	data, pub, err := DatasheetData(d)
	if err != nil {
		t.Fatal(err)
	}
	fit, err := FitClamp(data, &ClampOptions{Polarity: pub.Polarity, Ls: pub.Ls})
	if err != nil {
		t.Fatal(err)
	}
	// The 8/20 point is the self-heated one: the fit says so.
	if len(fit.Notes) == 0 || !strings.Contains(fit.Notes[0], "8/20 clamping voltage 10.3 V at 5 A") {
		t.Errorf("notes %q", fit.Notes)
	}
	within(t, "vbr", fit.Params.Vbr, 6.6, 0.02)
	within(t, "nbr", fit.Params.Nbr, 6.25, 0.05)
	within(t, "rdyn", fit.Params.Rdyn, 0.233, 0.05)
	within(t, "cj", fit.Params.Cj, 38e-12, 1e-12)
}

func TestDemoSnapback(t *testing.T) {
	tl, err := datafile.ReadTLP("esdsnap-tlp.csv", demo(t, "esdsnap-tlp.csv"))
	if err != nil {
		t.Fatal(err)
	}
	data, it2, _ := TLPData(tl)
	fit, err := FitSnapback(data, &SnapbackOptions{It2: it2})
	if err != nil {
		t.Fatal(err)
	}
	// The invented part: vt1 9.2 V at 80 mA, vh 4.6 V at 0.55 A, ron 1.4 Ω.
	within(t, "vt1", fit.Params.Vt1, 9.2, 0.02)
	within(t, "vh", fit.Params.Vh, 4.6, 0.02)
	within(t, "ih", fit.Params.Ih, 0.55, 0.05)
	within(t, "ron", fit.Params.Ron, 1.4, 0.02)
	if it2 < 9 || it2 > 11 {
		t.Errorf("It2 %g", it2)
	}
	d, err := datafile.ReadDatasheet("esdsnap.points", demo(t, "esdsnap.points"))
	if err != nil {
		t.Fatal(err)
	}
	dd, pub, err := DatasheetData(d)
	if err != nil || pub.Model != "snapback" || pub.It2 != 9.5 {
		t.Fatalf("%v %+v", err, pub)
	}
	fit, err = FitSnapback(dd, &SnapbackOptions{Runner: RunDeck, It2: pub.It2})
	if err != nil {
		t.Fatal(err)
	}
	within(t, "ron from the clamping points", fit.Params.Ron, 1.4, 0.05)
}

func TestDemoPin(t *testing.T) {
	tl, err := datafile.ReadTLP("pinA-tlp.csv", demo(t, "pinA-tlp.csv"))
	if err != nil {
		t.Fatal(err)
	}
	pt, err := PinTable(tl, 0, [2]float64{3.3, 2e-9})
	if err != nil {
		t.Fatal(err)
	}
	if pt.It2 < 2 || pt.It2 > 2.4 {
		t.Errorf("ifail %g", pt.It2)
	}
	var at33 float64
	for k, v := range pt.V {
		if v == 3.3 {
			at33 = pt.I[k]
		}
	}
	if at33 != 2e-9 {
		t.Errorf("the leakage point is not in the table: %v %v", pt.V, pt.I)
	}
}

func TestDemoBead(t *testing.T) {
	ts, err := datafile.ReadTouchstone("bead600.s2p", demo(t, "bead600.s2p"))
	if err != nil {
		t.Fatal(err)
	}
	c, how, err := BeadCurveOfTouchstone(ts, 0)
	if err != nil || !strings.Contains(how, "series") {
		t.Fatalf("%v %q", err, how)
	}
	fit, err := FitBead([]BeadCurve{c}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The invented bead: 0.09 Ω, 1.6 µH, 1.1 pF, 600 Ω; from 1 MHz up, rdc
	// is barely seen (ωl is 10 Ω there).
	within(t, "l", fit.Params.L, 1.6e-6, 0.02)
	within(t, "c", fit.Params.C, 1.1e-12, 0.02)
	within(t, "rac", fit.Params.Rac, 600, 0.02)
	im, err := datafile.ReadImpedance("bead600-bias.csv", demo(t, "bead600-bias.csv"))
	if err != nil {
		t.Fatal(err)
	}
	fit, err = FitBead(BeadCurveOf(im), &BeadOptions{Rdc: 0.09})
	if err != nil {
		t.Fatal(err)
	}
	within(t, "isat", fit.Params.Isat, 0.5, 0.05)
	if math.IsNaN(fit.Sigma["isat"]) {
		t.Error("no standard error for isat")
	}
}
