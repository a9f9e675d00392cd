package report

import (
	"strings"
	"testing"
)

// A figure's plain styles move into the page's style sheet as classes,
// one per style, shared across figures; a style that could end the rule
// or the style element, and an element that has a class, keep theirs
// [pub: CSS 2.1, 6.4.3: a class rule styles what the attribute styled].
func TestFigureStylesBecomeClasses(t *testing.T) {
	styles := &figureStyles{class: map[string]string{}}
	a, err := inlineSVG([]byte(`<?xml version="1.0"?><svg><path d="M0,0H1" style="fill:none;stroke:#000000" />`+
		`<text x="1" style="font-size:10px">a &lt; b</text></svg>`), styles)
	if err != nil {
		t.Fatal(err)
	}
	b, err := inlineSVG([]byte(`<svg><path d="M0,0V1" style="fill:none;stroke:#000000" />`+
		`<path d="M0,0V2" style="fill:none;stroke:#000000}" />`+
		`<path d="M0,0V3" class="own" style="fill:red" /></svg>`), styles)
	if err != nil {
		t.Fatal(err)
	}
	wantA := `<svg><path d="M0,0H1" class="sv0" /><text x="1" class="sv1">a &lt; b</text></svg>`
	wantB := `<svg><path d="M0,0V1" class="sv0" /><path d="M0,0V2" style="fill:none;stroke:#000000}" /><path d="M0,0V3" class="own" style="fill:red" /></svg>`
	if string(a) != wantA {
		t.Errorf("first figure\n%s\nwant\n%s", a, wantA)
	}
	if string(b) != wantB {
		t.Errorf("second figure\n%s\nwant\n%s", b, wantB)
	}
	if css := string(styles.css()); css != ".sv0 { fill:none;stroke:#000000 }\n.sv1 { font-size:10px }\n" || strings.Contains(css, "red") {
		t.Errorf("style sheet %q", css)
	}
}
