package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// marginOptions are the settings of `zapnet margin`.
type marginOptions struct {
	deck       string
	polarities []string // nil: the deck's
	max        string   // --max as given; "": twice the deck's highest level
	resolution string   // --resolution as given; "": 100 V for discharges
	json       string   // file, "-" for stdout, "" for none
	workers    int
	verify     bool // --verify: the bracket solved again at a tenth of the accuracy
	sweep      sweepSpec
	pictures   pictureOptions // --plot and --html: the margin against level
}

func runMargin(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("margin",
		"margin DECK [--max LEVEL] [--resolution LEVEL] [--polarity pos|neg|both] [--set E.P=v1,v2] [--shard i/n] [--json FILE] [--plot DIR] [--html FILE] [--verify] [--workers N]",
		`  zapnet margin testdata/demo.zap
  zapnet margin testdata/demo.zap --max 30k --set C1.value=10n,100n,1u
  zapnet margin testdata/demo.zap --plot figs --html margin.html

For every variant and polarity, finds the highest level that still passes:
first a scan of 16 levels up to --max, then bisection to --resolution
(0.1 kV for discharges). The scan also checks that the verdict changes only
once as the level rises; where it passes again above a failure the table
says "monotonic NO" and names the levels.
--plot and --html draw the worst margin at every level solved, one line
per variant and polarity: above 0 % the level passes, below it fails, and
the table's highest pass sits where a line crosses 0 %.
--verify solves the highest pass and the first fail again at a tenth of
the accuracy: where a verdict flips, the failure level is within the
solver's error, and the table says so.
Exit status: 0 when every search completed (failures are what it looks
for), 2 for unusable input or a failed solve.`,
		stderr)
	maxFlag := fs.String("max", "", "top of the searched range in the waveform's unit, e.g. 30k (default: twice the deck's highest level)")
	resFlag := fs.String("resolution", "", "step of the search, e.g. 100 (default: 100 V for discharges)")
	polarity := fs.String("polarity", "", "polarity to search instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the margins as JSON to `FILE` (- for stdout, the table then goes to stderr)")
	workers := fs.Int("workers", 0, "searches run at once (default: every core)")
	verify := fs.Bool("verify", false, "solve the highest pass and the first fail again at a tenth of the accuracy and say whether their verdicts hold")
	sweep := addSweepFlags(fs)
	pictures := addPictureFlags(fs)
	// The shared help of --plot and --html speaks of runs; a margin search
	// draws one figure.
	fs.Lookup("plot").Usage = "write the figure of the worst margin against level to `DIR`/DECK_margin.svg (folder created when missing)"
	fs.Lookup("html").Usage = "write a self-contained HTML report to `FILE`: caution, the margin figure and the deck (opens offline)"
	if err := fs.Parse(args); err != nil {
		return err
	}
	deck, err := oneDeck(fs, "margin")
	if err != nil {
		return err
	}
	opt := marginOptions{deck: deck, json: *jsonPath, workers: *workers, verify: *verify, pictures: pictures.options(),
		max: *maxFlag, resolution: *resFlag}
	var errs []error
	if opt.polarities, err = parsePolarity(*polarity); err != nil {
		errs = append(errs, err)
	}
	if opt.sweep, err = sweep.finish("margin", *workers, errs); err != nil {
		return err
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	return marginStudy(ctx, opt, stdout, stderr)
}

// marginStudy runs the search and writes its table and JSON.
func marginStudy(ctx context.Context, opt marginOptions, stdout, stderr io.Writer) error {
	c, err := loadDeck(opt.deck, stderr)
	if err != nil {
		return err
	}
	if err := deckOutputs(c, opt.json, opt.pictures).err(); err != nil {
		return err
	}
	mopt := &whatif.MarginOptions{Shard: opt.sweep.shard, Verify: opt.verify}
	if mopt.Max, err = deckLevel("--max", opt.max, c); err != nil {
		return err
	}
	if mopt.Resolution, err = deckLevel("--resolution", opt.resolution, c); err != nil {
		return err
	}
	mopt.Study.Polarities = opt.polarities
	mopt.Study.Workers = opt.workers
	if err := setVariants(c, opt.sweep.sets, &mopt.Study); err != nil {
		return err
	}
	res, err := withProgress(stderr, "margin", opt.deck, func(p whatif.Progress) (*whatif.MarginResult, error) {
		mopt.Progress = p
		return whatif.Margins(ctx, c, mopt)
	})
	if err != nil {
		return err
	}
	meta := deckMeta(opt.deck, c)
	err = writeMargins(res, meta, opt.json, stdout, stderr)
	if opt.pictures.wanted() {
		if perr := drawMargins(opt.pictures, c, meta, res); perr != nil {
			err = errors.Join(err, perr)
		}
	}
	return err
}

// drawMargins draws the worst margin against level of every search, one
// series per variant and polarity, from the levels the search solved.
// Points without a finite margin (no limit in the deck, or a limit of
// zero) cannot be placed and are left out.
func drawMargins(o pictureOptions, c *netlist.Circuit, meta study.Meta, res *whatif.MarginResult) error {
	var series []plots.MarginSeries
	for _, m := range res.Margins {
		s := plots.MarginSeries{Name: m.Polarity}
		if len(m.Variant) > 0 {
			s.Name = m.Variant.String() + " " + m.Polarity
		}
		for _, p := range m.Curve {
			if !math.IsInf(p.Percent, 0) && !math.IsNaN(p.Percent) {
				s.Levels = append(s.Levels, p.Level)
				s.Margins = append(s.Margins, p.Percent)
			}
		}
		if len(s.Levels) > 0 {
			series = append(series, s)
		}
	}
	if len(series) == 0 {
		return errors.New("--plot/--html: no level with a finite margin to draw (does the deck set any limit?)")
	}
	fig, err := plots.MarginCurve(c.Title, res.LevelUnit, series, nil)
	if err != nil {
		return err
	}
	return writeMarginPictures(o, c, meta, fig)
}

// writeMargins prints the table and writes the JSON of a margin search
// (also of merged shards), and turns unsolved searches and an interruption
// into the error the exit status comes from.
func writeMargins(res *whatif.MarginResult, meta study.Meta, jsonPath string, stdout, stderr io.Writer) error {
	errs, err := tableThenJSON(jsonPath, stdout, stderr,
		func(w io.Writer) error { return report.MarginTable(w, res, meta.Title, meta.Deck) },
		whatif.MarginDocument{Meta: meta, MarginResult: res})
	if err != nil {
		return err
	}
	for _, m := range res.Margins {
		if m.Error != "" {
			errs = append(errs, fmt.Errorf("%s %s: %s", m.Variant.String(), m.Polarity, m.Error))
		}
	}
	if res.Interrupted {
		errs = append(errs, sweepInterrupted(len(res.Margins), res.Total, res.Shard))
	}
	return errors.Join(errs...)
}
