package main

import (
	"fmt"
	"io"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/fit"
	"zapnet/netlist/datafile"
)

const fitClampExample = `  zapnet fit clamp --tlp testdata/fit/tvs5-tlp.csv
  zapnet fit clamp --datasheet testdata/fit/tvs5-uni.points --json tvs5u.json --plot fig/
  zapnet fit clamp --point 'vbr 6.6V@1mA' --point 'ir 50nA@5V' --point 'vc 11.9V@16A tlp'
  zapnet fit clamp --tlp testdata/fit/esdsnap-tlp.csv --snapback

  A TLP CSV has a header naming the columns v and i (a unit in brackets
  allowed: v [V], i [mA]), optionally leak (the leakage after each pulse:
  its first tenfold jump gives It2); one row per pulse, negative rows for the
  other polarity. A datasheet-points file holds one statement a line,
  KEY VALUE [@ CONDITION] [PULSE], with the keys vrwm, ir, vbr, vc, c, ipp,
  ls (clamp) and vt1, vh, ron, it2 (snapback); --point takes one such
  statement. Clamping voltages (vc) name their pulse: 8/20, 10/1000 or tlp;
  each is simulated through the engine with that pulse.`

// fitClampOptions are the settings of `zapnet fit clamp`.
type fitClampOptions struct {
	tlp       string   // TLP CSV, "" for none
	datasheet string   // datasheet-points file, "" for none
	points    []string // --point statements
	snapback  bool
	polarity  string // "uni", "bi" or "" (from the data)
	honour    fit.Honour
	ls        float64 // H, 0 for none
}

// clampInput is the data of a clamp fit and what it was read from.
type clampInput struct {
	data    []fit.Datum
	sources []string
	pub     fit.Published // pub.It2: the failure current, published or from the TLP leakage; 0 unknown
	notes   []string
}

// runFitClamp fits a clamp or a snapback clamp.
func runFitClamp(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("fit clamp", "fit clamp (--tlp FILE | --datasheet FILE | --point STATEMENT...) [options]", fitClampExample, stderr)
	tlp := fs.String("tlp", "", "fit to a TLP curve in `FILE` (CSV: v, i, optional leak)")
	ds := fs.String("datasheet", "", "fit to the datasheet points in `FILE`")
	points := fs.StringArray("point", nil, "one datasheet statement, e.g. 'vc 11.9V@16A tlp' (repeatable)")
	snap := fs.Bool("snapback", false, "fit a snapback clamp (trigger, holding, on-resistance)")
	pol := fs.String("polarity", "", "uni or bi (default: from the data)")
	honour := fs.String("honour", "tlp", "where a TLP curve and a surge clamping voltage disagree, keep `tlp` or surge")
	ls := fs.String("ls", "", "lead inductance to put in the part, e.g. 0.5nH")
	o := addFitOutputs(fs, "from the data", "the data and the fit")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if err := oneSource(fs, "fit clamp: give one of --tlp, --datasheet or --point", *tlp != "", *ds != "", len(*points) > 0); err != nil {
		return err
	}
	if *pol != "" && *pol != "uni" && *pol != "bi" {
		return fmt.Errorf("fit clamp: --polarity is uni or bi, not %q", *pol)
	}
	if *honour != "tlp" && *honour != "surge" {
		return fmt.Errorf("fit clamp: --honour is tlp or surge, not %q", *honour)
	}
	opt := fitClampOptions{tlp: *tlp, datasheet: *ds, points: *points, snapback: *snap, polarity: *pol, honour: fit.HonourTLP}
	if *honour == "surge" {
		opt.honour = fit.HonourSurge
	}
	var err error
	if opt.ls, err = optionalValue("--ls", *ls, spec.Henry, spec.NonNegative); err != nil {
		return fmt.Errorf("fit clamp: %w", err)
	}
	return fitClamp(opt, *o, stdout, stderr)
}

// fitClamp reads the data, fits the model the data or the options ask for
// and writes what o asks for.
func fitClamp(opt fitClampOptions, o fitOutputs, stdout, stderr io.Writer) error {
	var in clampInput
	var err error
	if opt.tlp != "" {
		in, err = readClampTLP(opt)
	} else {
		in, err = readClampDatasheet(opt)
	}
	if err != nil {
		return err
	}
	if in.pub.Name, err = o.partName(in.pub.Name); err != nil {
		return fmt.Errorf("fit clamp: %w", err)
	}
	if err := o.check(in.sources); err != nil {
		return fmt.Errorf("fit clamp: %w", err)
	}
	// Where the values the data cannot tell came from.
	origin := "datasheet"
	if opt.tlp != "" {
		origin = "--ls"
	}
	var doc fit.Document
	if in.pub.Model == "snapback" {
		doc, err = snapbackDocument(in, opt, origin)
	} else {
		doc, err = clampDocument(in, opt, origin)
	}
	if err != nil {
		return err
	}
	doc.Notes = append(in.notes, doc.Notes...)
	return finishFit(doc, o, stdout, stderr)
}

// readClampTLP reads the TLP curve opt names.
func readClampTLP(opt fitClampOptions) (clampInput, error) {
	in := clampInput{pub: fit.Published{Polarity: opt.polarity, Ls: opt.ls}}
	t, err := readFitData("fit clamp", opt.tlp, datafile.ReadTLP)
	if err != nil {
		return in, err
	}
	for _, n := range t.Notes {
		if !opt.snapback {
			in.notes = append(in.notes, n.Error())
		}
	}
	in.data, in.pub.It2, in.notes = appendTLP(t, in.notes)
	in.pub.Name = stem(opt.tlp)
	in.sources = append(in.sources, opt.tlp)
	if opt.snapback {
		in.pub.Model = "snapback"
	}
	return in, nil
}

// readClampDatasheet reads the datasheet points of the file or the
// --point statements opt names; the options win over what the points say.
func readClampDatasheet(opt fitClampOptions) (clampInput, error) {
	var in clampInput
	var d *datafile.Datasheet
	var err error
	name := opt.datasheet
	if name != "" {
		d, err = readFitData("fit clamp", name, datafile.ReadDatasheet)
	} else {
		name = "--point"
		d, err = datafile.ReadDatasheet(name, []byte(strings.Join(opt.points, "\n")))
		if err != nil {
			err = fitError("fit clamp", err)
		}
	}
	if err != nil {
		return in, err
	}
	in.sources = append(in.sources, name)
	dd, p, err := fit.DatasheetData(d)
	if err != nil {
		return in, fmt.Errorf("fit clamp: %w", err)
	}
	in.data = dd
	if opt.polarity != "" {
		p.Polarity = opt.polarity
	}
	if opt.ls > 0 {
		p.Ls = opt.ls
	}
	if opt.snapback {
		p.Model = "snapback"
	}
	if name == "--point" && d.NamePos.Line == 0 {
		p.Name = "fitted"
	}
	in.pub = p
	return in, nil
}

// snapbackDocument fits a snapback clamp.
func snapbackDocument(in clampInput, opt fitClampOptions, origin string) (fit.Document, error) {
	pub := in.pub
	f, err := fit.FitSnapback(in.data, &fit.SnapbackOptions{Polarity: pub.Polarity, Ron: pub.Ron, It2: pub.It2, Ls: pub.Ls})
	if err != nil {
		return fit.Document{}, fmt.Errorf("fit clamp --snapback: %w", err)
	}
	doc := f.Document(f.Params.Part(pub.Name), in.sources)
	for _, k := range []string{"vt1", "it1", "vh", "ih", "ron", "ls", "it2"} {
		doc.SetFrom(k, origin)
	}
	if opt.tlp != "" && pub.It2 > 0 {
		doc.SetFrom("it2", "the leakage's jump")
	}
	return doc, nil
}

// clampDocument fits a clamp and puts the published ratings in its part.
func clampDocument(in clampInput, opt fitClampOptions, origin string) (fit.Document, error) {
	pub := in.pub
	f, err := fit.FitClamp(in.data, &fit.ClampOptions{Polarity: pub.Polarity, Honour: opt.honour, Ls: pub.Ls})
	if err != nil {
		return fit.Document{}, fmt.Errorf("fit clamp: %w", err)
	}
	part := f.Params.Part(pub.Name)
	if pub.Vrwm > 0 {
		part.Num = append(part.Num, fit.Num{Key: "vrwm", Value: pub.Vrwm, Unit: "V"})
		if v, ok := leakAt(f.Params, pub.Vrwm); ok {
			f.Notes = append(f.Notes, v)
		}
	}
	if pub.Ipp > 0 {
		part.Num = append(part.Num, fit.Num{Key: "ipp", Value: pub.Ipp, Unit: "A"})
		if pub.IppPulse != fit.Surge8x20 {
			f.Notes = append(f.Notes, fmt.Sprintf("ipp is published for the %s pulse; the study compares it with any strike's peak current", pub.IppPulse))
		}
	}
	if pub.It2 > 0 {
		failing := "the datasheet gives the clamp's TLP failure current It2 = %s"
		if opt.tlp != "" {
			failing = "the TLP curve shows the clamp failing at %s (It2)"
		}
		f.Notes = append(f.Notes, fmt.Sprintf(failing+"; ipp, a surge rating, is not set from it: take ipp from the datasheet", spec.FormatSI(pub.It2, "A")))
	}
	doc := f.Document(part, in.sources)
	for _, k := range []string{"vrwm", "ipp", "ls"} {
		doc.SetFrom(k, origin)
	}
	return doc, nil
}

// appendTLP turns a TLP file into fit data with its notes.
func appendTLP(t *datafile.TLP, notes []string) ([]fit.Datum, float64, []string) {
	data, it2, n := fit.TLPData(t)
	return data, it2, append(notes, n...)
}

// leakAt says what the fitted clamp leaks at its stand-off voltage.
func leakAt(p fit.ClampParams, vrwm float64) (string, bool) {
	i, _ := p.Current(vrwm - 0) // no series drop at a leakage current
	if !(i > 0) {
		return "", false
	}
	return fmt.Sprintf("at its stand-off voltage %s the fitted clamp leaks %s", spec.FormatSI(vrwm, "V"), spec.FormatSI(i, "A")), true
}
