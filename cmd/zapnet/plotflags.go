package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/spf13/pflag"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// pictureOptions are --plot and --html of the commands that draw; the zero
// value draws nothing.
type pictureOptions struct {
	plotDir  string // folder for SVG figures, "" for none
	htmlFile string // self-contained HTML report, "" for none
}

// wanted says whether the runs must be recorded (study.Options.Record).
func (o pictureOptions) wanted() bool { return o.plotDir != "" || o.htmlFile != "" }

// pictureFlags hold the flag values until parsing is done.
type pictureFlags struct{ plot, html *string }

// addPictureFlags adds --plot and --html to a command's flag set.
func addPictureFlags(fs *pflag.FlagSet) *pictureFlags {
	return &pictureFlags{
		plot: fs.String("plot", "", "write SVG figures of every run into folder `DIR` (created when missing): strike, nodes, clamps, residual, ledger, and every run compared"),
		html: fs.String("html", "", "write one self-contained HTML report to `FILE`: caution, summary, tables, figures and the deck (opens offline)"),
	}
}

func (f *pictureFlags) options() pictureOptions {
	return pictureOptions{plotDir: *f.plot, htmlFile: *f.html}
}

// writePictures draws the figures of the solved runs and writes the SVG
// files and the HTML report that o asks for, each file whole or not at all.
// Figures of a run are named after the deck and the run
// ("demo_8kV_pos_residual-U1.svg"), figures across runs after the deck
// ("demo_overlay-residual-U1.svg").
func writePictures(o pictureOptions, c *netlist.Circuit, meta study.Meta, runs []study.Run) error {
	if !o.wanted() {
		return nil
	}
	popt := &plots.Options{Title: c.Title}
	perRun := make([][]plots.Figure, len(runs))
	var errs []error
	for i := range runs {
		if runs[i].Err != nil {
			continue // told in the tables; nothing to draw
		}
		figs, err := plots.RunFigures(c, &runs[i], popt)
		if err != nil {
			errs = append(errs, fmt.Errorf("run %s: %w", plots.RunLabel(&runs[i]), err))
			continue
		}
		perRun[i] = figs
	}
	overlays, err := plots.Overlays(c, runs, popt)
	if err != nil {
		errs = append(errs, err)
	}

	if o.plotDir != "" {
		if err := writeSVGs(o.plotDir, meta.Deck, runs, perRun, overlays); err != nil {
			errs = append(errs, fmt.Errorf("--plot: %w", err))
		}
	}
	if o.htmlFile != "" {
		hopt := &report.HTMLOptions{Meta: meta, Source: c.Source, Overlays: reportFigures(overlays)}
		for _, figs := range perRun {
			hopt.RunFigures = append(hopt.RunFigures, reportFigures(figs))
		}
		if hopt.Signal, err = signalSection(c, meta.Deck); err != nil {
			errs = append(errs, fmt.Errorf("--html: the signal's side: %w", err))
		}
		if err := report.WriteFile(o.htmlFile, func(w io.Writer) error { return report.HTML(w, runs, hopt) }); err != nil {
			errs = append(errs, fmt.Errorf("--html: %w", err))
		}
	}
	return errors.Join(errs...)
}

func writeSVGs(dir, deck string, runs []study.Run, perRun [][]plots.Figure, overlays []plots.Figure) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	base := strings.TrimSuffix(filepath.Base(deck), filepath.Ext(deck))
	write := func(name string, svg []byte) error {
		return report.WriteFile(filepath.Join(dir, name+".svg"), func(w io.Writer) error {
			_, err := w.Write(svg)
			return err
		})
	}
	for i, figs := range perRun {
		for _, f := range figs {
			if err := write(base+"_"+runName(&runs[i])+"_"+f.Name, f.SVG); err != nil {
				return err
			}
		}
	}
	for _, f := range overlays {
		if err := write(base+"_"+f.Name, f.SVG); err != nil {
			return err
		}
	}
	return nil
}

func reportFigures(fs []plots.Figure) []report.Figure {
	out := make([]report.Figure, 0, len(fs))
	for _, f := range fs {
		out = append(out, report.Figure{Name: f.Name, Caption: f.Caption, SVG: f.SVG})
	}
	return out
}

// writeMarginPictures writes the figure of a margin search (plots.MarginCurve)
// as o asks: "DECK_margin.svg" in the --plot folder, and an HTML report of
// the figure with the caution and the deck.
func writeMarginPictures(o pictureOptions, c *netlist.Circuit, meta study.Meta, fig plots.Figure) error {
	return writeStudyPictures(o, c, meta, "Margin against level", []plots.Figure{fig})
}

// writeStudyPictures writes the figures of a what-if study that has no
// recorded runs (margin, sensitivity, spread) as o asks: each figure as
// "DECK_NAME.svg" in the --plot folder, and one HTML report with the
// caution, the figures under the heading kind, and the deck.
func writeStudyPictures(o pictureOptions, c *netlist.Circuit, meta study.Meta, kind string, figs []plots.Figure) error {
	var errs []error
	if o.plotDir != "" {
		if err := writeSVGs(o.plotDir, meta.Deck, nil, nil, figs); err != nil {
			errs = append(errs, fmt.Errorf("--plot: %w", err))
		}
	}
	if o.htmlFile != "" {
		hopt := &report.HTMLOptions{Meta: meta, Source: c.Source, Overlays: reportFigures(figs), OverlaysTitle: kind}
		if err := report.WriteFile(o.htmlFile, func(w io.Writer) error { return report.HTML(w, nil, hopt) }); err != nil {
			errs = append(errs, fmt.Errorf("--html: %w", err))
		}
	}
	return errors.Join(errs...)
}
