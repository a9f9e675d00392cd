package netlist

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
)

// ownParams are the parameters an element states itself.
type ownParams struct {
	num   map[string]float64
	str   map[string]string
	part  string
	pos   map[string]Pos // where each own key was written
	name  Pos            // the element's name
	nodes [2]Pos         // where its nodes are named
}

// aKind is the kind with its article, for messages.
func aKind(k Kind) string {
	if k == Inductor {
		return "an " + string(k)
	}
	return "a " + string(k)
}

// paramOf names a parameter in messages: "vbr of a clamp".
func paramOf(k Kind, key string) string {
	if key == "value" {
		return "the value of " + aKind(k)
	}
	return key + " of " + aKind(k)
}

// numValue parses text as a value of a parameter in unit under rule, and
// returns a message for the user when it is not one.
func numValue(what, unit string, r rule, text string) (float64, string) {
	n, msg := parseNumber(text, false)
	if msg != "" {
		return 0, msg
	}
	if n.unit != "" && n.unit != unit {
		return 0, fmt.Sprintf("%s is in %s, but %s is in %s", text, unitWords[n.unit], what, unitWords[unit])
	}
	if m := checkRule(r, n.val); m != "" {
		return 0, fmt.Sprintf("%s %s (got %s)", what, m, text)
	}
	return n.val, ""
}

// wordParam checks a word parameter of kind and returns a message when the
// word is not allowed.
func wordParam(kind Kind, key, val string) string {
	switch {
	case kind == Clamp && key == "polarity":
		if val != "uni" && val != "bi" {
			return fmt.Sprintf("clamp polarity is uni or bi, not %s%s", val, didYouMean(val, []string{"uni", "bi"}))
		}
	case kind == Pin && key == "rail":
		if m := nameProblem(val); m != "" {
			return fmt.Sprintf("rail node name %s %s", val, m)
		}
	}
	return ""
}

func hasWord(kind Kind, key string) bool {
	s := specs[kind]
	if s == nil {
		return false
	}
	for _, w := range s.words {
		if w == key {
			return true
		}
	}
	return false
}

// readParam parses one key=value of an element or part of kind into num or
// str and reports what is wrong with it.
// Keys written but unusable are added to skip when it is not nil, so that
// they are not reported again as missing.
func (p *parser) readParam(kind Kind, kv rawParam, num map[string]float64, str map[string]string, skip map[string]bool) bool {
	if hasWord(kind, kv.key) {
		if m := wordParam(kind, kv.key, kv.val); m != "" {
			p.errs.Add(kv.valPos, "%s", m)
			return false
		}
		str[kv.key] = kv.val
		return true
	}
	sp := specOf(kind, kv.key)
	if sp == nil {
		p.errs.Add(kv.keyPos, "unknown parameter %s for %s%s", kv.key, aKind(kind), didYouMean(kv.key, keysOf(kind)))
		if skip != nil {
			// The slip is reported once, not again as a missing parameter.
			if g := suggest(kv.key, keysOf(kind)); g != "" {
				skip[g] = true
			}
		}
		return false
	}
	if kv.quoted {
		p.errs.Add(kv.valPos, "%s takes a number, not a quoted text", kv.key)
		if skip != nil {
			skip[kv.key] = true
		}
		return false
	}
	v, msg := numValue(paramOf(kind, kv.key), sp.unit, sp.rule, kv.val)
	if msg != "" {
		p.errs.Add(kv.valPos, "%s", msg)
		if skip != nil {
			skip[kv.key] = true
		}
		return false
	}
	num[kv.key] = v
	return true
}

// merge builds an element's parameters: the part's, then the element's own,
// then the defaults of MODELS.md for whatever is still missing.
func merge(kind Kind, part *Part, own *ownParams) (map[string]float64, map[string]string) {
	spec := specs[kind]
	num := make(map[string]float64, len(spec.params))
	str := map[string]string{}
	if kind == Clamp {
		str["polarity"] = "uni"
	}
	if part != nil {
		for k, v := range part.Num {
			num[k] = v
		}
		for k, v := range part.Str {
			str[k] = v
		}
		str["part"] = part.Name
	}
	for k, v := range own.num {
		num[k] = v
	}
	for k, v := range own.str {
		str[k] = v
	}
	for _, sp := range spec.params {
		if _, ok := num[sp.key]; ok || !sp.hasDef {
			continue
		}
		if sp.only != "" {
			if _, ok := num[sp.only]; !ok {
				continue
			}
		}
		num[sp.key] = sp.def
	}
	return num, str
}

// problems lists what makes a merged element unusable: missing required
// parameters and parameters that contradict each other.
func problems(e *Element, skip map[string]bool) []string {
	var out []string
	spec := specs[e.Kind]
	if spec == nil {
		return nil
	}
	for _, sp := range spec.params {
		if sp.required && !e.Has(sp.key) && !skip[sp.key] {
			what := sp.key
			if sp.key == "value" {
				what = "a value in " + unitWords[sp.unit]
			} else if sp.unit != "" {
				what += " (" + unitWords[sp.unit] + ")"
			}
			if part := e.Str["part"]; part != "" && sp.key != "value" {
				out = append(out, fmt.Sprintf("%s %s needs %s; neither it nor part %s gives it", e.Kind, e.Name, what, part))
			} else {
				out = append(out, fmt.Sprintf("%s %s needs %s", e.Kind, e.Name, what))
			}
		}
	}
	if e.Kind == Pin && e.Has("vmax") && e.Has("vmin") && !(e.Get("vmin") < e.Get("vmax")) {
		out = append(out, fmt.Sprintf("pin %s: vmin %s is not below vmax %s", e.Name, FormatSI(e.Get("vmin"), "V"), FormatSI(e.Get("vmax"), "V")))
	}
	return out
}

// check turns the raw statements into a Circuit, adding every problem to
// p.errs.
func (p *parser) check(src []byte) *Circuit {
	c := &Circuit{
		File:   p.top,
		Title:  p.title,
		Source: src,
		Parts:  map[string]*Part{},
		own:    map[string]*ownParams{},
	}
	p.checkParts(c)
	names := map[string]Pos{}
	var strikes []*Element
	for _, re := range p.elements {
		var e *Element
		if re.kind == Strike {
			e = p.checkStrike(re, c)
		} else {
			e = p.checkElement(re, c)
		}
		if !re.ok {
			continue
		}
		if first, dup := names[re.name]; dup {
			p.errs.Add(re.namePos, "element %s already defined at %s", re.name, first)
			// Its connections still count, or its nodes would be
			// reported as dangling too.
			p.dups = append(p.dups, conn{re.name, re.nodePos[0]}, conn{re.name, re.nodePos[1]})
			p.dupNodes = append(p.dupNodes, re.nodes[0], re.nodes[1])
			continue
		}
		names[re.name] = re.namePos
		c.Elements = append(c.Elements, e)
		if e.Kind == Strike {
			strikes = append(strikes, e)
		}
	}
	written := 0
	for _, re := range p.elements {
		if re.kind == Strike {
			written++
		}
	}
	switch {
	case written == 0:
		p.errs.Add(Pos{File: p.top, Line: 1, Col: 1}, "deck has no strike: add one, for example strike zap IN gnd waveform=iec61000-4-2 level=8k")
	case len(strikes) > 1:
		for _, s := range strikes[1:] {
			p.errs.Add(c.own[s.Name].name, "second strike %s; a deck has exactly one (the first is %s at %s)", s.Name, strikes[0].Name, c.own[strikes[0].Name].name)
		}
	}
	p.checkTopology(c)
	p.checkWatches(c)
	p.checkWindow(c)
	p.checkVary(c)
	p.checkVariants(c)
	p.checkTolerances(c)
	return c
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
			p.errs.Add(where[v[len(v)-1].Element], "the variant %s does not hold together: %s", strings.Join(s, " "), msg)
			return
		}
	}
}

func (p *parser) checkParts(c *Circuit) {
	for _, rp := range p.parts {
		if prev, dup := c.Parts[rp.name]; dup {
			p.errs.Add(rp.namePos, "part %s already defined at %s", rp.name, prev.Pos)
			continue
		}
		part := &Part{Name: rp.name, Kind: rp.kind, Num: map[string]float64{}, Str: map[string]string{}, Pos: rp.namePos}
		for _, kv := range rp.params {
			if kv.key == "part" {
				p.errs.Add(kv.keyPos, "a part cannot take another part")
				continue
			}
			p.readParam(rp.kind, kv, part.Num, part.Str, nil)
		}
		c.Parts[rp.name] = part
	}
}

// partsOfKind lists the names of the parts of kind, for suggestions.
func partsOfKind(c *Circuit, k Kind) []string {
	var out []string
	for n, pt := range c.Parts {
		if pt.Kind == k {
			out = append(out, n)
		}
	}
	sort.Strings(out)
	return out
}

// lookupPart finds the part name for an element of kind, or says why not.
func lookupPart(c *Circuit, k Kind, name string) (*Part, string) {
	pt := c.Parts[name]
	switch {
	case pt == nil:
		return nil, fmt.Sprintf("no part %s%s", name, didYouMean(name, partsOfKind(c, k)))
	case pt.Kind != k:
		return nil, fmt.Sprintf("part %s is a %s, not a %s (defined at %s)", name, pt.Kind, k, pt.Pos)
	}
	return pt, ""
}

func (p *parser) checkElement(re *rawElement, c *Circuit) *Element {
	own := &ownParams{num: map[string]float64{}, str: map[string]string{}, pos: map[string]Pos{}, name: re.namePos, nodes: re.nodePos}
	skip := map[string]bool{}
	for k := range re.written {
		skip[k] = true // a written key that is unusable was reported already
	}
	if re.hasValue {
		sp := specOf(re.kind, "value")
		v, msg := numValue(paramOf(re.kind, "value"), sp.unit, sp.rule, re.value)
		if msg != "" {
			p.errs.Add(re.valuePos, "%s", msg)
			skip["value"] = true
		} else {
			own.num["value"] = v
		}
		own.pos["value"] = re.valuePos
	}
	var part *Part
	for _, kv := range re.params {
		own.pos[kv.key] = kv.valPos
		switch {
		case kv.key == "part":
			pt, msg := lookupPart(c, re.kind, kv.val)
			if msg != "" {
				p.errs.Add(kv.valPos, "%s", msg)
				own.part = "?"
				continue
			}
			part, own.part = pt, kv.val
		case kv.key == "value" && re.hasValue:
			p.errs.Add(kv.keyPos, "value given twice: once after the nodes and once as value=")
		default:
			p.readParam(re.kind, kv, own.num, own.str, skip)
		}
	}
	e := &Element{Kind: re.kind, Name: re.name, Nodes: re.nodes, Pos: re.kindPos}
	e.Num, e.Str = merge(re.kind, part, own)
	if own.part != "?" && re.nodePos[1].IsValid() {
		for _, m := range problems(e, skip) {
			p.errs.Add(re.namePos, "%s", m)
		}
	}
	if re.ok && re.nodes[0] == re.nodes[1] {
		p.errs.Add(re.nodePos[1], "%s %s connects node %s to itself", re.kind, re.name, re.nodes[0])
		re.ok = false
	}
	if rail, ok := own.str["rail"]; ok && re.ok && rail == re.nodes[0] {
		p.errs.Add(own.pos["rail"], "pin %s: rail %s is the pin's own node", re.name, rail)
		re.ok = false
	}
	if re.ok {
		p.plausible(e, own)
		if _, dup := c.own[re.name]; !dup {
			c.own[re.name] = own
		}
	}
	return e
}

// plausible warns about legal values that are probably slips.
func (p *parser) plausible(e *Element, own *ownParams) {
	at := func(key string) Pos {
		if pos, ok := own.pos[key]; ok {
			return pos
		}
		if part := e.Str["part"]; part != "" {
			return own.pos["part"]
		}
		return own.name
	}
	warn := func(key string, format string, args ...any) { p.errs.Warn(at(key), format, args...) }
	switch e.Kind {
	case Capacitor:
		if v := e.Get("value"); v >= 0.1 {
			warn("value", "capacitor %s is %s: unusually large for a capacitor on a protected line", e.Name, FormatSI(v, "F"))
		}
	case Inductor:
		if v := e.Get("value"); v > 1e-3 {
			warn("value", "inductor %s is %s: unusually large for a protection path (nanohenries are usual)", e.Name, FormatSI(v, "H"))
		}
	case Clamp:
		if v := e.Get("vbr"); v > 1000 {
			warn("vbr", "clamp %s breaks down at %s: unusually high for a clamp", e.Name, FormatSI(v, "V"))
		}
		if v := e.Get("rdyn"); v > 100 {
			warn("rdyn", "clamp %s has rdyn %s: a clamp's dynamic resistance is usually below 1 Ω", e.Name, FormatSI(v, "Ω"))
		}
	case Pin:
		if v := e.Get("rdyn"); v > 100 {
			warn("rdyn", "pin %s has rdyn %s: unusually high", e.Name, FormatSI(v, "Ω"))
		}
		if !e.Has("vbr") {
			for _, k := range []string{"it", "nbr", "rdyn"} {
				if _, ok := own.num[k]; ok {
					warn(k, "pin %s: %s has no effect without vbr (the internal clamp)", e.Name, k)
				}
			}
		}
		if e.Has("cin") && e.Get("cin") > 1e-9 {
			warn("cin", "pin %s has cin %s: unusually large for an IC input", e.Name, FormatSI(e.Get("cin"), "F"))
		}
	case Resistor:
		if v := e.Get("value"); v > 1e9 {
			warn("value", "resistor %s is %s: unusually large", e.Name, FormatSI(v, "Ω"))
		}
	}
}

// checkStrike reads the strike: its waveform first, since the waveform
// decides the unit of the levels and which parameters are allowed.
func (p *parser) checkStrike(re *rawElement, c *Circuit) *Element {
	own := &ownParams{num: map[string]float64{}, str: map[string]string{}, pos: map[string]Pos{}, name: re.namePos, nodes: re.nodePos}
	e := &Element{Kind: Strike, Name: re.name, Nodes: re.nodes, Pos: re.kindPos, Str: map[string]string{"polarity": "pos"}}
	wave := ""
	for _, kv := range re.params {
		if kv.key != "waveform" {
			continue
		}
		wave = kv.val
		known := false
		for _, w := range waveformNames {
			known = known || w == wave
		}
		if !known {
			p.errs.Add(kv.valPos, "unknown waveform %s%s; the waveforms are %s", wave, didYouMean(wave, waveformNames), strings.Join(waveformNames, ", "))
			wave = "?"
		}
	}
	if wave == "" {
		if !re.written["waveform"] {
			p.errs.Add(re.namePos, "strike %s needs waveform= (one of %s)", re.name, strings.Join(waveformNames, ", "))
		}
		wave = "?"
	}
	own.str["waveform"] = wave
	hasLevel, hasFile := false, false
	for _, kv := range re.params {
		own.pos[kv.key] = kv.valPos
		switch kv.key {
		case "waveform":
		case "level":
			hasLevel = true
			p.strikeLevels(e, wave, kv)
		case "polarity":
			if kv.val != "pos" && kv.val != "neg" && kv.val != "both" {
				p.errs.Add(kv.valPos, "strike polarity is pos, neg or both, not %s%s", kv.val, didYouMean(kv.val, []string{"pos", "neg", "both"}))
				continue
			}
			e.Str["polarity"] = kv.val
		case "file":
			hasFile = true
			if wave != "pwl" && wave != "?" {
				p.errs.Add(kv.keyPos, "file is a parameter of waveform pwl, not of %s", wave)
				continue
			}
			path := kv.val
			if path != "" && !filepath.IsAbs(path) {
				path = filepath.Join(filepath.Dir(kv.keyPos.File), path)
			}
			if fi, err := os.Stat(path); path == "" || err != nil || fi.IsDir() {
				p.errs.Add(kv.valPos, "waveform file %s: no such file", kv.val)
				continue
			}
			e.Str["file"] = path
		case "part":
			p.errs.Add(kv.keyPos, "a strike takes no part")
		case "path":
			words, ok := strikeWords[kv.key][wave]
			if !ok && wave != "?" {
				p.errs.Add(kv.keyPos, "%s is a parameter of waveform surge-cwg, not of %s", kv.key, wave)
				continue
			}
			if ok && !slices.Contains(words, kv.val) {
				p.errs.Add(kv.valPos, "strike %s is %s, not %s%s", kv.key, strings.Join(words, ", "), kv.val, didYouMean(kv.val, words))
				continue
			}
			e.Str[kv.key] = kv.val
		default:
			sp, ok := strikeParams[kv.key]
			if !ok {
				p.errs.Add(kv.keyPos, "unknown parameter %s for a strike%s", kv.key, didYouMean(kv.key, keysOf(Strike)))
				continue
			}
			if _, ok := sp.waveforms[wave]; !ok && wave != "?" {
				p.errs.Add(kv.keyPos, "%s is a parameter of waveform %s, not of %s", kv.key, strings.Join(waveformsTaking(kv.key), ", "), wave)
				continue
			}
			v, msg := numValue(kv.key+" of waveform "+wave, sp.unit, sp.rule, kv.val)
			if msg != "" {
				p.errs.Add(kv.valPos, "%s", msg)
				continue
			}
			own.num[kv.key] = v
		}
	}
	if !hasLevel && !re.written["level"] {
		p.errs.Add(re.namePos, "strike %s needs level= (a list such as level=2k,4k,8k)", re.name)
	}
	if wave == "pwl" && !hasFile {
		p.errs.Add(re.namePos, `strike %s: waveform pwl needs file="path" (a CSV of time and value)`, re.name)
	}
	e.Str["waveform"] = wave
	e.Num = mergeStrike(wave, own)
	if re.ok && re.nodes[0] == re.nodes[1] {
		if re.nodes[0] == Ground {
			p.errs.Add(re.nodePos[0], "strike %s is on gnd and gnd: it must hit a node of the circuit", re.name)
		} else {
			p.errs.Add(re.nodePos[1], "strike %s connects node %s to itself", re.name, re.nodes[0])
		}
		re.ok = false
	}
	if re.ok {
		if _, dup := c.own[re.name]; !dup {
			c.own[re.name] = own
		}
	}
	return e
}

// mergeStrike fills the waveform's defaults under the strike's own values.
func mergeStrike(wave string, own *ownParams) map[string]float64 {
	num := map[string]float64{}
	for k, sp := range strikeParams {
		if d, ok := sp.waveforms[wave]; ok && d != noDefault {
			num[k] = d
		}
	}
	for k, v := range own.num {
		num[k] = v
	}
	return num
}

func (p *parser) strikeLevels(e *Element, wave string, kv rawParam) {
	unit := LevelUnit(wave)
	for _, it := range splitList(kv.val, kv.valPos, &p.errs) {
		n, msg := parseNumber(it.text, false)
		switch {
		case msg != "":
			p.errs.Add(it.pos, "%s", msg)
			continue
		case n.unit != "" && wave != "?" && n.unit != unit:
			if unit == "" {
				p.errs.Add(it.pos, "%s is in %s, but the levels of waveform pwl are plain scale factors", it.text, unitWords[n.unit])
			} else {
				p.errs.Add(it.pos, "%s is in %s, but the levels of waveform %s are in %s", it.text, unitWords[n.unit], wave, unitWords[unit])
			}
			continue
		case !(n.val > 0):
			p.errs.Add(it.pos, "level %s must be positive (polarity= gives the sign)", it.text)
			continue
		case isDischarge(wave) && n.val > 30e3:
			p.errs.Warn(it.pos, "level %s is above 30 kV, beyond the discharge test standards", FormatSI(n.val, "V"))
		}
		for _, l := range e.Levels {
			if l == n.val {
				p.errs.Warn(it.pos, "level %s is listed twice", it.text)
			}
		}
		e.Levels = append(e.Levels, n.val)
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
		add(e.Nodes[0], e.Name, own.nodes[0])
		add(e.Nodes[1], e.Name, own.nodes[1])
		if rail := e.Str["rail"]; e.Kind == Pin && rail != "" {
			add(rail, e.Name, own.pos["rail"])
			dc = append(dc, edge{e.Nodes[0], rail, e.Name})
		}
		switch e.Kind {
		case Capacitor, Strike:
		case Line:
			dc = append(dc, edge{e.Nodes[0], Ground, e.Name}, edge{e.Nodes[1], Ground, e.Name})
		default:
			dc = append(dc, edge{e.Nodes[0], e.Nodes[1], e.Name})
		}
		switch {
		case e.Kind == Supply && e.Get("r") == 0,
			e.Kind == Inductor && e.Get("r") == 0,
			e.Kind == Bead && e.Get("rdc") == 0:
			ideal = append(ideal, edge{e.Nodes[0], e.Nodes[1], e.Name})
		}
	}
	for i, n := range p.dupNodes {
		add(n, p.dups[i].elem, p.dups[i].pos)
	}
	for _, n := range c.Nodes {
		if cs := conns[n]; len(cs) == 1 {
			p.errs.Add(cs[0].pos, "node %s has only one connection (%s); connect it to something else or remove it", n, cs[0].elem)
		}
	}

	// A loop of branches that fix a voltage with no resistance has no
	// solution at DC: find the first edge that closes one.
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
			p.errs.Add(c.own[ed.elem].name, "loop of supplies and inductors with no resistance: %s; at DC it is a short circuit (give one of them a series resistance, r= or rdc=)", strings.Join(chain, " → "))
			continue
		}
		parent[ra] = rb
		adj[ed.a] = append(adj[ed.a], ed)
		adj[ed.b] = append(adj[ed.b], edge{ed.b, ed.a, ed.elem})
	}

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
