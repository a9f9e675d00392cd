package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/fit"
	"zapnet/netlist"
	"zapnet/netlist/datafile"
)

const fitBeadExample = `  zapnet fit bead --touchstone testdata/fit/bead600.s2p
  zapnet fit bead --z testdata/fit/bead600-bias.csv --rdc 90m --plot fig/
  zapnet fit bead --touchstone bead-0A.s2p --touchstone bead-500mA.s2p@0.5A

  A Touchstone file (version 1 or 2; S, Y or Z; MA, DB or RI) is read as
  the bead in series between two ports (Z = 2·Z0·(1 − S21)/S21) or, for one
  port, as Z = Z0·(1 + S11)/(1 − S11); FILE@BIAS gives the DC current it was
  measured with. An impedance CSV has the columns f and z (|Z|) with an
  optional phase in degrees, or f, r and x; an idc column splits it into
  curves at several DC currents, which fit isat. The fit is on the complex
  impedance: |Z| alone cannot tell resistance from reactance.`

// runFitBead fits a ferrite bead.
func runFitBead(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("fit bead", "fit bead (--touchstone FILE[@BIAS]... | --z FILE.csv) [options]", fitBeadExample, stderr)
	ts := fs.StringArray("touchstone", nil, "fit to a Touchstone `FILE` (.s1p, .s2p), optionally @ the DC bias, e.g. b.s2p@0.5A (repeatable)")
	zcsv := fs.String("z", "", "fit to an impedance CSV `FILE` (f, z [, phase] or f, r, x [, idc])")
	rdc := fs.String("rdc", "", "hold the DC resistance at this value (a datasheet's), e.g. 90m")
	o := addFitOutputs(fs, "the file's name", "the data and the fit")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if err := oneSource(fs, "fit bead: give --touchstone or --z", len(*ts) > 0, *zcsv != ""); err != nil {
		return err
	}
	opt := &fit.BeadOptions{}
	var err error
	if opt.Rdc, err = optionalValue("--rdc", *rdc, spec.Ohm, spec.Positive); err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	var in beadInput
	if *zcsv != "" {
		in, err = readBeadCSV(*zcsv)
	} else {
		in, err = readBeadTouchstones(*ts)
	}
	if err != nil {
		return err
	}
	name, err := o.partName(in.name)
	if err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	if err := o.check(in.paths); err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	f, err := fit.FitBead(in.curves, opt)
	if err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	doc := f.Document(beadPart(name, f.Params), in.sources)
	if opt.Rdc > 0 {
		doc.SetFrom("rdc", "--rdc")
	}
	doc.Notes = append(in.notes, doc.Notes...)
	return finishFit(doc, *o, stdout, stderr)
}

// beadInput is the data of a bead fit and what it was read from.
type beadInput struct {
	curves  []fit.BeadCurve
	sources []string // as given, a Touchstone file's @BIAS included
	paths   []string // the files read
	notes   []string
	name    string // the part's default name, the (first) file's
}

// readBeadCSV reads an impedance CSV, a curve for each DC current.
func readBeadCSV(path string) (beadInput, error) {
	im, err := readFitData("fit bead", path, datafile.ReadImpedance)
	if err != nil {
		return beadInput{}, err
	}
	return beadInput{curves: fit.BeadCurveOf(im), sources: []string{path}, paths: []string{path}, name: stem(path)}, nil
}

// readBeadTouchstones reads each --touchstone FILE[@BIAS] as a curve at
// its bias, with a note of how the file was read; it reports the problems
// of every file at once.
func readBeadTouchstones(args []string) (beadInput, error) {
	var in beadInput
	var errs []error
	for _, arg := range args {
		path, bias := arg, 0.0
		if k := strings.LastIndexByte(arg, '@'); k > 0 {
			v, err := netlist.ParseValue("the bias of "+arg[:k], arg[k+1:], spec.Ampere, spec.NonNegative)
			if err != nil {
				errs = append(errs, err)
				continue
			}
			path, bias = arg[:k], v
		}
		src, err := datafile.ReadFile(path)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		t, err := datafile.ReadTouchstone(path, src)
		if err != nil {
			errs = append(errs, fitError(path, err))
			continue
		}
		c, how, err := fit.BeadCurveOfTouchstone(t, bias)
		if err != nil {
			errs = append(errs, fitError(path, err))
			continue
		}
		in.curves = append(in.curves, c)
		in.sources = append(in.sources, arg)
		in.paths = append(in.paths, path)
		in.notes = append(in.notes, fmt.Sprintf("%s: %s", path, how))
		if in.name == "" {
			in.name = stem(path)
		}
	}
	if err := errors.Join(errs...); err != nil {
		return in, fmt.Errorf("fit bead: %w", err)
	}
	return in, nil
}

// beadPart is the part line of a fitted bead; isat only where the curves
// told it.
func beadPart(name string, p fit.BeadParams) fit.Part {
	part := fit.Part{Name: name, Kind: "bead", Num: []fit.Num{
		{Key: "rdc", Value: p.Rdc, Unit: "Ω"}, {Key: "l", Value: p.L, Unit: "H"},
		{Key: "c", Value: p.C, Unit: "F"}, {Key: "rac", Value: p.Rac, Unit: "Ω"}}}
	if p.Isat > 0 {
		part.Num = append(part.Num, fit.Num{Key: "isat", Value: p.Isat, Unit: "A"})
	}
	return part
}
