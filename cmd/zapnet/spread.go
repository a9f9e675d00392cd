package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// spreadOptions are the settings of `zapnet spread`.
type spreadOptions struct {
	deck       string
	levels     string   // --level as given; "": the deck's
	polarities []string // nil: the deck's
	runs       int
	seed       uint64
	json       string
	samples    bool // --samples: every circuit's record in the JSON
	exact      int  // --exact: percentiles exact up to this many circuits
	workers    int
	sweep      sweepSpec
	pictures   pictureOptions // --plot and --html: the histograms
}

func runSpread(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("spread",
		"spread DECK [--runs N] [--seed S] [--level LIST] [--polarity pos|neg|both] [--set E.P=v] [--shard i/n] [--json FILE [--samples]] [--exact N] [--plot DIR] [--html FILE] [--workers N]",
		fmt.Sprintf(`  zapnet spread testdata/signal-connector.zap --runs 2000 --seed 7 --level 8k
  zapnet spread deck.zap --runs 10000 --seed 1 --shard 3/10 --json part3.json
  zapnet spread testdata/signal-connector.zap --runs 500 --level 8k --plot figs --html spread.html

Draws N circuits from the deck's tolerance lines (uniform: ±x %%; normal: x %%
is three standard deviations, truncated there), strikes each at every level
and polarity, and reports the percentiles of each pin's residual peak, each
clamp's energy and current and the worst margin, and the fraction of
circuits that pass everywhere with its Wilson 95 %% interval. Circuit k draws
from a generator seeded by (seed, k): the same seed gives the same result on
any number of cores and shards. The percentiles are exact up to %d
solved circuits (--exact); above, they are read from a sketch, each within
%s of its exact value, so that memory and JSON do not grow with --runs
(counts, pass fractions, intervals, min, max and mean stay exact). A
shard's JSON carries that summary, and zapnet merge joins the shards into
exactly the unsharded result. --samples adds every circuit's verdicts and
values to the JSON ("samples"), a few hundred bytes a circuit and strike.
--plot and --html draw a histogram of each pin's residual peak and each
clamp's energy over the circuits, with p1, p50, p99 and the pin's vmax
(the clamp's emax) marked; above the exact count its bars are groups of
the sketch's buckets, each %s wide.
Exit status: 0 every drawn circuit passed, 1 at least one failed, 2 unusable
input or a failed solve.`, whatif.ExactCircuits, spec.FormatFraction(whatif.SketchAccuracy), spec.FormatFraction(2*whatif.SketchAccuracy)),
		stderr)
	runs := fs.Int("runs", whatif.DefaultRuns, "circuits to draw")
	seed := fs.String("seed", "1", "seed of the draws, a whole number ≥ 0")
	level := fs.String("level", "", "levels to run instead of the deck's, e.g. 8k")
	polarity := fs.String("polarity", "", "polarity instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the distribution as JSON to `FILE` (- for stdout, the tables then go to stderr)")
	workers := fs.Int("workers", 0, "circuits solved at once (default: every core)")
	samples := fs.Bool("samples", false, "also write every circuit's verdicts and values into the JSON (memory and file grow with --runs)")
	exact := fs.Int("exact", whatif.ExactCircuits, "percentiles exact up to `N` solved circuits, from a sketch within "+spec.FormatFraction(whatif.SketchAccuracy)+" above (memory grows with N: 8 bytes a measure, condition and circuit)")
	sweep := addSweepFlags(fs)
	pictures := addPictureFlags(fs)
	// The shared help of --plot and --html speaks of runs; a spread draws
	// one histogram per quantity.
	fs.Lookup("plot").Usage = "write histograms of each pin's residual peak and each clamp's energy to `DIR`/DECK_spread-U1-peak.svg, DECK_spread-D1-energy.svg, ... (folder created when missing)"
	fs.Lookup("html").Usage = "write a self-contained HTML report to `FILE`: caution, the histograms and the deck (opens offline)"
	if err := fs.Parse(args); err != nil {
		return err
	}
	deck, err := oneDeck(fs, "spread")
	if err != nil {
		return err
	}
	opt := spreadOptions{deck: deck, json: *jsonPath, samples: *samples, exact: *exact, workers: *workers, runs: *runs, pictures: pictures.options()}
	var errs []error
	if *samples && *jsonPath == "" {
		errs = append(errs, errors.New("--samples: the samples go into the JSON: give --json FILE too"))
	}
	opt.levels = *level
	if opt.polarities, err = parsePolarity(*polarity); err != nil {
		errs = append(errs, err)
	}
	if opt.seed, err = strconv.ParseUint(*seed, 10, 64); err != nil {
		errs = append(errs, fmt.Errorf("--seed %q: give a whole number ≥ 0", *seed))
	}
	if *exact < 1 {
		errs = append(errs, fmt.Errorf("--exact %d: give a count of circuits of at least 1", *exact))
	}
	if *runs < 1 {
		errs = append(errs, fmt.Errorf("--runs %d: draw at least one circuit", *runs))
	}
	if opt.sweep, err = sweep.finish("spread", *workers, errs); err != nil {
		return err
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	return spreadStudy(ctx, opt, stdout, stderr)
}

// spreadStudy draws and solves the circuits and writes the tables and JSON.
func spreadStudy(ctx context.Context, opt spreadOptions, stdout, stderr io.Writer) error {
	c, base, variant, err := loadDesign(opt.deck, opt.sweep.sets, stderr)
	if err != nil {
		return err
	}
	if err := deckOutputs(c, opt.json, opt.pictures).err(); err != nil {
		return err
	}
	sopt := &whatif.SpreadOptions{Runs: opt.runs, Seed: opt.seed, Shard: opt.sweep.shard, Samples: opt.samples,
		ExactUpTo: opt.exact}
	if sopt.Study.Levels, err = deckLevels("--level", opt.levels, c); err != nil {
		return err
	}
	sopt.Study.Polarities, sopt.Study.Workers = opt.polarities, opt.workers
	res, err := withProgress(stderr, "spread", opt.deck, func(p whatif.Progress) (*whatif.SpreadResult, error) {
		sopt.Progress = p
		return whatif.Spreads(ctx, base, sopt)
	})
	if err != nil {
		return err
	}
	res.Variant = variant
	meta := deckMeta(opt.deck, c)
	err = writeSpread(res, meta, opt.json, stdout, stderr)
	if opt.pictures.wanted() {
		// The ratings drawn are those of the design the circuits were
		// drawn around (--set may change them); the page shows the deck.
		if perr := drawSpread(opt.pictures, c, base, meta, res); perr != nil {
			err = errors.Join(err, perr)
		}
	}
	return err
}

// drawSpread draws the histograms of a spread.
func drawSpread(o pictureOptions, c, design *netlist.Circuit, meta study.Meta, res *whatif.SpreadResult) error {
	figs, err := plots.SpreadHistograms(c.Title, design, res, nil)
	if err != nil {
		return fmt.Errorf("--plot/--html: %w", err)
	}
	return writeStudyPictures(o, c, meta, "Spread over the drawn circuits", figs)
}

// writeSpread prints and writes a spread (also of merged shards). It returns
// errVerdictFail when a drawn circuit failed.
func writeSpread(res *whatif.SpreadResult, meta study.Meta, jsonPath string, stdout, stderr io.Writer) error {
	errs, err := tableThenJSON(jsonPath, stdout, stderr,
		func(w io.Writer) error { return report.SpreadTable(w, res, meta.Title, meta.Deck) },
		whatif.SpreadDocument{Meta: meta, SpreadResult: res})
	if err != nil {
		return err
	}
	for i, u := range res.UnsolvedCircuits {
		if i < 3 {
			errs = append(errs, fmt.Errorf("circuit %d: %s", u.Index, u.Error))
		}
	}
	if res.Unsolved > 3 {
		errs = append(errs, fmt.Errorf("%d circuits in all could not be solved", res.Unsolved))
	}
	if res.Interrupted {
		errs = append(errs, sweepInterrupted(res.Solved+res.Unsolved, res.Runs, res.Shard))
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	if res.Passed < res.Solved {
		return errVerdictFail
	}
	return nil
}
