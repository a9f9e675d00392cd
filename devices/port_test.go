package devices

import (
	"math"
	"testing"

	"zapnet/waveforms"
)

// A port stamps nothing until it is terminated (z0) or driven (a source
// behind z0) [calc: Ohm's law; Norton equivalent of a Thevenin source].
func TestPortModes(t *testing.T) {
	d := NewPort("P1", [2]string{"n", "gnd"}, 50)
	r := newNLRig(t, d, 0, Ground)
	x := []float64{1.5}
	eval := func(tm float64, dc bool) (f, j float64) {
		clear(r.c.F)
		clear(r.c.J)
		r.c.X, r.c.T, r.c.DC = x, tm, dc
		d.Eval(&r.c)
		return r.c.F[0], r.c.J[0]
	}
	if f, j := eval(1e-9, false); f != 0 || j != 0 {
		t.Errorf("off: F %g, J %g; want nothing", f, j)
	}
	d.Terminate()
	if f, j := eval(1e-9, false); f != 1.5/50 || j != 1.0/50 {
		t.Errorf("terminated: F %g, J %g; want 30 mA leaving, 20 mS", f, j)
	}
	st, err := waveforms.Step(2, 1e-12, 75, 1e-9)
	if err != nil {
		t.Fatal(err)
	}
	d.Drive(st)
	// 2 V behind 50 Ω (the port's z0, not the stimulus's R) at 1.5 V: 10 mA
	// into the node, so −10 mA leaving.
	if f, j := eval(1e-9, false); math.Abs(f-(1.5-2)/50) > 1e-17 || j != 1.0/50 {
		t.Errorf("driven: F %g, J %g; want −10 mA, 20 mS", f, j)
	}
	if f, _ := eval(0, true); f != 1.5/50 {
		t.Errorf("driven at the operating point: F %g, want the termination alone", f)
	}
	d.Off()
	if f, _ := eval(1e-9, false); f != 0 {
		t.Errorf("off again: F %g", f)
	}
	if n := testing.AllocsPerRun(100, func() { eval(1e-9, false) }); n != 0 {
		t.Errorf("Eval allocates %g times", n)
	}
}
