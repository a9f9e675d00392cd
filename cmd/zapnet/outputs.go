package main

import (
	"errors"
	"fmt"
	"path/filepath"

	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

// outputs gathers the files and folders a command will write and checks
// them all before the first solve, so that a long sweep is never lost to a
// path that cannot be written: every file must be absent or a regular
// file in a folder zapnet can write (report.CheckTarget), none may be an
// input of the command (the deck, a file it includes, a shard being
// merged), no two outputs may share a path, and at most one may take
// standard output ("-").
type outputs struct {
	inputs map[string]bool   // absolute paths of the inputs
	seen   map[string]string // absolute path of an output → its flag
	stdout string            // the flag that writes to standard output
	errs   []error
}

// newOutputs starts the check of a command that reads the files inputs.
func newOutputs(inputs ...string) *outputs {
	o := &outputs{inputs: map[string]bool{}, seen: map[string]string{}}
	for _, in := range inputs {
		o.inputs[absOf(in)] = true
	}
	return o
}

// deckOutputs starts the check of a command reading deck c (and the
// files it includes) with the outputs every deck command has: its JSON and
// its pictures.
func deckOutputs(c *netlist.Circuit, json string, p pictureOptions) *outputs {
	o := newOutputs(c.Included...)
	o.file("--json", json)
	o.named("--html", p.htmlFile)
	o.dir("--plot", p.plotDir)
	return o
}

func absOf(path string) string {
	if a, err := filepath.Abs(path); err == nil {
		return a
	}
	return filepath.Clean(path)
}

// file adds the file path that flag writes; "" is no file, "-" standard
// output.
func (o *outputs) file(flag, path string) {
	switch {
	case path == "":
		return
	case path == "-":
		if o.stdout != "" {
			o.errs = append(o.errs, fmt.Errorf("%s - and %s -: both would write to standard output", o.stdout, flag))
		}
		o.stdout = flag
		return
	}
	abs := absOf(path)
	switch {
	case o.inputs[abs]:
		o.errs = append(o.errs, fmt.Errorf("%s %s: that is an input of this command; zapnet never writes over its input", flag, path))
	case o.seen[abs] != "":
		o.errs = append(o.errs, fmt.Errorf("%s %s: %s writes that file too; give each output its own name", flag, path, o.seen[abs]))
	default:
		o.seen[abs] = flag
		if err := report.CheckTarget(path); err != nil {
			o.errs = append(o.errs, fmt.Errorf("%s: %w", flag, err))
		}
	}
}

// named adds the file path that flag writes, which cannot be standard
// output: "-" would otherwise be written as a file of that name, past
// every check of file.
func (o *outputs) named(flag, path string) {
	if path == "-" {
		o.errs = append(o.errs, fmt.Errorf("%s -: %s writes a file, not standard output; give the file's name (./- for a file called -)", flag, flag))
		return
	}
	o.file(flag, path)
}

// dir adds the folder flag writes files into, making it when missing.
func (o *outputs) dir(flag, dir string) {
	if dir == "" {
		return
	}
	if err := report.PrepareDir(dir); err != nil {
		o.errs = append(o.errs, fmt.Errorf("%s: %w", flag, err))
	}
}

// csv adds the files --csv writes for the runs of jobs.
func (o *outputs) csv(target, deck string, jobs []study.Job, unit spec.Unit) {
	if target == "" {
		return
	}
	names := make([]string, len(jobs))
	for i, j := range jobs {
		names[i] = report.RunName(j.Variant, j.Level, unit, j.Polarity)
	}
	paths, err := report.CSVPaths(target, deck, names)
	if err != nil {
		o.errs = append(o.errs, err)
		return
	}
	if len(paths) > 0 {
		o.dir("--csv", filepath.Dir(paths[0])) // a folder --csv names is made now
	}
	for _, p := range paths {
		o.named("--csv", p)
	}
}

// err joins every problem found.
func (o *outputs) err() error { return errors.Join(o.errs...) }
