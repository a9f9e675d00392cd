package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"zapnet/cmd/internal/report"
	"zapnet/cmd/internal/whatif"
	"zapnet/netlist"
)

// sensitivityOptions are the settings of `zapnet sensitivity`.
type sensitivityOptions struct {
	deck       string
	levels     []float64 // nil: the deck's
	polarities []string  // nil: the deck's
	params     []string  // nil: every design parameter
	step       float64   // fraction; 0: 0.10
	json       string
	workers    int
	sweep      sweepSpec
}

func runSensitivity(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("sensitivity",
		"sensitivity DECK [--param E.P,...] [--step PERCENT] [--level LIST] [--polarity pos|neg|both] [--set E.P=v] [--shard i/n] [--json FILE] [--workers N]",
		`  zapnet sensitivity testdata/demo.zap --level 4k
  zapnet sensitivity testdata/demo.zap --param D1.ls,Lpad.value,C1.value

Perturbs every numeric design parameter (or those named) by ±10 %, one at a
time, solves the study (every level and polarity) for each, and ranks the
parameters by how much they move the worst margin: what buys the most
margin. Ratings (vmax, ipp, ...) are left out unless named. --set gives the
design to start from (one value each); the deck's vary lines are ignored.
Exit status: 0 when the study completed, 2 for unusable input or a failed
solve.`,
		stderr)
	params := fs.String("param", "", "parameters to perturb, `LIST` of ELEMENT.PARAM (default: every design parameter)")
	step := fs.String("step", "10", "perturbation in `PERCENT`")
	level := fs.String("level", "", "levels to run instead of the deck's, e.g. 4k,8k")
	polarity := fs.String("polarity", "", "polarity instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the ranking as JSON to `FILE` (- for stdout, the table then goes to stderr)")
	workers := fs.Int("workers", 0, "circuits solved at once (default: every core)")
	sweep := addSweepFlags(fs)
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		fs.Usage()
		return fmt.Errorf("sensitivity: want one deck, got %d arguments", fs.NArg())
	}
	opt := sensitivityOptions{deck: fs.Arg(0), json: *jsonPath, workers: *workers}
	var errs []error
	var err error
	if *level != "" {
		if opt.levels, err = levelList(*level); err != nil {
			errs = append(errs, fmt.Errorf("--level: %w", err))
		}
	}
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
	if opt.sweep, err = sweep.spec(); err != nil {
		errs = append(errs, err)
	}
	if *workers < 0 {
		errs = append(errs, fmt.Errorf("--workers %d: use a positive number, or 0 for every core", *workers))
	}
	if len(errs) > 0 {
		return fmt.Errorf("sensitivity: %w", errors.Join(errs...))
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	return sensitivityStudy(ctx, opt, stdout, stderr)
}

// sensitivityStudy runs the study and writes its table and JSON.
func sensitivityStudy(ctx context.Context, opt sensitivityOptions, stdout, stderr io.Writer) error {
	c, err := netlist.ParseFile(opt.deck)
	if err != nil {
		return err
	}
	for _, w := range c.Warnings {
		fmt.Fprintln(stderr, w)
	}
	base, variant, err := whatif.Base(c, opt.sweep.sets)
	if err != nil {
		return err
	}
	sopt := &whatif.SensitivityOptions{Params: opt.params, Step: opt.step, Shard: opt.sweep.shard}
	sopt.Study.Levels, sopt.Study.Polarities, sopt.Study.Workers = opt.levels, opt.polarities, opt.workers
	progress, clear := newProgress(stderr, "sensitivity")
	sopt.Progress = progress
	res, err := whatif.Sensitivities(ctx, base, sopt)
	clear()
	if err != nil {
		return fmt.Errorf("%s: %w", opt.deck, err)
	}
	res.Variant = whatif.VariantMap(variant)
	return writeSensitivity(res, report.Meta{Tool: "zapnet", Version: Version, Deck: opt.deck, Title: c.Title}, opt.json, stdout, stderr)
}

// writeSensitivity prints and writes a sensitivity result (also of merged
// shards).
func writeSensitivity(res *whatif.SensitivityResult, meta report.Meta, jsonPath string, stdout, stderr io.Writer) error {
	tables := stdout
	if jsonPath == "-" {
		tables = stderr
	}
	if err := report.SensitivityTable(tables, res, meta.Title, meta.Deck); err != nil {
		return err
	}
	var errs []error
	if jsonPath != "" {
		if err := writeOutput(jsonPath, stdout, report.SensitivityDocument{Meta: meta, SensitivityResult: res}); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	for _, p := range res.Parameters {
		if p.Error != "" {
			errs = append(errs, fmt.Errorf("%s: %s", p.Param, p.Error))
		}
	}
	if res.Interrupted {
		n := res.Total
		if res.Shard != nil {
			n = len(res.Shard.Items())
		}
		errs = append(errs, errInterrupted{len(res.Parameters) + len(res.Skipped), n})
	}
	return errors.Join(errs...)
}
