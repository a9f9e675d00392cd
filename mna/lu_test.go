package mna

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/lapack/gonum"
)

// The engine's LU agrees with gonum's LAPACK (Dgetrf/Dgetrs, the reference
// implementation of the same algorithm) on random dense and sparse
// matrices, and its solution leaves a residual at rounding level
// [pub: Golub & Van Loan, backward stability of partial pivoting].
func TestLUAgainstLAPACK(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	var impl gonum.Implementation
	for _, n := range []int{1, 2, 5, 15, 40, 100} {
		for _, density := range []float64{1, 0.2, 0.05} {
			a := make([]float64, n*n)
			for i := range a {
				if rng.Float64() < density {
					a[i] = rng.NormFloat64()
				}
			}
			for i := 0; i < n; i++ {
				a[i*n+i] += 1e-3 // keep the sparse cases regular
			}
			b := make([]float64, n)
			for i := range b {
				b[i] = rng.NormFloat64()
			}
			f := newLU(n, nil, nil)
			if z := f.factor(a); z >= 0 {
				t.Fatalf("n=%d: zero pivot at %d", n, z)
			}
			x := append([]float64(nil), b...)
			f.solve(x)

			ref := append([]float64(nil), a...)
			ipiv := make([]int, n)
			impl.Dgetrf(n, n, ref, n, ipiv)
			xr := append([]float64(nil), b...)
			impl.Dgetrs(blas.NoTrans, n, 1, ref, n, ipiv, xr, 1)

			scale, res := 0.0, 0.0
			for i := 0; i < n; i++ {
				r := -b[i]
				for j := 0; j < n; j++ {
					r += a[i*n+j] * x[j]
					scale = math.Max(scale, math.Abs(a[i*n+j]*x[j]))
				}
				res = math.Max(res, math.Abs(r))
			}
			if res > 1e-12*scale*float64(n) {
				t.Errorf("n=%d density %g: residual %.3g against scale %.3g", n, density, res, scale)
			}
			for i := range x {
				if d := math.Abs(x[i] - xr[i]); d > 1e-8*(1+math.Abs(xr[i])) {
					t.Errorf("n=%d density %g: x[%d] = %.15g, LAPACK %.15g", n, density, i, x[i], xr[i])
					break
				}
			}
		}
	}
}

// A singular matrix reports the column of its first zero pivot.
func TestLUZeroPivot(t *testing.T) {
	a := []float64{
		1, 2, 3,
		2, 4, 6,
		0, 0, 1,
	}
	if z := newLU(3, nil, nil).factor(a); z != 1 {
		t.Errorf("zero pivot at %d, want 1", z)
	}
}

// With the structure of a banded matrix (as a chain of parts gives) the
// bounded elimination still matches LAPACK, pivoting and fill-in included.
func TestLUBandedAgainstLAPACK(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	var impl gonum.Implementation
	for _, n := range []int{3, 30, 120} {
		for _, bw := range []int{1, 2, 5} {
			a := make([]float64, n*n)
			first, last := make([]int, n), make([]int, n)
			for i := 0; i < n; i++ {
				first[i], last[i] = max(0, i-bw), min(n-1, i+bw)
				for j := max(0, i-bw); j <= last[i]; j++ {
					// Small diagonals force row exchanges.
					a[i*n+j] = rng.NormFloat64()
					if i == j && rng.Float64() < 0.5 {
						a[i*n+j] *= 1e-3
					}
				}
			}
			b := make([]float64, n)
			for i := range b {
				b[i] = rng.NormFloat64()
			}
			f := newLU(n, first, last)
			if z := f.factor(a); z >= 0 {
				t.Fatalf("n=%d bw=%d: zero pivot at %d", n, bw, z)
			}
			x := append([]float64(nil), b...)
			f.solve(x)
			ref := append([]float64(nil), a...)
			ipiv := make([]int, n)
			impl.Dgetrf(n, n, ref, n, ipiv)
			xr := append([]float64(nil), b...)
			impl.Dgetrs(blas.NoTrans, n, 1, ref, n, ipiv, xr, 1)
			for i := range x {
				if d := math.Abs(x[i] - xr[i]); d > 1e-8*(1+math.Abs(xr[i])) {
					t.Fatalf("n=%d bw=%d: x[%d] = %.15g, LAPACK %.15g", n, bw, i, x[i], xr[i])
				}
			}
		}
	}
}
