package main

import (
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"zapnet/devices/spec"
	"zapnet/mna/study"
	"zapnet/netlist"
)

const checkExample = `  zapnet check testdata/demo.zap

  reads the deck and the part library it includes, then prints the circuit
  as zapnet understood it (every parameter with its default filled in) and
  the study it describes: 4 levels × 2 polarities × 1 variant = 8 runs.
  A deck with problems prints each as file:line:col: message and exits 2.`

// checkOptions are the options of zapnet check.
type checkOptions struct {
	quiet bool // only problems, no listing
}

// runCheck reads a deck and either lists every problem in it (exit status 2)
// or shows the circuit and the study plan as zapnet understood them.
func runCheck(args []string, stdout, stderr io.Writer) error {
	var o checkOptions
	fs := newFlags("check", "check [options] DECK", checkExample, stderr)
	fs.BoolVarP(&o.quiet, "quiet", "q", false, "print only the problems and warnings, no listing")
	if err := fs.Parse(args); err != nil {
		return err
	}
	if fs.NArg() != 1 {
		fs.Usage()
		return errors.New("check needs one deck: zapnet check DECK")
	}
	deck := fs.Arg(0)
	c, err := netlist.ParseFile(deck)
	if err != nil {
		var list netlist.ErrorList
		if !errors.As(err, &list) {
			return err
		}
		for _, e := range list {
			fmt.Fprintln(stderr, e.Error())
		}
		n := list.Problems()
		if n == 1 {
			return fmt.Errorf("%s: 1 problem", deck)
		}
		return fmt.Errorf("%s: %d problems", deck, n)
	}
	if o.quiet {
		for _, w := range c.Warnings {
			fmt.Fprintln(stderr, w.Error())
		}
		if s := longStudy(c); s != "" {
			fmt.Fprintln(stderr, "warning: "+s)
		}
		fmt.Fprintf(stdout, "%s: no problems; %s, %s\n", deck, count(len(c.Elements), "element"), count(c.Plan().Runs(), "run"))
		return nil
	}
	writeListing(stdout, deck, c)
	return nil
}

// writeListing prints the checked circuit and its study. Every number goes
// through FormatSI so that the listing is stable across platforms.
func writeListing(w io.Writer, deck string, c *netlist.Circuit) {
	title := c.Title
	if title == "" {
		title = "(untitled)"
	}
	fmt.Fprintf(w, "%s\ndeck %s\n\n", title, deck)
	fmt.Fprintf(w, "Nodes (%d besides gnd)\n  %s\n\n", len(c.Nodes), strings.Join(c.Nodes, " "))
	for _, section := range []func(io.Writer, *netlist.Circuit){listElements, listWatches, listWindow, listTolerances, listStudy, listWarnings} {
		section(w, c)
	}
}

// listElements lists every element with its parameters, defaults filled in.
func listElements(w io.Writer, c *netlist.Circuit) {
	fmt.Fprintf(w, "Elements (%d)\n", len(c.Elements))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, e := range c.Elements {
		fmt.Fprintf(tw, "  %s\t%s\t%s → %s\t%s\n", e.Kind.Name, e.Name, e.Nodes[0], e.Nodes[1], strings.Join(elementParams(e), ", "))
	}
	tw.Flush()
	fmt.Fprintln(w)
}

// listWatches lists the watched nodes and their limits.
func listWatches(w io.Writer, c *netlist.Circuit) {
	fmt.Fprintln(w, "Watches")
	if len(c.Watches) == 0 {
		fmt.Fprintln(w, "  none")
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, wt := range c.Watches {
		var lim []string
		if wt.HasMax {
			lim = append(lim, "max "+spec.FormatSI(wt.Max, "V"))
		}
		if wt.HasMin {
			lim = append(lim, "min "+spec.FormatSI(wt.Min, "V"))
		}
		if wt.Peaking > 0 {
			lim = append(lim, fmt.Sprintf("peaking %g dB", wt.Peaking))
		}
		if wt.CMax > 0 {
			lim = append(lim, "cmax "+spec.FormatSI(wt.CMax, spec.Farad))
		}
		if wt.Rise > 0 {
			lim = append(lim, "rise "+spec.FormatSI(wt.Rise, spec.Second))
		}
		if len(lim) == 0 {
			lim = []string{"reported, no limits"}
		}
		fmt.Fprintf(tw, "  %s\t%s\n", wt.Node, strings.Join(lim, ", "))
	}
	tw.Flush()
	fmt.Fprintln(w)
}

// listWindow says what span and accuracy the deck asks for.
func listWindow(w io.Writer, c *netlist.Circuit) {
	fmt.Fprintln(w, "Window")
	win := c.Window
	field := func(name, v, zero string) {
		if v == "" {
			v = zero
		}
		fmt.Fprintf(w, "  %-8s %s\n", name, v)
	}
	si := func(v float64) string {
		if v == 0 {
			return ""
		}
		return spec.FormatSI(v, spec.Second)
	}
	accuracy := spec.FormatFraction(spec.DefaultAccuracy) + " (the default) on every reported number"
	if win.Accuracy > 0 {
		accuracy = spec.FormatFraction(win.Accuracy) + " on every reported number"
	}
	field("stop", si(win.Stop), "from the waveform and the circuit")
	field("accuracy", accuracy, "")
	field("resolve", si(win.Resolve), "as fine as the accuracy needs")
	fmt.Fprintln(w)
}

// listTolerances lists the manufacturing spreads.
func listTolerances(w io.Writer, c *netlist.Circuit) {
	fmt.Fprintln(w, "Tolerances")
	if len(c.Tolerances) == 0 {
		fmt.Fprintln(w, "  none")
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	for _, t := range c.Tolerances {
		dist := "uniform"
		if t.Dist == "normal" {
			dist = "normal, ±" + trimFloat(t.Percent) + " % is 3σ"
		}
		fmt.Fprintf(tw, "  %s.%s\t±%s %%\t%s\n", t.Element, t.Param, trimFloat(t.Percent), dist)
	}
	tw.Flush()
	fmt.Fprintln(w)
}

// workText says what a study will cost: "about 3 000 steps a run" or
// "at least 2 000 000 steps a run (T1's step bound of 10 ps over a 20 µs
// window), 8 000 000 in all".
func workText(w study.Work) string {
	if w.Bound == "" {
		return fmt.Sprintf("about %s steps a run, %s in all", stepCount(study.TypicalSteps), stepCount(w.Total()))
	}
	return fmt.Sprintf("at least %s steps a run (%s), %s in all", stepCount(w.Steps), w.Bound, stepCount(w.Total()))
}

// stepCount writes a count of steps with thin grouping: 2 000 000.
func stepCount(n float64) string {
	s := strconv.FormatFloat(n, 'f', 0, 64)
	for i := len(s) - 3; i > 0; i -= 3 {
		s = s[:i] + " " + s[i:]
	}
	return s
}

// shownVariants is how many variants check lists: enough to see how the
// vary lines combine.
const shownVariants = 20

// listStudy counts the runs of the study and lists its levels, polarities and variants.
func listStudy(w io.Writer, c *netlist.Circuit) {
	pl := c.Plan()
	unit := pl.Waveform.Unit
	levels := make([]string, len(pl.Levels))
	for i, l := range pl.Levels {
		levels[i] = spec.FormatSI(l, unit)
	}
	fmt.Fprintln(w, "Study")
	fmt.Fprintf(w, "  %s: %s × %s × %s = %s\n", pl.Waveform.Name,
		count(len(pl.Levels), "level"), count(len(pl.Polarities), "polarity"),
		count(len(pl.Variants), "variant"), count(pl.Runs(), "run"))
	if work, err := study.EstimateWork(c, nil); err == nil {
		fmt.Fprintf(w, "  work        %s\n", workText(work))
	}
	fmt.Fprintf(w, "  levels      %s\n", strings.Join(levels, ", "))
	fmt.Fprintf(w, "  polarities  %s\n", strings.Join(pl.Polarities, ", "))
	for i, v := range pl.Variants {
		head := "            "
		if i == 0 {
			head = "  variants  "
		}
		if i == shownVariants && len(pl.Variants) > shownVariants+1 {
			fmt.Fprintf(w, "%s... and %d more\n", head, len(pl.Variants)-i)
			break
		}
		text := "the deck as written"
		if len(v) > 0 {
			s := make([]string, len(v))
			for k, x := range v {
				s[k] = x.String()
			}
			text = strings.Join(s, " ")
		}
		fmt.Fprintf(w, "%s%*d  %s\n", head, 2, i+1, text)
	}
	fmt.Fprintln(w)
}

// listWarnings lists the warnings.
func listWarnings(w io.Writer, c *netlist.Circuit) {
	fmt.Fprintln(w, "Warnings")
	long := longStudy(c)
	if len(c.Warnings) == 0 && long == "" {
		fmt.Fprintln(w, "  none")
	}
	for _, e := range c.Warnings {
		fmt.Fprintf(w, "  %s: %s\n", e.Pos, e.Msg)
	}
	if long != "" {
		fmt.Fprintf(w, "  %s\n", long)
	}
}

// longStudy warns of a study whose work passes study.LongStudy steps, ""
// otherwise.
func longStudy(c *netlist.Circuit) string {
	w, err := study.EstimateWork(c, nil)
	if err != nil || w.Total() <= study.LongStudy {
		return ""
	}
	return fmt.Sprintf("the study takes %s steps or more (%s; %d runs): expect a long run; a finer window resolve= or a long line under a fast stimulus costs steps, and a line far shorter than the stimulus's rise is lumped by itself",
		stepCount(w.Total()), w.Bound, w.Runs)
}

// elementParams renders an element's parameters in the order of the
// language reference, each with its unit.
func elementParams(e *netlist.Element) []string {
	var out []string
	if e.IsStrike() {
		out = append(out, "waveform "+e.Waveform.Name, "polarity "+e.Polarity)
	} else if e.Part != "" {
		out = append(out, "part "+e.Part)
	}
	t := e.Values.Table()
	for _, w := range t.Words {
		if v := e.Values.Word(w.Key); v != "" {
			out = append(out, w.Key+" "+v)
		}
	}
	for _, p := range t.Params {
		if v, ok := e.Values.Lookup(p.Key); ok {
			out = append(out, p.Key+" "+spec.FormatSI(v, p.Unit))
		}
	}
	return out
}

func count(n int, what string) string {
	if n == 1 {
		return "1 " + what
	}
	if what == "polarity" {
		return fmt.Sprintf("%d polarities", n)
	}
	return fmt.Sprintf("%d %ss", n, what)
}

// trimFloat prints a percentage without trailing zeros.
func trimFloat(v float64) string {
	return strings.TrimSuffix(spec.FormatSI(v, ""), " ")
}
