package netlist

import (
	"fmt"
	"maps"
	"slices"
	"strconv"
	"strings"

	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// signalLimits are the units of a watch's signal-side limits: the peaking
// of its transfer in dB (a plain number), the capacitance it may see and
// the 10–90 % rise an edge may take to reach it.
var signalLimits = map[string]spec.Unit{"peaking": spec.Dimensionless, "cmax": spec.Farad, "rise": spec.Second}

func (p *parser) checkWatches(c *Circuit) {
	known := map[string]bool{}
	for _, n := range c.Nodes {
		known[n] = true
	}
	seen := map[string]Pos{}
	for _, rw := range p.watches {
		w := Watch{Node: rw.node, Pos: rw.nodePos}
		switch {
		case rw.node == Ground:
			p.errs.Add(rw.nodePos, ErrCircuit, "gnd is the reference: it is always 0 V")
			continue
		case !known[rw.node]:
			p.errs.Add(rw.nodePos, ErrUnknown, "watch: no node %s in the deck%s", rw.node, didYouMean(rw.node, c.Nodes))
			continue
		}
		if first, dup := seen[rw.node]; dup {
			p.errs.Add(rw.nodePos, ErrDuplicate, "node %s is already watched at %s", rw.node, first)
			continue
		}
		seen[rw.node] = rw.nodePos
		ok := true
		for _, kv := range rw.params {
			switch kv.key {
			case "max", "min":
				v, msg := numValue(kv.key+" of a watch", spec.Volt, spec.Any, kv.val)
				if msg != "" {
					p.errs.Add(kv.valPos, ErrValue, "%s", msg)
					ok = false
					continue
				}
				if kv.key == "max" {
					w.Max, w.HasMax = v, true
				} else {
					w.Min, w.HasMin = v, true
				}
			case "peaking", "cmax", "rise":
				v, msg := numValue(kv.key+" of a watch", signalLimits[kv.key], spec.Positive, kv.val)
				if msg != "" {
					p.errs.Add(kv.valPos, ErrValue, "%s", msg)
					ok = false
					continue
				}
				switch kv.key {
				case "peaking":
					w.Peaking = v
				case "cmax":
					w.CMax = v
				default:
					w.Rise = v
				}
			default:
				p.errs.Add(kv.keyPos, ErrUnknown, "unknown parameter %s for a watch%s", kv.key, didYouMean(kv.key, []string{"max", "min", "peaking", "cmax", "rise"}))
				ok = false
			}
		}
		if w.HasMax && w.HasMin && !(w.Min < w.Max) {
			p.errs.Add(rw.nodePos, ErrValue, "watch %s: min %s is not below max %s", rw.node, spec.FormatSI(w.Min, "V"), spec.FormatSI(w.Max, "V"))
			ok = false
		}
		if ok {
			c.Watches = append(c.Watches, w)
		}
	}
}

func (p *parser) checkWindow(c *Circuit) {
	for i, rw := range p.windows {
		if i > 0 {
			p.errs.Add(rw.pos, ErrDuplicate, "second window; the first is at %s", p.windows[0].pos)
			continue
		}
		w := Window{Pos: rw.pos}
		for _, kv := range rw.params {
			key := kv.key
			switch key {
			case "maxstep":
				p.errs.Warn(kv.keyPos, "maxstep is now called resolve: the finest time detail the run must show")
				key = "resolve"
			case "reltol":
				p.errs.Warn(kv.keyPos, "reltol is now accuracy: the relative accuracy wanted on every reported number (default %s); read as accuracy=%s", spec.FormatFraction(spec.DefaultAccuracy), kv.val)
				key = "accuracy"
			case "abstol":
				p.errs.Warn(kv.keyPos, "abstol is no longer needed and is ignored: accuracy= sets how close every reported number is")
				continue
			}
			switch key {
			case "stop":
				w.Stop = p.windowValue(kv, spec.Second)
			case "resolve":
				w.Resolve = p.windowValue(kv, spec.Second)
			case "accuracy":
				w.Accuracy = p.accuracyValue(kv)
			default:
				p.errs.Add(kv.keyPos, ErrUnknown, "unknown parameter %s for a window%s", kv.key, didYouMean(kv.key, windowKeys))
			}
		}
		if w.Stop > 0 && w.Resolve > w.Stop {
			p.errs.Add(rw.pos, ErrValue, "window: resolve %s is longer than stop %s", spec.FormatSI(w.Resolve, "s"), spec.FormatSI(w.Stop, "s"))
		}
		c.Window = w
	}
}

// windowKeys are the keys of a window statement.
var windowKeys = []string{"stop", "accuracy", "resolve"}

// Bounds of accuracy=: looser than a tenth is no estimate; tighter than
// 1e-6 asks more of double precision and the models than they hold.
const (
	loosestAccuracy  = 0.1
	tightestAccuracy = 1e-6
)

// windowValue reads a positive time of a window.
func (p *parser) windowValue(kv rawParam, unit spec.Unit) float64 {
	v, msg := numValue(kv.key+" of a window", unit, spec.Positive, kv.val)
	if msg != "" {
		p.errs.Add(kv.valPos, ErrValue, "%s", msg)
		return 0
	}
	return v
}

// accuracyValue reads accuracy=, a fraction or a percentage (0.001, 0.1%).
func (p *parser) accuracyValue(kv rawParam) float64 {
	n, msg := spec.ParseNumber(kv.val, true)
	switch {
	case msg != "":
	case n.Unit != "":
		msg = fmt.Sprintf("accuracy is a fraction or a percentage (0.001 or 0.1%%), not in %s", n.Unit.Word())
	case n.Percent:
		n.Value /= 100
	}
	if msg == "" && !(n.Value >= tightestAccuracy && n.Value <= loosestAccuracy) {
		msg = fmt.Sprintf("accuracy %s is outside %s to %s", kv.val, spec.FormatFraction(tightestAccuracy), spec.FormatFraction(loosestAccuracy))
	}
	if msg != "" {
		p.errs.Add(kv.valPos, ErrValue, "%s", msg)
		return 0
	}
	return n.Value
}

// problem is a deck error without a position yet.
func problem(kind error, format string, args ...any) *Error {
	return &Error{Err: kind, Msg: fmt.Sprintf(format, args...)}
}

// settable says why ELEMENT.PARAM cannot be set (ErrUnknown, ErrValue), or
// nil when it can.
func settable(c *Circuit, elem, param string) (*Error, *Element) {
	e := c.Element(elem)
	if e == nil {
		var names []string
		for _, x := range c.Elements {
			names = append(names, x.Name)
		}
		return problem(ErrUnknown, "no element %s%s", elem, didYouMean(elem, names)), nil
	}
	if e.IsStrike() {
		switch param {
		case "level", "polarity":
			return problem(ErrValue, "levels and polarities are already axes of the study; list them on the strike"), e
		case "waveform", "part":
			return problem(ErrValue, "the strike's %s cannot be varied", param), e
		}
		if e.Waveform == nil {
			// The strike's waveform is missing or unknown, an error
			// reported where the strike is read.
			return problem(ErrValue, "strike %s has no waveform whose %s could be set", e.Name, param), e
		}
		if e.Waveform.Word(param) != nil {
			return problem(ErrValue, "the strike's %s cannot be varied", param), e
		}
		taking := waveforms.Taking(param)
		if len(taking) == 0 {
			return problem(ErrUnknown, "a strike has no parameter %s%s", param, didYouMean(param, keysOf(e.Kind))), e
		}
		if e.Waveform.Param(param) == nil {
			return problem(ErrUnknown, "%s is a parameter of waveform %s, not of %s", param, strings.Join(taking, ", "), e.Waveform.Name), e
		}
		return nil, e
	}
	if w := e.Kind.Word(param); w != nil && w.Fixed {
		return problem(ErrValue, "a %s's %s changes the circuit's nodes and cannot be varied", e.Kind.Name, param), e
	}
	if param == "part" || e.Kind.Word(param) != nil || e.Kind.Param(param) != nil {
		return nil, e
	}
	return problem(ErrUnknown, "a %s has no parameter %s%s", e.Kind.Name, param, didYouMean(param, keysOf(e.Kind))), e
}

// isNumeric reports whether the parameter param of e takes a number (not a
// part or a word).
func isNumeric(e *Element, param string) bool { return e.Param(param) != nil }

// parseSetting reads the text of a setting of param of e (already settable)
// as the deck would: a number in the parameter's unit, a part of the
// element's kind or one of a word parameter's words. It says why when the
// text does not fit.
func (c *Circuit) parseSetting(e *Element, param, text string) (Setting, *Error) {
	s := Setting{Element: e.Name, Param: param, Text: text}
	switch {
	case isNumeric(e, param):
		sp := e.Param(param)
		what := paramOf(e.Kind, param)
		if e.IsStrike() {
			what = param + " of waveform " + e.Waveform.Name
		}
		v, msg := numValue(what, sp.Unit, sp.Rule, text)
		if msg != "" {
			return s, problem(ErrValue, "%s", msg)
		}
		s.Num = v
	case param == "part":
		if _, perr := lookupPart(c, e.Kind, text); perr != nil {
			return s, perr
		}
	default:
		if m := wordProblem(e.Kind, e.Kind.Word(param), text); m != "" {
			return s, problem(ErrValue, "%s", m)
		}
	}
	return s, nil
}

// Setting reads ELEMENT.PARAM=TEXT against the circuit, as a vary line's
// value would be read: the element and parameter must exist and be
// settable, and the text must fit the parameter. The error, an *Error
// without a deck position (the text did not come from the deck), says why
// not.
func (c *Circuit) Setting(target, text string) (Setting, error) {
	elem, param, ok := SplitTarget(target)
	if !ok {
		return Setting{}, problem(ErrSyntax, "%s: write ELEMENT.PARAM", target)
	}
	perr, e := settable(c, elem, param)
	if perr != nil {
		perr.Msg = target + ": " + perr.Msg
		return Setting{}, perr
	}
	s, perr := c.parseSetting(e, param, text)
	if perr != nil {
		perr.Msg = target + "=" + text + ": " + perr.Msg
		return Setting{}, perr
	}
	return s, nil
}

// apply sets one parameter of e (an element of c, already cloned by the
// caller) and merges again; it says why when the setting is not usable. It
// returns the element's own parameters after the change, for the caller to
// keep when it keeps e.
func (c *Circuit) apply(e *Element, s Setting) (*ownParams, *Error) {
	own := c.own[e.Name]
	if own == nil {
		return nil, problem(ErrValue, "element %s cannot be changed", e.Name)
	}
	next := *own
	if e.IsStrike() {
		if err := e.Values.Set(s.Param, s.Num); err != nil {
			return nil, problem(ErrValue, "%s of waveform %s %s", s.Param, e.Waveform.Name, err.(*spec.RuleError).Says)
		}
		next.vals.Set(s.Param, s.Num)
		return &next, nil
	}
	var part *Part
	if own.part != "" {
		part = c.Parts[own.part]
	}
	switch {
	case s.Param == "part":
		pt, perr := lookupPart(c, e.Kind, s.Text)
		if perr != nil {
			return nil, perr
		}
		part, next.part = pt, pt.Name
	case isNumeric(e, s.Param):
		if err := next.vals.Set(s.Param, s.Num); err != nil {
			return nil, problem(ErrValue, "%s %s", paramOf(e.Kind, s.Param), err.(*spec.RuleError).Says)
		}
	default:
		if m := wordProblem(e.Kind, e.Kind.Word(s.Param), s.Text); m != "" {
			return nil, problem(ErrValue, "%s", m)
		}
		next.vals.SetWord(s.Param, s.Text)
	}
	e.Values = merge(e.Kind, part, &next)
	e.Part = ""
	if part != nil {
		e.Part = part.Name
	}
	if ps := problems(e, nil); len(ps) > 0 {
		msgs := make([]string, len(ps))
		for i, p := range ps {
			msgs[i] = p.Msg
		}
		return nil, problem(ps[0].Err, "%s", strings.Join(msgs, "; "))
	}
	return &next, nil
}

func (p *parser) checkVary(c *Circuit) {
	seen := map[string]Pos{}
	for _, rv := range p.varies {
		target := rv.elem + "." + rv.param
		if first, dup := seen[target]; dup {
			p.errs.Add(rv.targetPos, ErrDuplicate, "%s is already varied at %s", target, first)
			continue
		}
		seen[target] = rv.targetPos
		perr, e := settable(c, rv.elem, rv.param)
		if perr != nil {
			pos := rv.paramPos
			if e == nil {
				pos = rv.targetPos
			}
			p.errs.Add(pos, perr.Err, "vary: %s", perr.Msg)
			continue
		}
		v := Vary{Element: rv.elem, Param: rv.param, Pos: rv.targetPos}
		ok := true
		for _, it := range rv.values {
			s, perr := c.parseSetting(e, rv.param, it.text)
			if perr == nil {
				_, perr = c.apply(e.clone(), s)
			}
			if perr != nil {
				p.errs.Add(it.pos, perr.Err, "vary %s: %s", target, perr.Msg)
				ok = false
			}
			v.Values = append(v.Values, s)
		}
		if ok {
			c.Vary = append(c.Vary, v)
		}
	}
	if err := CheckProduct(c.Vary); err != nil {
		p.errs.Add(c.Vary[0].Pos, ErrValue, "%v", err)
		c.Vary = nil
	}
}

func (p *parser) checkTolerances(c *Circuit) {
	seen := map[string]Pos{}
	for _, line := range p.tols {
		for _, rt := range line.pairs {
			target := rt.elem + "." + rt.param
			perr, e := settable(c, rt.elem, rt.param)
			switch {
			case perr != nil:
				pos := rt.paramPos
				if e == nil {
					pos = rt.targetPos
				}
				p.errs.Add(pos, perr.Err, "tolerance: %s", perr.Msg)
				continue
			case !isNumeric(e, rt.param):
				p.errs.Add(rt.paramPos, ErrValue, "tolerance: %s is not a number to spread", target)
				continue
			case !e.Values.Has(rt.param):
				p.errs.Add(rt.paramPos, ErrMissing, "tolerance: %s has no %s to spread (give it a value first)", rt.elem, rt.param)
				continue
			}
			if first, dup := seen[target]; dup {
				p.errs.Add(rt.targetPos, ErrDuplicate, "%s already has a tolerance at %s", target, first)
				continue
			}
			seen[target] = rt.targetPos
			n, m := spec.ParseNumber(rt.percent, true)
			switch {
			case m != "":
				p.errs.Add(rt.percentPos, ErrValue, "%s", m)
				continue
			case !n.Percent:
				p.errs.Add(rt.percentPos, ErrValue, "a tolerance is a percentage such as 5%%, not %s", rt.percent)
				continue
			case !(n.Value > 0 && n.Value < 100):
				p.errs.Add(rt.percentPos, ErrValue, "a tolerance must be above 0%% and below 100%% (got %s)", rt.percent)
				continue
			}
			c.Tolerances = append(c.Tolerances, Tolerance{Element: rt.elem, Param: rt.param, Percent: n.Value, Dist: line.dist, Pos: rt.targetPos})
		}
	}
}

// clone deep-copies an element.
func (e *Element) clone() *Element {
	x := *e
	x.Levels = slices.Clone(e.Levels)
	return &x
}

// Polarities are the polarities the strike runs, in order: "both" is pos
// then neg.
func (e *Element) Polarities() []string {
	switch e.Polarity {
	case "neg":
		return []string{"neg"}
	case "both":
		return []string{"pos", "neg"}
	}
	return []string{"pos"}
}

// Plan is the study the deck describes: its levels in deck order, the
// polarities ("both" is pos then neg) and the variants, the cartesian
// product of the vary lines with the first line varying slowest. A deck
// without vary lines has one empty variant.
func (c *Circuit) Plan() Plan {
	var pl Plan
	if s := c.Strike(); s != nil {
		pl.Waveform = s.Waveform
		pl.Levels = slices.Clone(s.Levels)
		pl.Polarities = s.Polarities()
	}
	pl.Variants = Product(c.Vary)
	return pl
}

// MaxVariants bounds the variants of one study: at a few strikes each it
// is already hours of solving, and the product of a few long vary lines
// grows past any memory (four lines of 60 values make 13 million).
const MaxVariants = 10000

// CheckProduct says whether the cartesian product of lines stays within
// MaxVariants; the error names the product of the list lengths.
func CheckProduct(lines []Vary) error {
	n := 1.0
	lens := make([]string, len(lines))
	for i, v := range lines {
		n *= float64(len(v.Values))
		lens[i] = strconv.Itoa(len(v.Values))
	}
	if n <= MaxVariants {
		return nil
	}
	return fmt.Errorf("the vary lines make %s = %s variants; a study runs at most %d: vary fewer values or fewer parameters at once, or draw circuits from tolerances with spread",
		strings.Join(lens, " × "), strconv.FormatFloat(n, 'f', -1, 64), MaxVariants)
}

// Product is the cartesian product of vary lines, the first line varying
// slowest; no lines give one empty variant. The caller has kept the
// product within MaxVariants (CheckProduct).
func Product(lines []Vary) []Variant {
	out := []Variant{{}}
	for _, v := range lines {
		next := make([]Variant, 0, len(out)*len(v.Values))
		for _, base := range out {
			for _, s := range v.Values {
				x := make(Variant, len(base), len(base)+1)
				copy(x, base)
				next = append(next, append(x, s))
			}
		}
		out = next
	}
	return out
}

// With returns a deep copy of c with the settings applied in order and
// checked again; c is not modified. The error is an ErrorList whose entries
// sit at the changed element's statement.
func (c *Circuit) With(settings ...Setting) (*Circuit, error) {
	x := *c
	x.Elements = make([]*Element, len(c.Elements))
	for i, e := range c.Elements {
		x.Elements[i] = e.clone()
	}
	x.Nodes = slices.Clone(c.Nodes)
	x.Watches = slices.Clone(c.Watches)
	x.Vary = slices.Clone(c.Vary)
	for i := range x.Vary {
		x.Vary[i].Values = slices.Clone(c.Vary[i].Values)
	}
	x.Tolerances = slices.Clone(c.Tolerances)
	x.Parts = maps.Clone(c.Parts)
	x.Warnings = slices.Clone(c.Warnings)
	if len(settings) > 0 {
		x.own = maps.Clone(c.own)
	}
	var errs ErrorList
	for _, s := range settings {
		perr, e := settable(&x, s.Element, s.Param)
		pos := Pos{File: c.File}
		if e != nil {
			pos = e.Pos
		}
		if perr == nil {
			var own *ownParams
			if own, perr = x.apply(e, s); own != nil {
				x.own[e.Name] = own
			}
		}
		if perr != nil {
			errs.Add(pos, perr.Err, "%s: %s", s, perr.Msg)
		}
	}
	if len(errs) > 0 {
		return nil, errs
	}
	return &x, nil
}
