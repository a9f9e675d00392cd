package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"maps"
	"slices"
	"strings"

	"zapnet/cmd/internal/report"
	"zapnet/cmd/internal/whatif"
	"zapnet/netlist"
)

// marginOptions are the settings of `zapnet margin`.
type marginOptions struct {
	deck       string
	polarities []string // nil: the deck's
	max        float64  // 0: twice the deck's highest level
	resolution float64  // 0: 100 V for discharges
	json       string   // file, "-" for stdout, "" for none
	workers    int
	sweep      sweepSpec
}

func runMargin(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("margin",
		"margin DECK [--max LEVEL] [--resolution LEVEL] [--polarity pos|neg|both] [--set E.P=v1,v2] [--shard i/n] [--json FILE] [--workers N]",
		`  zapnet margin testdata/demo.zap
  zapnet margin testdata/demo.zap --max 30k --set C1.value=10n,100n,1u

For every variant and polarity, finds the highest level that still passes:
first a scan of 16 levels up to --max, then bisection to --resolution
(0.1 kV for discharges). The scan also checks that the verdict changes only
once as the level rises; where it passes again above a failure the table
says "monotonic NO" and names the levels.
Exit status: 0 when every search completed (failures are what it looks
for), 2 for unusable input or a failed solve.`,
		stderr)
	maxFlag := fs.String("max", "", "top of the searched range in the waveform's unit, e.g. 30k (default: twice the deck's highest level)")
	resFlag := fs.String("resolution", "", "step of the search, e.g. 100 (default: 100 V for discharges)")
	polarity := fs.String("polarity", "", "polarity to search instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the margins as JSON to `FILE` (- for stdout, the table then goes to stderr)")
	workers := fs.Int("workers", 0, "searches run at once (default: every core)")
	sweep := addSweepFlags(fs)
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		fs.Usage()
		return fmt.Errorf("margin: want one deck, got %d arguments", fs.NArg())
	}
	opt := marginOptions{deck: fs.Arg(0), json: *jsonPath, workers: *workers}
	var errs []error
	for _, f := range []struct {
		name string
		text string
		dst  *float64
	}{{"--max", *maxFlag, &opt.max}, {"--resolution", *resFlag, &opt.resolution}} {
		if f.text == "" {
			continue
		}
		ls, err := levelList(f.text)
		if err == nil && len(ls) != 1 {
			err = fmt.Errorf("give one level")
		}
		if err != nil {
			errs = append(errs, fmt.Errorf("%s: %w", f.name, err))
			continue
		}
		*f.dst = ls[0]
	}
	var err error
	if opt.polarities, err = parsePolarity(*polarity); err != nil {
		errs = append(errs, err)
	}
	if opt.sweep, err = sweep.spec(); err != nil {
		errs = append(errs, err)
	}
	if *workers < 0 {
		errs = append(errs, fmt.Errorf("--workers %d: use a positive number, or 0 for every core", *workers))
	}
	if len(errs) > 0 {
		return fmt.Errorf("margin: %w", errors.Join(errs...))
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	return marginStudy(ctx, opt, stdout, stderr)
}

// marginStudy runs the search and writes its table and JSON.
func marginStudy(ctx context.Context, opt marginOptions, stdout, stderr io.Writer) error {
	c, err := netlist.ParseFile(opt.deck)
	if err != nil {
		return err
	}
	for _, w := range c.Warnings {
		fmt.Fprintln(stderr, w)
	}
	mopt := &whatif.MarginOptions{Max: opt.max, Resolution: opt.resolution, Shard: opt.sweep.shard}
	mopt.Study.Polarities = opt.polarities
	mopt.Study.Workers = opt.workers
	if len(opt.sweep.sets) > 0 {
		if mopt.Study.Variants, err = whatif.Variants(c, opt.sweep.sets); err != nil {
			return err
		}
	}
	progress, clear := newProgress(stderr, "margin")
	mopt.Progress = progress
	res, err := whatif.Margins(ctx, c, mopt)
	clear()
	if err != nil {
		return fmt.Errorf("%s: %w", opt.deck, err)
	}
	return writeMargins(res, report.Meta{Tool: "zapnet", Version: Version, Deck: opt.deck, Title: c.Title}, opt.json, stdout, stderr)
}

// writeMargins prints the table and writes the JSON of a margin search
// (also of merged shards), and turns unsolved searches and an interruption
// into the error the exit status comes from.
func writeMargins(res *whatif.MarginResult, meta report.Meta, jsonPath string, stdout, stderr io.Writer) error {
	tables := stdout
	if jsonPath == "-" {
		tables = stderr
	}
	var errs []error
	if err := report.MarginTable(tables, res, meta.Title, meta.Deck); err != nil {
		return err
	}
	if jsonPath != "" {
		if err := writeOutput(jsonPath, stdout, report.MarginDocument{Meta: meta, MarginResult: res}); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	for _, m := range res.Margins {
		if m.Error != "" {
			errs = append(errs, fmt.Errorf("%s %s: %s", variantLabel(m.Variant), m.Polarity, m.Error))
		}
	}
	if res.Interrupted {
		n := res.Total
		if res.Shard != nil {
			n = len(res.Shard.Items())
		}
		errs = append(errs, errInterrupted{len(res.Margins), n})
	}
	return errors.Join(errs...)
}

// variantLabel names a JSON variant in messages.
func variantLabel(v map[string]string) string {
	if len(v) == 0 {
		return "deck"
	}
	keys := slices.Sorted(maps.Keys(v))
	s := make([]string, len(keys))
	for i, k := range keys {
		s[i] = k + "=" + v[k]
	}
	return strings.Join(s, " ")
}
