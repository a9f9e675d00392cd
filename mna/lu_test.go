package mna

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/lapack/gonum"
)

// symmetricPattern is the pattern of the nonzeros of a (n×n, row-major)
// and of its transpose, with the entries of a in that pattern's order.
func symmetricPattern(n int, a []float64) (*pattern, []float64) {
	var blocks [][]int
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			if a[i*n+j] != 0 || a[j*n+i] != 0 {
				blocks = append(blocks, []int{i, j})
			}
		}
	}
	p := newPattern(n, blocks)
	v := make([]float64, p.nnz())
	for i := 0; i < n; i++ {
		for e := p.ptr[i]; e < p.ptr[i+1]; e++ {
			v[e] = a[i*n+int(p.col[e])]
		}
	}
	return p, v
}

// checkSolve factors a with the engine's LU and with gonum's LAPACK
// (Dgetrf/Dgetrs, partial pivoting) and compares the solutions of a·x = b;
// the engine's must also leave a residual at rounding level [pub: Golub &
// Van Loan, backward stability of partial pivoting].
func checkSolve(t *testing.T, what string, f *sparseLU, n int, a, vals, b []float64) {
	t.Helper()
	var impl gonum.Implementation
	if z := f.factor(vals); z >= 0 {
		t.Fatalf("%s: zero pivot at %d", what, z)
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
		t.Errorf("%s: residual %.3g against scale %.3g", what, res, scale)
	}
	// The two pivot differently (this LU prefers a row's own unknown within
	// pivotThreshold of the largest), so they agree to the rounding the
	// matrix's condition allows, not to the last bits.
	big := 0.0
	for _, v := range xr {
		big = math.Max(big, math.Abs(v))
	}
	for i := range x {
		if d := math.Abs(x[i] - xr[i]); d > 1e-6*(1+big) {
			t.Errorf("%s: x[%d] = %.15g, LAPACK %.15g", what, i, x[i], xr[i])
			break
		}
	}
}

// The engine's sparse LU agrees with gonum's LAPACK on random dense and
// sparse matrices, on the first factorisation (an analysis with pivoting)
// and on a second one of new numbers in the same pattern (a replay).
func TestLUAgainstLAPACK(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
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
			p, v := symmetricPattern(n, a)
			f := newSparseLU(p, nil)
			b := make([]float64, n)
			for i := range b {
				b[i] = rng.NormFloat64()
			}
			checkSolve(t, "first", f, n, a, v, b)
			// New numbers in the same places: a replay, or a new analysis
			// when the old pivots no longer suit them.
			for i := range a {
				if a[i] != 0 {
					a[i] *= 1 + 0.1*rng.NormFloat64()
				}
			}
			for i := 0; i < n; i++ {
				for e := p.ptr[i]; e < p.ptr[i+1]; e++ {
					v[e] = a[i*n+int(p.col[e])]
				}
			}
			checkSolve(t, "again", f, n, a, v, b)
		}
	}
}

// A singular matrix reports the column of its zero pivot.
func TestLUZeroPivot(t *testing.T) {
	a := []float64{
		1, 2, 3,
		2, 4, 6,
		0, 0, 1,
	}
	p, v := symmetricPattern(3, a)
	if z := newSparseLU(p, nil).factor(v); z < 0 {
		t.Errorf("no zero pivot reported for a singular matrix")
	}
}

// Small diagonals force row exchanges: a banded matrix whose diagonal is
// sometimes a thousand times below its neighbours still solves as LAPACK
// does, first with pivoting and then in a replay when the small diagonals
// grow (the pivots must be chosen again) or stay (the replay holds).
func TestLUPivotsAndReplays(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{3, 30, 120} {
		for _, bw := range []int{1, 2, 5} {
			a := make([]float64, n*n)
			small := make([]bool, n)
			for i := 0; i < n; i++ {
				small[i] = rng.Float64() < 0.5
				for j := max(0, i-bw); j <= min(n-1, i+bw); j++ {
					a[i*n+j] = rng.NormFloat64()
					if i == j && small[i] {
						a[i*n+j] *= 1e-3
					}
				}
			}
			p, v := symmetricPattern(n, a)
			f := newSparseLU(p, nil)
			b := make([]float64, n)
			for i := range b {
				b[i] = rng.NormFloat64()
			}
			checkSolve(t, "pivoted", f, n, a, v, b)
			analyses := f.analyses
			for i := 0; i < n; i++ {
				if small[i] {
					a[i*n+i] *= 1e4
				}
			}
			for i := 0; i < n; i++ {
				for e := p.ptr[i]; e < p.ptr[i+1]; e++ {
					v[e] = a[i*n+int(p.col[e])]
				}
			}
			checkSolve(t, "grown", f, n, a, v, b)
			checkSolve(t, "replayed", f, n, a, v, b)
			if f.analyses > analyses+1 {
				t.Errorf("n=%d bw=%d: %d analyses for one change of numbers", n, bw, f.analyses-analyses)
			}
		}
	}
}

// A fan of chains from one shared node fills in nothing with the engine's
// ordering: the factors hold no more entries than the matrix [calc: every
// chain is eliminated from its far end towards the shared node, which is
// eliminated last].
func TestLUFanHasNoFill(t *testing.T) {
	const lines, length = 40, 5
	n := 1 + lines*length
	a := make([]float64, n*n)
	set := func(i, j int, v float64) { a[i*n+j], a[j*n+i] = v, v }
	for i := 0; i < n; i++ {
		a[i*n+i] = 4
	}
	for l := 0; l < lines; l++ {
		prev := 0 // the shared node
		for k := 0; k < length; k++ {
			u := 1 + l*length + k
			set(prev, u, -1)
			prev = u
		}
	}
	p, v := symmetricPattern(n, a)
	f := newSparseLU(p, nil)
	b := make([]float64, n)
	for i := range b {
		b[i] = float64(i % 7)
	}
	checkSolve(t, "fan", f, n, a, v, b)
	if got, want := len(f.fCol), p.nnz(); got != want {
		t.Errorf("factors hold %d entries for a matrix of %d", got, want)
	}
}
