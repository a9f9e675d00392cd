package mna

import "math"

// Peaking is the largest rise of a gain above its low-frequency value.
type Peaking struct {
	Freq   float64 // Hz, of the peak
	Gain   float64 // |h| at the peak
	RiseDB float64 // dB above the low-frequency gain
	// Q is the quality factor of the second-order low-pass section that
	// peaks by the same ratio M = |h(peak)|/|h(low)|: a series R–L–C driven
	// by a voltage and read across C has M = Q/√(1 − 1/(4Q²)), so
	// Q² = (M² + M·√(M² − 1))/2. For one dominant resonance it is that
	// resonance's Q (exactly so for a pure second-order section); it is
	// defined even where the response never falls 3 dB below its peak on
	// the low side, which a half-power bandwidth is not.
	Q float64
	// AtEnd is true when the largest gain is at the top of the sweep: the
	// gain may rise further above it.
	AtEnd bool
}

// PeakQ is the Q of the second-order low-pass section whose peak is m
// times its low-frequency gain (m > 1); see Peaking.Q.
func PeakQ(m float64) float64 {
	if !(m > 1) {
		return math.Sqrt(0.5)
	}
	return math.Sqrt((m*m + m*math.Sqrt(m*m-1)) / 2)
}

// FindPeaking looks for the largest rise of |h| above its value at the
// lowest frequency of the sweep freq (ascending, Hz) with magnitudes mag.
// Every local maximum of the samples is refined by a golden-section search
// on log f between its sampled neighbours, evaluating |h| with gain, and
// the largest refined one is kept: a narrow resonance can sit between two
// samples lower than a broad one's top and still be the higher peak. ok is
// false when nothing rises above the first sample.
//
// A resonance much narrower than the sweep's spacing can fall between two
// samples without leaving a local maximum and be missed: ask for enough
// points a decade (a Q of 30 is about 3 % wide; 20 points a decade are
// 12 % apart, and the refinement then finds the top as long as one sample
// lies on the resonance's slope).
func FindPeaking(freq, mag []float64, gain func(f float64) (float64, error)) (p Peaking, ok bool, err error) {
	if len(freq) != len(mag) {
		panic("mna: FindPeaking: len(freq) != len(mag)")
	}
	if len(mag) < 2 {
		return p, false, nil
	}
	low := mag[0]
	n := len(mag)
	for k := 1; k < n; k++ {
		if !(mag[k] > mag[k-1]) || (k < n-1 && mag[k] < mag[k+1]) {
			continue
		}
		c := Peaking{Freq: freq[k], Gain: mag[k]}
		if k == n-1 {
			c.AtEnd = true
		} else if c.Freq, c.Gain, err = refinePeak(freq[k-1], freq[k+1], freq[k], mag[k], gain); err != nil {
			return p, false, err
		}
		if c.Gain > low && (!ok || c.Gain > p.Gain) {
			p, ok = c, true
		}
	}
	if !ok {
		return p, false, nil
	}
	m := p.Gain / low
	p.RiseDB = 20 * math.Log10(m)
	p.Q = PeakQ(m)
	return p, true, nil
}

// refinePeak is a golden-section search for the maximum of gain over log f
// in [fa, fb], starting from the sample (f0, g0) inside it.
func refinePeak(fa, fb, f0, g0 float64, gain func(f float64) (float64, error)) (float64, float64, error) {
	a, b := math.Log(fa), math.Log(fb)
	const r = 0.6180339887498949
	x1, x2 := b-r*(b-a), a+r*(b-a)
	f1, err := gain(math.Exp(x1))
	if err != nil {
		return 0, 0, err
	}
	f2, err := gain(math.Exp(x2))
	if err != nil {
		return 0, 0, err
	}
	for b-a > 1e-9 {
		if f1 >= f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - r*(b-a)
			if f1, err = gain(math.Exp(x1)); err != nil {
				return 0, 0, err
			}
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + r*(b-a)
			if f2, err = gain(math.Exp(x2)); err != nil {
				return 0, 0, err
			}
		}
	}
	if g := max(f1, f2); g > g0 {
		return math.Exp((a + b) / 2), g, nil
	}
	return f0, g0, nil
}
