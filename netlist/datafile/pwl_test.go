package datafile

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// A piecewise-linear current reads from a header with units (a prefixed
// unit scales its column [pub: SI Brochure, 9th ed., table 7]), from the
// CSV zapnet's waveform command writes (its voltage column ignored), and
// from bare rows in seconds and amperes.
func TestReadPWL(t *testing.T) {
	for _, c := range []struct{ name, src string }{
		{"units", "time [ns],current [mA]\n0,0\n2,500\n4,0\n"},
		{"export", "time [s],current [A],voltage [V]\n0,0,0\n2e-9,0.5,1\n4e-9,0,0\n"},
		{"bare", "# from a scope\n0,0\n2e-9,0.5\n4e-9,0\n"},
	} {
		ts, is, err := ReadPWL(c.name+".csv", []byte(c.src))
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(ts) != 3 || math.Abs(ts[1]-2e-9) > 1e-21 || math.Abs(is[1]-0.5) > 1e-15 || is[2] != 0 {
			t.Errorf("%s: %v, %v", c.name, ts, is)
		}
	}
	_, _, err := ReadPWL("late.csv", []byte("0,0\ntime,current\n1e-9,1\n"))
	if err == nil || !errors.Is(err, ErrNumber) || !strings.Contains(err.Error(), "late.csv:2:1:") {
		t.Errorf("a header after the first row: %v", err)
	}
}

// A data file is read only from a regular file: a device would never end
// [practice].
func TestReadFileRefusesDevices(t *testing.T) {
	if _, err := ReadFile("/dev/zero"); err == nil || !strings.Contains(err.Error(), "not a regular file") {
		t.Errorf("/dev/zero: %v", err)
	}
}
