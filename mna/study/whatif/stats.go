package whatif

import (
	"math"
)

// Quantile returns the p-quantile (0 ≤ p ≤ 1) of sorted, ascending data by
// linear interpolation between order statistics: with h = (n−1)·p, the
// value x[⌊h⌋] + (h−⌊h⌋)·(x[⌊h⌋+1] − x[⌊h⌋]) (0-based). This is definition 7
// of Hyndman and Fan, "Sample quantiles in statistical packages", The
// American Statistician 50(4), 1996, the default of most statistics
// software; it is continuous in p, gives the minimum at p = 0 and the
// maximum at p = 1, and the ordinary median at p = ½. NaN for no data.
func Quantile(sorted []float64, p float64) float64 {
	n := len(sorted)
	if n == 0 {
		return math.NaN()
	}
	h := float64(n-1) * p
	lo := int(math.Floor(h))
	if lo < 0 {
		return sorted[0]
	}
	if lo >= n-1 {
		return sorted[n-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

// Wilson95 is the Wilson score interval for a binomial proportion, k
// successes in n trials, at 95 % confidence (z = 1.959963984540054, the
// 97.5 % point of the standard normal):
//
//	centre = (p̂ + z²/2n) / (1 + z²/n)
//	half   = z/(1 + z²/n) · √(p̂(1−p̂)/n + z²/4n²)
//
// E. B. Wilson, "Probable inference, the law of succession, and statistical
// inference", J. Am. Stat. Assoc. 22 (1927) 209–212; recommended over the
// plain normal interval p̂ ± z√(p̂(1−p̂)/n) by R. G. Newcombe, Statistics in
// Medicine 17 (1998) 857–872, because it stays inside [0, 1] and keeps its
// coverage when p̂ is 0 or 1 — the usual case of a spread where every drawn
// circuit passes. With n = 0 it is the whole [0, 1].
func Wilson95(k, n int) (lo, hi float64) {
	if n <= 0 {
		return 0, 1
	}
	const z = 1.959963984540054
	nf := float64(n)
	p := float64(k) / nf
	z2 := z * z
	den := 1 + z2/nf
	centre := (p + z2/(2*nf)) / den
	half := z / den * math.Sqrt(p*(1-p)/nf+z2/(4*nf*nf))
	lo, hi = math.Max(0, centre-half), math.Min(1, centre+half)
	// At p̂ = 0 (or 1) the bound is exactly 0 (or 1); rounding must not
	// leave a tiny positive lower bound behind.
	if k == 0 {
		lo = 0
	}
	if k == n {
		hi = 1
	}
	return lo, hi
}

// Percentiles summarise a distribution of one measurement.
type Percentiles struct {
	N    int     `json:"n"`
	Min  float64 `json:"min"`
	P1   float64 `json:"p1"`
	P5   float64 `json:"p5"`
	P50  float64 `json:"p50"`
	P95  float64 `json:"p95"`
	P99  float64 `json:"p99"`
	Max  float64 `json:"max"`
	Mean float64 `json:"mean"`
}

// summariseSorted computes the percentiles of data already in ascending
// order. The mean is summed in ascending order, so the same values give the
// same bits whatever order they arrived in.
func summariseSorted(data []float64) Percentiles {
	p := Percentiles{N: len(data)}
	if len(data) == 0 {
		return p
	}
	sum := 0.0
	for _, v := range data {
		sum += v
	}
	p.Min, p.Max = data[0], data[len(data)-1]
	p.P1, p.P5, p.P50 = Quantile(data, 0.01), Quantile(data, 0.05), Quantile(data, 0.5)
	p.P95, p.P99 = Quantile(data, 0.95), Quantile(data, 0.99)
	p.Mean = sum / float64(len(data))
	return p
}
