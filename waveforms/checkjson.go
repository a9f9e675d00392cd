package waveforms

import (
	"encoding/json"
	"math"
)

// MarshalJSON writes a check as the waveform command's JSON: name, unit,
// value, published, low, high, tolerance, pass, source and ref. A value
// that is not finite (no published value, an unbounded side of a window)
// is null.
func (c Check) MarshalJSON() ([]byte, error) {
	num := func(v float64) *float64 {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil
		}
		return &v
	}
	return json.Marshal(struct {
		Name      string   `json:"name"`
		Unit      string   `json:"unit"`
		Value     *float64 `json:"value"`
		Published *float64 `json:"published"`
		Low       *float64 `json:"low"`
		High      *float64 `json:"high"`
		Tolerance string   `json:"tolerance"`
		Pass      bool     `json:"pass"`
		Source    string   `json:"source"`
		Ref       string   `json:"ref"`
	}{c.Quantity, c.Unit, num(c.Computed), num(c.Published), num(c.Lo), num(c.Hi), c.Tol, c.Within, c.Source, c.Ref})
}
