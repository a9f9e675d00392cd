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
	var o fitOutputs
	fs.StringVar(&o.name, "name", "", "the part's `NAME` (default: from the data)")
	fs.StringVar(&o.json, "json", "", "write the result as JSON to `FILE` (- for stdout)")
	fs.StringVar(&o.plot, "plot", "", "draw the data and the fit as SVG into folder `DIR`")
	if err := fs.Parse(args); err != nil {
		return err
	}
	given := 0
	for _, g := range []bool{*tlp != "", *ds != "", len(*points) > 0} {
		if g {
			given++
		}
	}
	if given != 1 || fs.NArg() != 0 {
		fs.Usage()
		return errors.New("fit clamp: give one of --tlp, --datasheet or --point")
	}
	if *pol != "" && *pol != "uni" && *pol != "bi" {
		return fmt.Errorf("fit clamp: --polarity is uni or bi, not %q", *pol)
	}
	if *honour != "tlp" && *honour != "surge" {
		return fmt.Errorf("fit clamp: --honour is tlp or surge, not %q", *honour)
	}
	var lsVal float64
	if *ls != "" {
		v, err := netlist.ParseValue("--ls", *ls, spec.Henry, spec.NonNegative)
		if err != nil {
			return fmt.Errorf("fit clamp: %w", err)
		}
		lsVal = v
	}

	var data []fit.Datum
	var sources []string
	pub := fit.Published{Polarity: *pol, Ls: lsVal}
	var notes []string
	it2 := 0.0
	switch {
	case *tlp != "":
		src, err := readData(*tlp)
		if err != nil {
			return fmt.Errorf("fit clamp: %w", err)
		}
		t, err := datafile.ReadTLP(*tlp, src)
		if err != nil {
			return fitError("fit clamp", err)
		}
		for _, n := range t.Notes {
			if !*snap {
				notes = append(notes, n.Error())
			}
		}
		data, it2, notes = appendTLP(t, notes)
		pub.Name = stem(*tlp)
		sources = append(sources, *tlp)
		if *snap {
			pub.Model = "snapback"
		}
	default:
		name, src := *ds, []byte(nil)
		if name != "" {
			b, err := readData(name)
			if err != nil {
				return fmt.Errorf("fit clamp: %w", err)
			}
			src = b
			sources = append(sources, name)
		} else {
			name = "--point"
			src = []byte(strings.Join(*points, "\n"))
			sources = append(sources, "--point")
		}
		d, err := datafile.ReadDatasheet(name, src)
		if err != nil {
			return fitError("fit clamp", err)
		}
		dd, p, err := fit.DatasheetData(d)
		if err != nil {
			return fmt.Errorf("fit clamp: %w", err)
		}
		data = dd
		if *pol != "" {
			p.Polarity = *pol
		}
		if lsVal > 0 {
			p.Ls = lsVal
		}
		if *snap {
			p.Model = "snapback"
		}
		if name == "--point" && d.NamePos.Line == 0 {
			p.Name = "fitted"
		}
		pub = p
		it2 = p.It2
	}
	if o.name != "" {
		pub.Name = o.name
	}
	if err := checkPartName(pub.Name); err != nil {
		return fmt.Errorf("fit clamp: %w", err)
	}
	if err := o.check(sources); err != nil {
		return fmt.Errorf("fit clamp: %w", err)
	}
	origin := "datasheet"
	if *tlp != "" {
		origin = "--ls"
	}

	var doc fit.Document
	if pub.Model == "snapback" {
		f, err := fit.FitSnapback(data, &fit.SnapbackOptions{Polarity: pub.Polarity, Ron: pub.Ron, It2: it2, Ls: pub.Ls})
		if err != nil {
			return fmt.Errorf("fit clamp --snapback: %w", err)
		}
		doc = f.Document(f.Params.Part(pub.Name), sources)
		for _, k := range []string{"vt1", "it1", "vh", "ih", "ron", "ls", "it2"} {
			doc.SetFrom(k, origin)
		}
		if *tlp != "" && it2 > 0 {
			doc.SetFrom("it2", "the leakage's jump")
		}
	} else {
		h := fit.HonourTLP
		if *honour == "surge" {
			h = fit.HonourSurge
		}
		f, err := fit.FitClamp(data, &fit.ClampOptions{Polarity: pub.Polarity, Honour: h, Ls: pub.Ls})
		if err != nil {
			return fmt.Errorf("fit clamp: %w", err)
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
		if it2 > 0 {
			f.Notes = append(f.Notes, fmt.Sprintf("the TLP curve shows the clamp failing at %s (It2); ipp, a surge rating, is not set from it: take ipp from the datasheet", spec.FormatSI(it2, "A")))
		}
		doc = f.Document(part, sources)
		for _, k := range []string{"vrwm", "ipp", "ls"} {
			doc.SetFrom(k, origin)
		}
	}
	doc.Notes = append(notes, doc.Notes...)
	return finishFit(doc, o, stdout)
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

// checkPartName refuses a name the deck language would not read.
func checkPartName(name string) error {
	if name == "" {
		return errors.New("the part needs a name: give --name")
	}
	for i, r := range name {
		ok := r == '_' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z') || (i > 0 && (r == '-' || r == '.' || (r >= '0' && r <= '9')))
		if !ok {
			return fmt.Errorf("%q is not a part name: it starts with a letter or _ and holds letters, digits, _, - and .", name)
		}
	}
	return nil
}
