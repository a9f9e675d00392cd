package netlist

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/waveforms"
)

// ownParams are the parameters an element states itself.
type ownParams struct {
	vals  spec.Values    // of the element's table (the waveform's, for the strike), no defaults
	part  string         // the part it names, "?" when that part is unusable
	pos   map[string]Pos // where each own key was written
	name  Pos            // the element's name
	nodes [2]Pos         // where its nodes are named
}

// numValue parses text as a value of a parameter in unit under rule, and
// returns a message for the user when it is not one.
func numValue(what string, unit spec.Unit, r spec.Rule, text string) (float64, string) {
	n, msg := spec.ParseNumber(text, false)
	if msg != "" {
		return 0, msg
	}
	if n.Unit != "" && n.Unit != unit {
		return 0, fmt.Sprintf("%s is in %s, but %s is in %s", text, n.Unit.Word(), what, unit.Word())
	}
	if m := r.Check(n.Value); m != "" {
		return 0, fmt.Sprintf("%s %s (got %s)", what, m, text)
	}
	return n.Value, ""
}

// wordProblem checks a word parameter of kind k and returns a message when
// the word is not allowed.
func wordProblem(k *devices.Kind, w *spec.Word, val string) string {
	switch {
	case w.Choices != nil && !slices.Contains(w.Choices, val):
		return fmt.Sprintf("%s %s is %s, not %s%s", k.Name, w.Key, orList(w.Choices), val, didYouMean(val, w.Choices))
	case w.Node:
		if m := NameProblem(val); m != "" {
			return fmt.Sprintf("%s node name %s %s", w.Key, val, m)
		}
	}
	return ""
}

// orList renders "a or b", "a, b or c".
func orList(words []string) string {
	if len(words) < 2 {
		return strings.Join(words, "")
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}

// readParam parses one key=value of an element or part of kind k into vals
// and reports what is wrong with it. Keys written but unusable are added to
// skip when it is not nil, so that they are not reported again as missing.
func (p *parser) readParam(k *devices.Kind, kv rawParam, vals *spec.Values, skip map[string]bool) bool {
	if w := k.Word(kv.key); w != nil {
		if m := wordProblem(k, w, kv.val); m != "" {
			p.errs.Add(kv.valPos, ErrValue, "%s", m)
			return false
		}
		if w.Path {
			path, ok := deckFile(kv)
			if !ok {
				p.errs.Add(kv.valPos, ErrFile, "%s file %s: no such file", kv.key, kv.val)
				return false
			}
			kv.val = path
		}
		if err := vals.SetWord(kv.key, kv.val); err != nil {
			p.errs.Add(kv.valPos, ErrValue, "%v", err)
			return false
		}
		return true
	}
	sp := k.Param(kv.key)
	if now, ok := k.Renamed[kv.key]; ok {
		p.errs.Add(kv.keyPos, ErrUnknown, "%s of %s is now called %s", kv.key, aKind(k), now)
		if skip != nil {
			skip[now] = true
		}
		return false
	}
	if sp == nil {
		p.errs.Add(kv.keyPos, ErrUnknown, "unknown parameter %s for %s%s", kv.key, aKind(k), didYouMean(kv.key, keysOf(k)))
		if skip != nil {
			// The slip is reported once, not again as a missing parameter.
			if g := suggest(kv.key, keysOf(k)); g != "" {
				skip[g] = true
			}
		}
		return false
	}
	if kv.quoted {
		p.errs.Add(kv.valPos, ErrValue, "%s takes a number, not a quoted text", kv.key)
		if skip != nil {
			skip[kv.key] = true
		}
		return false
	}
	v, msg := numValue(paramOf(k, kv.key), sp.Unit, sp.Rule, kv.val)
	if msg != "" {
		p.errs.Add(kv.valPos, ErrValue, "%s", msg)
		if skip != nil {
			skip[kv.key] = true
		}
		return false
	}
	vals.Set(kv.key, v) // the rule was checked above
	return true
}

// deckFile resolves the file path kv names beside the file that names it,
// as a deck's files are found, and says whether a file is there.
func deckFile(kv rawParam) (string, bool) {
	path := kv.val
	if path != "" && !filepath.IsAbs(path) {
		path = filepath.Join(filepath.Dir(kv.keyPos.File), path)
	}
	fi, err := os.Stat(path)
	return path, path != "" && err == nil && !fi.IsDir()
}

// merge builds an element's values: the part's, then the element's own,
// then the defaults of the models for whatever is still missing.
func merge(k *devices.Kind, part *Part, own *ownParams) spec.Values {
	v := k.Values()
	for _, src := range []*spec.Values{partValues(part), &own.vals} {
		if src == nil {
			continue
		}
		for _, key := range k.Numeric() {
			if x, ok := src.Lookup(key); ok {
				v.Set(key, x)
			}
		}
		for _, w := range k.Words {
			if s := src.Word(w.Key); s != "" {
				v.SetWord(w.Key, s)
			}
		}
	}
	v.FillDefaults()
	return v
}

func partValues(part *Part) *spec.Values {
	if part == nil {
		return nil
	}
	return &part.Values
}

// problems lists what makes a merged element unusable: missing required
// parameters (ErrMissing) and parameters that contradict each other
// (ErrValue).
func problems(e *Element, skip map[string]bool) []*Error {
	var out []*Error
	k := e.Kind
	for _, sp := range k.Params {
		if sp.Required && !e.Values.Has(sp.Key) && !skip[sp.Key] && (sp.Unless == "" || e.Values.Word(sp.Unless) == "") {
			what := sp.Key
			if sp.Key == "value" {
				what = "a value in " + sp.Unit.Word()
			} else if sp.Unit != "" {
				what += " (" + sp.Unit.Word() + ")"
			}
			msg := fmt.Sprintf("%s %s needs %s", k.Name, e.Name, what)
			if e.Part != "" && sp.Key != "value" {
				msg += fmt.Sprintf("; neither it nor part %s gives it", e.Part)
			}
			out = append(out, &Error{Err: ErrMissing, Msg: msg})
		}
	}
	// A window of two ratings must be open: its low side below its high.
	lo, l, okl := e.Rating(spec.LowVoltage)
	hi, h, okh := e.Rating(spec.HighVoltage)
	if okl && okh && !(l < h) {
		out = append(out, &Error{Err: ErrValue, Msg: fmt.Sprintf("%s %s: %s %s is not below %s %s", k.Name, e.Name, lo.Key, spec.FormatSI(l, lo.Unit), hi.Key, spec.FormatSI(h, hi.Unit))})
	}
	return out
}

// check turns the raw statements into a Circuit, adding every problem to
// p.errs.
func (p *parser) check(src []byte) *Circuit {
	c := &Circuit{
		File:     p.top,
		Title:    p.title,
		Source:   src,
		Parts:    map[string]*Part{},
		Included: p.included,
		own:      map[string]*ownParams{},
	}
	p.checkParts(c)
	names := map[string]Pos{}
	var strikes []*Element
	written := 0
	for _, re := range p.elements {
		var e *Element
		if re.kind.Role == spec.Stimulus {
			written++
			e = p.checkStrike(re, c)
		} else {
			e = p.checkElement(re, c)
		}
		if !re.ok {
			continue
		}
		if first, dup := names[re.name]; dup {
			p.errs.Add(re.namePos, ErrDuplicate, "element %s already defined at %s", re.name, first)
			// Its connections still count, or its nodes would be
			// reported as dangling too.
			p.dups = append(p.dups, conn{re.name, re.nodePos[0]}, conn{re.name, re.nodePos[1]})
			p.dupNodes = append(p.dupNodes, re.nodes[0], re.nodes[1])
			continue
		}
		names[re.name] = re.namePos
		c.Elements = append(c.Elements, e)
		if e.IsStrike() {
			strikes = append(strikes, e)
		}
	}
	switch {
	case written == 0:
		p.errs.Add(Pos{File: p.top, Line: 1, Col: 1}, ErrMissing, "deck has no strike: add one, for example strike zap IN gnd waveform=iec61000-4-2 level=8k")
	case len(strikes) > 1:
		for _, s := range strikes[1:] {
			p.errs.Add(c.own[s.Name].name, ErrDuplicate, "second strike %s; a deck has exactly one (the first is %s at %s)", s.Name, strikes[0].Name, c.own[strikes[0].Name].name)
		}
	}
	p.checkTopology(c)
	p.checkModels(c)
	p.checkWatches(c)
	p.checkWindow(c)
	p.checkVary(c)
	p.checkVariants(c)
	p.checkTolerances(c)
	return c
}

// checkModels builds every element's device once, so that what a model
// refuses (a constraint between its parameters that no single rule says)
// the check refuses too, at the element's statement.
func (p *parser) checkModels(c *Circuit) {
	if p.errs.Err() != nil {
		return
	}
	// The unknowns as the engine will number them: every node but gnd,
	// and each device's internal nodes and branches.
	n := 0
	nodes := map[string]bool{}
	for _, e := range c.Elements {
		d, err := e.Kind.New(e.Name, e.Nodes, &e.Values)
		if err != nil {
			p.errs.Add(c.own[e.Name].name, ErrValue, "%v", err)
			continue
		}
		lay := d.Layout()
		n += lay.Unknowns()
		for _, t := range lay.Terminals {
			if t != Ground && !nodes[t] {
				nodes[t] = true
				n++
			}
		}
	}
	c.Unknowns = n
	if err := devices.TooManyUnknowns(n); err != nil {
		p.errs.Add(Pos{File: p.top, Line: 1, Col: 1}, ErrCircuit, "%v", err)
	}
}

// maxCheckedVariants bounds the variants tried one by one at load time.
const maxCheckedVariants = 4096

// checkVariants tries every combination of the vary lines: each value was
// checked alone, but two lines can still contradict each other (a pin's
// vmin varied above its varied vmax).
func (p *parser) checkVariants(c *Circuit) {
	if len(c.Vary) < 2 || p.errs.Err() != nil {
		return
	}
	n := 1
	for _, v := range c.Vary {
		n *= len(v.Values)
		if n > maxCheckedVariants {
			return
		}
	}
	where := map[string]Pos{}
	for _, v := range c.Vary {
		where[v.Element] = v.Pos
	}
	for _, v := range c.Plan().Variants {
		if _, err := c.With(v...); err != nil {
			var s []string
			for _, x := range v {
				s = append(s, x.String())
			}
			msg := err.Error()
			if l, ok := err.(ErrorList); ok && len(l) > 0 {
				msg = l[0].Msg
			}
			p.errs.Add(where[v[len(v)-1].Element], ErrValue, "the variant %s does not hold together: %s", strings.Join(s, " "), msg)
			return
		}
	}
}

func (p *parser) checkParts(c *Circuit) {
	for _, rp := range p.parts {
		if prev, dup := c.Parts[rp.name]; dup {
			p.errs.Add(rp.namePos, ErrDuplicate, "part %s already defined at %s", rp.name, prev.Pos)
			continue
		}
		part := &Part{Name: rp.name, Kind: rp.kind, Values: rp.kind.Values(), Pos: rp.namePos}
		for _, kv := range rp.params {
			if kv.key == "part" {
				p.errs.Add(kv.keyPos, ErrValue, "a part cannot take another part")
				continue
			}
			p.readParam(rp.kind, kv, &part.Values, nil)
		}
		c.Parts[rp.name] = part
	}
}

// partsOfKind lists the names of the parts of kind k, for suggestions.
func partsOfKind(c *Circuit, k *devices.Kind) []string {
	var out []string
	for n, pt := range c.Parts {
		if pt.Kind == k {
			out = append(out, n)
		}
	}
	sort.Strings(out)
	return out
}

// lookupPart finds the part name for an element of kind k, or says why not
// (ErrUnknown or ErrValue).
func lookupPart(c *Circuit, k *devices.Kind, name string) (*Part, *Error) {
	pt := c.Parts[name]
	switch {
	case pt == nil:
		return nil, &Error{Err: ErrUnknown, Msg: fmt.Sprintf("no part %s%s", name, didYouMean(name, partsOfKind(c, k)))}
	case pt.Kind != k:
		return nil, &Error{Err: ErrValue, Msg: fmt.Sprintf("part %s is a %s, not a %s (defined at %s)", name, pt.Kind.Name, k.Name, pt.Pos)}
	}
	return pt, nil
}

func (p *parser) checkElement(re *rawElement, c *Circuit) *Element {
	k := re.kind
	own := &ownParams{vals: k.Values(), pos: map[string]Pos{}, name: re.namePos, nodes: re.nodePos}
	skip := map[string]bool{}
	for key := range re.written {
		skip[key] = true // a written key that is unusable was reported already
	}
	if re.hasValue {
		sp := k.Positional()
		v, msg := numValue(paramOf(k, "value"), sp.Unit, sp.Rule, re.value)
		if msg != "" {
			p.errs.Add(re.valuePos, ErrValue, "%s", msg)
			skip["value"] = true
		} else {
			own.vals.Set("value", v)
		}
		own.pos["value"] = re.valuePos
	}
	var part *Part
	for _, kv := range re.params {
		own.pos[kv.key] = kv.valPos
		switch {
		case kv.key == "part":
			pt, perr := lookupPart(c, k, kv.val)
			if perr != nil {
				p.errs.Add(kv.valPos, perr.Err, "%s", perr.Msg)
				own.part = "?"
				continue
			}
			part, own.part = pt, kv.val
		case kv.key == "value" && re.hasValue:
			p.errs.Add(kv.keyPos, ErrDuplicate, "value given twice: once after the nodes and once as value=")
		default:
			p.readParam(k, kv, &own.vals, skip)
		}
	}
	e := &Element{Kind: k, Name: re.name, Nodes: re.nodes, Pos: re.kindPos, Values: merge(k, part, own)}
	if part != nil {
		e.Part = part.Name
	}
	if own.part != "?" && re.nodePos[1].IsValid() {
		for _, m := range problems(e, skip) {
			p.errs.Add(re.namePos, m.Err, "%s", m.Msg)
		}
	}
	if re.ok && re.nodes[0] == re.nodes[1] {
		p.errs.Add(re.nodePos[1], ErrCircuit, "%s %s connects node %s to itself", k.Name, re.name, re.nodes[0])
		re.ok = false
	}
	for _, w := range k.Words {
		if n := own.vals.Word(w.Key); w.Node && n != "" && re.ok && n == re.nodes[0] {
			p.errs.Add(own.pos[w.Key], ErrCircuit, "%s %s: %s %s is the %s's own node", k.Name, re.name, w.Key, n, k.Name)
			re.ok = false
		}
	}
	if re.ok {
		p.plausible(e, own)
		if _, dup := c.own[re.name]; !dup {
			c.own[re.name] = own
		}
	}
	return e
}

// plausible warns about legal values that are probably slips, and about
// parameters given that have no effect.
func (p *parser) plausible(e *Element, own *ownParams) {
	at := func(key string) Pos {
		if pos, ok := own.pos[key]; ok {
			return pos
		}
		if e.Part != "" {
			return own.pos["part"]
		}
		return own.name
	}
	k := e.Kind
	for i := range k.Params {
		sp := &k.Params[i]
		if v, ok := e.Values.Lookup(sp.Key); ok && sp.Unusually(v) {
			p.errs.Warn(at(sp.Key), sp.Unusual.Format, e.Name, spec.FormatSI(v, sp.Unit))
		}
		if sp.OnlyWith != "" && !e.Values.Has(sp.OnlyWith) && own.vals.Has(sp.Key) {
			note := ""
			if n := k.Param(sp.OnlyWith).Note; n != "" {
				note = " (" + n + ")"
			}
			p.errs.Warn(at(sp.Key), "%s %s: %s has no effect without %s%s", k.Name, e.Name, sp.Key, sp.OnlyWith, note)
		}
	}
}

// checkStrike reads the strike: its waveform first, since the waveform
// decides the unit of the levels and which parameters are allowed.
func (p *parser) checkStrike(re *rawElement, c *Circuit) *Element {
	e := &Element{Kind: re.kind, Name: re.name, Nodes: re.nodes, Pos: re.kindPos, Polarity: "pos"}
	var w *waveforms.Waveform
	bad := false // the waveform is unknown: its parameters cannot be judged
	for _, kv := range re.params {
		if kv.key != "waveform" {
			continue
		}
		if w = waveforms.Lookup(kv.val); w == nil {
			names := catalogueNames()
			p.errs.Add(kv.valPos, ErrUnknown, "unknown waveform %s%s; the waveforms are %s", kv.val, didYouMean(kv.val, names), strings.Join(names, ", "))
			bad = true
		}
	}
	if w == nil && !bad && !re.written["waveform"] {
		p.errs.Add(re.namePos, ErrMissing, "strike %s needs waveform= (one of %s)", re.name, strings.Join(catalogueNames(), ", "))
	}
	bad = bad || w == nil
	own := &ownParams{pos: map[string]Pos{}, name: re.namePos, nodes: re.nodePos}
	if w != nil {
		own.vals = w.Values()
	}
	hasLevel := false
	for _, kv := range re.params {
		own.pos[kv.key] = kv.valPos
		switch kv.key {
		case "waveform":
		case "level":
			hasLevel = true
			p.strikeLevels(e, w, bad, kv)
		case "polarity":
			if !slices.Contains(polarityWords, kv.val) {
				p.errs.Add(kv.valPos, ErrValue, "strike polarity is pos, neg or both, not %s%s", kv.val, didYouMean(kv.val, polarityWords))
				continue
			}
			e.Polarity = kv.val
		case "part":
			p.errs.Add(kv.keyPos, ErrValue, "a strike takes no part")
		default:
			p.strikeParam(re, w, bad, kv, own)
		}
	}
	if !hasLevel && !re.written["level"] {
		p.errs.Add(re.namePos, ErrMissing, "strike %s needs level= (a list such as level=2k,4k,8k)", re.name)
	}
	if w != nil {
		for _, wd := range w.Words {
			if wd.Path && own.vals.Word(wd.Key) == "" && !re.written[wd.Key] {
				p.errs.Add(re.namePos, ErrMissing, `strike %s: waveform %s needs %s="path" (a CSV of time and value)`, re.name, w.Name, wd.Key)
			}
		}
		e.Waveform = w
		e.Values = own.vals
		e.Values.FillDefaults()
	}
	if re.ok && re.nodes[0] == re.nodes[1] {
		if re.nodes[0] == Ground {
			p.errs.Add(re.nodePos[0], ErrCircuit, "strike %s is on gnd and gnd: it must hit a node of the circuit", re.name)
		} else {
			p.errs.Add(re.nodePos[1], ErrCircuit, "strike %s connects node %s to itself", re.name, re.nodes[0])
		}
		re.ok = false
	}
	if re.ok && w != nil && len(e.Levels) > 0 && p.errs.Err() == nil {
		// The stimulus is built now, with the rule the run uses, so that
		// what the run would refuse the check refuses too.
		if _, err := w.New(e.Levels[0], &e.Values); err != nil {
			p.errs.Add(re.namePos, ErrValue, "strike %s: %v", re.name, err)
		}
	}
	if re.ok {
		if _, dup := c.own[re.name]; !dup {
			c.own[re.name] = own
		}
	}
	return e
}

// polarityWords are the strike's polarities.
var polarityWords = []string{"pos", "neg", "both"}

// catalogueNames lists the waveforms in documentation order.
func catalogueNames() []string {
	var out []string
	for _, w := range waveforms.Catalogue() {
		out = append(out, w.Name)
	}
	return out
}

// strikeParam reads one of the waveform's parameters of a strike; bad says
// the waveform is unknown, so only the key itself can be judged.
func (p *parser) strikeParam(re *rawElement, w *waveforms.Waveform, bad bool, kv rawParam, own *ownParams) {
	taking := waveforms.Taking(kv.key)
	switch {
	case len(taking) == 0:
		p.errs.Add(kv.keyPos, ErrUnknown, "unknown parameter %s for a strike%s", kv.key, didYouMean(kv.key, keysOf(re.kind)))
		return
	case bad:
		return
	case w.Param(kv.key) == nil && w.Word(kv.key) == nil:
		p.errs.Add(kv.keyPos, ErrUnknown, "%s is a parameter of waveform %s, not of %s", kv.key, strings.Join(taking, ", "), w.Name)
		return
	}
	if wd := w.Word(kv.key); wd != nil {
		val := kv.val
		if wd.Path {
			path, ok := deckFile(kv)
			if !ok {
				p.errs.Add(kv.valPos, ErrFile, "waveform file %s: no such file", kv.val)
				return
			}
			val = path
		} else if m := wordProblem(re.kind, wd, kv.val); m != "" {
			p.errs.Add(kv.valPos, ErrValue, "%s", m)
			return
		}
		own.vals.SetWord(kv.key, val)
		return
	}
	sp := w.Param(kv.key)
	v, msg := numValue(kv.key+" of waveform "+w.Name, sp.Unit, sp.Rule, kv.val)
	if msg != "" {
		p.errs.Add(kv.valPos, ErrValue, "%s", msg)
		return
	}
	own.vals.Set(kv.key, v)
}

func (p *parser) strikeLevels(e *Element, w *waveforms.Waveform, bad bool, kv rawParam) {
	if bad {
		w = nil
	}
	for _, it := range splitList(kv.val, kv.valPos, &p.errs) {
		v, msg := levelValue(it.text, w)
		if msg != "" {
			p.errs.Add(it.pos, ErrValue, "%s", msg)
			continue
		}
		if w != nil && w.Discharge && v > 30e3 {
			p.errs.Warn(it.pos, "level %s is above 30 kV, beyond the discharge test standards", spec.FormatSI(v, "V"))
		}
		for _, l := range e.Levels {
			if l == v {
				p.errs.Warn(it.pos, "level %s is listed twice", it.text)
			}
		}
		e.Levels = append(e.Levels, v)
	}
}

// conn is one connection of a node: the element and where the node is named.
type conn struct {
	elem string
	pos  Pos
}

// checkTopology finds the nodes, then the electrical problems that make a
// circuit unsolvable (a node with one connection, a loop of ideal voltage
// branches) and the doubtful ones (a node with no DC path to gnd).
func (p *parser) checkTopology(c *Circuit) {
	conns := map[string][]conn{}
	add := func(node, elem string, pos Pos) {
		if node != Ground && conns[node] == nil {
			c.Nodes = append(c.Nodes, node)
		}
		conns[node] = append(conns[node], conn{elem, pos})
	}
	var dc, ideal []edge
	for _, e := range c.Elements {
		own := c.own[e.Name]
		if own == nil {
			continue
		}
		k := e.Kind
		add(e.Nodes[0], e.Name, own.nodes[0])
		add(e.Nodes[1], e.Name, own.nodes[1])
		for _, w := range k.Words {
			if n := e.Values.Word(w.Key); w.Node && n != "" {
				add(n, e.Name, own.pos[w.Key])
				dc = append(dc, edge{e.Nodes[0], n, e.Name})
			}
		}
		switch k.DC {
		case spec.Blocks:
		case spec.ToReference:
			dc = append(dc, edge{e.Nodes[0], Ground, e.Name}, edge{e.Nodes[1], Ground, e.Name})
		default:
			dc = append(dc, edge{e.Nodes[0], e.Nodes[1], e.Name})
		}
		if r := k.IdealWithout; r != "" && e.Values.Num(r) == 0 {
			ideal = append(ideal, edge{e.Nodes[0], e.Nodes[1], e.Name})
		}
	}
	for i, n := range p.dupNodes {
		add(n, p.dups[i].elem, p.dups[i].pos)
	}
	for _, n := range c.Nodes {
		if cs := conns[n]; len(cs) == 1 {
			p.errs.Add(cs[0].pos, ErrCircuit, "node %s has only one connection (%s); connect it to something else or remove it", n, cs[0].elem)
		}
	}
	p.idealLoops(c, ideal)

	// Nodes reached from gnd only through capacitors or the strike float
	// at DC; the engine ties them down with a tiny conductance.
	dcAdj := map[string][]string{}
	for _, ed := range dc {
		dcAdj[ed.a] = append(dcAdj[ed.a], ed.b)
		dcAdj[ed.b] = append(dcAdj[ed.b], ed.a)
	}
	seen := map[string]bool{Ground: true}
	queue := []string{Ground}
	for len(queue) > 0 {
		n := queue[0]
		queue = queue[1:]
		for _, m := range dcAdj[n] {
			if !seen[m] {
				seen[m] = true
				queue = append(queue, m)
			}
		}
	}
	for _, n := range c.Nodes {
		if !seen[n] && len(conns[n]) > 1 {
			p.errs.Warn(conns[n][0].pos, "node %s has no DC path to gnd (only capacitors or the strike reach it); the solver ties it to gnd through a tiny conductance", n)
		}
	}
}

// idealLoops reports each loop of branches that fix a voltage with no
// resistance: such a loop has no solution at DC. It names the first edge
// that closes one.
func (p *parser) idealLoops(c *Circuit, ideal []edge) {
	parent := map[string]string{}
	find := func(x string) string {
		for {
			px, ok := parent[x]
			if !ok || px == x {
				return x
			}
			x = px
		}
	}
	adj := map[string][]edge{}
	for _, ed := range ideal {
		ra, rb := find(ed.a), find(ed.b)
		if ra == rb {
			path := pathBetween(adj, ed.b, ed.a)
			chain := append(path, ed.elem)
			p.errs.Add(c.own[ed.elem].name, ErrCircuit, "loop of supplies and inductors with no resistance: %s; at DC it is a short circuit (give one of them a series resistance, r= or rdc=)", strings.Join(chain, " → "))
			continue
		}
		parent[ra] = rb
		adj[ed.a] = append(adj[ed.a], ed)
		adj[ed.b] = append(adj[ed.b], edge{ed.b, ed.a, ed.elem})
	}
}

// pathBetween lists the elements on the path from a to b in a forest of
// edges.
func pathBetween(adj map[string][]edge, a, b string) []string {
	type step struct {
		node string
		elem string
		prev int
	}
	steps := []step{{a, "", -1}}
	seen := map[string]bool{a: true}
	for i := 0; i < len(steps); i++ {
		if steps[i].node == b {
			var out []string
			for k := i; steps[k].prev >= 0; k = steps[k].prev {
				out = append([]string{steps[k].elem}, out...)
			}
			return out
		}
		for _, ed := range adj[steps[i].node] {
			if !seen[ed.b] {
				seen[ed.b] = true
				steps = append(steps, step{ed.b, ed.elem, i})
			}
		}
	}
	return nil
}

// edge is a two-terminal path between nodes a and b through elem.
type edge struct {
	a, b string
	elem string
}
