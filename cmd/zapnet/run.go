package main

import (
	"errors"
	"fmt"
	"io"

	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
)

// runOptions are the settings of `zapnet run`; runStudy takes them so that
// tests can call it without flags.
type runOptions struct {
	deck       string
	levels     string   // --level as given; "": the deck's
	polarities []string // nil: the deck's
	json       string   // file, "-" for stdout, "" for none
	csv        string   // file, folder or pattern, "" for none
	workers    int      // 0: every core
	// timings keeps each run's wall-clock time in the JSON; without it
	// identical runs write identical files.
	timings bool
	// verify solves every run again at a tenth of its accuracy and
	// reports the differences (study.Verify).
	verify   bool
	sweep    sweepSpec      // --set and --shard (sweep.go)
	pictures pictureOptions // --plot and --html (plotflags.go)
}

func runRun(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("run",
		"run DECK [--level LIST] [--polarity pos|neg|both] [--set E.P=v1,v2] [--shard i/n] [--json FILE] [--csv FILE] [--plot DIR] [--html FILE] [--verify] [--timings] [--workers N]",
		`  zapnet run testdata/demo.zap
  zapnet run testdata/demo.zap --level 8k --polarity neg
  zapnet run testdata/demo.zap --json result.json --csv 'waves/{run}.csv'
  zapnet run testdata/demo.zap --html report.html --plot figures/

Runs every level × polarity (× variant) of the deck's strike and prints, per
run, the watched nodes, the clamps against ipp/emax, the residual pulse at
each protected pin, the capacitors against their rating, the energy ledger
and the verdict with the margin to the nearest limit; then a summary.
Exit status: 0 every run PASS, 1 at least one FAIL, 2 unusable input or a
failed solve.`,
		stderr)
	level := fs.String("level", "", "levels to run instead of the deck's, an SI list in the waveform's unit, e.g. 4k,8k")
	polarity := fs.String("polarity", "", "polarity to run instead of the deck's: pos, neg or both")
	jsonPath := fs.String("json", "", "write the results as JSON to `FILE` (- for stdout, the tables then go to stderr)")
	csvPath := fs.String("csv", "", "write each run's waveforms as CSV: a `FILE` for one run; a folder (ending in /) or a pattern with {run} for several")
	workers := fs.Int("workers", 0, "runs solved at once (default: every core)")
	verify := fs.Bool("verify", false, "solve every run again at a tenth of its accuracy and report, per headline number, the difference: the run's error bar (about three times the work)")
	timings := fs.Bool("timings", false, "add each run's wall-clock solve time (stats.wall_s) to the JSON; without it identical runs write identical files")
	sweep := addSweepFlags(fs)
	pictures := addPictureFlags(fs)
	if err := fs.Parse(args); err != nil {
		return err
	}
	deck, err := oneDeck(fs, "run")
	if err != nil {
		return err
	}
	opt := runOptions{deck: deck, json: *jsonPath, csv: *csvPath, workers: *workers, timings: *timings, verify: *verify,
		pictures: pictures.options()}
	// run stops at its first flag mistake, where the what-if commands
	// collect them all (sweepFlags.finish).
	if opt.sweep, err = sweep.spec(); err != nil {
		return fmt.Errorf("run: %w", err)
	}
	opt.levels = *level
	if opt.polarities, err = parsePolarity(*polarity); err != nil {
		return fmt.Errorf("run: %w", err)
	}
	if err := checkWorkers(*workers); err != nil {
		return fmt.Errorf("run: %w", err)
	}
	return runStudy(opt, stdout, stderr)
}

// runStudy reads the deck, solves its study, prints the report and writes
// the requested files. It returns errVerdictFail when a run failed its
// verdict, and any other error for unusable input or a failed solve.
func runStudy(opt runOptions, stdout, stderr io.Writer) error {
	c, err := loadDeck(opt.deck, stderr)
	if err != nil {
		return err
	}
	if s := longStudy(c); s != "" {
		fmt.Fprintln(stderr, "warning: "+s)
	}
	levels, err := deckLevels("--level", opt.levels, c)
	if err != nil {
		return err
	}
	sopt := &study.Options{Levels: levels, Polarities: opt.polarities, Workers: opt.workers,
		Record: opt.csv != "" || opt.pictures.wanted()}
	check := func(jobs []study.Job) error {
		out := deckOutputs(c, opt.json, opt.pictures)
		out.csv(opt.csv, opt.deck, jobs, c.Strike().Waveform.Unit)
		return out.err()
	}
	sw, solveErr := sweepRuns(c, sopt, opt.sweep, opt.verify, check, stderr)
	if sw == nil {
		return fmt.Errorf("%s: %w", opt.deck, solveErr)
	}
	runs := sw.runs
	if !opt.timings {
		for i := range runs {
			runs[i].Stats.Wall = 0
		}
	}

	tables := tablesOut(opt.json, stdout, stderr)
	if err := report.Tables(tables, runs, &report.TableOptions{Title: c.Title, Deck: opt.deck}); err != nil {
		return err
	}
	if err := rankVariants(tables, sw); err != nil {
		return err
	}
	meta := deckMeta(opt.deck, c)
	var errs []error
	if opt.json != "" {
		if err := writeOutput(opt.json, stdout, runDocument(meta, sw)); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	if opt.csv != "" {
		var solved []study.Run
		for _, r := range runs {
			if r.Err == nil {
				solved = append(solved, r)
			}
		}
		if err := writeCSVs(opt.csv, opt.deck, solved); err != nil {
			errs = append(errs, err)
		}
	}
	if err := writePictures(opt.pictures, c, meta, runs); err != nil {
		errs = append(errs, err)
	}
	if solveErr != nil {
		errs = append(errs, solveErr)
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	for _, r := range runs {
		if r.Verdict != study.Pass {
			return errVerdictFail
		}
	}
	return nil
}

// writeCSVs writes one CSV per run, each whole or not at all.
func writeCSVs(target, deck string, runs []study.Run) error {
	if len(runs) == 0 {
		return nil
	}
	names := make([]string, len(runs))
	for i := range runs {
		names[i] = runName(&runs[i])
	}
	paths, err := report.CSVPaths(target, deck, names)
	if err != nil {
		return err
	}
	for i, p := range paths {
		r := &runs[i]
		if err := report.WriteFile(p, func(w io.Writer) error { return report.CSV(w, r) }); err != nil {
			return fmt.Errorf("--csv: %w", err)
		}
	}
	return nil
}

// runName is a run's name for files (report.RunName).
func runName(r *study.Run) string { return report.RunName(r.Variant, r.Level, r.LevelUnit, r.Polarity) }
