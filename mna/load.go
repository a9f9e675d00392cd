package mna

import (
	"fmt"
	"math"

	"zapnet/devices"
	"zapnet/netlist"
	"zapnet/waveforms"
)

// LoadResult is a stimulus solved into a resistive load.
type LoadResult struct {
	Time []float64 // accepted points, s
	I    []float64 // current into the load, from the struck node to ref, A
	V    []float64 // voltage across the load, V
	// Stats of the solution.
	Stats Stats
}

// IntoLoad solves the stimulus st, positive polarity, into a resistive load
// of ohms between its node and ref (+Inf an open circuit, 0 an ideal
// short): a generator's calibration bench. The strike is built with the
// values st was built with (Stimulus.Values), so a generator circuit of any
// shape fits. A nil set means: the stimulus's span, RelTol 1e-6, MaxStep a
// 5000th of the span; Record is always on.
func IntoLoad(st *waveforms.Stimulus, ohms float64, set *Settings) (*LoadResult, error) {
	if st == nil {
		return nil, fmt.Errorf("mna: no stimulus to solve into a load")
	}
	if math.IsNaN(ohms) || ohms < 0 {
		return nil, fmt.Errorf("mna: a load is >= 0 ohms or open (+Inf), got %g", ohms)
	}
	const out = "out"
	els := []*netlist.Element{{Kind: devices.StrikeKind, Name: "zap", Nodes: [2]string{out, netlist.Ground},
		Values: st.Values, Waveform: waveforms.Lookup(st.Name)}}
	load := func(kind string, value float64) error {
		k := devices.Lookup(kind)
		v := k.Values()
		if err := v.Set("value", value); err != nil {
			return err
		}
		v.FillDefaults()
		els = append(els, &netlist.Element{Kind: k, Name: "load", Nodes: [2]string{out, netlist.Ground}, Values: v})
		return nil
	}
	var err error
	switch {
	case ohms == 0:
		err = load("supply", 0)
	case !math.IsInf(ohms, 1):
		err = load("resistor", ohms)
	}
	if err != nil {
		return nil, fmt.Errorf("mna: load of %g ohms: %w", ohms, err)
	}
	sys, err := Compile(&netlist.Circuit{Elements: els})
	if err != nil {
		return nil, err
	}
	var cfg Settings
	if set != nil {
		cfg = *set
	} else {
		cfg.RelTol = 1e-6
	}
	if cfg.Stop <= 0 {
		cfg.Stop = st.Stop
	}
	if cfg.MaxStep <= 0 {
		cfg.MaxStep = cfg.Stop / 5000
	}
	cfg.Record = true
	res, err := sys.Transient(st, 1, &cfg)
	if err != nil {
		return nil, err
	}
	r := &LoadResult{Time: res.Time, Stats: res.Stats, V: res.V[0]}
	if len(els) > 1 {
		r.I = res.I[1]
	} else {
		r.I = make([]float64, len(res.Time))
	}
	return r, nil
}

// LoadSolver is IntoLoad as a waveforms.Solver (for waveforms.SolvedChecks)
// with the settings set (nil: IntoLoad's); the span the checks ask for
// replaces set's Stop.
func LoadSolver(set *Settings) waveforms.Solver {
	return func(st *waveforms.Stimulus, load, span float64) (t, i, v []float64, err error) {
		var cfg *Settings
		if set != nil || span > 0 {
			c := Settings{RelTol: 1e-6}
			if set != nil {
				c = *set
			}
			c.Stop = span
			cfg = &c
		}
		r, err := IntoLoad(st, load, cfg)
		if err != nil {
			return nil, nil, nil, err
		}
		return r.Time, r.I, r.V, nil
	}
}
