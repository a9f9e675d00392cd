package report

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"html/template"
	"io"
	"regexp"
	"slices"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
)

// Figure is a picture in the HTML report: an SVG document drawn by package
// plots, with a name unique among its run's figures (or among the
// overlays) and a one-line caption.
type Figure struct {
	Name    string
	Caption string
	SVG     []byte
}

// HTMLOptions say what goes into the HTML report besides the runs. A nil
// *HTMLOptions means every default.
type HTMLOptions struct {
	// Meta names the tool, the deck and its title. Zero: no title (the
	// report is headed "zapnet report") and no deck path.
	Meta study.Meta
	// Source is the deck's text, listed as written with line numbers.
	// Nil: no listing.
	Source []byte
	// RunFigures[i] are the figures of runs[i]. Nil, or shorter than runs:
	// the runs past its end have no figures.
	RunFigures [][]Figure
	// Overlays are the figures across runs, shown under the summary.
	// Nil: none.
	Overlays []Figure
	// OverlaysTitle heads the overlays. Empty: "Every run compared".
	OverlaysTitle string
	// Signal is the signal side (zapnet ac), shown after the runs. Nil:
	// none.
	Signal *SignalSection
}

// SignalSection is the signal side in the HTML report: its tables as
// printed (ACTables) and its figures.
type SignalSection struct {
	Text    string
	Figures []Figure
}

// HTML writes the report as one self-contained page: inline CSS, inline SVG,
// no script and no reference to anything outside the file, so it opens
// offline and can be mailed or archived as it is. It holds the title, the
// caution, the summary, the overlays, each run's tables, verdict and
// figures, and the deck's listing. Without runs (a what-if command's report)
// the summary is left out and the page holds its figures.
//
// Every text from the deck (title, names, the listing) goes through
// html/template, which escapes it for where it lands; a Content Security
// Policy forbids script and fetches, so even a mistake could not run code.
// A figure's SVG is inlined only after checking that it holds nothing but
// drawing elements (svg, g, path, text and plain shapes) without event
// handlers or links: HTML returns an error otherwise.
func HTML(w io.Writer, runs []study.Run, opt *HTMLOptions) error {
	if opt == nil {
		opt = &HTMLOptions{}
	}
	page := htmlPage{
		Title: opt.Meta.Title, Deck: opt.Meta.Deck, Tool: opt.Meta.Tool, Version: opt.Meta.Version,
		Caution: Caution, OverlaysTitle: opt.OverlaysTitle,
	}
	if page.OverlaysTitle == "" {
		page.OverlaysTitle = "Every run compared"
	}
	if page.Tool == "" {
		page.Tool = "zapnet"
	}
	var err error
	styles := &figureStyles{class: map[string]string{}}
	if page.Overlays, err = htmlFigures("fig", opt.Overlays, styles); err != nil {
		return err
	}
	for _, r := range runs {
		if len(r.Variant) > 0 {
			page.Variants = true
		}
	}
	if ranks := whatif.RankVariants(runs); len(ranks) > 1 {
		head, rows := rankingRows(ranks)
		t := htmlTableOf("variants-ranked", rankingTitle, head, rows)
		page.Ranking = &t
	}
	for i := range runs {
		r := &runs[i]
		id := fmt.Sprintf("run-%d", i+1)
		row := htmlSummaryRow{ID: id, Variant: r.Variant.String(), Level: si(r.Level, r.LevelUnit),
			Polarity: r.Polarity, Verdict: string(r.Verdict), Class: verdictClass(r.Verdict), Worst: worstText(r)}
		page.Summary = append(page.Summary, row)
		hr := htmlRun{ID: id, Class: row.Class, Verdict: row.Verdict, Heading: runHeading(r, i, len(runs))}
		if r.Err != nil {
			hr.Error = r.Err.Error()
		} else {
			hr.Window = fmt.Sprintf("Window: 0 to %s (%s); %d steps, %d rejected", si(r.Window.Stop, "s"), windowHow(r), r.Stats.Steps, r.Stats.Rejected)
			hr.Tables = htmlRunTables(id, r)
			if r.Worst != nil {
				hr.Worst = r.Worst.String()
			}
		}
		hr.Failures, hr.Notes = r.Failures, r.Notes
		if s := verifySentence(r.Verify); s != "" {
			hr.Notes = append(slices.Clone(r.Notes), s)
		}
		if i < len(opt.RunFigures) {
			if hr.Figures, err = htmlFigures(id+"-fig", opt.RunFigures[i], styles); err != nil {
				return err
			}
		}
		page.Runs = append(page.Runs, hr)
	}
	if opt.Signal != nil {
		page.Signal = &htmlSignal{Text: opt.Signal.Text}
		if page.Signal.Figures, err = htmlFigures("signal-fig", opt.Signal.Figures, styles); err != nil {
			return err
		}
	}
	// The page says "runs" even of one run; the text summary says "run".
	page.Count = verdictCount(runs, "runs")
	if opt.Source != nil {
		lines := strings.Split(strings.TrimRight(strings.ReplaceAll(string(opt.Source), "\r\n", "\n"), "\n"), "\n")
		for k, l := range lines {
			page.Listing = append(page.Listing, htmlLine{N: k + 1, Text: l})
		}
	}
	page.FigureStyle = styles.css()
	return htmlTemplate.Execute(w, page)
}

type htmlPage struct {
	FigureStyle                         template.CSS
	Title, Deck, Tool, Version, Caution string
	OverlaysTitle                       string
	Variants                            bool
	Summary                             []htmlSummaryRow
	Count                               string
	Ranking                             *htmlTable
	Overlays                            []htmlFigure
	Runs                                []htmlRun
	Signal                              *htmlSignal
	Listing                             []htmlLine
}

type htmlSignal struct {
	Text    string
	Figures []htmlFigure
}

type htmlSummaryRow struct {
	ID, Variant, Level, Polarity, Verdict, Class, Worst string
}

type htmlRun struct {
	ID, Class, Heading, Verdict string
	Error, Window, Worst        string
	Tables                      []htmlTable
	Failures, Notes             []string
	Figures                     []htmlFigure
}

type htmlTable struct {
	ID, Title string
	Head      []htmlCell
	Rows      [][]htmlCell
}

type htmlCell struct {
	Text  string
	Class string // "num" for numbers (aligned right), "fail" for a limit exceeded
}

type htmlFigure struct {
	ID, Caption string
	SVG         template.HTML
}

type htmlLine struct {
	N    int
	Text string
}

func verdictClass(v study.Verdict) string {
	switch v {
	case study.Pass:
		return "pass"
	case study.Fail:
		return "fail"
	}
	return "error"
}

// htmlRunTables are the tables of a run, the same as the text report's.
func htmlRunTables(id string, r *study.Run) []htmlTable {
	var ts []htmlTable
	add := func(name, title string, head []string, rows [][]string) {
		if len(rows) > 0 {
			ts = append(ts, htmlTableOf(id+"-"+name, title, head, rows))
		}
	}

	// The pin table shows the ratings beside the residual pulse, unlike
	// the text report's; the other rows are the text report's.
	add("nodes", "Nodes", []string{"node", "role", "highest", "at", "lowest", "at"}, nodeRows(r))
	add("clamps", "Clamps", []string{"clamp", "peak current", "at", "ipp", "energy", "emax"}, clampRows(r))
	if bu := r.Burst; bu != nil {
		add("burst", burstTitle(bu), burstHead(bu), burstRows(bu))
	}

	var pins [][]string
	for _, p := range r.Pins() {
		vmax, vmin, above, below := "-", "-", "-", "-"
		if p.HasVmax {
			vmax, above = si(p.Vmax, "V"), si(p.AboveVmax, "s")
		}
		if p.HasVmin {
			vmin, below = si(p.Vmin, "V"), si(p.BelowVmin, "s")
		}
		pins = append(pins, []string{p.Name, si(p.Peak, "V"), si(p.TPeak, "s"), vmax, above,
			si(p.Min, "V"), vmin, below, si(p.Energy, "J"), si(p.IPath, "A"), rating(r.LimitOn(p.Name, spec.PeakCurrent))})
	}
	add("pins", "Protected pins (residual pulse)", []string{"pin", "peak", "at", "vmax", "time above",
		"lowest", "vmin", "time below", "energy in", "internal clamp", "ifail"}, pins)

	add("capacitors", "Capacitors", capacitorHead, capacitorRows(r))
	add("ledger", "Energy ledger", ledgerHead, ledgerRows(r))
	add("quiescent", quiescentTitle, quiescentHead, quiescentRows(r))
	add("limits", "Limits", []string{"limit", "measured", "at", "rating", "margin", "margin %", "verdict"}, limitRows(r))
	if v := r.Verify; v != nil && len(v.Quantities) > 0 {
		add("verify", "Error bar: every headline number solved again at accuracy "+spec.FormatFraction(v.Tighter),
			[]string{"number", "value", "tighter", "difference %", "asked", "within"}, verifyRows(v))
	}
	return ts
}

// htmlTableOf is a table of the text report as the page shows it: numbers
// aligned right, a FAIL marked.
func htmlTableOf(id, title string, head []string, rows [][]string) htmlTable {
	t := htmlTable{ID: id, Title: title}
	for _, h := range head {
		t.Head = append(t.Head, htmlCell{Text: h, Class: cellClass(h)})
	}
	for _, row := range rows {
		var cells []htmlCell
		for k, c := range row {
			cl := cellClass(head[k])
			if c == "FAIL" {
				cl = "fail"
			}
			cells = append(cells, htmlCell{Text: c, Class: cl})
		}
		t.Rows = append(t.Rows, cells)
	}
	return t
}

func cellClass(head string) string {
	if textColumns[head] {
		return ""
	}
	return "num"
}

// htmlFigures checks and inlines figures; each gets the id PREFIX-NAME.
func htmlFigures(prefix string, figs []Figure, styles *figureStyles) ([]htmlFigure, error) {
	var out []htmlFigure
	seen := map[string]bool{}
	for _, f := range figs {
		id := prefix + "-" + f.Name
		if seen[id] {
			return nil, fmt.Errorf("report: two figures named %q", id)
		}
		seen[id] = true
		svg, err := inlineSVG(f.SVG, styles)
		if err != nil {
			return nil, fmt.Errorf("report: figure %s: %w", f.Name, err)
		}
		out = append(out, htmlFigure{ID: id, Caption: f.Caption, SVG: svg})
	}
	return out, nil
}

// svgElements are the elements a figure may contain: drawing, nothing that
// runs, links or loads.
var svgElements = map[string]bool{"svg": true, "g": true, "path": true, "text": true, "tspan": true,
	"rect": true, "circle": true, "ellipse": true, "line": true, "polyline": true, "polygon": true,
	"defs": true, "clipPath": true, "title": true, "desc": true}

// figureStyles gathers the drawing styles of a page's figures, so that each
// is written once in the page's style sheet and the elements name it: a
// report of many figures repeats a dozen styles thousands of times.
type figureStyles struct {
	class map[string]string // style → class name
	order []string          // styles by first use
}

// plainStyle is what a style attribute may hold to move into the page's
// style sheet: declarations with nothing that could end the rule or the
// style element.
var plainStyle = regexp.MustCompile(`^[A-Za-z0-9 #:;,.%()_-]+$`)

// name returns the class of a style, giving it one on first use.
func (s *figureStyles) name(style string) string {
	c, ok := s.class[style]
	if !ok {
		c = fmt.Sprintf("sv%d", len(s.order))
		s.class[style] = c
		s.order = append(s.order, style)
	}
	return c
}

// css is the style sheet of the classes given out.
func (s *figureStyles) css() template.CSS {
	var b strings.Builder
	for _, st := range s.order {
		fmt.Fprintf(&b, ".%s { %s }\n", s.class[st], st)
	}
	return template.CSS(b.String())
}

// inlineSVG returns the <svg> element of an SVG document for inlining in
// HTML, after checking that it is well-formed and holds only drawing:
// allowed elements, no event handler, no link, no style element, no url().
// A plain style attribute of an element without a class becomes a class
// of styles.
func inlineSVG(doc []byte, styles *figureStyles) (template.HTML, error) {
	k := bytes.Index(doc, []byte("<svg"))
	if k < 0 {
		return "", fmt.Errorf("no <svg> element")
	}
	body := doc[k:]
	var out bytes.Buffer
	out.Grow(len(body))
	copied := int64(0)
	d := xml.NewDecoder(bytes.NewReader(body))
	for {
		start := d.InputOffset()
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			return "", fmt.Errorf("not well-formed SVG: %w", err)
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if !svgElements[t.Name.Local] {
				return "", fmt.Errorf("element <%s> is not drawing", t.Name.Local)
			}
			style, classed := "", false
			for _, a := range t.Attr {
				name := strings.ToLower(a.Name.Local)
				if strings.HasPrefix(name, "on") || name == "href" || strings.Contains(strings.ToLower(a.Value), "url(") {
					return "", fmt.Errorf("attribute %s of <%s> is not drawing", a.Name.Local, t.Name.Local)
				}
				switch name {
				case "style":
					style = a.Value
				case "class":
					classed = true
				}
			}
			if styles == nil || classed || !plainStyle.MatchString(style) {
				break
			}
			// The plain style's characters need no escaping, so the
			// attribute is written in the tag exactly as its value.
			end := d.InputOffset()
			tag := body[start:end]
			attr := []byte(`style="` + style + `"`)
			if i := bytes.Index(tag, attr); i >= 0 {
				out.Write(body[copied:start])
				out.Write(tag[:i])
				out.WriteString(`class="` + styles.name(style) + `"`)
				out.Write(tag[i+len(attr):])
				copied = end
			}
		case xml.ProcInst, xml.Directive:
			return "", fmt.Errorf("processing instruction or directive inside the SVG")
		}
	}
	out.Write(body[copied:])
	// The markup was checked element by element above; text in it was
	// escaped by the SVG writer.
	return template.HTML(out.String()), nil
}

var htmlTemplate = template.Must(template.New("report").Parse(htmlSource))

// htmlSource is the page. It is written as well-formed XML too (void
// elements closed, no raw < or & in the style), so tests can read it with
// encoding/xml.
const htmlSource = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8"/>
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'"/>
<meta name="viewport" content="width=device-width, initial-scale=1"/>
<meta name="generator" content="{{.Tool}} {{.Version}}"/>
<title>{{if .Title}}{{.Title}} – {{end}}{{.Tool}} report</title>
<style>
:root { color-scheme: light; }
body { font-family: "Liberation Sans", Arimo, Arial, Helvetica, sans-serif; color: #1a1a1a; background: #fff;
  margin: 0 auto; padding: 1rem 1.5rem 3rem; max-width: 72rem; line-height: 1.4; }
h1 { font-size: 1.6rem; margin: 0.5rem 0 0.2rem; }
h2 { font-size: 1.25rem; margin: 2rem 0 0.5rem; border-bottom: 2px solid #ccd; padding-bottom: 0.2rem; }
h3 { font-size: 1rem; margin: 1.2rem 0 0.3rem; }
.meta { color: #555; margin: 0 0 0.8rem; }
code, pre { font-family: "Liberation Mono", Cousine, Consolas, monospace; }
.caution { background: #fff6e0; border-left: 5px solid #e69f00; padding: 0.6rem 0.9rem; margin: 0.8rem 0; }
nav ul { list-style: none; padding: 0; margin: 0.3rem 0; display: flex; flex-wrap: wrap; gap: 0.3rem 0.6rem; }
nav a { text-decoration: none; }
table { border-collapse: collapse; margin: 0.3rem 0 0.8rem; font-size: 0.9rem; }
th, td { border: 1px solid #ccd; padding: 0.2rem 0.55rem; text-align: left; vertical-align: top; }
th { background: #eef0f6; font-weight: 600; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
.verdict { font-weight: 700; padding: 0.05rem 0.45rem; border-radius: 0.25rem; }
.pass .verdict, td.pass { color: #0b5e2e; background: #e3f4e8; }
.fail .verdict, td.fail { color: #8a0a1f; background: #fbe4e8; }
.error .verdict, td.error { color: #444; background: #e6e6e6; }
td.fail { font-weight: 700; }
.run { border-top: 1px solid #dde; margin-top: 1.5rem; }
.run h2 { border: 0; }
ul.failures li { color: #8a0a1f; }
.figures { display: grid; grid-template-columns: repeat(auto-fill, minmax(30rem, 1fr)); gap: 1rem; }
figure { margin: 0; border: 1px solid #dde; padding: 0.4rem; background: #fff; }
figure svg { display: block; width: 100%; height: auto; }
figcaption { font-size: 0.85rem; color: #444; margin-top: 0.2rem; }
pre.listing { background: #f6f7fa; border: 1px solid #dde; padding: 0.6rem 0.8rem; overflow-x: auto; font-size: 0.85rem; line-height: 1.35; }
pre.listing .ln { display: inline-block; width: 2.5rem; color: #889; user-select: none; }
footer { margin-top: 2.5rem; }
{{.FigureStyle}}</style>
</head>
<body>
<header id="top">
<h1 id="title">{{if .Title}}{{.Title}}{{else}}{{.Tool}} report{{end}}</h1>
<p class="meta">{{if .Deck}}Deck <code id="deck-path">{{.Deck}}</code>, {{end}}{{.Tool}} {{.Version}}</p>
<p id="caution" class="caution"><strong>Caution.</strong> {{.Caution}}</p>
<nav id="contents"><ul>
{{- if .Runs}}
<li><a href="#summary">Summary</a></li>
{{- end}}
{{- if .Overlays}}
<li><a href="#overlays">{{.OverlaysTitle}}</a></li>
{{- end}}
{{- range .Runs}}
<li><a href="#{{.ID}}">{{.Heading}}</a></li>
{{- end}}
{{- if .Listing}}
<li><a href="#deck">Deck</a></li>
{{- end}}
</ul></nav>
</header>
<main>
{{- if .Runs}}
<section id="summary">
<h2>Summary</h2>
<table id="summary-table">
<thead><tr><th>run</th>{{if .Variants}}<th>variant</th>{{end}}<th>level</th><th>polarity</th><th>verdict</th><th>worst margin</th></tr></thead>
<tbody>
{{- range $i, $r := .Summary}}
<tr class="{{.Class}}"><td><a href="#{{.ID}}">{{.ID}}</a></td>{{if $.Variants}}<td>{{.Variant}}</td>{{end}}<td>{{.Level}}</td><td>{{.Polarity}}</td><td class="{{.Class}}">{{.Verdict}}</td><td>{{.Worst}}</td></tr>
{{- end}}
</tbody>
</table>
<p id="summary-count">{{.Count}}</p>
{{- with .Ranking}}
<h3>{{.Title}}</h3>
{{template "table" .}}
{{- end}}
</section>
{{- end}}
{{- if .Overlays}}
<section id="overlays">
<h2>{{.OverlaysTitle}}</h2>
{{template "figures" .Overlays}}
</section>
{{- end}}
{{- range .Runs}}
<section id="{{.ID}}" class="run {{.Class}}">
<h2>{{.Heading}} <span class="verdict">{{.Verdict}}</span></h2>
{{- if .Error}}
<p class="error">Not solved: {{.Error}}</p>
{{- else}}
<p>{{.Window}}</p>
{{- range .Tables}}
<h3>{{.Title}}</h3>
{{template "table" .}}
{{- end}}
<p id="{{.ID}}-verdict"><strong>Verdict: {{.Verdict}}</strong>{{if .Worst}}; worst margin {{.Worst}}{{end}}</p>
{{- end}}
{{- if .Failures}}
<ul class="failures">
{{- range .Failures}}
<li>{{.}}</li>
{{- end}}
</ul>
{{- end}}
{{- range .Notes}}
<p class="note">Note: {{.}}</p>
{{- end}}
{{- if .Figures}}
{{template "figures" .Figures}}
{{- end}}
</section>
{{- end}}
{{- with .Signal}}
<section id="signal">
<h2>The signal's side</h2>
<pre id="signal-tables" class="listing">{{.Text}}</pre>
{{- if .Figures}}
{{template "figures" .Figures}}
{{- end}}
</section>
{{- end}}
{{- if .Listing}}
<section id="deck">
<h2>Deck</h2>
<pre id="deck-listing" class="listing">
{{- range .Listing}}
<span class="ln">{{.N}}</span>{{.Text}}
{{- end -}}
</pre>
</section>
{{- end}}
</main>
<footer>
<p class="caution">{{.Caution}}</p>
</footer>
</body>
</html>
{{- define "figures"}}
<div class="figures">
{{- range .}}
<figure id="{{.ID}}">{{.SVG}}<figcaption>{{.Caption}}</figcaption></figure>
{{- end}}
</div>
{{- end}}
{{- define "table"}}
<table id="{{.ID}}">
<thead><tr>{{range .Head}}<th{{if .Class}} class="{{.Class}}"{{end}}>{{.Text}}</th>{{end}}</tr></thead>
<tbody>
{{- range .Rows}}
<tr>{{range .}}<td{{if .Class}} class="{{.Class}}"{{end}}>{{.Text}}</td>{{end}}</tr>
{{- end}}
</tbody>
</table>
{{- end}}
`
