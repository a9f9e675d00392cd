package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/pflag"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/mna/study/signal"
	"zapnet/netlist"
)

// acOptions are the settings of `zapnet ac`; acStudy takes them so that
// tests can call it without flags.
type acOptions struct {
	deck       string
	analysis   signal.Options
	json       string // file, "-" for stdout, "" for none
	csv        string // file, "-" for stdout, "" for none
	touchstone string // file, "" for none
	pictures   pictureOptions
}

const acExample = `  zapnet ac testdata/usb-fs-port.zap
  zapnet ac testdata/rail-bead.zap --from 1k --to 100M
  zapnet ac testdata/usb-fs-port.zap --interface usb2-fs --touchstone line.s2p --html line.html

The signal's side of the deck: what the protection does to the line it
protects, around the DC operating point (strike off, supplies on). The
strike's node is driven by an ideal source; for every watched node and
protected pin it prints the gain and phase, the impedance seen at the
strike's node and each bead's and capacitor's own, the largest peaking
above the low-frequency gain with its Q (over 3 dB, or the node's
peaking=, it also finds the esr, rdc or series r that brings it under),
and the capacitance each node sees at 1 MHz, element by element (cmax=).
With ports: two ports make a two-port (return and insertion loss,
--touchstone), and a step from the first port is solved in the transient
engine, its 10–90 % rise measured at the other ports and at every node
with rise=. --interface applies an interface's budgets (README).
Exit status: 0 every limit kept, 1 a limit exceeded, 2 unusable input or
a failed solve.`

func runAC(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("ac",
		"ac DECK [--from F] [--to F] [--points-per-decade N] [--interface NAME] [--step-level V] [--step-rise TIME] [--json FILE] [--csv FILE] [--touchstone FILE] [--plot DIR] [--html FILE]",
		acExample, stderr)
	flags := addACFlags(fs)
	if err := fs.Parse(args); err != nil {
		return err
	}
	deck, err := oneDeck(fs, "ac")
	if err != nil {
		return err
	}
	opt, err := flags.options(deck)
	if err != nil {
		return err
	}
	return acStudy(opt, stdout, stderr)
}

// acFlags hold the flag values of `zapnet ac` until parsing is done.
type acFlags struct {
	from, to, stepLevel, stepRise, iface *string
	ppd                                  *int
	noDamping                            *bool
	json, csv, touchstone                *string
	pictures                             *pictureFlags
}

func addACFlags(fs *pflag.FlagSet) *acFlags {
	f := &acFlags{}
	f.from = fs.String("from", "10k", "lowest frequency of the sweep, e.g. 10k or 10kHz")
	f.to = fs.String("to", "6G", "highest frequency of the sweep, e.g. 6G")
	f.ppd = fs.Int("points-per-decade", signal.DefaultPerDecade, "frequencies a decade, on a grid aligned to the decades")
	f.iface = fs.String("interface", "", "apply an interface's capacitance and rise-time budgets: "+strings.Join(signal.BudgetNames(), ", "))
	f.stepLevel = fs.String("step-level", "1", "the edge check's step, its open-circuit amplitude in volts (junction capacitance depends on the swing)")
	f.stepRise = fs.String("step-rise", "1p", "the edge check's step, its linear ramp from 0 to 100 %")
	f.noDamping = fs.Bool("no-damping", false, "skip the search for damping values")
	f.json = fs.String("json", "", "write the results as JSON to `FILE` (- for stdout, the tables then go to stderr)")
	f.csv = fs.String("csv", "", "write the sweep as CSV to `FILE` (- for stdout, the tables then go to stderr): gain and phase of every node, impedances, S-parameters")
	f.touchstone = fs.String("touchstone", "", "write the two-port's S-parameters as a Touchstone v1 file (.s2p) to `FILE`; needs two ports of one z0")
	f.pictures = addPictureFlags(fs)
	fs.Lookup("plot").Usage = "write SVG figures into folder `DIR` (created when missing): Bode gain and phase, impedances, S-parameters"
	fs.Lookup("html").Usage = "write one self-contained HTML report to `FILE`: caution, the tables, the figures and the deck (opens offline)"
	return f
}

// options reads the values of the flags into the settings of the analysis
// of deck, reporting every unusable one at once.
func (f *acFlags) options(deck string) (acOptions, error) {
	opt := acOptions{deck: deck, json: *f.json, csv: *f.csv, touchstone: *f.touchstone, pictures: f.pictures.options()}
	a := &opt.analysis
	a.PerDecade, a.NoDamping = *f.ppd, *f.noDamping
	var errs []error
	for _, v := range []struct {
		name, text string
		unit       spec.Unit
		rule       spec.Rule
		dst        *float64
	}{
		{"--from", *f.from, spec.Hertz, spec.Positive, &a.From},
		{"--to", *f.to, spec.Hertz, spec.Positive, &a.To},
		{"--step-level", *f.stepLevel, spec.Volt, spec.Any, &a.StepLevel},
		{"--step-rise", *f.stepRise, spec.Second, spec.Positive, &a.StepRise},
	} {
		x, err := netlist.ParseValue(v.name, v.text, v.unit, v.rule)
		if err != nil {
			errs = append(errs, fmt.Errorf("%s: %w", v.name, err))
			continue
		}
		*v.dst = x
	}
	if *f.ppd < 1 || *f.ppd > 1000 {
		errs = append(errs, fmt.Errorf("--points-per-decade: want 1 to 1000, have %d", *f.ppd))
	}
	if a.From > 0 && a.To > 0 && !(a.To > a.From) {
		errs = append(errs, fmt.Errorf("--to (%s) must be above --from (%s)", *f.to, *f.from))
	}
	if a.StepLevel == 0 && *f.stepLevel != "" {
		errs = append(errs, errors.New("--step-level: a step of 0 V moves nothing"))
	}
	if *f.iface != "" {
		b, ok := signal.LookupBudget(*f.iface)
		if !ok {
			errs = append(errs, fmt.Errorf("--interface: unknown interface %q (known: %s)", *f.iface, strings.Join(signal.BudgetNames(), ", ")))
		}
		a.Interface = &b
	}
	if len(errs) > 0 {
		return opt, fmt.Errorf("ac: %w", errors.Join(errs...))
	}
	return opt, nil
}

// acStudy reads the deck, analyses its signal side, prints the tables and
// writes the files asked for. It returns errVerdictFail when a limit is
// exceeded.
func acStudy(opt acOptions, stdout, stderr io.Writer) error {
	c, err := loadDeck(opt.deck, stderr)
	if err != nil {
		return err
	}
	out := deckOutputs(c, opt.json, opt.pictures)
	out.file("--csv", opt.csv)
	out.named("--touchstone", opt.touchstone)
	if err := out.err(); err != nil {
		return err
	}
	res, err := analyseSignal(c, &opt.analysis)
	if err != nil {
		return fmt.Errorf("%s: %w", opt.deck, err)
	}
	meta := deckMeta(opt.deck, c)
	var text bytes.Buffer
	if err := report.ACTables(&text, res, &report.TableOptions{Title: c.Title, Deck: opt.deck}); err != nil {
		return err
	}
	tables := tablesOut(opt.json, stdout, stderr)
	if opt.csv == "-" {
		tables = stderr // standard output holds the CSV alone
	}
	if _, err := tables.Write(text.Bytes()); err != nil {
		return err
	}
	var errs []error
	if opt.json != "" {
		if err := writeOutput(opt.json, stdout, signal.Document{Meta: meta, Result: res}); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	if opt.csv != "" {
		if err := writeStream(opt.csv, stdout, func(w io.Writer) error { return report.ACCSV(w, res) }); err != nil {
			errs = append(errs, fmt.Errorf("--csv: %w", err))
		}
	}
	if opt.touchstone != "" {
		if err := writeTouchstone(opt.touchstone, opt.deck, res); err != nil {
			errs = append(errs, fmt.Errorf("--touchstone: %w", err))
		}
	}
	if opt.pictures.wanted() {
		if err := writeSignalPictures(opt.pictures, c, meta, res, text.String()); err != nil {
			errs = append(errs, err)
		}
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	if res.Exceeded() {
		return errVerdictFail
	}
	return nil
}

// analyseSignal is the deck's request analysed with opt.
func analyseSignal(c *netlist.Circuit, opt *signal.Options) (*signal.Result, error) {
	req, err := signal.FromCircuit(c)
	if err != nil {
		return nil, err
	}
	return signal.Analyse(c, req, opt)
}

// writeTouchstone writes the two-port of res, which needs two ports of one
// impedance (version 1 has a single reference).
func writeTouchstone(path, deck string, res *signal.Result) error {
	tp := res.TwoPort
	if tp == nil {
		return errors.New("the deck needs exactly two ports (port NAME NODE REF [z0=50]) for a two-port")
	}
	if tp.Z0[0] != tp.Z0[1] {
		return fmt.Errorf("a Touchstone v1 file has one reference impedance; ports %s (%s) and %s (%s) differ",
			tp.Ports[0], spec.FormatSI(tp.Z0[0], spec.Ohm), tp.Ports[1], spec.FormatSI(tp.Z0[1], spec.Ohm))
	}
	comments := []string{
		fmt.Sprintf("zapnet %s: small-signal two-port of %s", Version, deck),
		fmt.Sprintf("port 1 = %s, port 2 = %s, reference %s; strike off, supplies on", tp.Ports[0], tp.Ports[1], spec.FormatSI(tp.Z0[0], spec.Ohm)),
	}
	return report.WriteFile(path, func(w io.Writer) error { return report.Touchstone(w, tp.Freq, tp.S, tp.Z0[0], comments) })
}

// signalSection is the signal side of a deck that asks for it (a port, or
// a watch or pin with peaking=, cmax= or rise=) for the HTML report of its
// strike runs, analysed with the defaults of zapnet ac; nil for a deck that
// does not ask.
func signalSection(c *netlist.Circuit, deck string) (*report.SignalSection, error) {
	asks := false
	for _, w := range c.Watches {
		asks = asks || w.Peaking > 0 || w.CMax > 0 || w.Rise > 0
	}
	for _, e := range c.Elements {
		asks = asks || e.Kind.Role == spec.Port
		if e.Kind.Role == spec.ProtectedPin {
			for _, k := range []string{"peaking", "cmax", "rise"} {
				asks = asks || e.Values.Has(k)
			}
		}
	}
	if !asks {
		return nil, nil
	}
	res, err := analyseSignal(c, nil)
	if err != nil {
		return nil, err
	}
	var text bytes.Buffer
	if err := report.ACTables(&text, res, &report.TableOptions{Title: c.Title, Deck: deck}); err != nil {
		return nil, err
	}
	figs, err := plots.ACFigures(c.Title, res, nil)
	if err != nil {
		return nil, err
	}
	return &report.SignalSection{Text: text.String(), Figures: reportFigures(figs)}, nil
}

// writeSignalPictures writes the signal side's figures into the --plot
// folder (DECK_NAME.svg) and an HTML report with its tables and figures.
func writeSignalPictures(o pictureOptions, c *netlist.Circuit, meta study.Meta, res *signal.Result, text string) error {
	figs, err := plots.ACFigures(c.Title, res, nil)
	if err != nil {
		return err
	}
	var errs []error
	if o.plotDir != "" {
		if err := writeSVGs(o.plotDir, meta.Deck, nil, nil, figs); err != nil {
			errs = append(errs, fmt.Errorf("--plot: %w", err))
		}
	}
	if o.htmlFile != "" {
		hopt := &report.HTMLOptions{Meta: meta, Source: c.Source,
			Signal: &report.SignalSection{Text: text, Figures: reportFigures(figs)}}
		if err := report.WriteFile(o.htmlFile, func(w io.Writer) error { return report.HTML(w, nil, hopt) }); err != nil {
			errs = append(errs, fmt.Errorf("--html: %w", err))
		}
	}
	return errors.Join(errs...)
}
