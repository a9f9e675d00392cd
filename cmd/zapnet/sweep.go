package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"

	"github.com/spf13/pflag"

	"zapnet/cmd/internal/report"
	"zapnet/mna/study"
	"zapnet/mna/study/whatif"
	"zapnet/netlist"
)

// The sweep flags shared by run, margin, sensitivity and spread: what-if
// values from the command line and one shard of the sweep.

// sweepFlags are the flags as registered; spec reads them.
type sweepFlags struct {
	sets  *[]string
	shard *string
}

// sweepSpec is what the flags asked for.
type sweepSpec struct {
	sets  []string    // --set, as given; read against the deck by whatif.ParseSets
	shard study.Shard // --shard; zero: the whole sweep
}

// addSweepFlags registers --set and --shard on fs.
func addSweepFlags(fs *pflag.FlagSet) *sweepFlags {
	return &sweepFlags{
		sets:  fs.StringArray("set", nil, "what-if values `ELEMENT.PARAM=v1,v2,...` as on a vary line, repeatable; a list makes variants (run, margin), one value sets the design studied (sensitivity, spread)"),
		shard: fs.String("shard", "", "solve only slice `i/n` of the sweep (i from 1 to n), for a batch scheduler; join the slices' JSON with zapnet merge"),
	}
}

// spec parses the registered flags.
func (f *sweepFlags) spec() (sweepSpec, error) {
	sh, err := study.ParseShard(*f.shard)
	if err != nil {
		err = fmt.Errorf("--shard: %w", err)
	}
	return sweepSpec{sets: *f.sets, shard: sh}, err
}

// parsePolarity reads --polarity: "" (the deck's), pos, neg or both.
func parsePolarity(s string) ([]string, error) {
	switch s {
	case "":
		return nil, nil
	case "pos", "neg":
		return []string{s}, nil
	case "both":
		return []string{"pos", "neg"}, nil
	}
	return nil, fmt.Errorf("--polarity %q: use pos, neg or both", s)
}

// interruptible is a context cancelled by the first Ctrl-C (or SIGTERM from
// a batch scheduler): the sweep then finishes the solves in progress and
// reports what finished. A second Ctrl-C ends the program at once.
func interruptible(stderr io.Writer) (context.Context, func()) {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	go func() {
		<-ctx.Done()
		if context.Cause(ctx) != context.Canceled {
			fmt.Fprintln(stderr, "\nzapnet: stopping: finishing the solves in progress (Ctrl-C again to quit at once)")
		}
		stop()
	}()
	return ctx, stop
}

// errInterrupted reports a sweep cut short; its output holds what finished.
type errInterrupted struct{ done, total int }

func (e errInterrupted) Error() string {
	return fmt.Sprintf("interrupted: %d of %d finished and were reported; the rest were stopped or did not start", e.done, e.total)
}

// runSweep is what `zapnet run` solves with the sweep flags: the variants of
// the deck and --set, the shard's slice of the jobs, stopped cleanly by
// Ctrl-C, with a progress bar on a terminal.
type runSweep struct {
	runs     []study.Run
	variants int // variants of the whole study
	shard    *study.ShardInfo
	// interrupted: Ctrl-C came before every job ran.
	interrupted bool
}

// sweepRuns solves the runs of c that sopt and spec select, once check has
// accepted them (the outputs they will write, say), and with verify solves
// them again at a tenth of their accuracy (study.Verify). The error joins
// the failed solves and, when interrupted, an errInterrupted; runs is nil
// only when nothing could start.
func sweepRuns(c *netlist.Circuit, sopt *study.Options, spec sweepSpec, verify bool, check func([]study.Job) error, stderr io.Writer) (*runSweep, error) {
	if err := setVariants(c, spec.sets, sopt); err != nil {
		return nil, err
	}
	jobs, err := study.Jobs(c, sopt)
	if err != nil {
		return nil, err
	}
	sw := &runSweep{shard: spec.shard.Info(len(jobs))}
	var mine []study.Job
	for _, j := range jobs {
		if spec.shard.Has(j.Index) {
			mine = append(mine, j)
		}
		sw.variants = max(sw.variants, j.VariantIndex+1)
	}
	if err := check(mine); err != nil {
		return nil, err
	}
	ctx, stop := interruptible(stderr)
	defer stop()
	progress, clear := newProgress(stderr, "run")
	var done func(int)
	if progress != nil {
		done = func(n int) { progress(n, len(mine)) }
	}
	runs, err := study.Execute(ctx, c, mine, sopt, done)
	clear()
	if verify && len(runs) == len(mine) {
		vprogress, vclear := newProgress(stderr, "verify")
		if vprogress != nil {
			vprogress(0, 1)
		}
		// A failed check is said in each run's Verify; only an interrupt
		// matters here.
		verr := study.Verify(ctx, c, runs, sopt)
		vclear()
		if ctx.Err() != nil {
			err = errors.Join(err, verr)
			sw.interrupted = true
		}
	}
	sw.runs = runs
	if len(runs) < len(mine) {
		sw.interrupted = true
		// Keep the solve failures, replace the context's error by one
		// that says what the report holds.
		err = errors.Join(withoutContext(err), errInterrupted{len(runs), len(mine)})
	}
	return sw, err
}

// setVariants reads --set (run, margin) against c into the variants sopt
// studies: the deck's vary lines combined with the sets (whatif.Variants).
// Without --set sopt keeps the deck's own.
func setVariants(c *netlist.Circuit, flags []string, sopt *study.Options) error {
	if len(flags) == 0 {
		return nil
	}
	sets, err := whatif.ParseSets(c, flags)
	if err != nil {
		return err
	}
	sopt.Variants, err = whatif.Variants(c, sets)
	return err
}

// withoutContext drops context errors from a joined error.
func withoutContext(err error) error {
	if err == nil {
		return nil
	}
	var keep []error
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		for _, e := range j.Unwrap() {
			if !errors.Is(e, context.Canceled) {
				keep = append(keep, e)
			}
		}
		return errors.Join(keep...)
	}
	if errors.Is(err, context.Canceled) {
		return nil
	}
	return err
}

// runDocument is the run JSON's document; a shard or an interrupted sweep
// also says so.
func runDocument(meta study.Meta, sw *runSweep) study.Document {
	runs := sw.runs
	if runs == nil {
		runs = []study.Run{}
	}
	return study.Document{Meta: meta, Runs: runs, Shard: sw.shard, Interrupted: sw.interrupted}
}

// rankVariants prints the variant ranking when the sweep has several.
func rankVariants(w io.Writer, sw *runSweep) error {
	if sw.variants < 2 {
		return nil
	}
	return report.VariantRanking(w, whatif.RankVariants(sw.runs))
}

// writeOutput writes a document as JSON to "-" (w) or to a file, whole or
// not at all.
func writeOutput(path string, w io.Writer, doc any) error {
	return writeStream(path, w, func(f io.Writer) error { return report.EncodeJSON(f, doc) })
}

// writeStream writes with write to "-" (w) or to a file, whole or not at
// all.
func writeStream(path string, w io.Writer, write func(io.Writer) error) error {
	if path == "-" {
		return write(w)
	}
	return report.WriteFile(path, write)
}

// The plumbing run, margin, sensitivity and spread share: the one deck, the
// flag checks, the deck's loading, the progress bar and the table and JSON
// output. Each command keeps only what differs.

// oneDeck returns the deck, the one argument a study command takes.
func oneDeck(fs *pflag.FlagSet, cmd string) (string, error) {
	if fs.NArg() != 1 {
		fs.Usage()
		return "", fmt.Errorf("%s: want one deck, got %d arguments", cmd, fs.NArg())
	}
	return fs.Arg(0), nil
}

// deckLevels reads the levels of flag (a list such as 4k,8k; "" for the
// deck's own, nil) as the deck's strike line reads its levels: in the
// unit of the deck's waveform, so that 8kA on a discharge deck is an error.
func deckLevels(flag, text string, c *netlist.Circuit) ([]float64, error) {
	if text == "" {
		return nil, nil
	}
	s := c.Strike()
	if s == nil {
		return nil, errors.New("the deck has no strike: add a strike line")
	}
	ls, err := netlist.ParseLevels(text, s.Waveform)
	if err != nil {
		return nil, fmt.Errorf("%s %s: %w", flag, text, err)
	}
	return ls, nil
}

// deckLevel reads one level (deckLevels).
func deckLevel(flag, text string, c *netlist.Circuit) (float64, error) {
	ls, err := deckLevels(flag, text, c)
	if err == nil && len(ls) > 1 {
		err = fmt.Errorf("%s %s: give one level", flag, text)
	}
	if err != nil || len(ls) == 0 {
		return 0, err
	}
	return ls[0], nil
}

// checkWorkers refuses a negative --workers; 0 means every core.
func checkWorkers(n int) error {
	if n < 0 {
		return fmt.Errorf("--workers %d: use a positive number, or 0 for every core", n)
	}
	return nil
}

// finish ends the flag checks of a command that collects its flag errors:
// it adds those of --set, --shard and --workers to errs, which hold the
// command's own, and names the command once before all of them.
func (f *sweepFlags) finish(cmd string, workers int, errs []error) (sweepSpec, error) {
	s, err := f.spec()
	if err != nil {
		errs = append(errs, err)
	}
	if err := checkWorkers(workers); err != nil {
		errs = append(errs, err)
	}
	if len(errs) > 0 {
		return s, fmt.Errorf("%s: %w", cmd, errors.Join(errs...))
	}
	return s, nil
}

// loadDeck parses the deck and prints its warnings.
func loadDeck(path string, stderr io.Writer) (*netlist.Circuit, error) {
	c, err := netlist.ParseFile(path)
	if err != nil {
		return nil, err
	}
	for _, w := range c.Warnings {
		fmt.Fprintln(stderr, w)
	}
	return c, nil
}

// deckMeta names the tool, the deck and its title in a report.
func deckMeta(deck string, c *netlist.Circuit) study.Meta {
	return study.Meta{Tool: "zapnet", Version: Version, Deck: deck, Title: c.Title}
}

// loadDesign loads the deck and applies --set to it (whatif.Base): the
// design a sensitivity or spread studies, and the values set.
func loadDesign(path string, flags []string, stderr io.Writer) (c, base *netlist.Circuit, variant netlist.Variant, err error) {
	if c, err = loadDeck(path, stderr); err != nil {
		return nil, nil, nil, err
	}
	sets, err := whatif.ParseSets(c, flags)
	if err != nil {
		return nil, nil, nil, err
	}
	if base, variant, err = whatif.Base(c, sets); err != nil {
		return nil, nil, nil, err
	}
	return c, base, variant, nil
}

// withProgress runs a what-if sweep with a progress bar named label on
// stderr (on a terminal only), cleared when the sweep ends. Its error names
// the deck.
func withProgress[R any](stderr io.Writer, label, deck string, sweep func(whatif.Progress) (R, error)) (R, error) {
	progress, clear := newProgress(stderr, label)
	res, err := sweep(progress)
	clear()
	if err != nil {
		return res, fmt.Errorf("%s: %w", deck, err)
	}
	return res, nil
}

// tablesOut is where the tables go: stdout, or stderr when the JSON takes
// stdout.
func tablesOut(jsonPath string, stdout, stderr io.Writer) io.Writer {
	if jsonPath == "-" {
		return stderr
	}
	return stdout
}

// tableThenJSON prints a what-if table and writes its JSON document when
// asked. A table that cannot be printed ends the command at once (err); a
// JSON that cannot be written is collected (errs) so that the command
// still says what else went wrong.
func tableThenJSON(jsonPath string, stdout, stderr io.Writer, table func(io.Writer) error, doc any) (errs []error, err error) {
	if err := table(tablesOut(jsonPath, stdout, stderr)); err != nil {
		return nil, err
	}
	if jsonPath != "" {
		if err := writeOutput(jsonPath, stdout, doc); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	return errs, nil
}

// sweepInterrupted is the error of a what-if sweep cut short after done
// items: of the shard's items, or of total for the whole sweep.
func sweepInterrupted(done, total int, shard *study.ShardInfo) error {
	if shard != nil {
		total = study.Shard{Index: shard.Index, Count: shard.Count}.Len(shard.Total)
	}
	return errInterrupted{done, total}
}
