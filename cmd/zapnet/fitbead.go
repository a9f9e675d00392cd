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
	var o fitOutputs
	fs.StringVar(&o.name, "name", "", "the part's `NAME` (default: the file's name)")
	fs.StringVar(&o.json, "json", "", "write the result as JSON to `FILE` (- for stdout)")
	fs.StringVar(&o.plot, "plot", "", "draw the data and the fit as SVG into folder `DIR`")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if (len(*ts) > 0) == (*zcsv != "") || fs.NArg() != 0 {
		fs.Usage()
		return errors.New("fit bead: give --touchstone or --z")
	}
	opt := &fit.BeadOptions{}
	if *rdc != "" {
		v, err := netlist.ParseValue("--rdc", *rdc, spec.Ohm, spec.Positive)
		if err != nil {
			return fmt.Errorf("fit bead: %w", err)
		}
		opt.Rdc = v
	}
	var curves []fit.BeadCurve
	var sources, notes []string
	name := ""
	if *zcsv != "" {
		src, err := readData(*zcsv)
		if err != nil {
			return fmt.Errorf("fit bead: %w", err)
		}
		im, err := datafile.ReadImpedance(*zcsv, src)
		if err != nil {
			return fitError("fit bead", err)
		}
		curves = fit.BeadCurveOf(im)
		sources, name = []string{*zcsv}, stem(*zcsv)
	}
	var errs []error
	for _, arg := range *ts {
		path, bias := arg, 0.0
		if k := strings.LastIndexByte(arg, '@'); k > 0 {
			v, err := netlist.ParseValue("the bias of "+arg[:k], arg[k+1:], spec.Ampere, spec.NonNegative)
			if err != nil {
				errs = append(errs, err)
				continue
			}
			path, bias = arg[:k], v
		}
		src, err := readData(path)
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
		curves = append(curves, c)
		sources = append(sources, arg)
		notes = append(notes, fmt.Sprintf("%s: %s", path, how))
		if name == "" {
			name = stem(path)
		}
	}
	if err := errors.Join(errs...); err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	if o.name != "" {
		name = o.name
	}
	if err := checkPartName(name); err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	inputs := append([]string(nil), sources...)
	for k, src := range inputs {
		if i := strings.LastIndexByte(src, '@'); i > 0 && src != *zcsv {
			inputs[k] = src[:i]
		}
	}
	if err := o.check(inputs); err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	f, err := fit.FitBead(curves, opt)
	if err != nil {
		return fmt.Errorf("fit bead: %w", err)
	}
	part := fit.Part{Name: name, Kind: "bead", Num: []fit.Num{
		{Key: "rdc", Value: f.Params.Rdc, Unit: "Ω"}, {Key: "l", Value: f.Params.L, Unit: "H"},
		{Key: "c", Value: f.Params.C, Unit: "F"}, {Key: "rac", Value: f.Params.Rac, Unit: "Ω"}}}
	if f.Params.Isat > 0 {
		part.Num = append(part.Num, fit.Num{Key: "isat", Value: f.Params.Isat, Unit: "A"})
	}
	doc := f.Document(part, sources)
	if opt.Rdc > 0 {
		doc.SetFrom("rdc", "--rdc")
	}
	doc.Notes = append(notes, doc.Notes...)
	return finishFit(doc, o, stdout)
}
