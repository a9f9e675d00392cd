package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"zapnet/cmd/internal/report"
	"zapnet/devices"
	"zapnet/devices/spec"
	"zapnet/mna/fit"
	"zapnet/netlist"
	"zapnet/netlist/datafile"
)

const fitPinExample = `  zapnet fit pin --tlp testdata/fit/pinA-tlp.csv
  zapnet fit pin --tlp pin.csv --leak 3.3V@2nA --table pin-table.csv --it2 1.8A
  zapnet fit pin --ibis testdata/fit/sensor-input.ibs --model 1 --corner max

  From a TLP curve: a table-path pin (its conduction is the curve, both
  polarities, through the origin) with ifail the failure current It2, read
  from the leak column's first tenfold jump or given with --it2. Below its
  first TLP row the table runs straight from the origin; --leak V@A adds the
  pin's leakage at its supply voltage, written with the table to --table.
  From IBIS: the pin's clamp tables, C_comp and package at a corner; IBIS
  carries no failure data, so ifail is yours to set.`

// runFitPin makes a table-path pin from a TLP curve or an IBIS model.
func runFitPin(args []string, stdout, stderr io.Writer) error {
	fs := newFlags("fit pin", "fit pin (--tlp FILE | --ibis FILE --model NAME) [options]", fitPinExample, stderr)
	tlp := fs.String("tlp", "", "make the pin from a TLP curve in `FILE` (CSV: v, i, optional leak)")
	it2 := fs.String("it2", "", "the failure current, e.g. 1.8A (default: from the leak column)")
	leak := fs.StringArray("leak", nil, "add a point V@A below the TLP rows, e.g. 3.3V@2nA (repeatable; needs --table)")
	table := fs.String("table", "", "write the pin's table to `FILE` and name it in the part (needed with --leak)")
	ibis := fs.String("ibis", "", "import the pin from an IBIS `FILE`")
	model := fs.String("model", "", "the IBIS [Model] or pin name")
	corner := fs.String("corner", "typ", "the IBIS corner: typ, min or max")
	o := addFitOutputs(fs, "the file's or the model's name", "the data and the table")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if err := oneSource(fs, "fit pin: give --tlp or --ibis", *tlp != "", *ibis != ""); err != nil {
		return err
	}
	if *ibis != "" {
		return fitPinIBIS(*ibis, *model, *corner, *o, stdout, stderr)
	}
	given, err := optionalValue("--it2", *it2, spec.Ampere, spec.Positive)
	if err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	extra, err := leakPoints(*leak)
	if err != nil {
		return err
	}
	if len(extra) > 0 && *table == "" {
		return errors.New("fit pin: --leak adds points to the table, which the part must name: give --table FILE")
	}
	return fitPinTLP(*tlp, given, extra, *table, *o, stdout, stderr)
}

// leakPoints reads the --leak points, VOLTAGE@CURRENT each.
func leakPoints(leaks []string) ([][2]float64, error) {
	var extra [][2]float64
	for _, l := range leaks {
		vs, is, ok := strings.Cut(l, "@")
		if !ok {
			return nil, fmt.Errorf("fit pin: --leak %q: write VOLTAGE@CURRENT, e.g. 3.3V@2nA", l)
		}
		v, err1 := netlist.ParseValue("the voltage of --leak", vs, spec.Volt, spec.Any)
		i, err2 := netlist.ParseValue("the current of --leak", is, spec.Ampere, spec.Any)
		if err := errors.Join(err1, err2); err != nil {
			return nil, fmt.Errorf("fit pin: %w", err)
		}
		extra = append(extra, [2]float64{v, i})
	}
	return extra, nil
}

// fitPinTLP makes a table-path pin from the TLP curve at path with the
// failure current given (0: from the leakage's jump) and the extra points
// below the curve, and writes its table to table ("" for none, the part
// then naming the curve itself).
func fitPinTLP(path string, given float64, extra [][2]float64, table string, o fitOutputs, stdout, stderr io.Writer) error {
	t, err := readFitData("fit pin", path, datafile.ReadTLP)
	if err != nil {
		return err
	}
	f, err := fit.PinTable(t, given, extra...)
	if err != nil {
		return fitError("fit pin: "+path, err)
	}
	if err := o.check([]string{path}, "--table", table); err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	name, err := o.partName(stem(path))
	if err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	tablePath := path
	if table != "" {
		tablePath = table
	}
	part := fit.Part{Name: name, Kind: "pin", Words: []fit.Word{{Key: "table", Value: tablePath, Quote: true}}}
	if f.It2 > 0 {
		part.Num = append(part.Num, fit.Num{Key: "ifail", Value: f.It2, Unit: "A"})
	} else {
		f.Notes = append(f.Notes, "no failure current: the leakage never jumps and --it2 was not given; set ifail yourself")
	}
	doc, err := f.Document(part, []string{path}, t)
	if err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	if given > 0 {
		doc.SetFrom("ifail", "--it2")
	} else {
		doc.SetFrom("ifail", "the leakage's jump (It2)")
	}
	doc.Notes = append(doc.Notes, "table= is read beside the file that holds the part line: move the part or the table so that the path fits")
	if table != "" {
		if err := writePinTable(table, f); err != nil {
			return fmt.Errorf("fit pin: --table: %w", err)
		}
	}
	return finishFit(doc, o, stdout, stderr)
}

// writePinTable writes the pin's table as a TLP-style CSV the deck reads.
func writePinTable(path string, f *fit.PinTableFit) error {
	return report.WriteFile(path, func(w io.Writer) error {
		fmt.Fprintln(w, "# table-path pin written by zapnet fit pin")
		fmt.Fprintln(w, "v [V],i [A]")
		for k := range f.V {
			fmt.Fprintf(w, "%.9g,%.9g\n", f.V[k], f.I[k])
		}
		return nil
	})
}

// fitPinIBIS imports an IBIS pin.
func fitPinIBIS(path, model, corner string, o fitOutputs, stdout, stderr io.Writer) error {
	if model == "" {
		return errors.New("fit pin: --ibis needs --model NAME, a [Model] or a pin of the file")
	}
	k := datafile.CornerIndex(corner)
	if k < 0 {
		return fmt.Errorf("fit pin: --corner is typ, min or max, not %q", corner)
	}
	ib, err := readFitData("fit pin", path, datafile.ReadIBIS)
	if err != nil {
		return err
	}
	pm, err := ib.PinModel(model, k)
	if err != nil {
		return fitError("fit pin: "+path, err)
	}
	if err := o.check([]string{path}); err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	s, notes, err := devices.IBISPin(model, [2]string{"p", "gnd"}, "", pm)
	if err != nil {
		return fmt.Errorf("fit pin: %w", err)
	}
	name, err := o.partName(pm.Model)
	if err != nil {
		return fmt.Errorf("fit pin: %w (give --name)", err)
	}
	part := fit.Part{Name: name, Kind: "pin", Words: []fit.Word{
		{Key: "ibis", Value: path, Quote: true}, {Key: "model", Value: model}, {Key: "corner", Value: corner}}}
	doc := fit.IBISDocument(part, []string{path}, pm, s)
	var corners []string
	for _, c := range []string{"typ", "min", "max"} {
		q, err := ib.PinModel(model, datafile.CornerIndex(c))
		if err != nil {
			continue
		}
		corners = append(corners, fmt.Sprintf("%s: C_comp %s, package %s, %s, %s, reference %s", c,
			spec.FormatSI(q.CComp, "F"), spec.FormatSI(q.Rpkg, "Ω"), spec.FormatSI(q.Lpkg, "H"), spec.FormatSI(q.Cpkg, "F"), spec.FormatSI(q.PowerRef, "V")))
	}
	doc.Notes = append(doc.Notes, "the corners of "+pm.Model+" — "+strings.Join(corners, "; ")+"; to run all three, vary U1.corner=min,typ,max in the deck")
	doc.Notes = append(doc.Notes, notes...)
	doc.Notes = append(doc.Notes, "the table's points are the pin's DC current at each row's die voltage, both clamp tables together; a run notes every time the pin leaves the tables' range")
	return finishFit(doc, o, stdout, stderr)
}
