package mna

import (
	"fmt"
	"math"

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
// short): a generator's calibration bench. The strike is built for st's
// waveform and parameters (Stimulus.Params, Words), so a generator circuit
// of any shape fits. A nil set means: the stimulus's span, RelTol 1e-6,
// MaxStep a 5000th of the span; Record is always on.
func IntoLoad(st *waveforms.Stimulus, ohms float64, set *Settings) (*LoadResult, error) {
	if st == nil {
		return nil, fmt.Errorf("mna: no stimulus to solve into a load")
	}
	if math.IsNaN(ohms) || ohms < 0 {
		return nil, fmt.Errorf("mna: a load is >= 0 ohms or open (+Inf), got %g", ohms)
	}
	str := map[string]string{"waveform": st.Name}
	for k, v := range st.Words {
		if k != "waveform" {
			str[k] = v
		}
	}
	const out = "out"
	els := []*netlist.Element{{Kind: netlist.Strike, Name: "zap", Nodes: [2]string{out, netlist.Ground},
		Num: st.Params, Str: str}}
	switch {
	case ohms == 0:
		els = append(els, &netlist.Element{Kind: netlist.Supply, Name: "load", Nodes: [2]string{out, netlist.Ground},
			Num: map[string]float64{"value": 0}})
	case !math.IsInf(ohms, 1):
		els = append(els, &netlist.Element{Kind: netlist.Resistor, Name: "load", Nodes: [2]string{out, netlist.Ground},
			Num: map[string]float64{"value": ohms}})
	}
	sys, err := Compile(&netlist.Circuit{Elements: els})
	if err != nil {
		return nil, err
	}
	if s := sys.strikeDev(); s != nil {
		if err := s.Fits(st); err != nil {
			return nil, err
		}
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
	sys.SetStimulus(st, 1)
	res, err := sys.Transient(&cfg)
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

// fitter is the strike's check that a stimulus fits the unknowns it was
// built for.
type fitter interface {
	Fits(*waveforms.Stimulus) error
}

// strikeDev is the strike, if it can tell whether a stimulus fits it.
func (s *System) strikeDev() fitter {
	f, _ := s.striker.(fitter)
	return f
}
