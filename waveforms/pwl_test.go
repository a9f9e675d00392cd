package waveforms

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A piecewise-linear file is reproduced exactly, scaled by the level, with
// every sample time a breakpoint [calc: linear interpolation].
func TestPWL(t *testing.T) {
	s, err := mk("pwl", 3, nil, map[string]string{"file": "testdata/pulse.csv"})
	if err != nil {
		t.Fatal(err)
	}
	if s.Form != Current || s.Unit != "" || s.Stop != 2e-8 {
		t.Fatalf("stimulus %+v", s)
	}
	if len(s.Breakpoints) != 4 || s.Breakpoints[0] != 0 || s.Breakpoints[3] != 2e-8 {
		t.Errorf("breakpoints %v", s.Breakpoints)
	}
	for _, c := range []struct{ t, want float64 }{
		{0, 0}, {0.5e-9, 3}, {1e-9, 6}, {3e-9, 4.5}, {12.5e-9, 1.5}, {2e-8, 0}, {3e-8, 0}, {-1, 0},
	} {
		nearAbs(t, "pwl", s.F(c.t), c.want, 1e-12)
	}
	// Sampling a piecewise-linear source needs no more than its corners,
	// and the charge is exact: (1·2 + 4·3 + 15·1)/2·1e-9 ·3 [calc].
	ts, is, v := Sample(s, 0, 0)
	if v != nil {
		t.Error("a current source has no voltage column")
	}
	near(t, "charge", Integral(ts, is), 3*14.5e-9, 1e-12)

	s, err = mk("pwl", 1, nil, map[string]string{"file": "testdata/noheader.csv"})
	if err != nil {
		t.Fatal(err)
	}
	nearAbs(t, "no header", s.F(1e-9), 0.75, 1e-12)
}

// Bad files: every bad line is named with its line and column.
func TestPWLErrors(t *testing.T) {
	_, err := mk("pwl", 1, nil, map[string]string{"file": "testdata/bad.csv"})
	if err == nil {
		t.Fatal("bad file accepted")
	}
	for _, want := range []string{
		"bad.csv:4:1: time 1 ns is not after the time before (2 ns): times must rise",
		`bad.csv:5:6: column "current": "x" is not a number`,
		`bad.csv:6:5: the row ends before column "current"`,
		"bad.csv:7:1: time -1 s is negative",
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error lacks %q:\n%v", want, err)
		}
	}
	if _, err := mk("pwl", 1, nil, map[string]string{"file": "testdata/short.csv"}); err == nil || !strings.Contains(err.Error(), "at least 2 rows") {
		t.Errorf("one-row file: %v", err)
	}
	if _, err := mk("pwl", 1, nil, nil); err == nil || !strings.Contains(err.Error(), "file") {
		t.Errorf("no file: %v", err)
	}
	if _, err := mk("pwl", 1, nil, map[string]string{"file": filepath.Join(t.TempDir(), "none.csv")}); err == nil {
		t.Error("missing file accepted")
	}
	// A header anywhere but the first row is a bad number.
	p := filepath.Join(t.TempDir(), "late.csv")
	os.WriteFile(p, []byte("0,0\ntime,current\n1e-9,1\n"), 0o644)
	if _, err := mk("pwl", 1, nil, map[string]string{"file": p}); err == nil || !strings.Contains(err.Error(), "late.csv:2:") {
		t.Errorf("late header: %v", err)
	}
}
