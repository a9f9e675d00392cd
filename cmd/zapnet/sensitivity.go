package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// sensitivityOptions are the settings of `zapnet sensitivity`.
type sensitivityOptions struct {
	deck       string
	levels     string   // --level as given; "": the deck's
	polarities []string // nil: the deck's
	params     []string // nil: every design parameter
	step       float64  // fraction; 0: 0.10
	limit      string   // "ELEMENT PARAM" whose margin ranks; "": the worst
	all        bool     // the models' constants and the operating conditions too
	json       string
	workers    int
	sweep      sweepSpec
	pictures   pictureOptions // --plot and --html: the ranked bars
}

func runSensitivity(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("sensitivity",
		"sensitivity DECK [--param E.P,...] [--step PERCENT] [--limit E.P] [--level LIST] [--polarity pos|neg|both] [--set E.P=v] [--shard i/n] [--json FILE] [--plot DIR] [--html FILE] [--workers N]",
		`  zapnet sensitivity testdata/demo.zap --level 4k
  zapnet sensitivity testdata/demo.zap --param D1.ls,Lpad.value,C1.value
  zapnet sensitivity testdata/demo.zap --level 8k --plot figs --html sensitivity.html
  zapnet sensitivity testdata/demo-weak.zap --level 8k --limit U1.vmax

Perturbs every design parameter (or those named) by ±10 %, one at a
time, solves the study (every level and polarity) for each, and ranks the
parameters by how much they move the worst margin: what buys the most
margin. --limit ranks by one limit's margin instead (its smallest over
the levels and polarities): while a clamp's ipp is the worst limit, the
ranking only says how the strike current moves, and --limit U1.vmax asks
what buys margin at the pin. Ratings (vmax, ipp, ...), the models'
constants (is, n, ...) and operating conditions (a supply's voltage) are
left out unless named (--all adds the constants and the conditions), and
so are parameters whose ±10 % moves no margin. --set gives the
design to start from (one value each); the deck's vary lines are ignored.
--plot and --html draw the ranking as bars: per parameter (the first 15),
the worst margin with it lowered and raised by the step, against the
baseline margin drawn as a vertical line.
Exit status: 0 when the study completed, 2 for unusable input or a failed
solve.`,
		stderr)
	params := fs.String("param", "", "parameters to perturb, `LIST` of ELEMENT.PARAM (default: every design parameter)")
	all := fs.Bool("all", false, "perturb the models' constants and the operating conditions too")
	step := fs.String("step", "10", "perturbation in `PERCENT`")
	limit := fs.String("limit", "", "rank by the margin of one `LIMIT`, ELEMENT.PARAM such as U1.vmax or D1.ipp (default: the worst margin over every limit)")
	level := fs.String("level", "", "levels to run instead of the deck's, e.g. 4k,8k")
	polarity := fs.String("polarity", "", "polarity instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the ranking as JSON to `FILE` (- for stdout, the table then goes to stderr)")
	workers := fs.Int("workers", 0, "circuits solved at once (default: every core)")
	sweep := addSweepFlags(fs)
	pictures := addPictureFlags(fs)
	// The shared help of --plot and --html speaks of runs; a sensitivity
	// study draws one figure.
	fs.Lookup("plot").Usage = "write the figure of the ranked margins to `DIR`/DECK_sensitivity.svg (folder created when missing)"
	fs.Lookup("html").Usage = "write a self-contained HTML report to `FILE`: caution, the sensitivity figure and the deck (opens offline)"
	if err := fs.Parse(args); err != nil {
		return err
	}
	deck, err := oneDeck(fs, "sensitivity")
	if err != nil {
		return err
	}
	opt := sensitivityOptions{deck: deck, json: *jsonPath, workers: *workers, limit: *limit, all: *all, pictures: pictures.options()}
	var errs []error
	opt.levels = *level
	if opt.polarities, err = parsePolarity(*polarity); err != nil {
		errs = append(errs, err)
	}
	if *params != "" {
		opt.params = strings.Split(*params, ",")
	}
	p, perr := strconv.ParseFloat(strings.TrimSuffix(*step, "%"), 64)
	if perr != nil || !(p > 0 && p < 100) {
		errs = append(errs, fmt.Errorf("--step %q: give a percentage between 0 and 100", *step))
	}
	opt.step = p / 100
	if opt.sweep, err = sweep.finish("sensitivity", *workers, errs); err != nil {
		return err
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	return sensitivityStudy(ctx, opt, stdout, stderr)
}

// sensitivityStudy runs the study and writes its table and JSON.
func sensitivityStudy(ctx context.Context, opt sensitivityOptions, stdout, stderr io.Writer) error {
	c, base, variant, err := loadDesign(opt.deck, opt.sweep.sets, stderr)
	if err != nil {
		return err
	}
	if err := deckOutputs(c, opt.json, opt.pictures).err(); err != nil {
		return err
	}
	sopt := &whatif.SensitivityOptions{Params: opt.params, All: opt.all, Step: opt.step, Limit: opt.limit, Shard: opt.sweep.shard}
	if sopt.Study.Levels, err = deckLevels("--level", opt.levels, c); err != nil {
		return err
	}
	sopt.Study.Polarities, sopt.Study.Workers = opt.polarities, opt.workers
	res, err := withProgress(stderr, "sensitivity", opt.deck, func(p whatif.Progress) (*whatif.SensitivityResult, error) {
		sopt.Progress = p
		return whatif.Sensitivities(ctx, base, sopt)
	})
	if err != nil {
		return err
	}
	res.Variant = variant
	meta := deckMeta(opt.deck, c)
	err = writeSensitivity(res, meta, opt.json, stdout, stderr)
	if opt.pictures.wanted() {
		if perr := drawSensitivity(opt.pictures, c, meta, res); perr != nil {
			err = errors.Join(err, perr)
		}
	}
	return err
}

// drawSensitivity draws the ranked margins of a sensitivity study.
func drawSensitivity(o pictureOptions, c *netlist.Circuit, meta study.Meta, res *whatif.SensitivityResult) error {
	fig, err := plots.SensitivityBars(c.Title, res, nil)
	if err != nil {
		return fmt.Errorf("--plot/--html: %w", err)
	}
	return writeStudyPictures(o, c, meta, "Sensitivity of the worst margin", []plots.Figure{fig})
}

// writeSensitivity prints and writes a sensitivity result (also of merged
// shards).
func writeSensitivity(res *whatif.SensitivityResult, meta study.Meta, jsonPath string, stdout, stderr io.Writer) error {
	errs, err := tableThenJSON(jsonPath, stdout, stderr,
		func(w io.Writer) error { return report.SensitivityTable(w, res, meta.Title, meta.Deck) },
		whatif.SensitivityDocument{Meta: meta, SensitivityResult: res})
	if err != nil {
		return err
	}
	for _, p := range res.Parameters {
		if p.Error != "" {
			errs = append(errs, fmt.Errorf("%s: %s", p.Param, p.Error))
		}
	}
	if res.Interrupted {
		errs = append(errs, sweepInterrupted(len(res.Parameters)+len(res.Skipped), res.Total, res.Shard))
	}
	return errors.Join(errs...)
}
