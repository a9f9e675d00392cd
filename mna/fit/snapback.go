package fit

import (
	"errors"
	"fmt"
	"math"

	"zapnet/devices"
)

// SnapbackParams are a snapback clamp's model parameters (the snapback
// model of devices/snapback.go), SI units; zero Nbr, Is, N and Ton take
// the model's defaults. It2 is the failure current, a rating.
type SnapbackParams struct {
	Vt1, It1, Vh, Ih, Ron float64
	Nbr, Is, N            float64
	Bi                    bool
	Cj, Ls, Ton           float64
	It2                   float64
}

func (p SnapbackParams) spec() devices.SnapbackSpec {
	return devices.SnapbackSpec{Vt1: p.Vt1, It1: p.It1, Vh: p.Vh, Ih: p.Ih, Ron: p.Ron,
		Nbr: p.Nbr, Is: p.Is, N: p.N, Bi: p.Bi, Cj: p.Cj, Ls: p.Ls, Ton: p.Ton}
}

// Law returns the quasi-static S-curve of the parameters.
func (p SnapbackParams) Law() (*devices.SnapbackLaw, error) { return devices.NewSnapbackLaw(p.spec()) }

// Part writes the parameters as a snapback part; defaults are left out.
func (p SnapbackParams) Part(name string) Part {
	pt := Part{Name: name, Kind: "snapback"}
	add := func(key string, v float64, unit string, def float64) {
		if v != def && !(def == 0 && v == 0) {
			pt.Num = append(pt.Num, Num{key, v, unit})
		}
	}
	add("vt1", p.Vt1, "V", math.NaN())
	add("it1", p.It1, "A", math.NaN())
	add("vh", p.Vh, "V", math.NaN())
	add("ih", p.Ih, "A", math.NaN())
	add("ron", p.Ron, "Ω", math.NaN())
	add("nbr", p.Nbr, "", 0)
	if !p.Bi {
		add("is", p.Is, "A", 0)
		add("n", p.N, "", 0)
	}
	add("ton", p.Ton, "s", 0)
	add("ls", p.Ls, "H", 0)
	add("cj", p.Cj, "F", 0)
	add("it2", p.It2, "A", 0)
	if p.Bi {
		pt.Words = append(pt.Words, Word{Key: "polarity", Value: "bi"})
	}
	return pt
}

// SnapbackOptions tune FitSnapback.
type SnapbackOptions struct {
	Polarity string  // "uni" (default) or "bi"
	Ron      float64 // a published on-resistance, held fixed when > 0
	It2      float64 // the failure current, copied into the part
	Ls, Ton  float64 // copied into the part
	Runner   Runner  // nil: Engine
}

// SnapbackFit is the result of FitSnapback.
type SnapbackFit struct {
	Params SnapbackParams
	Fitted []string
	Sigma  map[string]float64
	Points []ClampPoint
	Notes  []string
	Result *Result
	Shots  int
}

// FitSnapback fits a snapback clamp to a TLP curve or to published points.
//
// From a TLP curve (rows in the order the pulses rose): the trigger is the
// highest voltage before the first fall of more than 5 %, the holding point
// the lowest voltage after it. vt1, vh and ron are fitted to every row, it1
// and ih too when rows lie between those two (else they stay at the rows'
// currents), and nbr with two rows or more below the trigger. From published points: vt1@it1 and vh (with ih, or
// else the current a 50 Ω TLP load line from the trigger lands on,
// it1 + (vt1 − vh)/50 Ω [calc]) are taken as given and ron, unless
// given, is fitted to the clamping points, each simulated through the
// engine with its pulse as FitClamp does.
func FitSnapback(data []Datum, opt *SnapbackOptions) (*SnapbackFit, error) {
	if opt == nil {
		opt = &SnapbackOptions{}
	}
	run := opt.Runner
	if run == nil {
		run = Engine
	}
	f := &SnapbackFit{}
	for _, d := range data {
		f.Points = append(f.Points, ClampPoint{Datum: d, Used: d.Aside == ""})
	}
	p := SnapbackParams{Bi: opt.Polarity == "bi", Ls: opt.Ls, Ton: opt.Ton, It2: opt.It2, Ron: opt.Ron}
	if !p.Bi {
		f.setForwardAside()
	}
	var rows []Datum
	for _, d := range data {
		if d.Kind == TLPRow && d.I > 0 && d.Aside == "" {
			rows = append(rows, d)
		}
	}
	var ps paramSet
	var err error
	if len(rows) > 0 {
		ps, err = snapbackFromTLP(&p, rows)
	} else {
		ps, err = f.startFromPoints(&p, data)
	}
	if err != nil {
		return nil, err
	}
	if _, err := p.Law(); err != nil {
		return nil, err
	}
	// The points the least squares sees: TLP rows and clamping points.
	var fitPts []ClampPoint
	for _, c := range f.Points {
		if c.Used && (c.Kind == TLPRow || c.Kind == Clamping) {
			fitPts = append(fitPts, c)
		}
	}
	if len(ps.free) > 0 && len(fitPts) < len(ps.free) {
		return nil, fmt.Errorf("%w: %d points for %d parameters (%v): give ron, or clamping voltages", errTooFew, len(fitPts), len(ps.free), ps.names())
	}
	if err := f.fitPulses(&p, &ps, fitPts, run); err != nil {
		return nil, err
	}
	f.Params = p
	f.Fitted = ps.names()
	f.Sigma = sigmaByName(f.Result, f.Fitted)
	cp := ClampParams{Vj: 0.7}
	if err := fitCapacitance(&cp, f.Points); err != nil {
		return nil, err
	}
	f.Params.Cj = cp.Cj
	if cp.M > 0 {
		f.Notes = append(f.Notes, "the snapback model's capacitance is constant: cj is the capacitance's fit at 0 V, its voltage dependence is left out")
	}
	law, err := f.Params.Law()
	if err != nil {
		return nil, err
	}
	capAt := func(float64) float64 { return f.Params.Cj }
	static := func(i float64) float64 { v, _ := law.V(i); return v }
	simulate := func(d Datum) (float64, error) { return simulateSnapback(run, f.Params, d) }
	if err := comparePoints(f.Points, capAt, static, simulate, &f.Shots); err != nil {
		return nil, err
	}
	return f, nil
}

// setForwardAside shows a uni clamp's negative TLP rows without fitting
// them: the model conducts there through its junction, whose is and n stay
// at their defaults.
func (f *SnapbackFit) setForwardAside() {
	n := 0
	for k := range f.Points {
		if c := &f.Points[k]; c.Kind == TLPRow && c.I < 0 && c.Used {
			c.Used = false
			n++
		}
	}
	if n > 0 {
		f.Notes = append(f.Notes, fmt.Sprintf("%d negative rows: a uni snapback clamp conducts forward there through its junction (is, n at their defaults); they are shown against it, not fitted", n))
	}
}

// snapbackFromTLP starts p at the trigger and holding rows of a TLP curve
// (its positive rows, in pulse order) and returns the parameters the rows
// can tell.
func snapbackFromTLP(p *SnapbackParams, rows []Datum) (paramSet, error) {
	var ps paramSet
	k1, kh, err := snapbackPoints(rows)
	if err != nil {
		return ps, err
	}
	ronGiven := p.Ron != 0
	p.Vt1, p.It1, p.Vh, p.Ih = rows[k1].V, rows[k1].I, rows[kh].V, rows[kh].I
	if !ronGiven {
		p.Ron = 1
		if n := len(rows); n-1 > kh {
			p.Ron = math.Max((rows[n-1].V-rows[kh].V)/(rows[n-1].I-rows[kh].I), 1e-3)
		}
	}
	p.Nbr = 1
	// The trigger and holding currents are fitted when rows lie
	// between them (the negative-resistance part a 50 Ω load line
	// crosses when the snapback is not too steep); otherwise they stay
	// at the rows'.
	between := kh-k1 > 1
	ps.add("vt1", p.Vt1, true)
	ps.add("it1", p.It1, between)
	ps.add("vh", p.Vh, true)
	ps.add("ih", p.Ih, between)
	ps.add("ron", p.Ron, !ronGiven && len(rows)-1 > kh)
	ps.add("nbr", p.Nbr, k1 >= 2)
	if len(rows) <= len(ps.free) {
		return ps, fmt.Errorf("%w: %d TLP rows for %d parameters", errTooFew, len(rows), len(ps.free))
	}
	return ps, nil
}

// startFromPoints takes p's trigger and holding points from the published
// points as given and returns what is left to fit: ron, unless given.
func (f *SnapbackFit) startFromPoints(p *SnapbackParams, data []Datum) (paramSet, error) {
	var ps paramSet
	for _, d := range data {
		switch d.Kind {
		case Trigger:
			p.Vt1, p.It1 = d.V, d.I
		case Holding:
			p.Vh, p.Ih = d.V, d.I
		}
	}
	if p.Vt1 == 0 || p.Vh == 0 {
		return ps, errors.New("a snapback clamp needs its trigger point (vt1 V @ A) and holding voltage (vh), or a TLP curve")
	}
	if p.Ih == 0 {
		p.Ih = p.It1 + (p.Vt1-p.Vh)/50
		f.Notes = append(f.Notes, fmt.Sprintf("no holding current given: ih = it1 + (vt1 − vh)/50 Ω = %.4g A, where a 50 Ω TLP load line from the trigger meets the holding voltage", p.Ih))
	}
	if p.Ron == 0 {
		p.Ron = 1
		ps.add("ron", p.Ron, true)
	}
	return ps, nil
}

// fitPulses fits ps's free parameters of p to the TLP rows and clamping
// points fitPts, alternating the static fit with the engine's pulses as
// FitClamp does.
func (f *SnapbackFit) fitPulses(p *SnapbackParams, ps *paramSet, fitPts []ClampPoint, run Runner) error {
	if len(ps.free) == 0 {
		return nil
	}
	static := func(i float64) float64 { law, _ := p.Law(); v, _ := law.V(i); return v }
	simulate := func(d Datum) (float64, error) { return simulateSnapback(run, *p, d) }
	fitStatic := func(delta []float64) error {
		q := *p
		prob := Problem{M: len(fitPts), Residuals: func(dst, x []float64) {
			ps.set(x)
			ps.setSnapback(&q)
			law, err := q.Law()
			for k, c := range fitPts {
				if err != nil {
					dst[k] = math.Inf(1)
					continue
				}
				v, _ := law.V(c.I)
				dst[k] = (v + delta[k] - c.V) / math.Abs(c.V)
			}
		}}
		res, err := Minimize(prob, ps.x(), nil)
		if err != nil {
			return err
		}
		ps.set(res.X)
		ps.setSnapback(p)
		f.Result = res
		return nil
	}
	return settlePulses(fitPts, fitStatic, static, simulate, &f.Shots)
}

// setSnapback writes the free parameters into q.
func (s *paramSet) setSnapback(q *SnapbackParams) {
	for _, i := range s.free {
		switch s.p[i].name {
		case "vt1":
			q.Vt1 = s.p[i].value
		case "it1":
			q.It1 = s.p[i].value
		case "ih":
			q.Ih = s.p[i].value
		case "vh":
			q.Vh = s.p[i].value
		case "ron":
			q.Ron = s.p[i].value
		case "nbr":
			q.Nbr = s.p[i].value
		}
	}
}

func simulateSnapback(run Runner, p SnapbackParams, d Datum) (float64, error) {
	law, err := p.Law()
	if err != nil {
		return 0, err
	}
	static := func(i float64) float64 { v, _ := law.V(i); return v }
	return simulatePoint(run, p.Part("fitted"), d, static)
}

// snapbackPoints finds the trigger and holding rows of a TLP curve (rows in
// pulse order): the first fall of the voltage by more than 5 % below the
// highest so far ends the blocking branch.
func snapbackPoints(rows []Datum) (trig, hold int, err error) {
	trig = 0
	for k := 1; k < len(rows); k++ {
		if rows[k].V < 0.95*rows[trig].V {
			hold = k
			for j := k; j < len(rows); j++ {
				if rows[j].V < rows[hold].V {
					hold = j
				}
			}
			if hold+1 < len(rows) && rows[hold].I <= rows[trig].I {
				return 0, 0, fmt.Errorf("%s: the holding row's current (%.4g A) is not above the trigger's (%.4g A): rows out of pulse order?", rows[hold].Where, rows[hold].I, rows[trig].I)
			}
			return trig, hold, nil
		}
		if rows[k].V > rows[trig].V {
			trig = k
		}
	}
	return 0, 0, errors.New("no snapback in the TLP curve (the voltage never falls by 5 % as the current rises): fit a clamp instead")
}
