package devices

// A small stand-alone rig for the nonlinear model tests: it binds one device
// to unknowns of its own, evaluates it through a Context exactly as the
// engine's contract describes (F(x) + d/dt q(x) = 0, d/dt q ≈ Alpha·q + hist
// on the rows of each state), checks Jacobians against central differences
// and runs a plain Newton loop with a dense solve. It does not depend on the
// engine, so these tests stand on their own.

import (
	"fmt"
	"math"
	"testing"
)

type nlRig struct {
	d    Device
	n    int
	nd   Nodes
	rows []StateRows
	c    Context
	hist []float64 // per state: d/dt q ≈ Alpha·q + hist
	// extra stamps the rest of a test circuit (sources, loads) into c.
	extra func(c *Context)
}

// newNLRig binds d with its terminals at the given indices (Ground allowed)
// and its internal nodes and branches numbered after the largest terminal.
func newNLRig(t testing.TB, d Device, terms ...int) *nlRig {
	t.Helper()
	l := d.Layout()
	if len(terms) != len(l.Terminals) {
		t.Fatalf("%s: rig given %d terminals, layout has %d", d.Name(), len(terms), len(l.Terminals))
	}
	n := 0
	for _, k := range terms {
		if k+1 > n {
			n = k + 1
		}
	}
	nd := Nodes{Terminals: terms}
	for range l.Internal {
		nd.Internal = append(nd.Internal, n)
		n++
	}
	for range l.Branches {
		nd.Branches = append(nd.Branches, n)
		n++
	}
	r := &nlRig{d: d, n: n, nd: nd}
	r.rows = d.Bind(nd)
	r.c = Context{
		X: make([]float64, n), F: make([]float64, n), J: make([]float64, n*n), N: n,
		Q: make([]float64, len(r.rows)), Rows: r.rows,
	}
	r.hist = make([]float64, len(r.rows))
	return r
}

// eval evaluates at x with the given Alpha, static part only (no hist, no
// state derivative in F): F and J as stamped by the device (and extra).
func (r *nlRig) eval(x []float64, alpha float64) {
	copy(r.c.X, x)
	r.c.Alpha = alpha
	r.c.Limited = false
	clear(r.c.F)
	clear(r.c.J)
	r.d.Eval(&r.c)
	if r.extra != nil {
		r.extra(&r.c)
	}
}

// residual evaluates the full residual of the rig's equations at x:
// F + Alpha·q + hist on each state's rows, and its Jacobian.
func (r *nlRig) residual(x []float64) {
	r.eval(x, r.c.Alpha)
	for k, sr := range r.rows {
		dq := r.c.Alpha*r.c.Q[k] + r.hist[k]
		r.c.AddF(sr.Plus, dq)
		r.c.AddF(sr.Minus, -dq)
	}
}

// settle evaluates at x until the device's limiting memory sits at x.
func (r *nlRig) settle(t testing.TB, x []float64) {
	t.Helper()
	for range 200 {
		r.eval(x, 0)
		if !r.c.Limited {
			return
		}
	}
	t.Fatalf("%s: limiting never settles at %v", r.d.Name(), x)
}

// checkJacobian compares the stamped static Jacobian and the stamped charge
// derivatives with central differences of F and of the states, at x.
// Source of the check: the definition of the Jacobian (a finite-difference
// derivative, as in gonum's diff/fd).
func (r *nlRig) checkJacobian(t testing.TB, x []float64, what string) {
	t.Helper()
	n := r.n
	r.settle(t, x)
	r.eval(x, 0)
	j0 := append([]float64(nil), r.c.J...)
	const alpha = 1e9 // like 2/h for h = 2 ns: makes the charge part visible
	r.eval(x, alpha)
	ja := append([]float64(nil), r.c.J...)
	// Expected charge Jacobian D[row][col] = Σ_k ±∂q_k/∂x_col on the state rows.
	xp := append([]float64(nil), x...)
	fd := make([]float64, n*n)
	fround := make([]float64, n*n) // rounding error of each difference
	qd := make([]float64, n*n)
	fp, fm := make([]float64, n), make([]float64, n)
	qp, qm := make([]float64, len(r.rows)), make([]float64, len(r.rows))
	for col := range n {
		h := 1e-7 * math.Max(1e-2, math.Abs(x[col]))
		xp[col] = x[col] + h
		r.eval(xp, 0)
		if r.c.Limited {
			t.Fatalf("%s: limiting triggered by a finite-difference step", what)
		}
		copy(fp, r.c.F)
		copy(qp, r.c.Q)
		xp[col] = x[col] - h
		r.eval(xp, 0)
		copy(fm, r.c.F)
		copy(qm, r.c.Q)
		xp[col] = x[col]
		for row := range n {
			fd[row*n+col] = (fp[row] - fm[row]) / (2 * h)
			fround[row*n+col] = 1e-15 * math.Max(math.Abs(fp[row]), math.Abs(fm[row])) / h
		}
		for k, sr := range r.rows {
			dq := (qp[k] - qm[k]) / (2 * h)
			if sr.Plus >= 0 {
				qd[sr.Plus*n+col] += dq
			}
			if sr.Minus >= 0 {
				qd[sr.Minus*n+col] -= dq
			}
		}
	}
	scale, scaleQ := 0.0, 0.0
	for _, v := range j0 {
		scale = math.Max(scale, math.Abs(v))
	}
	for _, v := range qd {
		scaleQ = math.Max(scaleQ, math.Abs(v))
	}
	for row := range n {
		for col := range n {
			got, want := j0[row*n+col], fd[row*n+col]
			if !nlClose(got, want, 1e-5, 1e-9*scale+fround[row*n+col]+1e-15) {
				t.Errorf("%s: dF[%d]/dx[%d] = %.10g, finite difference %.10g", what, row, col, got, want)
			}
			gotQ := (ja[row*n+col] - got) / alpha
			wantQ := qd[row*n+col]
			if !nlClose(gotQ, wantQ, 1e-5, 1e-9*scaleQ+1e-25) {
				t.Errorf("%s: charge derivative [%d][%d] = %.10g, finite difference %.10g", what, row, col, gotQ, wantQ)
			}
		}
	}
}

// nlClose reports |a−b| ≤ rel·max(|a|,|b|) + abs.
func nlClose(a, b, rel, abs float64) bool {
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))+abs
}

// newton solves the rig's residual = 0 from x (modified in place), with
// the rig's Alpha and hist. It returns the iterations used.
func (r *nlRig) newton(x []float64, maxIter int) (int, error) {
	n := r.n
	a := make([]float64, n*n)
	b := make([]float64, n)
	for it := 1; it <= maxIter; it++ {
		r.residual(x)
		copy(a, r.c.J)
		for i := range n {
			b[i] = -r.c.F[i]
		}
		if err := nlSolveDense(a, b, n); err != nil {
			return it, err
		}
		big := 0.0
		for i := range n {
			x[i] += b[i]
			big = math.Max(big, math.Abs(b[i])/(1+math.Abs(x[i])))
		}
		if big < 1e-12 && !r.c.Limited {
			return it, nil
		}
	}
	return maxIter, fmt.Errorf("no convergence in %d iterations", maxIter)
}

// nlSolveDense solves a·x = b in place (b becomes x) by Gaussian
// elimination with partial pivoting.
func nlSolveDense(a, b []float64, n int) error {
	for k := range n {
		p := k
		for i := k + 1; i < n; i++ {
			if math.Abs(a[i*n+k]) > math.Abs(a[p*n+k]) {
				p = i
			}
		}
		if a[p*n+k] == 0 {
			return fmt.Errorf("singular at column %d", k)
		}
		if p != k {
			for j := range n {
				a[k*n+j], a[p*n+j] = a[p*n+j], a[k*n+j]
			}
			b[k], b[p] = b[p], b[k]
		}
		for i := k + 1; i < n; i++ {
			f := a[i*n+k] / a[k*n+k]
			if f == 0 {
				continue
			}
			for j := k; j < n; j++ {
				a[i*n+j] -= f * a[k*n+j]
			}
			b[i] -= f * b[k]
		}
	}
	for k := n - 1; k >= 0; k-- {
		s := b[k]
		for j := k + 1; j < n; j++ {
			s -= a[k*n+j] * b[j]
		}
		b[k] = s / a[k*n+k]
	}
	return nil
}

// testElement is an element as a test writes it in code: its kind's name,
// its name, its nodes and the parameters it states.
type testElement struct {
	kind  string
	name  string
	nodes [2]string
	num   map[string]float64
	str   map[string]string
}

// nlElement builds an element as a test would write it in code.
func nlElement(kind, name, a, b string, num map[string]float64, str map[string]string) testElement {
	return testElement{kind: kind, name: name, nodes: [2]string{a, b}, num: num, str: str}
}

// build makes the device of e as the deck checker would hand it to the
// model: every value through its kind's table (its rule checked, the
// defaults filled in, the required ones present).
func build(e testElement) (Device, error) {
	k := Lookup(e.kind)
	if k == nil {
		return nil, fmt.Errorf("%s: no kind %q", e.name, e.kind)
	}
	v := k.Values()
	for key, x := range e.num {
		if k.Param(key) == nil {
			return nil, fmt.Errorf("%s: a %s has no parameter %s", e.name, e.kind, key)
		}
		if err := v.Set(key, x); err != nil {
			return nil, fmt.Errorf("%s: %w", e.name, err)
		}
	}
	for key, w := range e.str {
		if err := v.SetWord(key, w); err != nil {
			return nil, fmt.Errorf("%s: %w", e.name, err)
		}
	}
	v.FillDefaults()
	for _, p := range k.Params {
		if p.Required && !v.Has(p.Key) {
			return nil, fmt.Errorf("%s: %s %s needs %s", e.name, e.kind, e.name, p.Key)
		}
	}
	return k.New(e.name, e.nodes, &v)
}

// nlMust builds the device of e or fails the test.
func nlMust(t testing.TB, e testElement) Device {
	t.Helper()
	d, err := build(e)
	if err != nil {
		t.Fatalf("%s: %v", e.name, err)
	}
	return d
}

// nlRandom fills a vector of n with values in [−s, s] from a fixed
// sequence (a small linear congruential generator keeps the test
// deterministic without a seed to manage).
func nlRandom(n int, s float64, seed uint64) []float64 {
	x := make([]float64, n)
	for i := range x {
		seed = seed*6364136223846793005 + 1442695040888963407
		x[i] = s * (2*float64(seed>>11)/float64(1<<53) - 1)
	}
	return x
}
