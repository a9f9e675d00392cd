package waveforms

import (
	"errors"
	"fmt"
	"math"
	"zapnet/devices/spec"
	"zapnet/netlist/datafile"
)

func init() {
	Register(&Waveform{Name: "pwl", Unit: spec.Dimensionless, Level: 1,
		Summary: "piecewise-linear current from a CSV file (time,current), scaled by the level",
		Table:   spec.Table{Words: []spec.Word{{Key: "file", Path: true, Fixed: true}}},
		build:   newPWL,
		Order:   80,
	})
}

// newPWL reads a piecewise-linear current from the CSV file v["file"]
// (datafile.ReadPWL: a header naming time and current with their units, or
// rows of seconds and amperes). The current is scaled by level. Times must be >= 0 and
// strictly increasing; the current is zero before the first and after the
// last sample, so a file that does not start and end at zero has a step
// there. Every sample time is a breakpoint; the span ends at the last one.
func newPWL(level float64, v *spec.Values) (*Stimulus, error) {
	path := v.Word("file")
	if path == "" {
		return nil, errors.New(`pwl: needs file="path" naming a CSV of time,current rows`)
	}
	ts, ys, err := ReadPWL(path)
	if err != nil {
		return nil, err
	}
	for k := range ys {
		ys[k] *= level
	}
	last := len(ts) - 1
	f := func(t float64) float64 {
		if t <= 0 || t < ts[0] || t > ts[last] {
			return 0
		}
		return valueAt(ts, ys, t)
	}
	bp := ts
	if ts[0] > 0 {
		bp = append([]float64{0}, ts...)
	}
	// Any sample may be an edge: the shortest interval is the fastest.
	rise := math.Inf(1)
	for k := 1; k < len(bp); k++ {
		rise = math.Min(rise, bp[k]-bp[k-1])
	}
	return &Stimulus{Form: Current, F: f, Breakpoints: bp, Stop: ts[last], Rise: rise}, nil
}

// ReadPWL reads the "time,current" CSV at path (datafile.ReadPWL) and
// returns its columns.
func ReadPWL(path string) (t, i []float64, err error) {
	src, err := datafile.ReadFile(path)
	if err != nil {
		return nil, nil, fmt.Errorf("pwl: %w", err)
	}
	return datafile.ReadPWL(path, src)
}
