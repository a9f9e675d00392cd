package netlist

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// ParseValue reads text as the deck reads a parameter's value: a number with
// an optional SI prefix and unit, where a unit written must be unit and the
// value must keep rule. what names the value in the error ("--max").
// Values from the command line go through it, so that they follow the
// deck's rules exactly.
func ParseValue(what, text string, unit spec.Unit, rule spec.Rule) (float64, error) {
	v, msg := numValue(what, unit, rule, strings.TrimSpace(text))
	if msg != "" {
		return 0, errors.New(msg)
	}
	return v, nil
}

// ParseLevels reads a comma-separated list of levels of waveform w as the
// strike's level= reads them: positive numbers in the waveform's unit.
func ParseLevels(list string, w *waveforms.Waveform) ([]float64, error) {
	var out []float64
	var errs []error
	for _, text := range strings.Split(list, ",") {
		v, msg := levelValue(strings.TrimSpace(text), w)
		if msg != "" {
			errs = append(errs, errors.New(msg))
			continue
		}
		out = append(out, v)
	}
	return out, errors.Join(errs...)
}

// levelValue reads one level of waveform w (nil: unknown, any unit).
func levelValue(text string, w *waveforms.Waveform) (float64, string) {
	n, msg := spec.ParseNumber(text, false)
	switch {
	case msg != "":
		return 0, msg
	case n.Unit != "" && w != nil && n.Unit != w.Unit:
		if w.Unit == "" {
			return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are plain scale factors", text, n.Unit.Word(), w.Name)
		}
		return 0, fmt.Sprintf("%s is in %s, but the levels of waveform %s are in %s", text, n.Unit.Word(), w.Name, w.Unit.Word())
	case !(n.Value > 0) || math.IsInf(n.Value, 0):
		return 0, fmt.Sprintf("level %s must be positive (polarity= gives the sign)", text)
	}
	return n.Value, ""
}
