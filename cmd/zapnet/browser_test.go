package main

// The HTML report is checked in a real browser, headless Chromium driven
// over the DevTools protocol with chromedp. A browser is the only honest
// judge of "the page loads with no console errors": a Content Security
// Policy violation, a failed fetch or a script error are reported on the
// browser's console and log, which the protocol streams to the test, and the
// page's layout (are the figures really drawn, with a size?) exists only
// there. chromedp is a maintained pure-Go client of that protocol, talking to
// the browser over a pipe, with no driver binary to install.

import (
	"bytes"
	"context"
	"fmt"
	"image/png"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	cdplog "github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"

	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// chromiumPath is where Debian's chromium package puts the browser.
const chromiumPath = "/usr/bin/chromium"

// needChromium skips the test without a browser, except in CI, where .ci/run
// installs one and a missing browser is a failure.
func needChromium(t *testing.T) {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err == nil {
		return
	}
	if ci := os.Getenv("CI"); ci != "" && ci != "false" {
		t.Fatalf("CI=%s but %s is missing: .ci/run must install Debian's chromium before the tests", ci, chromiumPath)
	}
	t.Skipf("skipping the browser test: %s is not installed (apt-get install chromium); CI runs it", chromiumPath)
}

// browserLog collects what the page told the browser's console and log, and
// every request it made.
type browserLog struct {
	mu       sync.Mutex
	problems []string // console errors and warnings, exceptions, log errors
	requests []string // URLs of every request the page made
}

func (b *browserLog) listen(ev any) {
	b.mu.Lock()
	defer b.mu.Unlock()
	switch e := ev.(type) {
	case *runtime.EventConsoleAPICalled:
		if e.Type == runtime.ConsoleAPICalledTypeError || e.Type == runtime.ConsoleAPICalledTypeWarning || e.Type == runtime.ConsoleAPICalledTypeAssert {
			var parts []string
			for _, a := range e.Args {
				parts = append(parts, strings.Trim(string(a.Value), `"`)+a.Description)
			}
			b.problems = append(b.problems, fmt.Sprintf("console.%s: %s", e.Type, strings.Join(parts, " ")))
		}
	case *runtime.EventExceptionThrown:
		d := e.ExceptionDetails
		text := d.Text
		if d.Exception != nil {
			text += " " + d.Exception.Description
		}
		b.problems = append(b.problems, "exception: "+text)
	case *cdplog.EventEntryAdded:
		if e.Entry.Level == cdplog.EntryLevelError || e.Entry.Level == cdplog.EntryLevelWarning {
			b.problems = append(b.problems, fmt.Sprintf("log %s (%s): %s %s", e.Entry.Level, e.Entry.Source, e.Entry.Text, e.Entry.URL))
		}
	case *network.EventRequestWillBeSent:
		b.requests = append(b.requests, e.Request.URL)
	}
}

func (b *browserLog) snapshot() (problems, requests []string) {
	b.mu.Lock()
	defer b.mu.Unlock()
	return append([]string(nil), b.problems...), append([]string(nil), b.requests...)
}

// browse starts a fresh headless Chromium, with the launch flags of this
// workplace and a profile of its own, and returns a tab whose console, log
// and requests go to the returned log.
func browse(t *testing.T) (context.Context, *browserLog) {
	t.Helper()
	needChromium(t)
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath),
		chromedp.Flag("headless", true),
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.Flag("disable-quic", true),
		chromedp.NoFirstRun,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("hide-scrollbars", true),
		chromedp.UserDataDir(t.TempDir()),
		chromedp.WindowSize(1280, 1600),
	}
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	bl := &browserLog{}
	ctx, cancelCtx := chromedp.NewContext(actx, chromedp.WithListener(bl.listen))
	t.Cleanup(func() { cancelCtx(); cancelAlloc() })
	// The first action starts the browser; it must run on the context that
	// lives as long as the browser, without a deadline of its own.
	start := chromedp.Func(func(ctx context.Context, tg *chromedp.Target) error {
		if _, err := cdp.Call(ctx, tg, network.Enable, network.EnableParams{}); err != nil {
			return err
		}
		_, err := cdp.Call(ctx, tg, cdplog.Enable, cdp.Empty{})
		return err
	})
	if err := chromedp.Do(ctx, start); err != nil {
		t.Fatalf("starting %s: %v", chromiumPath, err)
	}
	return ctx, bl
}

// load opens a page and waits until it has loaded, within a minute.
func load(t *testing.T, ctx context.Context, u string) {
	t.Helper()
	tctx, cancel := context.WithTimeout(ctx, time.Minute)
	defer cancel()
	if err := chromedp.Do(tctx, chromedp.Navigate(u), chromedp.WaitReady(chromedp.CSS("body"))); err != nil {
		t.Fatalf("loading %s: %v", u, err)
	}
}

func fileURL(path string) string {
	abs, err := filepath.Abs(path)
	if err != nil {
		panic(err)
	}
	return (&url.URL{Scheme: "file", Path: abs}).String()
}

// writeReport solves a deck with recorded waveforms and writes its HTML
// report the way `zapnet run --html` does.
func writeReport(t *testing.T, c *netlist.Circuit, path string) []study.Run {
	t.Helper()
	jobs, err := study.Jobs(c, &study.Options{Record: true})
	if err != nil {
		t.Fatal(err)
	}
	runs, err := study.Execute(context.Background(), c, jobs, &study.Options{Record: true}, nil)
	if err != nil {
		t.Fatal(err)
	}
	meta := study.Meta{Tool: "zapnet", Version: Version, Deck: c.File, Title: c.Title}
	if err := writePictures(pictureOptions{htmlFile: path}, c, meta, runs); err != nil {
		t.Fatal(err)
	}
	return runs
}

// pageFacts is what the page itself says about its content after layout.
type pageFacts struct {
	Title        string   `json:"title"`
	Caution      string   `json:"caution"`
	SummaryRows  int      `json:"summaryRows"`
	Figures      int      `json:"figures"`
	EmptyFigures []string `json:"emptyFigures"`
	Scripts      int      `json:"scripts"`
	Injected     bool     `json:"injected"`
	Headings     int      `json:"headings"`
}

const pageFactsJS = `(() => {
  const q = (id) => document.getElementById(id);
  const figs = [...document.querySelectorAll('figure')];
  return {
    title: q('title') ? q('title').textContent : '',
    caution: q('caution') ? q('caution').textContent : '',
    summaryRows: q('summary-table') ? q('summary-table').tBodies[0].rows.length : -1,
    figures: figs.length,
    emptyFigures: figs.filter((f) => {
      const svg = f.querySelector('svg');
      if (!svg) return true;
      const box = svg.getBoundingClientRect();
      return box.width < 200 || box.height < 100 || svg.querySelectorAll('path').length < 5 ||
        svg.querySelectorAll('text').length < 5;
    }).map((f) => f.id),
    scripts: document.scripts.length,
    injected: typeof window.__zapnetInjected !== 'undefined',
    headings: document.querySelectorAll('h1').length,
  };
})()`

// The demo's report loads in Chromium without a console error or a single
// request beyond the file itself, shows the caution, the summary of its 8
// runs (testdata/demo-weak.zap: 4 levels × 2 polarities) and 5 figures per run
// plus 2 overlays, each drawn with a real size; the screenshot is not blank.
func TestReportInBrowser(t *testing.T) {
	ctx, bl := browse(t)

	// The harness first proves it hears a console error: a page that writes
	// one must be caught, or a clean result below would mean nothing.
	load(t, ctx, `data:text/html,<p>probe</p><script>console.error("zapnet-probe")</script>`)
	deadline := time.Now().Add(10 * time.Second)
	for {
		problems, _ := bl.snapshot()
		if strings.Contains(strings.Join(problems, "\n"), "zapnet-probe") {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("the harness did not see a console.error of a probe page; heard %q", problems)
		}
		time.Sleep(50 * time.Millisecond)
	}
	*bl = browserLog{}

	c, err := netlist.ParseFile("../../testdata/demo-weak.zap")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "demo.html")
	runs := writeReport(t, c, path)
	load(t, ctx, fileURL(path))

	facts, err := chromedp.Run(ctx, chromedp.Evaluate[pageFacts](pageFactsJS))
	if err != nil {
		t.Fatal(err)
	}
	if facts.Title != c.Title {
		t.Errorf("heading %q, want %q", facts.Title, c.Title)
	}
	if !strings.Contains(facts.Caution, report.Caution) {
		t.Errorf("caution %q", facts.Caution)
	}
	if facts.SummaryRows != len(runs) || len(runs) != 8 {
		t.Errorf("summary rows %d, runs %d, want 8", facts.SummaryRows, len(runs))
	}
	if want := 5*len(runs) + 2; facts.Figures != want {
		t.Errorf("%d figures, want %d", facts.Figures, want)
	}
	if len(facts.EmptyFigures) > 0 {
		t.Errorf("figures without a drawing or a size: %q", facts.EmptyFigures)
	}
	if facts.Scripts != 0 {
		t.Errorf("%d scripts in the page", facts.Scripts)
	}

	shot, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatal(err)
	}
	checkScreenshot(t, shot)
	if out := os.Getenv("ZAPNET_SCREENSHOT"); out != "" {
		if err := os.WriteFile(out, shot, 0o644); err != nil {
			t.Fatal(err)
		}
		t.Logf("screenshot of the demo report: %s", out)
	}

	if checkBrowserLog(t, bl, path) == 0 {
		t.Error("no request seen at all: the network log is not working")
	}
}

// checkBrowserLog lets late log entries arrive, then fails on every problem
// the browser logged and on every request but the report file itself (the
// report must be self-contained). It returns how many requests it saw.
func checkBrowserLog(t *testing.T, bl *browserLog, path string) int {
	t.Helper()
	time.Sleep(300 * time.Millisecond)
	problems, requests := bl.snapshot()
	for _, p := range problems {
		t.Errorf("browser: %s", p)
	}
	for _, r := range requests {
		if r != fileURL(path) {
			t.Errorf("the report fetched %s: it must be self-contained", r)
		}
	}
	return len(requests)
}

// A deck whose title and comments hold markup and script renders them as
// text in the browser: nothing runs, the policy blocks nothing because
// nothing tried, and the heading reads as the deck wrote it.
func TestHostileReportInBrowser(t *testing.T) {
	ctx, bl := browse(t)
	deck := `# <script>window.__zapnetInjected = 1</script> & "q" 'a'
title "</title><script>window.__zapnetInjected = 2</script><img src=x onerror=\"window.__zapnetInjected=3\"> & <b>b</b>"
strike zap tip gnd waveform=iec61000-4-2 level=2k,4k polarity=pos
inductor L1 tip n1 1n   # </pre><h1 id="evil">x</h1><svg onload="window.__zapnetInjected=4">
clamp D1 n1 gnd vbr=6.6V rdyn=0.4ohm cj=6p polarity=bi ipp=10A
pin U1 n1 gnd cin=5p vmax=12V
`
	c, err := netlist.Parse("hostile.zap", []byte(deck))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "hostile.html")
	writeReport(t, c, path)
	load(t, ctx, fileURL(path))
	facts, err := chromedp.Run(ctx, chromedp.Evaluate[pageFacts](pageFactsJS))
	if err != nil {
		t.Fatal(err)
	}
	if facts.Injected || facts.Scripts != 0 || facts.Headings != 1 {
		t.Errorf("the deck injected markup: %+v", facts)
	}
	if facts.Title != c.Title {
		t.Errorf("heading %q, want the title as text %q", facts.Title, c.Title)
	}
	checkBrowserLog(t, bl, path)
}

// checkScreenshot decodes the PNG and checks that it shows something: a
// blank or one-colour page means the report did not render.
func checkScreenshot(t *testing.T, shot []byte) {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(shot))
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	b := img.Bounds()
	if b.Dx() < 1000 || b.Dy() < 1000 {
		t.Errorf("screenshot is %v", b)
	}
	dark := 0
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r+g+bl < 3*0x8000 {
				dark++
			}
		}
	}
	// Text, tables and axes darken a few percent of a page [practice].
	if frac := float64(dark) / float64(b.Dx()*b.Dy()/4); frac < 0.005 {
		t.Errorf("screenshot is nearly blank: %.4f of it dark", frac)
	}
}
