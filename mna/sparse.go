package mna

import (
	"math"
	"slices"
)

// The circuit matrix is sparse: a device stamps only among its own unknowns,
// so a row holds the unknowns of the few devices at that node or branch.
// Its structure is known when the circuit is compiled, and so is the order
// in which Gaussian elimination creates the least fill. The engine keeps
// only the entries of that structure (pattern), factors them with a
// structure worked out once and reused (sparseLU), and so needs neither an
// N×N matrix nor N³ work: a ladder or a connector with a hundred lines
// costs about linearly in its size, and the tens of unknowns of a
// protection network factor in a few hundred operations laid out in
// advance.

// pattern is the structure of the circuit matrix in the unknowns' own
// numbering, rows in compressed form with ascending columns. It is
// symmetric: every block a device stamps is square (its unknowns by its
// unknowns), and every diagonal is present.
type pattern struct {
	n    int
	ptr  []int32 // start of each row's entries, n+1
	col  []int32 // column of each entry
	diag []int32 // position of each row's diagonal entry
}

// newPattern is the union of the diagonal and of blocks[d]×blocks[d] for
// every block (the unknowns a device stamps; Ground entries excluded).
func newPattern(n int, blocks [][]int) *pattern {
	rows := make([][]int32, n)
	for i := range rows {
		rows[i] = []int32{int32(i)}
	}
	for _, b := range blocks {
		for _, r := range b {
			if r < 0 {
				continue
			}
			for _, c := range b {
				if c >= 0 {
					rows[r] = append(rows[r], int32(c))
				}
			}
		}
	}
	p := &pattern{n: n, ptr: make([]int32, n+1), diag: make([]int32, n)}
	for i, r := range rows {
		slices.Sort(r)
		r = slices.Compact(r)
		p.ptr[i] = int32(len(p.col))
		for _, c := range r {
			if int(c) == i {
				p.diag[i] = int32(len(p.col))
			}
			p.col = append(p.col, c)
		}
	}
	p.ptr[n] = int32(len(p.col))
	return p
}

// at is the position of entry (i, j), or -1 when it is not in the pattern.
func (p *pattern) at(i, j int) int {
	lo, hi := int(p.ptr[i]), int(p.ptr[i+1])
	k, ok := slices.BinarySearch(p.col[lo:hi], int32(j))
	if !ok {
		return -1
	}
	return lo + k
}

// nnz is the number of entries.
func (p *pattern) nnz() int { return len(p.col) }

// minimumDegree is an elimination order of the symmetric pattern that keeps
// fill low: repeatedly the unknown with the fewest neighbours left (the
// lowest index among equals, so that the order is reproducible), its
// neighbours then joined to each other as its elimination would join them
// [pub: Tinney & Walker 1967, scheme 2; George & Liu 1989]. A fan of lines
// from one shared node orders the lines first and the shared node last, so
// that eliminating a line fills in nothing beyond it.
func minimumDegree(p *pattern) []int32 {
	n := p.n
	adj := make([][]int32, n)
	for i := 0; i < n; i++ {
		for _, c := range p.col[p.ptr[i]:p.ptr[i+1]] {
			if int(c) != i {
				adj[i] = append(adj[i], c)
			}
		}
	}
	done := make([]bool, n)
	mark := make([]int, n)
	for i := range mark {
		mark[i] = -1
	}
	order := make([]int32, 0, n)
	for step := 0; step < n; step++ {
		v, best := -1, math.MaxInt
		for i := 0; i < n; i++ {
			if !done[i] && len(adj[i]) < best {
				v, best = i, len(adj[i])
			}
		}
		done[v] = true
		order = append(order, int32(v))
		nb := adj[v]
		for _, u := range nb {
			// adj(u) ← adj(u) ∪ adj(v) \ {u, v}
			mark[u] = step
			kept := adj[u][:0]
			for _, w := range adj[u] {
				if int(w) != v {
					kept = append(kept, w)
					mark[w] = step
				}
			}
			adj[u] = kept
			for _, w := range nb {
				if w != u && mark[w] != step {
					adj[u] = append(adj[u], w)
					mark[w] = step
				}
			}
		}
		adj[v] = nil
	}
	return order
}

// sparseLU factors matrices of one pattern: P·A·Q = L·U with the column
// order Q fixed (minimumDegree) and the row order P chosen by threshold
// partial pivoting.
//
// The first factorisation, and any later one whose fixed order no longer
// suits the numbers, is an analysis: a left-looking elimination column by
// column [pub: Gilbert & Peierls 1988], each column's pivot the row of the
// largest magnitude unless the row belonging to that unknown comes within
// pivotThreshold of it (which keeps the structure close to symmetric). It
// records the structure of L and U and the operations that form them.
// Every other factorisation replays those operations on the new numbers
// (refactor): one pass over precomputed positions, no search. A replay
// whose pivot vanishes, or whose multipliers grow past growthLimit (the
// numbers have moved, a clamp has switched on, the matrix of the operating
// point has given way to the transient's), falls back to an analysis.
type sparseLU struct {
	n   int
	pat *pattern
	src []int32 // entry e of the pattern is a[src[e]] in the matrices factored
	ord []int32 // column order

	ok bool // the structure below belongs to a successful analysis

	// The factors, row by row in pivot order: row k holds L's multipliers
	// (columns < k, ascending), the pivot, then U divided by the pivot
	// (columns > k), with columns numbered by elimination step.
	rowOf []int32 // original row of pivot row k
	colOf []int32 // original column eliminated at step k
	fPtr  []int32 // n+1
	fDiag []int32
	fCol  []int32
	val   []float64
	inv   []float64 // reciprocal pivots (0 for a zero pivot)

	aToF    []int32 // factor position of each pattern entry
	opStart []int32 // for each factor position, the start of its updates in opDst (L entries only)
	opDst   []int32 // row k −= l·U(j,:): the positions in row k of U(j,:)'s columns
	work    []float64

	// The factors again for the solve, each part in one flat run in the
	// order the substitutions take them: L by ascending rows, U (divided
	// by its pivots) by descending rows, each entry with its row, column
	// and place in val.
	lRow, lCol, lPos []int32
	uRow, uCol, uPos []int32
	lv, uv           []float64

	// tiny is the pivot magnitude at or below which factor reports a column
	// in weak (the first such, or -1): set it before factor.
	tiny float64
	weak int

	// Analyses done, for tests.
	analyses int

	// Scratch of the analysis, kept to spare allocation.
	an analysisScratch
}

// pivotThreshold: a row's own unknown is taken as pivot when its magnitude
// is at least this share of the column's largest [pub: the threshold
// partial pivoting of sparse LU codes, 0.1 being common].
const pivotThreshold = 0.1

// growthLimit bounds the multipliers of a replayed factorisation: partial
// pivoting keeps them within 1/pivotThreshold, so one a hundred times
// beyond that means the pivot order no longer suits the numbers.
const growthLimit = 1e3

type analysisScratch struct {
	x      []float64 // the column being formed, by original row
	inX    []bool
	nzx    []int32 // rows of x's entries
	stepOf []int32 // pivot step of each original row, -1 before it pivots
	lCol   [][]int32
	lVal   [][]float64
	uCol   [][]int32 // per column step j: the steps i < j of U(i, j)
	uVal   [][]float64
	stack  []int32
	pstack []int32
	idx    []int32
	visit  []int32 // the search that last visited each step
	search int32

	// The layout's: the factors by rows, and two maps of columns.
	lRows, uRows [][]int32
	lRowV, uRowV [][]float64
	pos, stepCol []int32
}

// newSparseLU prepares the factorisation of matrices of pattern p whose
// entry e is a[src[e]] (nil src: a[e]).
func newSparseLU(p *pattern, src []int32) *sparseLU {
	n := p.n
	if src == nil {
		src = make([]int32, p.nnz())
		for e := range src {
			src[e] = int32(e)
		}
	}
	f := &sparseLU{n: n, pat: p, src: src, ord: minimumDegree(p), weak: -1,
		rowOf: make([]int32, n), colOf: make([]int32, n), fPtr: make([]int32, n+1),
		fDiag: make([]int32, n), inv: make([]float64, n), aToF: make([]int32, p.nnz()),
		work: make([]float64, n)}
	a := &f.an
	a.x = make([]float64, n)
	a.inX = make([]bool, n)
	a.stepOf = make([]int32, n)
	a.lCol, a.lVal = make([][]int32, n), make([][]float64, n)
	a.uCol, a.uVal = make([][]int32, n), make([][]float64, n)
	a.visit = make([]int32, n)
	a.lRows, a.uRows = make([][]int32, n), make([][]int32, n)
	a.lRowV, a.uRowV = make([][]float64, n), make([][]float64, n)
	a.pos, a.stepCol = make([]int32, n), make([]int32, n)
	return f
}

// factor factors the matrix whose pattern entries are in a (see src). It returns the
// original column of the first exactly zero pivot, or -1; weak is the first
// column whose best pivot is at most tiny, or -1.
func (f *sparseLU) factor(a []float64) int {
	if f.ok {
		if z, ok := f.refactor(a); ok {
			return z
		}
	}
	return f.analyse(a)
}

// refactor replays the recorded elimination on a. ok is false when the
// replay is unsound (see sparseLU); z is the original column of an exactly
// zero pivot, or -1.
func (f *sparseLU) refactor(a []float64) (z int, ok bool) {
	val, inv := f.val, f.inv
	clear(val)
	src := f.src[:len(f.aToF)]
	for e, p := range f.aToF {
		val[p] = a[src[e]]
	}
	f.weak = -1
	for k := 0; k < f.n; k++ {
		lo, d, hi := f.fPtr[k], f.fDiag[k], f.fPtr[k+1]
		for p := lo; p < d; p++ {
			j := f.fCol[p]
			aj := val[p]
			l := aj * inv[j]
			if !(math.Abs(l) <= growthLimit) {
				return -1, false
			}
			val[p] = l
			// row k −= l·U(j,:) = aj·U(j,:)/U(j,j), the stored row.
			u := val[f.fDiag[j]+1 : f.fPtr[j+1]]
			o := int(f.opStart[p])
			dst := f.opDst[o : o+len(u)]
			for m, v := range u {
				val[dst[m]] -= aj * v
			}
		}
		piv := val[d]
		if !(math.Abs(piv) > f.tiny) {
			return -1, false
		}
		ik := 1 / piv
		inv[k] = ik
		row := val[d+1 : hi]
		for m := range row {
			row[m] *= ik
		}
	}
	f.publish()
	return -1, true
}

// publish copies the factors into the solve's flat runs.
func (f *sparseLU) publish() {
	val := f.val
	lv, uv := f.lv[:len(f.lPos)], f.uv[:len(f.uPos)]
	for i, p := range f.lPos {
		lv[i] = val[p]
	}
	for i, p := range f.uPos {
		uv[i] = val[p]
	}
}

// analyse factors a with pivoting, column by column in f.ord, and records
// the structure and operations for later replays.
func (f *sparseLU) analyse(a []float64) int {
	f.analyses++
	n, p, s := f.n, f.pat, &f.an
	f.ok = false
	f.weak = -1
	zero := -1
	for i := range s.stepOf {
		s.stepOf[i] = -1
	}
	for j := 0; j < n; j++ {
		s.lCol[j], s.lVal[j] = s.lCol[j][:0], s.lVal[j][:0]
		s.uCol[j], s.uVal[j] = s.uCol[j][:0], s.uVal[j][:0]
	}
	// The pattern is symmetric: column c's entries are row c's columns.
	for j := 0; j < n; j++ {
		c := int(f.ord[j])
		f.colOf[j] = int32(c)
		// x = A(:, c), scattered by original row.
		s.nzx = s.nzx[:0]
		for e := p.ptr[c]; e < p.ptr[c+1]; e++ {
			r := p.col[e]
			// A(r, c) sits in row r; the pattern's symmetry finds it.
			s.x[r] = a[f.src[p.at(int(r), c)]]
			s.inX[r] = true
			s.nzx = append(s.nzx, r)
		}
		// The steps whose columns of L reach x, in topological order.
		top := f.reach(j)
		for _, step := range top {
			r := f.rowOf[step]
			u := s.x[r]
			for k, row := range s.lCol[step] {
				if !s.inX[row] {
					s.inX[row] = true
					s.x[row] = 0
					s.nzx = append(s.nzx, row)
				}
				s.x[row] -= s.lVal[step][k] * u
			}
		}
		// U(:, j): the entries of pivoted rows; the pivot among the rest.
		best, bestRow, own := -1.0, int32(-1), -1.0
		for _, r := range s.nzx {
			if st := s.stepOf[r]; st >= 0 {
				s.uCol[j] = append(s.uCol[j], st)
				s.uVal[j] = append(s.uVal[j], s.x[r])
				continue
			}
			v := math.Abs(s.x[r])
			if v > best || (v == best && r < bestRow) {
				best, bestRow = v, r
			}
			if int(r) == c {
				own = v
			}
		}
		piv := bestRow
		if own >= 0 && own >= pivotThreshold*best && own > 0 {
			piv = int32(c)
		}
		if piv < 0 {
			// A column with no entry left: structurally singular.
			piv = f.freeRow()
			best = 0
		}
		if f.weak < 0 && !(best > f.tiny) {
			f.weak = c
		}
		f.rowOf[j] = piv
		s.stepOf[piv] = int32(j)
		d := 0.0
		if s.inX[piv] {
			d = s.x[piv]
		}
		if d == 0 {
			if zero < 0 {
				zero = c
			}
			f.inv[j] = 0
		} else {
			f.inv[j] = 1 / d
		}
		for _, r := range s.nzx {
			if s.stepOf[r] < 0 {
				s.lCol[j] = append(s.lCol[j], r)
				s.lVal[j] = append(s.lVal[j], s.x[r]*f.inv[j])
			}
			s.inX[r] = false
		}
	}
	f.layout()
	f.publish()
	f.ok = zero < 0
	return zero
}

// freeRow is the lowest original row not yet pivoted.
func (f *sparseLU) freeRow() int32 {
	for r, st := range f.an.stepOf {
		if st < 0 {
			return int32(r)
		}
	}
	panic("mna: no row left to pivot")
}

// reach returns the steps before j whose L columns the entries of x (in
// s.nzx) reach, in topological order (each before the steps it updates),
// by depth-first search through L [pub: Gilbert & Peierls 1988].
func (f *sparseLU) reach(j int) []int32 {
	s := &f.an
	s.search++
	stamp := s.search
	out := s.stack[:0]
	for _, r := range s.nzx[:len(s.nzx):len(s.nzx)] {
		st := s.stepOf[r]
		if st < 0 || s.visit[st] == stamp {
			continue
		}
		// Iterative DFS from st; postorder into out.
		s.pstack = append(s.pstack[:0], st)
		s.visit[st] = stamp
		idx := append(s.idx[:0], 0)
		for len(s.pstack) > 0 {
			top := s.pstack[len(s.pstack)-1]
			k := idx[len(idx)-1]
			col := s.lCol[top]
			pushed := false
			for int(k) < len(col) {
				row := col[k]
				k++
				if nst := s.stepOf[row]; nst >= 0 && s.visit[nst] != stamp {
					idx[len(idx)-1] = k
					s.visit[nst] = stamp
					s.pstack = append(s.pstack, nst)
					idx = append(idx, 0)
					pushed = true
					break
				}
			}
			if !pushed {
				out = append(out, top)
				s.pstack = s.pstack[:len(s.pstack)-1]
				idx = idx[:len(idx)-1]
			}
		}
		s.idx = idx
	}
	s.stack = out
	slices.Reverse(out)
	return out
}

// layout turns the columns of the analysis into the row-wise factors and
// the replay's operations.
func (f *sparseLU) layout() {
	n, s := f.n, &f.an
	// Row k of the factors: L(k, j) for the steps j whose L column holds
	// row rowOf[k], U(k, m) for the steps m whose U column holds step k.
	lRows, lRowV, uRows, uRowV := s.lRows, s.lRowV, s.uRows, s.uRowV
	for k := 0; k < n; k++ {
		lRows[k], lRowV[k] = lRows[k][:0], lRowV[k][:0]
		uRows[k], uRowV[k] = uRows[k][:0], uRowV[k][:0]
	}
	for j := 0; j < n; j++ {
		for t, r := range s.lCol[j] {
			k := s.stepOf[r]
			lRows[k] = append(lRows[k], int32(j))
			lRowV[k] = append(lRowV[k], s.lVal[j][t])
		}
	}
	for m := 0; m < n; m++ {
		for t, k := range s.uCol[m] {
			uRows[k] = append(uRows[k], int32(m))
			uRowV[k] = append(uRowV[k], s.uVal[m][t])
		}
	}
	f.fCol = f.fCol[:0]
	f.val = f.val[:0]
	for k := 0; k < n; k++ {
		f.fPtr[k] = int32(len(f.fCol))
		// The L columns come in ascending step order already (j loops up);
		// so do the U columns (m loops up).
		f.fCol = append(f.fCol, lRows[k]...)
		f.val = append(f.val, lRowV[k]...)
		f.fDiag[k] = int32(len(f.fCol))
		f.fCol = append(f.fCol, int32(k))
		d := 0.0
		if f.inv[k] != 0 {
			d = 1 / f.inv[k]
		}
		f.val = append(f.val, d)
		f.fCol = append(f.fCol, uRows[k]...)
		for _, v := range uRowV[k] {
			f.val = append(f.val, v*f.inv[k])
		}
	}
	f.fPtr[n] = int32(len(f.fCol))
	f.lRow, f.lCol, f.lPos = f.lRow[:0], f.lCol[:0], f.lPos[:0]
	for k := 0; k < n; k++ {
		for q := f.fPtr[k]; q < f.fDiag[k]; q++ {
			f.lRow = append(f.lRow, int32(k))
			f.lCol = append(f.lCol, f.fCol[q])
			f.lPos = append(f.lPos, q)
		}
	}
	f.uRow, f.uCol, f.uPos = f.uRow[:0], f.uCol[:0], f.uPos[:0]
	for k := n - 1; k >= 0; k-- {
		for q := f.fDiag[k] + 1; q < f.fPtr[k+1]; q++ {
			f.uRow = append(f.uRow, int32(k))
			f.uCol = append(f.uCol, f.fCol[q])
			f.uPos = append(f.uPos, q)
		}
	}
	f.lv = slices.Grow(f.lv[:0], len(f.lPos))[:len(f.lPos)]
	f.uv = slices.Grow(f.uv[:0], len(f.uPos))[:len(f.uPos)]

	// Positions of row k's columns while its operations are laid out.
	pos := s.pos
	for i := range pos {
		pos[i] = -1
	}
	stepCol := s.stepCol // elimination step of each original column
	for k, c := range f.colOf {
		stepCol[c] = int32(k)
	}
	f.opStart = slices.Grow(f.opStart[:0], len(f.fCol))[:len(f.fCol)]
	f.opDst = f.opDst[:0]
	p := f.pat
	for k := 0; k < n; k++ {
		for q := f.fPtr[k]; q < f.fPtr[k+1]; q++ {
			pos[f.fCol[q]] = q
		}
		for q := f.fPtr[k]; q < f.fDiag[k]; q++ {
			j := f.fCol[q]
			f.opStart[q] = int32(len(f.opDst))
			for m := f.fDiag[j] + 1; m < f.fPtr[j+1]; m++ {
				dst := pos[f.fCol[m]]
				if dst < 0 {
					panic("mna: factor structure not closed under elimination")
				}
				f.opDst = append(f.opDst, dst)
			}
		}
		r := int(f.rowOf[k])
		for e := p.ptr[r]; e < p.ptr[r+1]; e++ {
			q := pos[stepCol[p.col[e]]]
			if q < 0 {
				panic("mna: a matrix entry outside the factor structure")
			}
			f.aToF[e] = q
		}
		for q := f.fPtr[k]; q < f.fPtr[k+1]; q++ {
			pos[f.fCol[q]] = -1
		}
	}
}

// solve overwrites b with the solution of A·x = b for the last matrix
// factored.
func (f *sparseLU) solve(b []float64) { f.solveTo(b, b, false) }

// solveNeg sets x to the solution of A·x = −b for the last matrix factored:
// Newton's update from the residual b, whose negation is folded into the
// gather of the right-hand side instead of taking a pass of its own.
func (f *sparseLU) solveNeg(x, b []float64) { f.solveTo(x, b, true) }

// solveTo sets x to the solution of A·x = b, or of A·x = −b with neg; x
// may be b.
func (f *sparseLU) solveTo(x, b []float64, neg bool) {
	y := f.work[:f.n]
	if neg {
		for k, r := range f.rowOf {
			y[k] = -b[r]
		}
	} else {
		for k, r := range f.rowOf {
			y[k] = b[r]
		}
	}
	lRow, lCol := f.lRow[:len(f.lv)], f.lCol[:len(f.lv)]
	for i, v := range f.lv {
		y[lRow[i]] -= v * y[lCol[i]]
	}
	// The reciprocal the elimination already formed: a multiplication
	// instead of a division.
	inv := f.inv[:len(y)]
	for k := range y {
		y[k] *= inv[k]
	}
	uRow, uCol := f.uRow[:len(f.uv)], f.uCol[:len(f.uv)]
	for i, v := range f.uv {
		y[uRow[i]] -= v * y[uCol[i]]
	}
	for k, c := range f.colOf {
		x[c] = y[k]
	}
}
