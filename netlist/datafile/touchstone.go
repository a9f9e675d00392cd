package datafile

import (
	"math"
	"math/cmplx"
	"path/filepath"
	"strconv"
	"strings"

	"zapnet/devices/spec"
	"zapnet/netlist/textpos"
)

// Touchstone is the network data of a Touchstone file (the open format of
// the IBIS Open Forum, versions 1.x and 2.x), converted to complex numbers
// in SI units: S-parameters as they are, Z-parameters in ohms and
// Y-parameters in siemens (version 1 stores both normalised to the
// reference resistance; they are de-normalised here).
type Touchstone struct {
	Version int       // 1 or 2
	Ports   int       // number of ports
	Param   byte      // 'S', 'Y' or 'Z'
	Format  string    // "RI", "MA" or "DB", as the file gave its pairs
	R       float64   // the option line's reference resistance, Ω
	Ref     []float64 // each port's reference resistance, Ω
	Freq    []float64 // Hz, rising
	// Data holds, for each frequency, the Ports×Ports matrix row-major:
	// N[i][j] at i*Ports+j (zero-based ports).
	Data [][]complex128
	Pos  []Pos // where each frequency's record starts
}

// At returns N[i][j] (ports counted from 1) at frequency index k.
func (t *Touchstone) At(k, i, j int) complex128 { return t.Data[k][(i-1)*t.Ports+(j-1)] }

// tsToken is a number of the network data with its position.
type tsToken struct {
	text string
	pos  Pos
	eol  bool // the last number of its line
}

// ReadTouchstone reads a Touchstone file. name is shown in messages and,
// for a version 1 file, its extension (.s1p, .s2p, .sNp) gives the number
// of ports; without one, a first data line of 3 numbers means one port and
// one of 9 numbers two.
//
// Version 1: comments from '!', an option line
// `# <Hz|kHz|MHz|GHz> <S|Y|Z|H|G> <MA|DB|RI> R <n>` (any order, every part
// optional; defaults GHz S MA R 50; only the first counts), then one record
// per frequency: the frequency and the network data as pairs, a two-port's
// in the order N11 N21 N12 N22, larger matrices row by row; a two-port file
// may end with noise data, which starts where the frequency falls back and
// is skipped.
//
// Version 2 adds the keywords [Version], [Number of Ports], [Two-Port Data
// Order] (12_21: N11 N12 N21 N22; 21_12: N11 N21 N12 N22), [Number of
// Frequencies], [Reference], [Matrix Format] (Full, Lower, Upper),
// [Network Data], [Noise Data] and [End]; its Y- and Z-parameters are not
// normalised. Mixed-mode data and H- and G-parameters are refused.
func ReadTouchstone(name string, src []byte) (*Touchstone, error) {
	r := &tsReader{
		name:   name,
		t:      &Touchstone{Version: 1, Param: 'S', Format: "MA", R: 50},
		unit:   1e9,
		first:  true,
		nFreq:  -1,
		matrix: "full",
	}
	for _, ln := range lines(src, '!') {
		if !r.line(ln) {
			break
		}
	}
	t := r.t
	if !r.ports() {
		r.errs.RemoveMultiples()
		return nil, r.errs
	}
	r.references()
	t.records(name, r.toks, r.unit, r.order, r.matrix, &r.errs)
	if r.nFreq > 0 && len(t.Freq) != r.nFreq && len(r.errs) == 0 {
		r.errs.Add(Pos{File: name}, ErrSyntax, "[Number of Frequencies] says %d, the data has %d", r.nFreq, len(t.Freq))
	}
	if len(t.Freq) == 0 && len(r.errs) == 0 {
		r.errs.Add(Pos{File: name}, ErrMissing, "no network data")
	}
	r.errs.RemoveMultiples()
	if err := r.errs.Err(); err != nil {
		return nil, err
	}
	return t, nil
}

// tsReader is what a Touchstone file has said so far, line by line. The
// data's numbers wait in toks: they fall into records only once the whole
// file has told the number of ports and how the matrix is laid out.
type tsReader struct {
	name string
	t    *Touchstone
	errs ErrorList
	unit float64 // the frequency unit's factor

	// first: no line but comments and unclosed brackets yet, so a keyword
	// other than [Version] marks a version 1 file.
	first, seenOption                   bool
	inData, inInfo, inRef, noise, ended bool

	nFreq  int
	order  string // two-port data order, v2
	matrix string // v2 matrix format: full, lower or upper
	refs   []float64
	refPos Pos
	toks   []tsToken
}

func (r *tsReader) at(ln line, f field) Pos { return Pos{File: r.name, Line: ln.no, Col: f.col} }

// line reads one line; false stops the reading.
func (r *tsReader) line(ln line) bool {
	text := strings.TrimSpace(ln.text)
	if text == "" {
		return true
	}
	ws := words(ln.text)
	if r.ended {
		r.errs.Add(r.at(ln, ws[0]), ErrSyntax, "text after [End]")
		return false
	}
	if r.inInfo {
		if kw, _ := keyword(ln.text); kw == "end information" {
			r.inInfo = false
		}
		return true
	}
	if strings.HasPrefix(text, "[") {
		r.keyword(ln, ws)
		return true
	}
	if strings.HasPrefix(text, "#") {
		r.first = false
		if r.seenOption {
			return true // only the first option line counts
		}
		r.seenOption = true
		r.unit = r.t.option(r.name, ln, &r.errs)
		return true
	}
	r.first = false
	if r.inRef {
		for _, f := range ws {
			r.refs = append(r.refs, tsReal(f, r.at(ln, f), &r.errs))
		}
		return true
	}
	if r.noise {
		return true
	}
	if r.t.Version == 2 && !r.inData {
		r.errs.Add(r.at(ln, ws[0]), ErrSyntax, "data before [Network Data]")
		return true
	}
	if !r.seenOption {
		r.errs.Add(r.at(ln, ws[0]), ErrMissing, "data before the option line: the first line that is not a comment is # <unit> <parameter> <format> R <n>")
		r.seenOption = true
	}
	for k, f := range ws {
		r.toks = append(r.toks, tsToken{f.text, r.at(ln, f), k == len(ws)-1})
	}
	return true
}

// tsKeywordLine is a "[Keyword] value ..." line of a version 2 file.
type tsKeywordLine struct {
	kw   string // lower case
	ln   line
	head Pos     // where the line's first word starts
	rest []field // the words after the bracket, their columns the line's
}

// keyword reads a line that starts with a bracket.
func (r *tsReader) keyword(ln line, ws []field) {
	r.inRef = false
	kw, rest := keyword(ln.text)
	restWords := rest.words()
	head := r.at(ln, ws[0])
	if kw == "" {
		r.errs.Add(head, ErrSyntax, "a keyword's bracket is not closed")
		return
	}
	if r.first && kw != "version" {
		// A version 1 file has no keywords.
		r.errs.Add(head, ErrSyntax, "keyword [%s] in a version 1 file (a version 2 file starts with [Version] 2.0)", kw)
		r.first = false
		return
	}
	r.first = false
	r.setKeyword(tsKeywordLine{kw: kw, ln: ln, head: head, rest: restWords})
}

// setKeyword takes in what a version 2 keyword says.
func (r *tsReader) setKeyword(k tsKeywordLine) {
	t := r.t
	switch k.kw {
	case "version":
		if f, ok := r.arg(k); ok {
			v, msg := spec.ParsePlain(f.text)
			if msg != "" || v < 2 || v >= 3 {
				r.errs.Add(r.at(k.ln, f), ErrUnsupported, "[Version] %s: zapnet reads versions 1.x and 2.x", f.text)
			}
		}
		t.Version = 2
	case "number of ports":
		t.Ports = r.count(k)
	case "two-port data order":
		if f, ok := r.arg(k); ok {
			r.order = f.text
			if r.order != "12_21" && r.order != "21_12" {
				r.errs.Add(r.at(k.ln, f), ErrSyntax, "[Two-Port Data Order] is 12_21 or 21_12, not %q", f.text)
			}
		}
	case "number of frequencies":
		r.nFreq = r.count(k)
	case "number of noise frequencies":
		r.count(k) // checked, though the noise data is skipped
	case "reference":
		r.refPos = k.head
		r.inRef = true
		for _, f := range k.rest {
			r.refs = append(r.refs, tsReal(f, r.at(k.ln, f), &r.errs))
		}
	case "matrix format":
		if f, ok := r.arg(k); ok {
			r.matrix = strings.ToLower(f.text)
			if r.matrix != "full" && r.matrix != "lower" && r.matrix != "upper" {
				r.errs.Add(r.at(k.ln, f), ErrSyntax, "[Matrix Format] is Full, Lower or Upper, not %q", f.text)
			}
		}
	case "mixed-mode order":
		r.errs.Add(k.head, ErrUnsupported, "mixed-mode data is not supported: give single-ended S-parameters")
	case "begin information":
		r.inInfo = true
	case "network data":
		if !r.seenOption {
			r.errs.Add(k.head, ErrMissing, "[Network Data] before the option line (# ...)")
		}
		r.inData = true
	case "noise data":
		r.inData, r.noise = false, true
	case "end":
		r.ended = true
	default:
		r.errs.Add(k.head, ErrSyntax, "unknown keyword [%s]", k.kw)
	}
}

// arg returns a keyword's value, the first word after its bracket.
func (r *tsReader) arg(k tsKeywordLine) (field, bool) {
	if len(k.rest) == 0 {
		r.errs.Add(k.head, ErrMissing, "[%s] needs a value", k.kw)
		return field{}, false
	}
	return k.rest[0], true
}

// count returns a keyword's whole-number value, −1 when it has none.
func (r *tsReader) count(k tsKeywordLine) int {
	f, ok := r.arg(k)
	if !ok {
		return -1
	}
	n, err := strconv.Atoi(f.text)
	if err != nil || n < 1 {
		r.errs.Add(r.at(k.ln, f), ErrNumber, "[%s] wants a whole number above 0, got %q", k.kw, f.text)
		return -1
	}
	return n
}

// ports settles the number of ports (a version 1 file's from its name or
// its first data line) and says whether there is one.
func (r *tsReader) ports() bool {
	t := r.t
	if t.Version == 2 {
		switch {
		case t.Ports < 1:
			r.errs.Add(Pos{File: r.name}, ErrMissing, "a version 2 file needs [Number of Ports]")
		case t.Ports == 2 && r.order == "":
			r.errs.Add(Pos{File: r.name}, ErrMissing, "a version 2 two-port file needs [Two-Port Data Order]")
		}
		if !r.ended && len(r.errs) == 0 {
			r.errs.Add(Pos{File: r.name}, ErrMissing, "a version 2 file ends with [End]")
		}
		return t.Ports >= 1
	}
	r.order = "21_12"
	t.Ports = tsPortsFromName(r.name)
	if t.Ports == 0 && len(r.toks) > 0 {
		n := 0
		for _, tk := range r.toks {
			n++
			if tk.eol {
				break
			}
		}
		switch n {
		case 3:
			t.Ports = 1
		case 9:
			t.Ports = 2
		default:
			r.errs.Add(r.toks[0].pos, ErrMissing, "cannot tell the number of ports: name the file .s1p, .s2p, ... (the first data line has %d numbers)", n)
		}
	}
	return t.Ports >= 1
}

// references gives each port the option line's reference resistance, or
// the one [Reference] names for it.
func (r *tsReader) references() {
	t := r.t
	t.Ref = make([]float64, t.Ports)
	for k := range t.Ref {
		t.Ref[k] = t.R
	}
	if r.refs != nil {
		if len(r.refs) != t.Ports {
			r.errs.Add(r.refPos, ErrSyntax, "[Reference] gives %d resistances for %d ports", len(r.refs), t.Ports)
		} else {
			copy(t.Ref, r.refs)
		}
	}
}

// tsReal reads a positive resistance.
func tsReal(f field, pos Pos, errs *ErrorList) float64 {
	v, msg := spec.ParsePlain(f.text)
	if msg != "" {
		errs.Add(pos, ErrNumber, "%s", msg)
		return 50
	}
	if !(v > 0) {
		errs.Add(pos, ErrRange, "a reference resistance must be > 0, got %g", v)
		return 50
	}
	return v
}

// option reads the option line and returns the frequency unit's factor.
func (t *Touchstone) option(name string, ln line, errs *ErrorList) float64 {
	unit := 1e9
	hash := strings.Index(ln.text, "#")
	ws := field{ln.text[hash+1:], len([]rune(ln.text[:hash+1])) + 1}.words()

	for k := 0; k < len(ws); k++ {
		f := ws[k]
		pos := Pos{File: name, Line: ln.no, Col: f.col}
		switch w := strings.ToUpper(f.text); w {
		case "HZ":
			unit = 1
		case "KHZ":
			unit = 1e3
		case "MHZ":
			unit = 1e6
		case "GHZ":
			unit = 1e9
		case "S", "Y", "Z":
			t.Param = w[0]
		case "H", "G":
			errs.Add(pos, ErrUnsupported, "%s-parameters are not supported: give S, Y or Z", w)
		case "MA", "DB", "RI":
			t.Format = w
		case "R":
			if k+1 >= len(ws) {
				errs.Add(pos, ErrMissing, "R needs the reference resistance after it")
				continue
			}
			k++
			t.R = tsReal(ws[k], Pos{File: name, Line: ln.no, Col: ws[k].col}, errs)
		default:
			errs.Add(pos, ErrSyntax, "unknown option %q: the option line is # <Hz|kHz|MHz|GHz> <S|Y|Z> <MA|DB|RI> R <n>", f.text)
		}
	}
	return unit
}

// tsPortsFromName reads N from a .sNp extension, 0 when there is none.
func tsPortsFromName(name string) int {
	ext := strings.ToLower(filepath.Ext(name))
	if len(ext) < 4 || ext[1] != 's' || ext[len(ext)-1] != 'p' {
		return 0
	}
	n, err := strconv.Atoi(ext[2 : len(ext)-1])
	if err != nil || n < 1 {
		return 0
	}
	return n
}

// records groups the data numbers into frequency records.
func (t *Touchstone) records(name string, toks []tsToken, unit float64, order, matrix string, errs *ErrorList) {
	n := t.Ports
	entries := n * n
	if matrix != "full" {
		entries = n * (n + 1) / 2
	}
	size := 1 + 2*entries
	for k := 0; k < len(toks); {
		start := toks[k]
		if f, msg := spec.ParsePlain(start.text); msg == "" && t.Version == 1 && n == 2 {
			if nf := len(t.Freq); nf > 0 && f*unit <= t.Freq[nf-1] {
				return // version 1 noise data follows
			}
		}
		if k+size > len(toks) {
			errs.Add(start.pos, ErrSyntax, "the record of frequency %s has %d numbers, a %d-port record needs %d (1 frequency + %d pairs)", start.text, len(toks)-k, n, size, entries)
			return
		}
		rec := toks[k : k+size]
		k += size
		if !rec[size-1].eol {
			errs.Add(toks[k].pos, ErrSyntax, "a record ends inside a line: a %d-port record has %d numbers (1 frequency + %d pairs)", n, size, entries)
			return
		}
		vals := make([]float64, size)
		bad := false
		for i, tk := range rec {
			v, msg := spec.ParsePlain(tk.text)
			if msg != "" {
				errs.Add(tk.pos, ErrNumber, "%s", msg)
				bad = true
			}
			vals[i] = v
		}
		if bad {
			continue
		}
		f := vals[0] * unit
		if nf := len(t.Freq); nf > 0 && f <= t.Freq[nf-1] {
			errs.Add(start.pos, ErrOrder, "frequency %s does not rise above the record before", start.text)
			continue
		}
		if f < 0 {
			errs.Add(start.pos, ErrRange, "frequency %s: must be >= 0", start.text)
			continue
		}
		m := make([]complex128, n*n)
		for e := range entries {
			a, b := vals[1+2*e], vals[2+2*e]
			var z complex128
			switch t.Format {
			case "RI":
				z = complex(a, b)
			case "MA":
				z = cmplx.Rect(a, b*math.Pi/180)
			case "DB":
				z = cmplx.Rect(math.Pow(10, a/20), b*math.Pi/180)
			}
			i, j := tsIndex(e, n, order, matrix)
			m[i*n+j] = z
			if matrix != "full" {
				m[j*n+i] = z
			}
		}
		t.normalise(m)
		t.Freq = append(t.Freq, f)
		t.Data = append(t.Data, m)
		t.Pos = append(t.Pos, start.pos)
	}
}

// tsIndex is the (row, column) of the e-th pair of a record.
func tsIndex(e, n int, order, matrix string) (int, int) {
	if n == 2 && matrix == "full" && order == "21_12" {
		return e % 2, e / 2 // N11 N21 N12 N22: column by column
	}
	switch matrix {
	case "lower": // rows of the lower triangle: (0,0), (1,0) (1,1), ...
		for i := 0; i < n; i++ {
			if e <= i {
				return i, e
			}
			e -= i + 1
		}
	case "upper": // (0,0) (0,1) ... (0,n−1), (1,1) ...
		for i := 0; i < n; i++ {
			if e < n-i {
				return i, i + e
			}
			e -= n - i
		}
	}
	return e / n, e % n
}

// normalise undoes version 1's normalisation of Y and Z to the reference.
func (t *Touchstone) normalise(m []complex128) {
	if t.Version != 1 {
		return
	}
	switch t.Param {
	case 'Z':
		for k := range m {
			m[k] *= complex(t.R, 0)
		}
	case 'Y':
		for k := range m {
			m[k] /= complex(t.R, 0)
		}
	}
}

// Impedance returns the impedance of the part the file describes at each
// frequency, and says how it was read:
//
//	one-port S:  Z = Z0·(1 + S11)/(1 − S11)
//	one-port Z:  Z = Z11;  one-port Y: Z = 1/Y11
//	two-port S:  the part in series between the ports (series-through),
//	             Z = 2·Z0·(1 − S21)/S21
//	two-port Y:  the part in series, Z = −1/Y21
//
// A two-port Z file cannot hold a part in series (its Z-matrix does not
// exist) and is refused, as are files with more than two ports and two-port
// S files whose ports have different references.
func (t *Touchstone) Impedance() ([]complex128, string, error) {
	z := make([]complex128, len(t.Freq))
	bad := func(format string, args ...any) ([]complex128, string, error) {
		return nil, "", textpos.New(Pos{File: posFile(t)}, ErrUnsupported, format, args...)
	}
	switch {
	case t.Ports == 1 && t.Param == 'S':
		z0 := complex(t.Ref[0], 0)
		for k := range z {
			s := t.At(k, 1, 1)
			z[k] = z0 * (1 + s) / (1 - s)
		}
		return z, "one-port S11: Z = Z0·(1 + S11)/(1 − S11)", nil
	case t.Ports == 1 && t.Param == 'Z':
		for k := range z {
			z[k] = t.At(k, 1, 1)
		}
		return z, "one-port Z11", nil
	case t.Ports == 1 && t.Param == 'Y':
		for k := range z {
			z[k] = 1 / t.At(k, 1, 1)
		}
		return z, "one-port Y11: Z = 1/Y11", nil
	case t.Ports == 2 && t.Param == 'S':
		if t.Ref[0] != t.Ref[1] {
			return bad("the ports' references differ (%g Ω, %g Ω): the series-through formula needs one", t.Ref[0], t.Ref[1])
		}
		z0 := complex(t.Ref[0], 0)
		for k := range z {
			s21 := t.At(k, 2, 1)
			z[k] = 2 * z0 * (1 - s21) / s21
		}
		return z, "two-port S21, part in series: Z = 2·Z0·(1 − S21)/S21", nil
	case t.Ports == 2 && t.Param == 'Y':
		for k := range z {
			z[k] = -1 / t.At(k, 2, 1)
		}
		return z, "two-port Y21, part in series: Z = −1/Y21", nil
	case t.Ports == 2 && t.Param == 'Z':
		return bad("a two-port Z file cannot describe a part in series between the ports; give S- or Y-parameters")
	}
	return bad("a %d-port file: zapnet reads the impedance of one- and two-port files only", t.Ports)
}

func posFile(t *Touchstone) string {
	if len(t.Pos) > 0 {
		return t.Pos[0].File
	}
	return ""
}
