package datafile

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
)

func readExampleIBIS(t *testing.T) *IBIS {
	t.Helper()
	src, err := os.ReadFile("../../testdata/fit/sensor-input.ibs")
	if err != nil {
		t.Fatal(err)
	}
	ib, err := ReadIBIS("sensor-input.ibs", src)
	if err != nil {
		t.Fatal(err)
	}
	return ib
}

func TestReadIBISExample(t *testing.T) {
	ib := readExampleIBIS(t)
	if ib.Version != "5.0" || ib.Component != "DEMO-SENSOR-IF" || len(ib.Pins) != 4 || len(ib.Models) != 1 {
		t.Fatalf("header: %q %q, %d pins, %d models", ib.Version, ib.Component, len(ib.Pins), len(ib.Models))
	}
	m := ib.Model("IN33")
	if m == nil || m.Type != "Input" {
		t.Fatalf("model in33: %+v", m)
	}
	// Scaling letters: 3.1pF is 3.1e-12, 2.0nH 2e-9, -455.0mA −0.455, 18.0uA
	// 1.8e-5 [pub: IBIS scaling factors T G M k m u n p f].
	if m.CComp[Typ] != 3.1e-12 || m.CComp[Min] != 2.6e-12 || m.CComp[Max] != 3.6e-12 {
		t.Errorf("C_comp %v", m.CComp)
	}
	if ib.Package[1][Typ] != 2e-9 || ib.Package[0][Max] != 0.3 {
		t.Errorf("package %v", ib.Package)
	}
	if len(m.GNDClamp) != 16 || m.GNDClamp[0].V != -3.3 || m.GNDClamp[0].I[Typ] != -0.455 {
		t.Errorf("GND clamp %d rows, first %+v", len(m.GNDClamp), m.GNDClamp[0])
	}
	if r := m.GNDClamp[12]; !math.IsNaN(r.I[Min]) || r.I.At(Min) != -0.1e-6 {
		t.Errorf("NA falls back to typ: %+v", r)
	}
	if m.VoltageRange != (Corners{3.3, 3.0, 3.6}) {
		t.Errorf("voltage range %v", m.VoltageRange)
	}
}

func TestIBISPinModel(t *testing.T) {
	ib := readExampleIBIS(t)
	// Pin 1 has its own R_pin L_pin C_pin; pin 2 takes [Package]'s; the
	// model name takes [Package]'s too [pub: IBIS, [Pin] overrides [Package]].
	p1, err := ib.PinModel("1", Typ)
	if err != nil {
		t.Fatal(err)
	}
	if p1.Rpkg != 0.31 || p1.Lpkg != 2.6e-9 || p1.Cpkg != 0.52e-12 || p1.CComp != 3.1e-12 {
		t.Errorf("pin 1: %+v", p1)
	}
	p2, _ := ib.PinModel("2", Max)
	if p2.Rpkg != 0.3 || p2.Lpkg != 2.4e-9 || p2.Cpkg != 0.5e-12 || p2.CComp != 3.6e-12 || p2.PowerRef != 3.6 {
		t.Errorf("pin 2 at max: %+v", p2)
	}
	m, _ := ib.PinModel("in33", Min)
	if m.Rpkg != 0.2 || m.PowerRef != 3.0 || m.GNDI[0] != -0.39 {
		t.Errorf("model at min: %+v", m)
	}
	// The POWER clamp's table voltage is the reference minus the pad's:
	// turned round it rises in u = v(pad) − v(ref), and its largest current
	// (0.48 A at −3.3 V in the table) lands at u = +3.3 V.
	n := len(p1.PowerV)
	if p1.PowerV[n-1] != 3.3 || p1.PowerI[n-1] != 0.48 || p1.PowerV[0] != -3.3 {
		t.Errorf("power clamp turned round: %v %v", p1.PowerV, p1.PowerI)
	}
	for k := 1; k < n; k++ {
		if p1.PowerV[k] <= p1.PowerV[k-1] {
			t.Fatalf("power clamp voltages do not rise: %v", p1.PowerV)
		}
	}
	if _, err := ib.PinModel("nope", Typ); err == nil || !strings.Contains(err.Error(), "no model or pin \"nope\" (models: in33)") {
		t.Errorf("unknown name: %v", err)
	}
}

func TestIBISErrors(t *testing.T) {
	head := "[IBIS Ver] 5.0\n[Model] m\nModel_type Input\nC_comp 1p 1p 1p\n[Voltage Range] 3.3 3 3.6\n"
	for _, c := range []struct {
		src, want string
		kind      error
	}{
		{head + "[GND Clamp]\n-1 -0.1 x -0.2\n", "i.ibs:7:9: \"x\" is not a number", ErrNumber},
		{head + "[GND Clamp]\n-1 -0.1 -0.2\n", "i.ibs:7:1: a clamp table row has a voltage and 1 or 3 currents", ErrSyntax},
		{head + "[GND Clamp]\n-1 -0.1\n0 0\n-0.5 -0.01\n", "i.ibs:9:1: voltage -0.5 V breaks the table's order", ErrOrder},
		{head + "[GND Clamp]\nNA -0.1\n", "i.ibs:7:1: a table voltage cannot be NA", ErrNumber},
		{"[Package]\nR_pkg 1 2 3\nQ_pkg 1\n", "i.ibs:3:1: unknown [Package] entry \"Q_pkg\"", ErrSyntax},
		{"[Pin] signal_name model_name\n1 A\n", "i.ibs:2:1: a [Pin] row is", ErrSyntax},
		{head + "[GND Clamp\n", "i.ibs:6:1: a keyword's bracket is not closed", ErrSyntax},
		{"[Voltage Range] 3.3\n", "i.ibs:1:1: [voltage range] outside a [Model]", ErrSyntax},
	} {
		_, err := ReadIBIS("i.ibs", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want %q", c.src, err, c.want)
			continue
		}
		if !errors.Is(err, c.kind) {
			t.Errorf("%q: %v is not %v", c.src, err, c.kind)
		}
	}
	// A changed comment character.
	ib, err := ReadIBIS("c.ibs", []byte("[Comment Char] #_char\n[Component] X # a comment | not one\n"))
	if err != nil || ib.Component != "X" {
		t.Errorf("comment char: %v %q", err, ib.Component)
	}
}
