package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/pflag"

	"zapnet/cmd/internal/plots"
	"zapnet/cmd/internal/report"
	"zapnet/devices/spec"
	"zapnet/mna/fit"
	"zapnet/netlist"
	"zapnet/netlist/datafile"
)

// fitCaution ends every fit report (SAFETY.md).
const fitCaution = "A fitted model is an estimate of a part from its data, and a simulation with it an estimate, not a compliance result."

const fitUsage = `Usage:
  zapnet fit clamp (--tlp FILE.csv | --datasheet FILE | --point 'KEY VALUE [@ COND] [PULSE]'...) [options]
  zapnet fit bead  (--touchstone FILE[@BIAS]... | --z FILE.csv) [options]
  zapnet fit pin   (--tlp FILE.csv | --ibis FILE --model NAME) [options]

Turns the data a part comes with (TLP curves, datasheet points, impedance
curves, Touchstone and IBIS files) into a part line for a deck, with every
data point beside the fitted model. Run 'zapnet fit clamp --help' (or bead,
pin) for the options and a worked example.
`

// fitOutputs are the options every fit shares.
type fitOutputs struct {
	name string // the part's name; "" from the data
	json string // --json file, "-" stdout
	plot string // --plot folder
}

// addFitOutputs adds --name, --json and --plot to a fit's flag set;
// nameFrom says where the default name comes from, drawn what the figures
// show.
func addFitOutputs(fs *pflag.FlagSet, nameFrom, drawn string) *fitOutputs {
	o := &fitOutputs{}
	fs.StringVar(&o.name, "name", "", "the part's `NAME` (default: "+nameFrom+")")
	fs.StringVar(&o.json, "json", "", "write the result as JSON to `FILE` (- for stdout)")
	fs.StringVar(&o.plot, "plot", "", "draw "+drawn+" as SVG into folder `DIR`")
	return o
}

// partName is --name, or def without it, refused where the deck language
// would not read it.
func (o fitOutputs) partName(def string) (string, error) {
	name := def
	if o.name != "" {
		name = o.name
	}
	return name, checkPartName(name)
}

// checkPartName refuses a name the deck language would not read.
func checkPartName(name string) error {
	if name == "" {
		return errors.New("the part needs a name: give --name")
	}
	if m := netlist.NameProblem(name); m != "" {
		return fmt.Errorf("%q is not a part name: it %s", name, m)
	}
	return nil
}

// oneSource checks that exactly one kind of data is given and nothing
// else beside the options; msg says which kinds there are.
func oneSource(fs *pflag.FlagSet, msg string, given ...bool) error {
	n := 0
	for _, g := range given {
		if g {
			n++
		}
	}
	if n != 1 || fs.NArg() != 0 {
		fs.Usage()
		return errors.New(msg)
	}
	return nil
}

// optionalValue reads an option's value in unit; 0 when it is not given.
func optionalValue(flag, text string, unit spec.Unit, rule spec.Rule) (float64, error) {
	if text == "" {
		return 0, nil
	}
	return netlist.ParseValue(flag, text, unit, rule)
}

// readFitData reads the data file at path with read; what starts the
// messages ("fit clamp").
func readFitData[T any](what, path string, read func(string, []byte) (T, error)) (T, error) {
	var zero T
	src, err := datafile.ReadFile(path)
	if err != nil {
		return zero, fmt.Errorf("%s: %w", what, err)
	}
	v, err := read(path, src)
	if err != nil {
		return zero, fitError(what, err)
	}
	return v, nil
}

// runFit dispatches zapnet fit clamp|bead|pin.
func runFit(args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 || args[0] == "-h" || args[0] == "--help" {
		fmt.Fprint(stderr, fitUsage)
		if len(args) == 0 {
			return errors.New("fit: say what to fit: clamp, bead or pin")
		}
		return nil
	}
	switch args[0] {
	case "clamp":
		return runFitClamp(args[1:], stdout, stderr)
	case "bead":
		return runFitBead(args[1:], stdout, stderr)
	case "pin":
		return runFitPin(args[1:], stdout, stderr)
	}
	return fmt.Errorf("fit: unknown part %q: fit clamp, bead or pin", args[0])
}

// stem is a file's name without folder and extension: the default part
// name.
func stem(path string) string {
	b := filepath.Base(path)
	b = strings.TrimSuffix(b, filepath.Ext(b))
	// A part name starts with a letter or _ and holds letters, digits, _,
	// - and . (LANGUAGE.md).
	var out strings.Builder
	for i, r := range b {
		ok := r == '_' || r == '-' || r == '.' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z') || (r >= '0' && r <= '9')
		if !ok {
			r = '_'
		}
		if i == 0 && !(r == '_' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z')) {
			out.WriteRune('p')
		}
		out.WriteRune(r)
	}
	if out.Len() == 0 {
		return "fitted"
	}
	return out.String()
}

// check checks every output of a fit before the fit runs (see outputs):
// none may be one of the data files read, --plot's folder is made now;
// files (flag, path pairs) are files a part names, never standard output.
func (o fitOutputs) check(inputs []string, files ...string) error {
	out := newOutputs(inputs...)
	out.file("--json", o.json)
	out.dir("--plot", o.plot)
	for k := 0; k+1 < len(files); k += 2 {
		out.named(files[k], files[k+1])
	}
	return out.err()
}

// finishFit prints the report of a fit and writes what was asked, every
// file whole or not at all. With --json - the report goes to stderr, as
// every command's tables do, so that the JSON stays parseable and the
// caution is still shown.
func finishFit(doc fit.Document, o fitOutputs, stdout, stderr io.Writer) error {
	doc.Tool, doc.Version = "zapnet", Version
	var errs []error
	if o.plot != "" {
		figs, err := plots.FitFigures(&doc, nil)
		if err != nil {
			errs = append(errs, fmt.Errorf("--plot: %w", err))
		} else {
			for _, f := range figs {
				path := filepath.Join(o.plot, doc.Name+"_"+f.Name+".svg")
				if err := report.WriteFile(path, func(w io.Writer) error { _, err := w.Write(f.SVG); return err }); err != nil {
					errs = append(errs, fmt.Errorf("--plot: %w", err))
				}
			}
		}
	}
	if o.json != "" {
		if err := writeOutput(o.json, stdout, doc); err != nil {
			errs = append(errs, fmt.Errorf("--json: %w", err))
		}
	}
	if err := report.FitText(tablesOut(o.json, stdout, stderr), &doc, fitCaution); err != nil {
		errs = append(errs, err)
	}
	return errors.Join(errs...)
}

// fitError says that a data file is unusable, listing its problems one a
// line as file:line:col: message.
func fitError(what string, err error) error {
	var list datafile.ErrorList
	if errors.As(err, &list) {
		return fmt.Errorf("%s: %d problem(s):\n%s", what, list.Problems(), list.Error())
	}
	return fmt.Errorf("%s: %w", what, err)
}
