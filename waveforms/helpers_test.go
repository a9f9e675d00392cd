package waveforms

import (
	"fmt"
	"strings"
)

// mk builds waveform name at level as a deck's strike line would: num and
// str are its parameters, each through the waveform's table (its rule
// checked), the others at their defaults.
func mk(name string, level float64, num map[string]float64, str map[string]string) (*Stimulus, error) {
	w := Lookup(name)
	if w == nil {
		return nil, fmt.Errorf("unknown waveform %q (known: %s)", name, strings.Join(Names(), ", "))
	}
	v := w.Values()
	for k, x := range num {
		if w.Param(k) == nil {
			continue // a key of another waveform
		}
		if err := v.Set(k, x); err != nil {
			return nil, err
		}
	}
	for k, s := range str {
		if w.Word(k) == nil {
			continue
		}
		if err := v.SetWord(k, s); err != nil {
			return nil, err
		}
	}
	v.FillDefaults()
	return w.New(level, &v)
}
