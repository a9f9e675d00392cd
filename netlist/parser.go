package netlist

import (
	"fmt"
	"path/filepath"
	"strings"
	"unicode"
	"unicode/utf8"

	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/netlist/textpos"
)

// maxDeckSize bounds a deck or an included file: a deck is a page of text,
// and the bound keeps a mistaken include of a device or a huge file harmless.
const maxDeckSize = 8 << 20

// maxIncludeDepth bounds include nesting (cycles are caught before this).
const maxIncludeDepth = 32

// rawParam is a key=value as written.
type rawParam struct {
	key    string
	keyPos Pos
	val    string
	valPos Pos
	quoted bool
}

// rawElement is an element statement before its parameters are checked.
type rawElement struct {
	kind     *devices.Kind
	kindPos  Pos
	name     string
	namePos  Pos
	nodes    [2]string
	nodePos  [2]Pos
	value    string
	valuePos Pos
	hasValue bool
	params   []rawParam
	ok       bool            // name and both nodes present and well formed
	written  map[string]bool // every key written, usable or not
}

type rawPart struct {
	name    string
	namePos Pos
	kind    *devices.Kind
	params  []rawParam
	pos     Pos
}

type rawWatch struct {
	node    string
	nodePos Pos
	params  []rawParam
	pos     Pos
}

type rawVary struct {
	elem, param string
	targetPos   Pos // position of ELEMENT.PARAM
	paramPos    Pos
	values      []item
	pos         Pos
}

type rawTol struct {
	elem, param string
	targetPos   Pos
	paramPos    Pos
	percent     string
	percentPos  Pos
}

type rawTolLine struct {
	pairs []rawTol
	dist  string
	dPos  Pos
	pos   Pos
}

// parser reads a deck and its includes into raw statements.
type parser struct {
	errs     ErrorList
	top      string
	stack    []string // absolute paths of the files being read, outermost first
	shown    []string // the same files as shown in messages
	done     map[string]bool
	included []string // absolute paths of every file read, in order
	elements []*rawElement
	parts    []*rawPart
	watches  []rawWatch
	varies   []rawVary
	tols     []rawTolLine
	windows  []rawParamsAt
	title    string
	titlePos Pos
	dups     []conn // connections of elements whose name is taken
	dupNodes []string
}

type rawParamsAt struct {
	params []rawParam
	pos    Pos
}

// ParseFile reads and checks the deck at path. On failure the error is an
// ErrorList holding every problem found.
func ParseFile(path string) (*Circuit, error) {
	src, err := readDeck(path)
	if err != nil {
		var l ErrorList
		l.Add(Pos{File: path}, ErrFile, "%v", err)
		return nil, l
	}
	return Parse(path, src)
}

// readDeck reads a deck or an included file: regular, of bounded size.
func readDeck(path string) ([]byte, error) {
	return textpos.ReadFile(path, maxDeckSize, "a deck")
}

// Parse reads and checks a deck whose text is src. filename is used in
// positions and to resolve includes and waveform files relative to its
// folder. On failure the error is an ErrorList (sorted, without repeats)
// holding every problem found, warnings included; on success the warnings are
// in Circuit.Warnings.
func Parse(filename string, src []byte) (c *Circuit, err error) {
	p := &parser{top: filename, done: map[string]bool{}}
	p.file(filename, src, Pos{})
	c = p.check(src)
	p.errs.RemoveMultiples()
	if p.errs.Err() != nil {
		return nil, p.errs
	}
	c.Warnings = p.errs
	return c, nil
}

func absPath(path string) string {
	a, err := filepath.Abs(path)
	if err != nil {
		return filepath.Clean(path)
	}
	return a
}

// file reads the statements of one file; from is the include statement that
// asked for it (invalid for the top deck).
func (p *parser) file(name string, src []byte, from Pos) {
	abs := absPath(name)
	p.included = append(p.included, abs)
	p.stack = append(p.stack, abs)
	p.shown = append(p.shown, name)
	defer func() {
		p.stack = p.stack[:len(p.stack)-1]
		p.shown = p.shown[:len(p.shown)-1]
	}()
	for _, st := range scan(name, src, &p.errs) {
		p.statement(st)
	}
	p.done[abs] = true
}

// statement dispatches on the first word.
func (p *parser) statement(st statement) {
	t := st.toks[0]
	word := t.raw
	if t.quoted || t.isKV {
		p.errs.Add(t.pos, ErrSyntax, "a statement starts with a keyword such as %s, not %s", "resistor", t.raw)
		return
	}
	switch word {
	case "title":
		p.parseTitle(st)
	case "include":
		p.parseInclude(st)
	case "part":
		p.parsePart(st)
	case "watch":
		p.parseWatch(st)
	case "vary":
		p.parseVary(st)
	case "tolerance":
		p.parseTolerance(st)
	case "window":
		p.parseWindow(st)
	default:
		if k := devices.Lookup(word); k != nil {
			p.parseElement(st, k)
			return
		}
		switch {
		case strings.HasPrefix(word, "."):
			p.errs.Add(t.pos, ErrUnknown, "unknown statement %s: statements have no leading dot%s", word, didYouMean(word[1:], statementWords()))
		case strings.HasPrefix(word, "+"):
			p.errs.Add(t.pos, ErrSyntax, "a line cannot continue with +; end the previous line with \\ instead")
		default:
			p.errs.Add(t.pos, ErrUnknown, "unknown statement %s%s", word, didYouMean(word, statementWords()))
		}
	}
}

// title = "title" quoted .
func (p *parser) parseTitle(st statement) {
	if !p.oneQuoted(st, "title", `title takes one quoted text: title "..."`) {
		return
	}
	t := st.toks[0]
	if t.pos.File != p.top {
		return // a library's own title does not name the deck
	}
	if p.titlePos.IsValid() {
		p.errs.Add(t.pos, ErrDuplicate, "second title; the first is at %s", p.titlePos)
		return
	}
	p.title, p.titlePos = st.toks[1].text, t.pos
}

// oneQuoted checks a statement that takes one quoted text (title,
// include): it reports usage when the text is missing and any token after
// it, and says whether st.toks[1] is the text.
func (p *parser) oneQuoted(st statement, what, usage string) bool {
	if len(st.toks) < 2 || !st.toks[1].quoted {
		p.errs.Add(st.toks[0].pos, ErrSyntax, "%s", usage)
		return false
	}
	p.extra(st.toks[2:], what)
	return true
}

// extra reports tokens left over at the end of a statement.
func (p *parser) extra(toks []token, what string) {
	for _, t := range toks {
		p.errs.Add(t.pos, ErrSyntax, "unexpected %s at the end of the %s statement", t.raw, what)
	}
}

// include = "include" quoted .
func (p *parser) parseInclude(st statement) {
	if !p.oneQuoted(st, "include", `include takes one quoted path: include "parts/tvs.zap"`) {
		return
	}
	t := st.toks[0]
	pt := st.toks[1]
	path := pt.text
	if path == "" {
		p.errs.Add(pt.pos, ErrFile, "include of an empty path")
		return
	}
	if !filepath.IsAbs(path) {
		path = filepath.Join(filepath.Dir(t.pos.File), path)
	}
	abs := absPath(path)
	for i, s := range p.stack {
		if s == abs {
			chain := append(append([]string(nil), p.shown[i:]...), path)
			p.errs.Add(pt.pos, ErrFile, "include cycle: %s", strings.Join(chain, " → "))
			return
		}
	}
	if p.done[abs] {
		return // a library included twice is read once
	}
	if len(p.stack) >= maxIncludeDepth {
		p.errs.Add(pt.pos, ErrFile, "includes nested more than %d deep", maxIncludeDepth)
		return
	}
	src, err := readDeck(path)
	if err != nil {
		p.errs.Add(pt.pos, ErrFile, "%v", err)
		return
	}
	p.file(path, src, pt.pos)
}

// params splits the key=value tokens off a statement, reporting repeated
// keys and malformed pairs. Bare words are returned as positionals. Spaces
// around = or inside a list are reported once and repaired, so that one slip
// does not bring a cascade of messages.
func (p *parser) params(toks []token) (pos []token, kv []rawParam) {
	seen := map[string]Pos{}
	for i := 0; i < len(toks); i++ {
		t := toks[i]
		next := func(k int) (token, bool) {
			if i+k < len(toks) {
				return toks[i+k], true
			}
			return token{}, false
		}
		if n, ok := next(1); ok && !t.isKV && !t.quoted && n.isKV && n.key == "" {
			// key =value or key = value
			p.errs.Add(n.pos, ErrSyntax, "no spaces around = in key=value")
			t = token{raw: t.raw + "=" + n.val, isKV: true, key: t.raw, pos: t.pos, val: n.val, valPos: n.valPos, valQuoted: n.valQuoted}
			i++
			if n.val == "" && !n.valQuoted {
				if v, ok := next(1); ok && !v.isKV {
					t.val, t.valPos, t.valQuoted = v.text, v.pos, v.quoted
					i++
				}
			}
		} else if t.isKV && t.key != "" && t.val == "" && !t.valQuoted {
			if v, ok := next(1); ok && !v.isKV {
				// key= value
				p.errs.Add(v.pos, ErrSyntax, "no spaces around = in key=value")
				t.val, t.valPos, t.valQuoted = v.text, v.pos, v.quoted
				i++
			}
		}
		if t.isKV && strings.HasSuffix(t.val, ",") {
			if v, ok := next(1); ok && !v.isKV && !v.quoted {
				p.errs.Add(v.pos, ErrSyntax, "no spaces in a list: write level=2k,4k")
				for ok && !v.isKV && !v.quoted && strings.HasSuffix(t.val, ",") {
					t.val += v.raw
					i++
					v, ok = next(1)
				}
			}
		}
		if !t.isKV {
			if len(kv) > 0 {
				p.errs.Add(t.pos, ErrSyntax, "unexpected %s after the key=value parameters", t.raw)
				continue
			}
			pos = append(pos, t)
			continue
		}
		switch {
		case t.key == "":
			p.errs.Add(t.pos, ErrSyntax, "no spaces around = in key=value")
			continue
		case t.val == "" && !t.valQuoted:
			p.errs.Add(t.pos, ErrMissing, "%s= has no value", t.key)
			continue
		}
		if first, dup := seen[t.key]; dup {
			p.errs.Add(t.pos, ErrDuplicate, "%s given twice (first at %d:%d)", t.key, first.Line, first.Col)
			continue
		}
		seen[t.key] = t.pos
		kv = append(kv, rawParam{key: t.key, keyPos: t.pos, val: t.val, valPos: t.valPos, quoted: t.valQuoted})
	}
	return pos, kv
}

// checkName reports a malformed element, node or part name.
func (p *parser) checkName(what, s string, pos Pos) bool {
	msg := NameProblem(s)
	if msg == "" {
		return true
	}
	if what == "node" && (s == "0" || s == "GND" || s == "Gnd") {
		msg += "; the reference node is gnd"
	}
	p.errs.Add(pos, ErrSyntax, "%s name %s %s", what, s, msg)
	return false
}

// NameProblem says what is wrong with s as a name of the deck language
// (an element, node or part), "" when nothing is: a part line written by
// another tool must pass the rule the deck reads it by.
func NameProblem(s string) string {
	r, _ := utf8.DecodeRuneInString(s)
	if s == "" {
		return "is empty"
	}
	if !(r == '_' || unicode.IsLetter(r)) {
		return "must start with a letter or _"
	}
	for _, r := range s {
		if !(r == '_' || r == '-' || r == '.' || unicode.IsLetter(r) || unicode.IsDigit(r)) {
			return fmt.Sprintf("may hold only letters, digits, _, - and . (not %q)", r)
		}
	}
	return ""
}

// element = kind name node node [value] { key "=" value } .
func (p *parser) parseElement(st statement, kind *devices.Kind) {
	t := st.toks[0]
	e := &rawElement{kind: kind, kindPos: t.pos, written: map[string]bool{}}
	for _, t := range st.toks[1:] {
		if t.isKV {
			e.written[t.key] = true
		}
	}
	pos, kv := p.params(st.toks[1:])
	e.params = kv
	e.ok = true
	if len(pos) < 1 {
		p.errs.Add(t.pos, ErrMissing, "%s needs a name and two nodes: %s", kind.Name, usageOf(kind))
		return
	}
	e.name, e.namePos = pos[0].raw, pos[0].pos
	if pos[0].quoted || !p.checkName("element", e.name, e.namePos) {
		e.ok = false
	}
	if len(pos) < 3 {
		p.errs.Add(e.namePos, ErrMissing, "%s %s needs two nodes: %s", kind.Name, e.name, usageOf(kind))
		e.ok = false
	}
	for i := 0; i < 2 && i+1 < len(pos); i++ {
		e.nodes[i], e.nodePos[i] = pos[i+1].raw, pos[i+1].pos
		if pos[i+1].quoted || !p.checkName("node", e.nodes[i], e.nodePos[i]) {
			e.ok = false
		}
	}
	rest := pos[min(len(pos), 3):]
	positional := kind.Positional() != nil
	if len(rest) > 0 && positional {
		e.value, e.valuePos, e.hasValue = rest[0].raw, rest[0].pos, true
		rest = rest[1:]
	}
	for _, r := range rest {
		if positional {
			p.errs.Add(r.pos, ErrSyntax, "unexpected %s: %s takes one value, then key=value parameters", r.raw, kind.Name)
		} else {
			p.errs.Add(r.pos, ErrSyntax, "unexpected %s: %s takes no positional value, only key=value parameters", r.raw, kind.Name)
		}
	}
	p.elements = append(p.elements, e)
}

// usageOf is the synopsis of an element statement, for messages.
func usageOf(k *devices.Kind) string {
	switch {
	case k.Role == spec.Stimulus:
		return k.Name + " NAME NODE REF waveform=W level=L1,L2 [polarity=pos|neg|both]"
	case k.Positional() != nil:
		return k.Name + " NAME A B VALUE [key=value ...]"
	}
	return k.Name + " NAME A B [key=value ...]"
}

// part = "part" name kind { key "=" value } .
func (p *parser) parsePart(st statement) {
	t := st.toks[0]
	pos, kv := p.params(st.toks[1:])
	if len(pos) < 2 {
		p.errs.Add(t.pos, ErrMissing, "part needs a name and a kind: part NAME KIND key=value ...")
		return
	}
	pt := &rawPart{name: pos[0].raw, namePos: pos[0].pos, kind: devices.Lookup(pos[1].raw), params: kv, pos: t.pos}
	p.extra(pos[2:], "part")
	if !p.checkName("part", pt.name, pt.namePos) {
		return
	}
	switch {
	case pt.kind == nil:
		p.errs.Add(pos[1].pos, ErrUnknown, "unknown element kind %s%s", pos[1].raw, didYouMean(pos[1].raw, kindNames()))
		return
	case pt.kind.Role == spec.Stimulus:
		p.errs.Add(pos[1].pos, ErrValue, "a %s cannot be a part", pt.kind.Name)
		return
	}
	p.parts = append(p.parts, pt)
}

// watch = "watch" node [ "max=" volts ] [ "min=" volts ] .
func (p *parser) parseWatch(st statement) {
	t := st.toks[0]
	pos, kv := p.params(st.toks[1:])
	if len(pos) < 1 {
		p.errs.Add(t.pos, ErrMissing, "watch needs a node: watch NODE [max=V] [min=V]")
		return
	}
	p.extra(pos[1:], "watch")
	if !p.checkName("node", pos[0].raw, pos[0].pos) {
		return
	}
	p.watches = append(p.watches, rawWatch{node: pos[0].raw, nodePos: pos[0].pos, params: kv, pos: t.pos})
}

// splitTarget splits ELEMENT.PARAM (SplitTarget) and places PARAM.
func splitTarget(key string, pos Pos) (elem, param string, paramPos Pos, ok bool) {
	elem, param, ok = SplitTarget(key)
	if !ok {
		return "", "", pos, false
	}
	paramPos = pos
	paramPos.Col += utf8.RuneCountInString(elem) + 1
	return elem, param, paramPos, true
}

// vary = "vary" element "." param "=" value { "," value } .
func (p *parser) parseVary(st statement) {
	t := st.toks[0]
	pos, kv := p.params(st.toks[1:])
	p.extra(pos, "vary")
	if len(kv) == 0 {
		p.errs.Add(t.pos, ErrMissing, "vary needs ELEMENT.PARAM=v1,v2,...")
		return
	}
	for i, r := range kv {
		if i > 0 {
			p.errs.Add(r.keyPos, ErrSyntax, "one ELEMENT.PARAM a vary line; put %s on a line of its own", r.key)
			continue
		}
		elem, param, ppos, ok := splitTarget(r.key, r.keyPos)
		if !ok {
			p.errs.Add(r.keyPos, ErrSyntax, "vary takes ELEMENT.PARAM=v1,v2,..., not %s", r.key)
			continue
		}
		vals := splitList(r.val, r.valPos, &p.errs)
		if len(vals) == 0 {
			continue
		}
		p.varies = append(p.varies, rawVary{elem: elem, param: param, targetPos: r.keyPos, paramPos: ppos, values: vals, pos: t.pos})
	}
}

// tolerance = "tolerance" target "=" percent { target "=" percent } [ "dist=" ( "uniform" | "normal" ) ] .
func (p *parser) parseTolerance(st statement) {
	t := st.toks[0]
	pos, kv := p.params(st.toks[1:])
	p.extra(pos, "tolerance")
	line := rawTolLine{dist: "uniform", pos: t.pos}
	for _, r := range kv {
		if r.key == "dist" {
			line.dPos = r.valPos
			if r.val != "uniform" && r.val != "normal" {
				p.errs.Add(r.valPos, ErrValue, "dist is uniform or normal, not %s%s", r.val, didYouMean(r.val, []string{"uniform", "normal"}))
			}
			line.dist = r.val
			continue
		}
		elem, param, ppos, ok := splitTarget(r.key, r.keyPos)
		if !ok {
			p.errs.Add(r.keyPos, ErrSyntax, "tolerance takes ELEMENT.PARAM=x%%, not %s", r.key)
			continue
		}
		line.pairs = append(line.pairs, rawTol{elem: elem, param: param, targetPos: r.keyPos, paramPos: ppos, percent: r.val, percentPos: r.valPos})
	}
	if len(line.pairs) == 0 {
		p.errs.Add(t.pos, ErrMissing, "tolerance needs ELEMENT.PARAM=x%% (for example C1.value=10%%)")
		return
	}
	p.tols = append(p.tols, line)
}

// window = "window" { ("stop" | "accuracy" | "resolve") "=" value } .
//
// The older keys maxstep (now resolve), reltol (now accuracy) and abstol
// (no longer needed) are read with a warning.
func (p *parser) parseWindow(st statement) {
	t := st.toks[0]
	pos, kv := p.params(st.toks[1:])
	p.extra(pos, "window")
	if len(kv) == 0 {
		p.errs.Add(t.pos, ErrMissing, "window needs at least one of stop=, accuracy=, resolve=")
		return
	}
	p.windows = append(p.windows, rawParamsAt{params: kv, pos: t.pos})
}
