package devices

import (
	"strings"
	"testing"

	"zapnet/netlist/datafile"
)

func TestIBISPinFillsDipsAndNamesThem(t *testing.T) {
	pm := &datafile.PinModel{Model: "m", CComp: 2e-12, Rpkg: 0.2, Lpkg: 1e-9, Cpkg: 0.3e-12, PowerRef: 3.3,
		GNDV: []float64{-2, -1, -0.5, 0, 1, 3.3}, GNDI: []float64{-0.3, -0.1, -1e-4, 0, 2e-9, 1e-9},
		PowerV: []float64{-3.3, 0, 0.5, 1, 2}, PowerI: []float64{0, 0, 1e-4, 0.1, 0.3},
		GNDPos: datafile.Pos{File: "x.ibs", Line: 20, Col: 2}}
	s, notes, err := IBISPin("U1", [2]string{"p", "gnd"}, "", pm)
	if err != nil {
		t.Fatal(err)
	}
	joined := strings.Join(notes, "\n")
	if !strings.Contains(joined, "x.ibs:20:2: the GND clamp table's current falls as the voltage rises (by up to 1e-09 A, at 3.3 V)") {
		t.Errorf("notes %q", joined)
	}
	if i, _ := s.Low.Eval(3.3); i != 2e-9 {
		t.Errorf("filled current %g, want 2e-9 A", i)
	}
	if s.UpRef != 3.3 || s.C != 2e-12 || s.Rs != 0.2 || s.Ls != 1e-9 || s.Cpkg != 0.3e-12 {
		t.Errorf("spec %+v", s)
	}
	// A rail node takes the POWER clamp; without a POWER table it cannot.
	if s, _, _ := IBISPin("U1", [2]string{"p", "gnd"}, "vdd", pm); s.Rail != "vdd" || s.UpRef != 0 {
		t.Errorf("with rail: %+v", s)
	}
	pm.PowerV, pm.PowerI = nil, nil
	if _, _, err := IBISPin("U1", [2]string{"p", "gnd"}, "vdd", pm); err == nil || !strings.Contains(err.Error(), "no [POWER Clamp] table for the rail vdd") {
		t.Errorf("%v", err)
	}
}
