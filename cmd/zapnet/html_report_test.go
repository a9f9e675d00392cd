package main

import (
	"bytes"
	"context"
	"encoding/xml"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// node is an element of a parsed page.
type node struct {
	name     string
	attr     map[string]string
	children []*node
	text     strings.Builder // all text inside, descendants included
}

// parsePage reads the report as XML: the page is written well-formed, so a
// strict parser doubles as a check that every element is closed.
func parsePage(t *testing.T, page []byte) *node {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(page))
	root := &node{name: "#document"}
	stack := []*node{root}
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("the page is not well-formed: %v", err)
		}
		switch tk := tok.(type) {
		case xml.StartElement:
			n := &node{name: tk.Name.Local, attr: map[string]string{}}
			for _, a := range tk.Attr {
				n.attr[a.Name.Local] = a.Value
			}
			top := stack[len(stack)-1]
			top.children = append(top.children, n)
			stack = append(stack, n)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			for _, n := range stack {
				n.text.Write(tk)
			}
		}
	}
	if len(stack) != 1 {
		t.Fatalf("%d elements left open", len(stack)-1)
	}
	return root
}

func (n *node) walk(f func(*node)) {
	f(n)
	for _, c := range n.children {
		c.walk(f)
	}
}

func (n *node) find(id string) *node {
	var hit *node
	n.walk(func(m *node) {
		if hit == nil && m.attr["id"] == id {
			hit = m
		}
	})
	return hit
}

func (n *node) all(name string) []*node {
	var out []*node
	n.walk(func(m *node) {
		if m.name == name {
			out = append(out, m)
		}
	})
	return out
}

// outline is the page's structure: every element with an id in document
// order, each table's rows by their word columns (names, levels, verdicts;
// numbers change with the models and are left to the text golden tests), and
// for each figure the names in its legend.
func outline(root *node) string {
	var b strings.Builder
	root.walk(func(n *node) {
		id := n.attr["id"]
		if id == "" {
			return
		}
		fmt.Fprintf(&b, "%s#%s\n", n.name, id)
		switch n.name {
		case "table":
			head := n.all("th")
			for _, tr := range n.all("tr")[1:] {
				var cells []string
				for k, td := range tr.all("td") {
					if k < len(head) && (head[k].attr["class"] == "num" || head[k].text.String() == "run") {
						continue
					}
					if k < len(head) && head[k].text.String() == "worst margin" {
						continue
					}
					cells = append(cells, td.text.String())
				}
				fmt.Fprintf(&b, "  row: %s\n", strings.Join(cells, " | "))
			}
		case "figure":
			svgs := n.all("svg")
			fmt.Fprintf(&b, "  svg: %d\n", len(svgs))
		}
	})
	return b.String()
}

// demoReport solves a deck and renders its full report with figures.
func demoReport(t *testing.T, c *netlist.Circuit, opt *study.Options) ([]byte, []study.Run) {
	t.Helper()
	if opt == nil {
		opt = &study.Options{}
	}
	opt.Record = true
	jobs, err := study.Jobs(c, opt)
	if err != nil {
		t.Fatal(err)
	}
	runs, err := study.Execute(context.Background(), c, jobs, opt, nil)
	if err != nil {
		t.Fatal(err)
	}
	popt := &plots.Options{Title: c.Title}
	hopt := &report.HTMLOptions{Meta: study.Meta{Tool: "zapnet", Version: "test", Deck: c.File, Title: c.Title}, Source: c.Source}
	for i := range runs {
		figs, err := plots.RunFigures(c, &runs[i], popt)
		if err != nil {
			t.Fatal(err)
		}
		hopt.RunFigures = append(hopt.RunFigures, reportFigures(figs))
	}
	ov, err := plots.Overlays(c, runs, popt)
	if err != nil {
		t.Fatal(err)
	}
	hopt.Overlays = reportFigures(ov)
	var buf bytes.Buffer
	if err := report.HTML(&buf, runs, hopt); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes(), runs
}

// The demo's report has the summary of its eight runs (testdata/demo-weak.zap:
// levels 2k,4k,6k,8k, polarity both), each run's tables and five figures,
// the overlays and the deck's listing; the golden file keeps its structure.
func TestHTMLDemoStructure(t *testing.T) {
	c, err := netlist.ParseFile("../../testdata/demo-weak.zap")
	if err != nil {
		t.Fatal(err)
	}
	page, runs := demoReport(t, c, nil)
	root := parsePage(t, page)
	golden(t, "html-demo.outline", []byte(outline(root)))

	if n := len(root.find("summary-table").all("tr")) - 1; n != len(runs) || n != 8 {
		t.Errorf("summary has %d rows for %d runs, want 8", n, len(runs))
	}
	for i := range runs {
		for _, f := range []string{"strike", "nodes", "clamps", "residual-U1", "ledger"} {
			fig := root.find(fmt.Sprintf("run-%d-fig-%s", i+1, f))
			if fig == nil || len(fig.all("path")) < 5 || len(fig.all("svg")) != 1 {
				t.Errorf("run %d: figure %s missing or empty", i+1, f)
			}
		}
	}
	if got := root.find("caution").text.String(); !strings.Contains(got, report.Caution) {
		t.Errorf("caution %q", got)
	}
	listing := root.find("deck-listing")
	if listing == nil || !strings.Contains(listing.text.String(), `title "Front-panel probe input, contact discharge"`) {
		t.Error("the deck listing does not show the deck as written")
	}
	selfContained(t, root, page)
}

// selfContained checks that the page needs nothing outside itself and can
// run nothing: no script, no external reference of any kind.
func selfContained(t *testing.T, root *node, page []byte) {
	t.Helper()
	root.walk(func(n *node) {
		switch n.name {
		case "script", "link", "img", "iframe", "object", "embed", "base", "form", "image", "use", "foreignObject":
			t.Errorf("element <%s> in the page", n.name)
		}
		for k, v := range n.attr {
			if k == "src" || k == "href" && !strings.HasPrefix(v, "#") || strings.HasPrefix(k, "on") {
				t.Errorf("<%s %s=%q> in the page", n.name, k, v)
			}
		}
	})
	if bytes.Contains(page, []byte("url(")) || bytes.Contains(page, []byte("@import")) {
		t.Error("the style fetches something")
	}
	csp := false
	for _, m := range root.all("meta") {
		if m.attr["http-equiv"] == "Content-Security-Policy" && strings.Contains(m.attr["content"], "default-src 'none'") {
			csp = true
		}
	}
	if !csp {
		t.Error("no Content Security Policy forbidding script and fetches")
	}
}

// hostileDeck has markup, ampersands and quotes in its title, comments and
// include-free text; all of it must come out as text.
const hostileDeck = `# <script>alert("comment")</script> & "quotes" 'single' ]]>
title "</title><script>alert(1)</script> & <b>bold</b> \"q\" 'a'"
part p1 clamp vbr=6.6V rdyn=0.4ohm cj=6p polarity=bi ipp=10A   # <img src=x onerror=alert(2)>
strike zap tip gnd waveform=iec61000-4-2 level=2k polarity=pos
inductor L1 tip n1 1n   # </pre><h1>not a heading</h1>
clamp D1 n1 gnd part=p1
pin U1 n1 gnd cin=5p vmax=12V
`

// A deck cannot put markup or script into its report: the title, the
// comments and every name arrive as the same text in the page.
func TestHTMLHostileDeck(t *testing.T) {
	c, err := netlist.Parse("hostile<&>.zap", []byte(hostileDeck))
	if err != nil {
		t.Fatal(err)
	}
	page, _ := demoReport(t, c, nil)
	root := parsePage(t, page)
	selfContained(t, root, page)
	for _, bad := range []string{"script", "b", "img"} {
		if n := len(root.all(bad)); n > 0 {
			t.Errorf("%d <%s> elements: the deck injected markup", n, bad)
		}
	}
	if got := root.find("title").text.String(); got != c.Title {
		t.Errorf("heading %q, want the title as text %q", got, c.Title)
	}
	if len(root.all("h1")) != 1 {
		t.Errorf("%d h1 elements, want 1", len(root.all("h1")))
	}
	if got := root.find("deck-path").text.String(); got != "hostile<&>.zap" {
		t.Errorf("deck path %q", got)
	}
	// The listing is the deck, line for line, after its line numbers.
	var lines []string
	for _, ln := range strings.Split(strings.TrimSuffix(hostileDeck, "\n"), "\n") {
		lines = append(lines, ln)
	}
	var got []string
	listing := root.find("deck-listing")
	// The line break right after <pre> belongs to the markup (HTML drops it).
	for _, l := range strings.Split(strings.TrimPrefix(listing.text.String(), "\n"), "\n") {
		k := 0
		for k < len(l) && l[k] >= '0' && l[k] <= '9' {
			k++
		}
		got = append(got, l[k:])
	}
	if strings.Join(got, "\n") != strings.Join(lines, "\n") {
		t.Errorf("listing\n%s\nwant\n%s", strings.Join(got, "\n"), hostileDeck)
	}
	// The <title> of the document is text too.
	heads := root.all("title")
	if len(heads) == 0 || !strings.HasPrefix(heads[0].text.String(), c.Title) {
		t.Errorf("document title %q", heads[0].text.String())
	}
}

// A figure that holds anything but drawing is refused, whoever drew it.
func TestHTMLRefusesActiveSVG(t *testing.T) {
	for _, svg := range []string{
		`<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>`,
		`<svg xmlns="http://www.w3.org/2000/svg"><path d="M0 0" onclick="alert(1)"/></svg>`,
		`<svg xmlns="http://www.w3.org/2000/svg"><a href="https://example.invalid/"><text>x</text></a></svg>`,
		`<svg xmlns="http://www.w3.org/2000/svg"><path style="fill:url(https://example.invalid/x)"/></svg>`,
		`<svg xmlns="http://www.w3.org/2000/svg"><foreignObject><div/></foreignObject></svg>`,
		`<svg><g></svg>`,
		`no svg at all`,
	} {
		err := report.HTML(io.Discard, nil, &report.HTMLOptions{Overlays: []report.Figure{{Name: "x", SVG: []byte(svg)}}})
		if err == nil {
			t.Errorf("accepted %s", svg)
		}
	}
	err := report.HTML(io.Discard, nil, &report.HTMLOptions{Overlays: []report.Figure{
		{Name: "x", SVG: []byte(`<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"><g><path d="M0 0L1 1"/><text>a &lt; b</text></g></svg>`)}}})
	if err != nil {
		t.Errorf("refused a plain drawing: %v", err)
	}
}

// A sweep of three variants at four levels, twelve runs of five figures
// each, makes a page under 600 kB that still holds every figure, and
// ranks the variants as the terminal does (testdata/demo.zap: levels 2k to
// 8k; the sizes are the house's target, common practice for a page mailed
// as it is).
func TestHTMLTwelveRunsSmall(t *testing.T) {
	dir := t.TempDir()
	page := filepath.Join(dir, "r.html")
	out, errs, code := runMain(t, "../../testdata/demo.zap", "--set", "C1.value=100n,220n,1u", "--polarity", "pos", "--html", page)
	if code == exitUnusable {
		t.Fatalf("exit %d\n%s", code, errs)
	}
	b, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	if len(b) >= 600e3 {
		t.Errorf("the page of 12 runs is %d bytes, want under 600 kB", len(b))
	}
	root := parsePage(t, b)
	if n := len(root.find("summary-table").all("tr")) - 1; n != 12 {
		t.Fatalf("%d runs in the summary, want 12", n)
	}
	for i := 1; i <= 12; i++ {
		for _, f := range []string{"strike", "nodes", "clamps", "residual-U1", "ledger"} {
			if fig := root.find(fmt.Sprintf("run-%d-fig-%s", i, f)); fig == nil || len(fig.all("path")) < 3 {
				t.Errorf("run %d: figure %s missing or empty", i, f)
			}
		}
	}
	// The ranking: the same rows as the terminal's table, in its order.
	rank := root.find("variants-ranked")
	if rank == nil {
		t.Fatal("the page has no ranking of the variants")
	}
	rows := rank.all("tr")[1:]
	if len(rows) != 3 {
		t.Fatalf("%d ranked variants, want 3", len(rows))
	}
	at := 0
	for _, r := range rows {
		cells := r.all("td")
		v := cells[1].text.String()
		k := strings.Index(out[at:], v)
		if k < 0 {
			t.Errorf("variant %s is not ranked in this order in the terminal's table", v)
			continue
		}
		at += k
	}
	selfContained(t, root, b)
}
