package mna

import "math"

// lu is a dense LU factorisation with partial pivoting on storage reused
// for every solve: P·A = L·U, L unit lower and U upper, both in a.
//
// It is the unblocked right-looking algorithm of LAPACK's dgetf2 written
// out, with economies for circuit matrices: zero multipliers are skipped,
// and the elimination is bounded by where entries can be nonzero, starting
// from the structure of the circuit (a device stamps only among its own
// unknowns) and widened by the fill-in as it happens. For the tens of
// unknowns of a protection network this beats a BLAS-based factorisation,
// whose per-call dispatch costs more than the arithmetic (measured: gonum's
// Dgetrf and Dgetrs took several times longer at 15 unknowns); for a long
// chain of parts numbered along the chain the cost grows with the
// bandwidth rather than n³.
type lu struct {
	n   int
	a   []float64 // n×n row-major
	piv []int     // row exchanged with row k at step k
	inv []float64 // reciprocal of each pivot (0 for a zero pivot)
	hi  []int     // last possibly nonzero column of each row
	lo  []int     // first possibly nonzero column of each row
	lr  []int     // last possibly nonzero row of each column

	// The circuit's structure: the first and last column of each row (and,
	// the structure being symmetric, the first and last row of each column).
	lo0, hi0 []int

	// tiny is the pivot magnitude at or below which factor reports a column
	// in weak (the first such, or -1): set it before factor.
	tiny float64
	weak int
}

// newLU prepares the factorisation of n×n matrices whose row i has no
// nonzero outside columns first[i]..last[i] and whose column j none outside
// rows first[j]..last[j]; nil bounds mean dense.
func newLU(n int, first, last []int) *lu {
	f := &lu{n: n, a: make([]float64, n*n), piv: make([]int, n), inv: make([]float64, n),
		hi: make([]int, n), lo: make([]int, n), lr: make([]int, n), lo0: first, hi0: last}
	if f.hi0 == nil {
		f.lo0, f.hi0 = make([]int, n), make([]int, n)
		for i := range f.hi0 {
			f.hi0[i] = n - 1
		}
	}
	copy(f.lo, f.lo0)
	copy(f.hi, f.hi0)
	return f
}

// smallLU is the size up to which the whole matrix is copied in one move:
// cheaper than a copy and a clear per row for the tens of unknowns of a
// protection network.
const smallLU = 48

// factor copies m into the factorisation storage and factors it. It returns
// the first column whose pivot is exactly zero, or -1. m must be zero outside
// the structure; only the structure is copied, after the extent the last
// factorisation filled is cleared.
func (f *lu) factor(m []float64) int {
	n, a, hi, lo, lr := f.n, f.a, f.hi, f.lo, f.lr
	if n <= smallLU {
		copy(a, m)
	} else {
		for i := 0; i < n; i++ {
			row := a[i*n : i*n+n]
			clear(row[lo[i] : max(hi[i], i)+1])
			copy(row[f.lo0[i]:f.hi0[i]+1], m[i*n+f.lo0[i]:i*n+f.hi0[i]+1])
		}
	}
	copy(hi, f.hi0)
	copy(lo, f.lo0)
	copy(lr, f.hi0)
	zero := -1
	f.weak = -1
	for k := 0; k < n; k++ {
		end := lr[k]
		p, mx := k, math.Abs(a[k*n+k])
		for i := k + 1; i <= end; i++ {
			if v := math.Abs(a[i*n+k]); v > mx {
				p, mx = i, v
			}
		}
		f.piv[k] = p
		if p != k {
			// Only the columns where either row can be nonzero move; the
			// multipliers of L travel with their rows.
			j0, j1 := min(lo[k], lo[p]), max(hi[k], hi[p])
			rk, rp := a[k*n+j0:k*n+j1+1], a[p*n+j0:p*n+j1+1]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
			hi[k], hi[p] = hi[p], hi[k]
			lo[k], lo[p] = lo[p], lo[k]
			// The old row k now sits at p: its columns reach down to p.
			for j := k + 1; j <= hi[p]; j++ {
				if lr[j] < p {
					lr[j] = p
				}
			}
		}
		d := a[k*n+k]
		if f.weak < 0 && !(math.Abs(d) > f.tiny) {
			f.weak = k
		}
		if d == 0 {
			if zero < 0 {
				zero = k
			}
			f.inv[k] = 0
			continue
		}
		inv := 1 / d
		f.inv[k] = inv
		hk := hi[k]
		if hk <= k {
			// Row k ends at the diagonal: the multipliers change nothing.
			for i := k + 1; i <= end; i++ {
				a[i*n+k] *= inv
			}
			continue
		}
		rowk := a[k*n+k+1 : k*n+hk+1]
		for i := k + 1; i <= end; i++ {
			l := a[i*n+k]
			if l == 0 {
				continue
			}
			l *= inv
			a[i*n+k] = l
			rowi := a[i*n+k+1 : i*n+hk+1]
			rowi = rowi[:len(rowk)] // lets the compiler drop the bounds checks
			for j, v := range rowk {
				rowi[j] -= l * v
			}
			if hk > hi[i] {
				hi[i] = hk
			}
		}
		// Fill-in: the columns of row k now reach every row updated.
		for j := k + 1; j <= hk; j++ {
			if lr[j] < end {
				lr[j] = end
			}
		}
	}
	return zero
}

// solve overwrites b with the solution of A·x = b.
func (f *lu) solve(b []float64) {
	n, a := f.n, f.a
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
		}
	}
	for i := 1; i < n; i++ {
		j0 := min(f.lo[i], i)
		row := a[i*n+j0 : i*n+i]
		s := b[i]
		x := b[j0:i]
		x = x[:len(row)]
		for j, v := range row {
			s -= v * x[j]
		}
		b[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		h := max(f.hi[i], i)
		row := a[i*n+i+1 : i*n+h+1]
		s := b[i]
		x := b[i+1 : h+1]
		x = x[:len(row)]
		for j, v := range row {
			s -= v * x[j]
		}
		// The reciprocal the elimination already formed: a multiplication
		// instead of a division on the chain of dependent back-substitutions.
		b[i] = s * f.inv[i]
	}
}
