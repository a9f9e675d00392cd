package mna

import "math"

// lu is a dense LU factorisation with partial pivoting on storage reused
// for every solve: P·A = L·U, L unit lower and U upper, both in a.
//
// It is the unblocked right-looking algorithm of LAPACK's dgetf2 written
// out, with two economies for circuit matrices: zero multipliers are
// skipped, and each row's update stops at the last column where it can be
// nonzero (hi). For the tens of unknowns of a protection network this beats
// a BLAS-based factorisation, whose per-call dispatch costs more than the
// arithmetic (measured: gonum's Dgetrf and Dgetrs took several times
// longer at 15 unknowns); for a long chain of parts numbered along the chain
// the cost grows with the bandwidth rather than n³.
type lu struct {
	n   int
	a   []float64 // n×n row-major
	piv []int     // row exchanged with row k at step k
	hi  []int     // last possibly nonzero column of each row
}

func newLU(n int) *lu {
	return &lu{n: n, a: make([]float64, n*n), piv: make([]int, n), hi: make([]int, n)}
}

// factor copies m into the factorisation storage and factors it. It returns
// the first column whose pivot is exactly zero, or -1.
func (f *lu) factor(m []float64) int {
	n, a, hi := f.n, f.a, f.hi
	copy(a, m)
	for i := 0; i < n; i++ {
		h := -1
		row := a[i*n : i*n+n]
		for j := n - 1; j >= 0; j-- {
			if row[j] != 0 {
				h = j
				break
			}
		}
		hi[i] = h
	}
	zero := -1
	for k := 0; k < n; k++ {
		p, mx := k, math.Abs(a[k*n+k])
		for i := k + 1; i < n; i++ {
			if v := math.Abs(a[i*n+k]); v > mx {
				p, mx = i, v
			}
		}
		f.piv[k] = p
		if p != k {
			rk, rp := a[k*n:k*n+n], a[p*n:p*n+n]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
			hi[k], hi[p] = hi[p], hi[k]
		}
		d := a[k*n+k]
		if d == 0 {
			if zero < 0 {
				zero = k
			}
			continue
		}
		inv := 1 / d
		hk := hi[k]
		if hk <= k {
			// Row k ends at the diagonal: the multipliers change nothing.
			for i := k + 1; i < n; i++ {
				a[i*n+k] *= inv
			}
			continue
		}
		rowk := a[k*n+k+1 : k*n+hk+1]
		for i := k + 1; i < n; i++ {
			l := a[i*n+k]
			if l == 0 {
				continue
			}
			l *= inv
			a[i*n+k] = l
			rowi := a[i*n+k+1 : i*n+hk+1]
			for j, v := range rowk {
				rowi[j] -= l * v
			}
			if hk > hi[i] {
				hi[i] = hk
			}
		}
	}
	return zero
}

// pivot is the k-th diagonal entry of U.
func (f *lu) pivot(k int) float64 { return f.a[k*f.n+k] }

// solve overwrites b with the solution of A·x = b.
func (f *lu) solve(b []float64) {
	n, a := f.n, f.a
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
		}
	}
	for i := 1; i < n; i++ {
		row := a[i*n : i*n+i]
		s := b[i]
		for j, v := range row {
			s -= v * b[j]
		}
		b[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		h := max(f.hi[i], i)
		row := a[i*n+i+1 : i*n+h+1]
		s := b[i]
		x := b[i+1 : h+1]
		for j, v := range row {
			s -= v * x[j]
		}
		b[i] = s / a[i*n+i]
	}
}
