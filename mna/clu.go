package mna

import (
	"math"
	"math/cmplx"
)

// clu is a dense complex LU factorisation with partial pivoting, P·A = L·U
// with L unit lower and U upper, both in a, on storage reused at every
// frequency of a sweep. It is the unblocked right-looking algorithm of
// LAPACK's zgetf2 written out, the pivot chosen by |re| + |im| as LAPACK
// does; zero multipliers are skipped, which is most of them in a circuit
// matrix. gonum has no complex factorisation, so the tests check this one
// against gonum's real LU of the equivalent real system of twice the size.
type clu struct {
	n   int
	a   []complex128
	piv []int
}

func newCLU(n int) *clu {
	return &clu{n: n, a: make([]complex128, n*n), piv: make([]int, n)}
}

func cabs1(z complex128) float64 { return math.Abs(real(z)) + math.Abs(imag(z)) }

// factor copies m and factors it. It returns the first column whose pivot is
// zero or not finite, or -1.
func (f *clu) factor(m []complex128) int {
	n, a := f.n, f.a
	copy(a, m)
	bad := -1
	for k := 0; k < n; k++ {
		p, mx := k, cabs1(a[k*n+k])
		for i := k + 1; i < n; i++ {
			if v := cabs1(a[i*n+k]); v > mx {
				p, mx = i, v
			}
		}
		f.piv[k] = p
		if p != k {
			rk, rp := a[k*n:k*n+n], a[p*n:p*n+n]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
		}
		d := a[k*n+k]
		if d == 0 || cmplx.IsNaN(d) || cmplx.IsInf(d) {
			if bad < 0 {
				bad = k
			}
			continue
		}
		inv := 1 / d
		rowk := a[k*n+k+1 : k*n+n]
		for i := k + 1; i < n; i++ {
			l := a[i*n+k]
			if l == 0 {
				continue
			}
			l *= inv
			a[i*n+k] = l
			rowi := a[i*n+k+1 : i*n+n]
			rowi = rowi[:len(rowk)]
			for j, v := range rowk {
				if v != 0 {
					rowi[j] -= l * v
				}
			}
		}
	}
	return bad
}

// solve overwrites b with the solution of A·x = b.
func (f *clu) solve(b []complex128) {
	n, a := f.n, f.a
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
		}
	}
	for i := 1; i < n; i++ {
		s := b[i]
		for j, v := range a[i*n : i*n+i] {
			if v != 0 {
				s -= v * b[j]
			}
		}
		b[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		s := b[i]
		row := a[i*n+i+1 : i*n+n]
		for j, v := range row {
			if v != 0 {
				s -= v * b[i+1+j]
			}
		}
		b[i] = s / a[i*n+i]
	}
}
