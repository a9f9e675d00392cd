package fit

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"
)

// Problem is a nonlinear least-squares problem: find x minimising
// ½·Σ r_k(x)² over M residuals.
type Problem struct {
	// M is the number of residuals.
	M int
	// Residuals stores r(x) in dst (length M). It must not modify x.
	Residuals func(dst, x []float64)
}

// Settings tune Minimize. A nil *Settings means every default; a zero
// field means that field's default.
type Settings struct {
	// MaxIterations bounds the major iterations. Zero: 200.
	MaxIterations int
	// Relative is the decrease of the cost, relative to the cost, below
	// which three iterations in a row count as converged. Zero: 1e-12.
	Relative float64
	// Step is the finite-difference step of the Jacobian, in the units of x
	// (the fits use logarithms of their parameters, so it is relative).
	// Zero: gonum's central-difference default.
	Step float64
}

// Result is the solution of a Problem.
type Result struct {
	X         []float64
	Residuals []float64 // r(X)
	Cost      float64   // ½·Σ r²
	// Sigma is the standard error of each x from the Jacobian at X,
	// √(diag((JᵀJ)⁻¹)·s²) with s² = Σr²/(M − N), NaN when the Jacobian is
	// singular or M ≤ N. For x = ln p it is the relative error of p.
	Sigma       []float64
	Status      optimize.Status
	Iterations  int
	Evaluations int
}

// Minimize solves p from x0 with gonum's Newton method given the
// Gauss–Newton Hessian JᵀJ (the Jacobian J of the residuals by central
// differences, gonum's diff/fd) and the gradient Jᵀr: away from the optimum
// gonum adds a multiple of the identity until the matrix is positive
// definite and searches along the step, which is the damping a
// Levenberg–Marquardt method would add, done by a maintained library.
func Minimize(p Problem, x0 []float64, set *Settings) (*Result, error) {
	n := len(x0)
	if n == 0 || p.M == 0 || p.Residuals == nil {
		panic("fit: Minimize needs parameters, residuals and a residual function")
	}
	cfg := set.withDefaults()
	obj := newObjective(p, n, cfg.Step)
	settings := &optimize.Settings{
		MajorIterations: cfg.MaxIterations,
		Converger:       &optimize.FunctionConverge{Relative: cfg.Relative, Absolute: 1e-300, Iterations: 3},
	}
	res, err := optimize.Minimize(obj.problem(), x0, settings, &optimize.Newton{Linesearcher: &optimize.Backtracking{}})
	if res == nil {
		return nil, fmt.Errorf("fit: %w", err)
	}
	out := &Result{X: append([]float64(nil), res.X...), Residuals: make([]float64, p.M),
		Status: res.Status, Iterations: res.MajorIterations}
	p.Residuals(out.Residuals, out.X)
	for _, v := range out.Residuals {
		out.Cost += v * v / 2
	}
	if obj.bad && (math.IsNaN(out.Cost) || math.IsInf(out.Cost, 0)) {
		return nil, errors.New("fit: the model could not be evaluated at the data (a residual is not finite)")
	}
	if err != nil && res.Status != optimize.IterationLimit {
		// gonum reports a line search that cannot improve an optimum
		// already reached to machine precision as an error; the result
		// stands when its gradient is that small.
		if !nearStationary(obj.jac, out.Residuals, n) {
			return nil, fmt.Errorf("fit: %w", err)
		}
	}
	obj.haveJ = false
	obj.jacobian(out.X)
	out.Sigma = sigma(obj.jac, out.Residuals, n)
	out.Evaluations = obj.evals
	return out, nil
}

// withDefaults returns the settings with every zero field (or a nil s)
// replaced by its default.
func (s *Settings) withDefaults() Settings {
	var cfg Settings
	if s != nil {
		cfg = *s
	}
	if cfg.MaxIterations == 0 {
		cfg.MaxIterations = 200
	}
	if cfg.Relative == 0 {
		cfg.Relative = 1e-12
	}
	return cfg
}

// objective is a Problem's cost ½·Σr² with the gradient Jᵀr and the
// Gauss–Newton Hessian JᵀJ, as gonum's optimize asks for them.
type objective struct {
	p     Problem
	n     int
	jset  *fd.JacobianSettings
	r     []float64
	evals int  // residual evaluations, the Jacobian's included
	bad   bool // a residual was not finite
	// The Jacobian at the last point asked for, shared by Grad and Hess,
	// which gonum calls at the same x.
	jac    *mat.Dense
	jx, jr []float64
	haveJ  bool
}

func newObjective(p Problem, n int, step float64) *objective {
	return &objective{
		p:    p,
		n:    n,
		jset: &fd.JacobianSettings{Formula: fd.Central, Step: step},
		r:    make([]float64, p.M),
		jac:  mat.NewDense(p.M, n, nil),
		jx:   make([]float64, n),
		jr:   make([]float64, p.M),
	}
}

func (o *objective) resid(dst, x []float64) {
	o.evals++
	o.p.Residuals(dst, x)
	for _, v := range dst {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			o.bad = true
		}
	}
}

// jacobian makes jac and jr the Jacobian and residuals at x.
func (o *objective) jacobian(x []float64) {
	if o.haveJ && equal(o.jx, x) {
		return
	}
	o.resid(o.jr, x)
	fd.Jacobian(o.jac, o.resid, x, o.jset)
	copy(o.jx, x)
	o.haveJ = true
}

func (o *objective) problem() optimize.Problem {
	return optimize.Problem{
		Func: func(x []float64) float64 {
			o.resid(o.r, x)
			s := 0.0
			for _, v := range o.r {
				s += v * v
			}
			if math.IsNaN(s) {
				return math.Inf(1)
			}
			return s / 2
		},
		Grad: func(grad, x []float64) {
			o.jacobian(x)
			g := mat.NewVecDense(o.n, grad)
			g.MulVec(o.jac.T(), mat.NewVecDense(o.p.M, o.jr))
		},
		Hess: func(h *mat.SymDense, x []float64) {
			o.jacobian(x)
			h.SymOuterK(1, o.jac.T())
		},
	}
}

func equal(a, b []float64) bool {
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// nearStationary reports a point where the Gauss–Newton step promises no
// decrease of the cost beyond rounding: ½·gᵀ(JᵀJ)⁻¹g ≤ 1e-10·cost. gonum's
// line search reports failure there, having nothing left to gain.
func nearStationary(j *mat.Dense, r []float64, n int) bool {
	g := mat.NewVecDense(n, nil)
	g.MulVec(j.T(), mat.NewVecDense(len(r), r))
	cost := 0.0
	for _, v := range r {
		cost += v * v / 2
	}
	var jtj mat.SymDense
	jtj.SymOuterK(1, j.T())
	var ch mat.Cholesky
	if !ch.Factorize(&jtj) {
		return mat.Norm(g, math.Inf(1)) == 0
	}
	var d mat.VecDense
	if err := ch.SolveVecTo(&d, g); err != nil {
		return false
	}
	return mat.Dot(g, &d)/2 <= 1e-10*cost+1e-300
}

// sigma is the standard error of each parameter from the Jacobian.
func sigma(j *mat.Dense, r []float64, n int) []float64 {
	m := len(r)
	out := make([]float64, n)
	for k := range out {
		out[k] = math.NaN()
	}
	if m <= n {
		return out
	}
	var jtj mat.SymDense
	jtj.SymOuterK(1, j.T())
	var ch mat.Cholesky
	if !ch.Factorize(&jtj) {
		return out
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return out
	}
	s2 := 0.0
	for _, v := range r {
		s2 += v * v
	}
	s2 /= float64(m - n)
	for k := range n {
		out[k] = math.Sqrt(inv.At(k, k) * s2)
	}
	return out
}
