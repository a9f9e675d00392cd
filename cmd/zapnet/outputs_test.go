package main

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// copyDeck copies the demo deck and its part library into dir, so that a
// test may point outputs at them.
func copyDeck(t *testing.T, dir string) string {
	t.Helper()
	for _, f := range []string{"demo-weak.zap", "parts/clamps.zap", "parts/passives.zap"} {
		b, err := os.ReadFile(filepath.Join("..", "..", "testdata", f))
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, f)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(dir, "demo-weak.zap")
}

// Every output is checked before the first solve: the command exits 2
// with a message naming the path the user gave, prints no run, and leaves
// whatever was at the path as it was. zapnet writes only regular files, and
// never over an input [the house's output rules, README].
func TestOutputsRefusedBeforeSolving(t *testing.T) {
	dir := t.TempDir()
	deck := copyDeck(t, dir)
	lib := filepath.Join(dir, "parts", "clamps.zap")
	link := filepath.Join(dir, "link.json")
	if err := os.Symlink(filepath.Join(dir, "target.json"), link); err != nil {
		t.Fatal(err)
	}
	fifo := filepath.Join(dir, "fifo")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	folder := filepath.Join(dir, "folder")
	if err := os.Mkdir(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	notAFolder := filepath.Join(dir, "plain")
	if err := os.WriteFile(notAFolder, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--json", deck}, "that is an input of this command"},
		{[]string{"--html", lib}, "that is an input of this command"},
		{[]string{"--json", filepath.Join(dir, "r.json"), "--html", filepath.Join(dir, "r.json")}, "--json writes that file too"},
		{[]string{"--json", link}, "is a symbolic link"},
		{[]string{"--json", fifo}, "is not a regular file"},
		{[]string{"--json", os.DevNull}, "is not a regular file"},
		{[]string{"--json", folder}, "is a folder"},
		{[]string{"--html", filepath.Join(dir, "missing", "r.html")}, "does not exist"},
		{[]string{"--plot", filepath.Join(notAFolder, "figs")}, "--plot"},
		{[]string{"--csv", filepath.Join(dir, "one.csv")}, "8 runs need a folder"},
	} {
		args := append([]string{"run", deck}, c.args...)
		out, errs, code := zapnet(t, args...)
		if code != exitUnusable || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errs, c.want)
		}
		if strings.Contains(out+errs, "Run 1/") {
			t.Errorf("%v: a run was solved before the output was refused", c.args)
		}
	}
	if b, _ := os.ReadFile(deck); !strings.Contains(string(b), "strike") {
		t.Error("the deck was overwritten")
	}
	if fi, err := os.Lstat(link); err != nil || fi.Mode()&os.ModeSymlink == 0 {
		t.Error("the symbolic link was replaced")
	}
	if fi, err := os.Lstat(fifo); err != nil || fi.Mode()&os.ModeNamedPipe == 0 {
		t.Error("the pipe was replaced")
	}
	// The what-if commands and merge check theirs too.
	for _, args := range [][]string{
		{"margin", deck, "--json", deck},
		{"sensitivity", deck, "--html", folder},
		{"spread", deck, "--json", link},
		{"waveform", "hbm", "--csv", fifo},
		{"merge", deck, "-o", deck},
	} {
		if _, errs, code := zapnet(t, args...); code != exitUnusable {
			t.Errorf("%v: exit %d, %s", args, code, errs)
		}
	}
}

// zapnet ac checks its outputs as the strike commands do: never over the
// deck or a file it includes, one file per output, one output on standard
// output [the house's output rules, README].
func TestACOutputsRefusedBeforeAnalysing(t *testing.T) {
	dir := t.TempDir()
	deck := filepath.Join(dir, "usb-fs-port.zap")
	src, err := os.ReadFile(usbDeck)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(deck, src, 0o644); err != nil {
		t.Fatal(err)
	}
	s2p := filepath.Join(dir, "line.s2p")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--json", deck}, "that is an input of this command"},
		{[]string{"--touchstone", deck}, "that is an input of this command"},
		{[]string{"--csv", s2p, "--touchstone", s2p}, "--csv writes that file too"},
		{[]string{"--json", "-", "--csv", "-"}, "both would write to standard output"},
	} {
		args := append([]string{"ac", deck}, c.args...)
		out, errs, code := zapnet(t, args...)
		if code != exitUnusable || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errs, c.want)
		}
		if strings.Contains(out+errs, "Transfer from") {
			t.Errorf("%v: the deck was analysed before the output was refused", c.args)
		}
	}
	if b, _ := os.ReadFile(deck); string(b) != string(src) {
		t.Error("the deck was overwritten")
	}
	if _, err := os.Stat(s2p); err == nil {
		t.Error("a refused output was written")
	}
}

// failingWriter stands for a standard output that cannot be written (a full
// disk, a closed pipe).
type failingWriter struct{}

func (failingWriter) Write([]byte) (int, error) { return 0, errors.New("no space left on device") }

// Results that cannot reach standard output are an error, not a success.
func TestFailedStandardOutputExits2(t *testing.T) {
	var e strings.Builder
	code := Main([]string{"run", demoDeck, "--level", "2k", "--polarity", "pos", "--json", "-"}, failingWriter{}, &e)
	if code != exitUnusable || !strings.Contains(e.String(), "no space left on device") {
		t.Errorf("exit %d, stderr %q", code, e.String())
	}
}

// zapnet waveform never writes over the file a pwl waveform reads, and
// gives --csv and --json a file each [the house's output rules, README].
func TestWaveformOutputsRefused(t *testing.T) {
	dir := t.TempDir()
	pwl := filepath.Join(dir, "measured.csv")
	src := []byte("time [s],current [A]\n0,0\n1e-9,1\n2e-9,0\n")
	if err := os.WriteFile(pwl, src, 0o644); err != nil {
		t.Fatal(err)
	}
	both := filepath.Join(dir, "hbm.out")
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"pwl", "--set", "file=" + pwl, "--csv", pwl}, "that is an input of this command"},
		{[]string{"pwl", "--set", "file=" + pwl, "--json", pwl}, "that is an input of this command"},
		{[]string{"hbm", "--csv", both, "--json", both}, "--csv writes that file too"},
	} {
		args := append([]string{"waveform"}, c.args...)
		if _, errs, code := zapnet(t, args...); code != exitUnusable || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errs, c.want)
		}
	}
	if b, _ := os.ReadFile(pwl); string(b) != string(src) {
		t.Error("the waveform's file was overwritten")
	}
	if _, err := os.Stat(both); err == nil {
		t.Error("a refused output was written")
	}
}

// "-" is standard output only for the outputs that can stream there
// (--json, ac's --csv, merge's -o); for a file output it is refused
// before any solve rather than written as a file called "-" [the house's
// output rules, README].
func TestFileOutputsRefuseStandardOutput(t *testing.T) {
	for _, args := range [][]string{
		{"run", demoDeck, "--level", "2k", "--polarity", "pos", "--csv", "-"},
		{"run", demoDeck, "--level", "2k", "--polarity", "pos", "--html", "-"},
		{"margin", demoDeck, "--html", "-"},
		{"waveform", "hbm", "--csv", "-"},
		{"ac", usbDeck, "--touchstone", "-"},
		{"fit", "pin", "--tlp", "../../testdata/fit/pinA-tlp.csv", "--table", "-"},
	} {
		out, errs, code := zapnet(t, args...)
		if code != exitUnusable || !strings.Contains(errs, "writes a file, not standard output") {
			t.Errorf("%v: exit %d, stderr %q; want 2 and the file asked for", args, code, errs)
		}
		if strings.Contains(out, "Run 1/") || strings.Contains(out, "Transfer from") {
			t.Errorf("%v: solved before the output was refused", args)
		}
	}
	if _, err := os.Stat("-"); err == nil {
		os.Remove("-")
		t.Error("a file called - was written")
	}
}
