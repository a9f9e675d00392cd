package waveforms

import (
	"fmt"
	"math"

	"zapnet/devices/spec"
)

func init() {
	Register(&Waveform{Name: "tlp", Unit: spec.Ampere, Level: 8,
		Summary: "transmission-line pulse: trapezoid from a 50 Ω source, level = current into a short",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("width", spec.Second, spec.Positive, tlpWidth),
			spec.Default("rise", spec.Second, spec.Positive, tlpRise),
		}},
		build:  newTLP,
		Order:  60,
		checks: checksTLP,
	})
}

func init() {
	Register(&Waveform{Name: "eft", Unit: spec.Volt, Level: 1000, Rise: eftRiseMin,
		Summary: "IEC 61000-4-4 5/50 ns fast transient (or a burst) from a 50 Ω source",
		Table: spec.Table{Params: []spec.Param{
			spec.Default("count", spec.Dimensionless, spec.Count, 1),
			spec.Default("rate", spec.Hertz, spec.Positive, eftRate),
			spec.Optional("burst", spec.Hertz, spec.Positive).
				Noted("a standard burst at this repetition rate, 5k or 100k, through the coupling capacitor; replaces count and rate"),
		}},
		build: newEFTAny,
		Order: 70, Load: eftR, Loads: []float64{1000}, generator: true,
		checks: checksEFT,
	})
}

// Transmission-line pulse (ANSI/ESD STM5.5.1) [pub]: a 50 Ω system, 100 ns
// pulse, rise 0.2–10 ns.
const (
	tlpR     = 50.0
	tlpWidth = 100e-9
	tlpRise  = 1e-9
)

// newTLP is a trapezoid from a 50 Ω source whose current into a short is the
// level (so the open-circuit voltage is level·50 Ω). Keys: width (default
// 100 ns) and rise (default 1 ns). The edges are linear and take `rise` each
// (0→100 %, so the 10–90 % rise is 0.8·rise); width is the full width at half
// maximum: the ramp starts at 0, the flat top runs from rise to width, the
// fall ends at width + rise. The span adds half a width after the pulse.
func newTLP(level float64, v *spec.Values) (*Stimulus, error) {
	width, rise := v.Num("width"), v.Num("rise")
	if rise >= width {
		return nil, fmt.Errorf("tlp: rise %s must be shorter than width %s", spec.FormatSI(rise, "s"), spec.FormatSI(width, "s"))
	}
	voc := level * tlpR
	f := func(t float64) float64 {
		switch {
		case t <= 0:
			return 0
		case t < rise:
			return voc * t / rise
		case t <= width:
			return voc
		case t < width+rise:
			return voc * (width + rise - t) / rise
		}
		return 0
	}
	return &Stimulus{
		Form:        Thevenin,
		F:           f,
		R:           tlpR,
		Breakpoints: []float64{0, rise, width, width + rise},
		Rise:        rise,
		Stop:        width + rise + width/2,
	}, nil
}

// IEC 61000-4-4 fast transient: 5/50 ns from a 50 Ω source [pub]. The shape
// is a double exponential v = A·Vp·(e^(−t/τ2) − e^(−t/τ1)) whose constants
// were fitted so that its 10–90 % rise is 5.000 ns and its width at half
// maximum 50.00 ns [calc: fitted here, checked by the tests]. The standard
// states both for the pulse into 50 Ω; a resistive load does not change the
// shape of a Thevenin pulse, only its size, so the same shape serves the
// open-circuit voltage.
const (
	eftR    = 50.0
	eftA    = 1.269775
	eftTau1 = 3.290974e-9
	eftTau2 = 55.609701e-9
	eftRate = 5e3
	// eftTail is how long one pulse lasts for the span: below 1 % of its
	// peak after 270 ns [calc].
	eftTail = 300e-9
)

// newEFT is one 5/50 ns pulse of open-circuit peak level (volts; into 50 Ω
// the peak is half) or, with count > 1, a burst of count pulses at rate
// (Hz, default 5 kHz). The span ends eftTail after the last pulse starts.
func newEFT(level float64, v *spec.Values) (*Stimulus, error) {
	return eftTrain(level, int(v.Num("count")), v.Num("rate"))
}

// eftTrain is count pulses of open-circuit peak level at rate, from 50 Ω.
func eftTrain(level float64, count int, rate float64) (*Stimulus, error) {
	period := 1 / rate
	if count > 1 && period < 2*eftTail {
		return nil, fmt.Errorf("eft: rate %s puts pulses %s apart; they need at least %s (rate up to %s)", spec.FormatSI(rate, "Hz"), spec.FormatSI(period, "s"), spec.FormatSI(2*eftTail, "s"), spec.FormatSI(1/(2*eftTail), "Hz"))
	}
	amp := eftA * level
	pulse := func(u float64) float64 { return amp * (math.Exp(-u/eftTau2) - math.Exp(-u/eftTau1)) }
	f := func(t float64) float64 {
		if t <= 0 {
			return 0
		}
		k := int(t * rate)
		if k > count-1 {
			k = count - 1
		}
		if k+1 < count && t > float64(k+1)*period {
			k++
		}
		v := 0.0
		// Earlier pulses have decayed (e^−40 after 40·τ2) long before
		// the next one; the loop stops there instead of summing them all.
		for j := k; j >= 0; j-- {
			u := t - float64(j)*period
			if u >= 40*eftTau2 {
				break
			}
			if u > 0 {
				v += pulse(u)
			}
		}
		return v
	}
	bp := make([]float64, count)
	for j := range bp {
		bp[j] = float64(j) * period
	}
	st := &Stimulus{
		Form:        Thevenin,
		F:           f,
		R:           eftR,
		Breakpoints: bp,
		Stop:        float64(count-1)*period + eftTail,
	}
	if count > 1 {
		st.Pulse = eftTail
	}
	return st, nil
}

// checksTLP: the current into the load averaged over 70–90 % of the pulse
// width [pub: STM5.5.1's averaging window], against the level scaled by the
// 50 Ω divider [calc] within ±1 % [practice]; the width at half maximum
// against the width asked for (±1 % [practice]); the 10–90 % rise inside
// STM5.5.1's 0.2–10 ns [pub].
func checksTLP(s *Stimulus, load float64, m meter) []Check {
	width := s.Breakpoints[2]
	sh := m(s, load, s.Stop, false)
	pv, _ := sh.peak()
	a, b := 0.7*width, 0.9*width
	var wt, wy []float64
	for k, x := range sh.t {
		if x > a && x < b {
			wt, wy = append(wt, x), append(wy, sh.y[k])
		}
	}
	wt = append(append([]float64{a}, wt...), b)
	wy = append(append([]float64{sh.g(a)}, wy...), sh.g(b))
	avg := Integral(wt, wy) / (b - a)
	fwhm := WidthAbove(sh.t, sh.y, 0.5*pv)
	rise := sh.riseCross(0.9*pv) - sh.riseCross(0.1*pv)
	ref := "ANSI/ESD STM5.5.1, 50 Ω system"
	return []Check{
		rel("current, 70-90 % avg", "A", avg, s.Level*tlpR/(tlpR+load), 0.01, "[calc]", ref+"; level is the current into a short"),
		rel("width at half max", "s", fwhm, width, 0.01, "[practice]", "the width asked for (parameter width)"),
		window("rise 10-90 %", "s", rise, 0.2e-9, 10e-9, "0.2-10 ns", "[pub]", ref),
	}
}

// checksEFT: the first pulse into the load (50 Ω by default): peak
// level·load/(50 Ω + load) ±10 % (half the open-circuit level into 50 Ω
// [mem]), rise 5 ns ±30 % and width at half maximum 50 ns ±30 %
// [pub: IEC 61000-4-4].
func checksEFT(s *Stimulus, load float64, m meter) []Check {
	if s.Burst != nil {
		// A burst's pulses are alike: the first is checked.
		first, err := s.Burst.First(1)
		if err != nil {
			return nil
		}
		s = first
	}
	ref := "IEC 61000-4-4, into " + siFormat(load, "Ω")
	if math.IsInf(load, 1) {
		ref = "IEC 61000-4-4, open circuit"
	}
	if s.Burst != nil || s.Gen != nil {
		ref += ", the burst's first pulse through the coupling capacitor"
	}
	// Into a short there is no voltage: check the current instead.
	q, unit, want := "peak voltage", "V", s.Level
	if !math.IsInf(load, 1) {
		want = s.Level * load / (eftR + load)
	}
	if load == 0 {
		q, unit, want = "peak current", "A", s.Level/eftR
	}
	sh := m(s, load, eftTail, load != 0)
	pv, _ := sh.peak()
	rise := sh.riseCross(0.9*pv) - sh.riseCross(0.1*pv)
	width := WidthAbove(sh.t, sh.y, 0.5*pv)
	return []Check{
		rel(q, unit, pv, want, 0.10, "[mem]", ref),
		rel("rise 10-90 %", "s", rise, 5e-9, 0.30, "[pub]", ref),
		rel("width at half max", "s", width, 50e-9, 0.30, "[pub]", ref),
	}
}
