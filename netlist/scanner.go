package netlist

import (
	"bytes"
	"strings"
	"unicode/utf8"

	"zapnet/netlist/textpos"
)

// token is one word of a statement: a bare word, a quoted string or a
// key=value pair (whose value may be quoted).
type token struct {
	raw    string // as written, quotes and all
	text   string // bare word or decoded quoted string
	pos    Pos
	quoted bool // the whole token is a quoted string

	isKV      bool
	key       string
	val       string // decoded
	valPos    Pos
	valQuoted bool
}

// statement is the tokens of one logical line (continuations joined).
type statement struct {
	toks []token
}

// maxWords bounds the words of one statement: no element, part or sweep
// needs more than a few dozen, and a runaway line is then read in bounded
// memory.
const maxWords = 1000

// scan splits src into statements. It never fails: problems are added to
// errs and the scan goes on, so that every problem of a deck is reported.
//
//	deck      = { line } .
//	line      = [ token { space token } ] [ "\" ] [ "#" comment ] newline .
//	token     = word | quoted | word "=" ( word | quoted ) .
func scan(file string, src []byte, errs *ErrorList) []statement {
	// A byte-order mark, which some editors write at the start of a UTF-8
	// file, is not part of the text.
	src = bytes.TrimPrefix(src, []byte("\uFEFF"))
	var out []statement
	var cur []token
	var contPos Pos
	continuing := false
	lineNo := 0
	for len(src) > 0 || continuing {
		if len(src) == 0 {
			errs.Add(contPos, ErrSyntax, "the last line ends with \\ but no line follows")
			break
		}
		lineNo++
		var line []byte
		if k := bytes.IndexByte(src, '\n'); k >= 0 {
			line, src = src[:k], src[k+1:]
		} else {
			line, src = src, nil
		}
		if n := len(line); n > 0 && line[n-1] == '\r' {
			line = line[:n-1]
		}
		toks, cont, cpos := scanLine(file, lineNo, line, maxWords-len(cur), errs)
		cur = append(cur, toks...)
		continuing = cont
		contPos = cpos
		if !cont {
			if len(cur) > 0 {
				out = append(out, statement{toks: cur})
			}
			cur = nil
		}
	}
	if len(cur) > 0 {
		out = append(out, statement{toks: cur})
	}
	return out
}

// scanLine reads the tokens of one physical line, at most room of them
// (the words past it are reported once and skipped), and reports whether
// the line continues on the next one.
func scanLine(file string, lineNo int, line []byte, room int, errs *ErrorList) ([]token, bool, Pos) {
	var toks []token
	var skipped *token // the last word past room
	hidden(file, lineNo, line, errs)
	col := 1
	i := 0
	badUTF8 := false
	for i < len(line) {
		r, w := utf8.DecodeRune(line[i:])
		if r == ' ' || r == '\t' || r == '\f' || r == '\v' {
			i += w
			col++
			continue
		}
		if r == '#' {
			break
		}
		start, startCol := i, col
		inQuote := false
		var quotePos Pos
		for i < len(line) {
			r, w = utf8.DecodeRune(line[i:])
			if r == utf8.RuneError && w == 1 && !badUTF8 {
				badUTF8 = true
				errs.Add(Pos{File: file, Line: lineNo, Col: col}, ErrSyntax, "invalid UTF-8 encoding")
			}
			if inQuote {
				if r == '\\' && i+1 < len(line) && (line[i+1] == '"' || line[i+1] == '\\') {
					i += 2
					col += 2
					continue
				}
				if r == '"' {
					inQuote = false
				}
				i += w
				col++
				continue
			}
			if r == ' ' || r == '\t' || r == '\f' || r == '\v' || r == '#' {
				break
			}
			// A quote opens a string only at the start of a word or of a
			// value; elsewhere it is a stray character, reported by
			// makeToken, and does not swallow the rest of the line.
			if r == '"' && (i == start || line[i-1] == '=') {
				inQuote = true
				quotePos = Pos{File: file, Line: lineNo, Col: col}
			}
			i += w
			col++
		}
		if inQuote {
			errs.Add(quotePos, ErrSyntax, "string not closed: a quote \" is missing before the end of the line")
		}
		pos := Pos{File: file, Line: lineNo, Col: startCol}
		if len(toks) >= room {
			if skipped == nil && room >= 0 {
				errs.Add(pos, ErrSyntax, "a statement holds at most %d words; the rest of this one is not read", maxWords)
			}
			skipped = &token{raw: string(line[start:i]), pos: pos}
			continue
		}
		toks = append(toks, makeToken(string(line[start:i]), pos, errs))
	}
	if skipped != nil {
		if strings.HasSuffix(skipped.raw, `\`) {
			return toks, true, skipped.pos
		}
		return toks, false, Pos{}
	}
	// A trailing backslash continues the statement, whether it stands alone
	// or is glued to the last word.
	if n := len(toks); n > 0 {
		t := &toks[n-1]
		if !t.quoted && !t.valQuoted && strings.HasSuffix(t.raw, `\`) {
			cpos := t.pos
			cpos.Col += utf8.RuneCountInString(t.raw) - 1
			raw := strings.TrimSuffix(t.raw, `\`)
			if raw == "" {
				toks = toks[:n-1]
			} else {
				toks[n-1] = makeToken(raw, t.pos, errs)
			}
			return toks, true, cpos
		}
	}
	return toks, false, Pos{}
}

// hidden reports the first character of a line that a terminal or an
// editor would not show as itself: a control character (an escape, a
// stray carriage return) or an invisible one (a zero-width space, a
// no-break space). Such a character would make a name differ from the one
// the reader sees, or act on the terminal when echoed. Tabs, form feeds
// and vertical tabs are white space.
func hidden(file string, lineNo int, line []byte, errs *ErrorList) {
	col := 1
	for i := 0; i < len(line); {
		r, w := utf8.DecodeRune(line[i:])
		if !(r == utf8.RuneError && w == 1) && r != '\f' && r != '\v' && !textpos.Shown(r) {
			errs.Add(Pos{File: file, Line: lineNo, Col: col}, ErrSyntax, "character %s is not text a deck may hold (a control or invisible character)", Printable(string(r)))
			return
		}
		i += w
		col++
	}
}

// makeToken classifies a raw word.
func makeToken(raw string, pos Pos, errs *ErrorList) token {
	t := token{raw: raw, text: raw, pos: pos}
	if strings.HasPrefix(raw, `"`) {
		t.quoted = true
		t.text = unquote(raw, pos, errs)
		return t
	}
	q := strings.IndexByte(raw, '"')
	eq := strings.IndexByte(raw, '=')
	if eq >= 0 && (q < 0 || eq < q) {
		t.isKV = true
		t.key = raw[:eq]
		t.val = raw[eq+1:]
		t.valPos = pos
		t.valPos.Col += utf8.RuneCountInString(t.key) + 1
		if strings.HasPrefix(t.val, `"`) {
			t.valQuoted = true
			t.val = unquote(t.val, t.valPos, errs)
		} else if k := strings.IndexByte(t.val, '"'); k >= 0 {
			p := t.valPos
			p.Col += utf8.RuneCountInString(t.val[:k])
			errs.Add(p, ErrSyntax, "unexpected quote inside %s", raw)
		}
		return t
	}
	if q >= 0 {
		p := pos
		p.Col += utf8.RuneCountInString(raw[:q])
		errs.Add(p, ErrSyntax, "unexpected quote inside %s (quote the whole text)", raw)
	}
	return t
}

// unquote decodes a quoted string: \" is a quote and \\ a backslash; any
// other backslash stays as written so that folder separators survive.
func unquote(s string, pos Pos, errs *ErrorList) string {
	var b strings.Builder
	col := pos.Col + 1
	for i := 1; i < len(s); {
		r, w := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == '\\' && i+1 < len(s) && (s[i+1] == '"' || s[i+1] == '\\'):
			b.WriteByte(s[i+1])
			i += 2
			col += 2
			continue
		case r == '"':
			if i+1 < len(s) {
				p := pos
				p.Col = col + 1
				errs.Add(p, ErrSyntax, "unexpected text after the closing quote")
			}
			return b.String()
		}
		b.WriteString(s[i : i+w])
		i += w
		col++
	}
	return b.String() // not closed: already reported by the scanner
}

// item is one element of a comma-separated list, with its position.
type item struct {
	text string
	pos  Pos
}

// splitList splits a list value; empty items are reported.
func splitList(val string, pos Pos, errs *ErrorList) []item {
	var out []item
	col := pos.Col
	for _, s := range strings.Split(val, ",") {
		p := pos
		p.Col = col
		if s == "" {
			errs.Add(p, ErrSyntax, "empty item in a list (lists are comma-separated, no spaces)")
		} else {
			out = append(out, item{s, p})
		}
		col += utf8.RuneCountInString(s) + 1
	}
	return out
}
