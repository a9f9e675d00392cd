package whatif

import (
	"math"
	"sort"
	"testing"
)

func TestQuantileDefinition7(t *testing.T) {
	// Hyndman & Fan (1996), definition 7: h = (n−1)p, linear between the
	// order statistics around h. Expected values [calc] by hand from it.
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}
	for _, c := range []struct{ p, want float64 }{
		{0, 1}, {1, 10}, {0.5, 5.5}, {0.25, 3.25}, {0.75, 7.75}, {0.01, 1.09}, {0.99, 9.91},
	} {
		if got := Quantile(x, c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("Quantile(1..10, %g) = %.15g, want %g", c.p, got, c.want)
		}
	}
	if got := Quantile([]float64{4}, 0.3); got != 4 {
		t.Errorf("one value: %g, want 4", got)
	}
	if !math.IsNaN(Quantile(nil, 0.5)) {
		t.Error("no data must give NaN")
	}
}

func TestWilson95(t *testing.T) {
	// R. G. Newcombe, Statistics in Medicine 17 (1998) 857–872, table of
	// the seven methods, method 3 (score interval without continuity
	// correction), to four decimals [pub][mem].
	for _, c := range []struct {
		k, n   int
		lo, hi float64
	}{
		{81, 263, 0.2553, 0.3662},
		{15, 148, 0.0624, 0.1605},
		{0, 20, 0, 0.1611},
		{1, 29, 0.0061, 0.1718},
	} {
		lo, hi := Wilson95(c.k, c.n)
		if math.Abs(lo-c.lo) > 5e-5 || math.Abs(hi-c.hi) > 5e-5 {
			t.Errorf("Wilson95(%d, %d) = [%.5f, %.5f], want [%.4f, %.4f]", c.k, c.n, lo, hi, c.lo, c.hi)
		}
	}
	// Every circuit passing: the lower bound is n/(n+z²) [calc] from the
	// formula with p̂ = 1, the "rule of three" region for large n.
	lo, hi := Wilson95(1000, 1000)
	z2 := 1.959963984540054 * 1.959963984540054
	if hi != 1 || math.Abs(lo-1000/(1000+z2)) > 1e-12 {
		t.Errorf("Wilson95(1000, 1000) = [%g, %g], want [%g, 1]", lo, hi, 1000/(1000+z2))
	}
	if lo, hi := Wilson95(0, 0); lo != 0 || hi != 1 {
		t.Errorf("no trials: [%g, %g], want [0, 1]", lo, hi)
	}
}

func TestSummarise(t *testing.T) {
	// [calc] from definition 7 on 0..100: pk is k itself; the mean is 50.
	d := make([]float64, 101)
	for i := range d {
		d[len(d)-1-i] = float64(i) // reversed: Summarise sorts
	}
	p := Summarise(d)
	if p.N != 101 || p.Min != 0 || p.Max != 100 || p.P1 != 1 || p.P5 != 5 || p.P50 != 50 || p.P95 != 95 || p.P99 != 99 || p.Mean != 50 {
		t.Errorf("Summarise(0..100) = %+v", p)
	}
}

// Summarise computes the percentiles of data, sorting it in place.
func Summarise(data []float64) Percentiles {
	sort.Float64s(data)
	return summariseSorted(data)
}
