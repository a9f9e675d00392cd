package report

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"

	"zapnet/devices/spec"
	"zapnet/mna/fit"
)

// FitText writes a fit's report: the part line, the parameters with their
// standard errors, every point with the model beside it, the bead's
// figures, the notes and the caution.
func FitText(w io.Writer, d *fit.Document, caution string) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "Fit of %s %s, %s, from %s\n\n", article(d.Kind), d.Kind, d.Name, strings.Join(d.Sources, ", "))
	fmt.Fprintf(bw, "  %s\n\n", d.Part)
	if len(d.Order) > 0 {
		if err := fitParameters(bw, d); err != nil {
			return err
		}
	}
	if len(d.Points) > 0 {
		if err := fitPoints(bw, d); err != nil {
			return err
		}
	}
	if b := d.Bead; b != nil {
		fmt.Fprintf(bw, "Self-resonance %s; |Z| at 100 MHz %s; ", spec.FormatSI(b.SRF, "Hz"), spec.FormatSI(b.Z100MHz, "Ω"))
		if b.BandHi > 0 {
			fmt.Fprintf(bw, "the fit holds within %s from %s to %s\n\n", percent(100*b.Within), spec.FormatSI(b.BandLo, "Hz"), spec.FormatSI(b.BandHi, "Hz"))
		} else {
			fmt.Fprintf(bw, "no stretch of the data is within %s of the fit\n\n", percent(100*b.Within))
		}
	}
	if len(d.Notes) > 0 {
		fmt.Fprintln(bw, "Notes")
		for _, n := range d.Notes {
			fmt.Fprintf(bw, "  - %s\n", n)
		}
		fmt.Fprintln(bw)
	}
	fmt.Fprintln(bw, caution)
	return bw.Flush()
}

// fitParameters prints each parameter with its standard error and where
// its value came from.
func fitParameters(w io.Writer, d *fit.Document) error {
	fitted := map[string]bool{}
	for _, k := range d.Fitted {
		fitted[k] = true
	}
	fmt.Fprintln(w, "Parameters")
	t := newTable(w, []string{"parameter", "value", "standard error", "from"})
	t.Header("parameter", "value", "standard error", "from")
	for _, k := range d.Order {
		from, se := "given", ""
		if f, ok := d.From[k]; ok {
			from = f
		}
		if fitted[k] {
			from = "fitted"
			if s, ok := d.Sigma[k]; ok {
				se = fitPercent(100 * s)
			}
		}
		if err := t.Append(k, spec.FormatSI(d.Params[k], spec.Unit(d.Units[k])), se, from); err != nil {
			return err
		}
	}
	if err := t.Render(); err != nil {
		return err
	}
	fmt.Fprintln(w)
	return nil
}

// fitPoints prints every point with the model beside it, and the largest
// residual of those fitted.
func fitPoints(w io.Writer, d *fit.Document) error {
	fmt.Fprintln(w, "Points")
	bead := d.Bead != nil
	head := []string{"where", "what", "at", "measured", "model", "residual", ""}
	if bead {
		head = []string{"where", "frequency", "bias", "measured", "model", "residual", ""}
	}
	t := newTable(w, head)
	t.Header(toAny(head)...)
	worst, worstAt := 0.0, ""
	for _, p := range d.Points {
		if p.Used && math.Abs(p.Residual) > math.Abs(worst) {
			worst, worstAt = p.Residual, p.Where
		}
		if err := t.Append(toAny(fitPointRow(p, bead))...); err != nil {
			return err
		}
	}
	if err := t.Render(); err != nil {
		return err
	}
	if worstAt != "" || worst != 0 {
		fmt.Fprintf(w, "Largest residual of the fitted points: %s", fitPercent(100*math.Abs(worst)))
		if worstAt != "" {
			fmt.Fprintf(w, " (%s)", worstAt)
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintln(w)
	return nil
}

// fitPointRow is a point's row: a bead's by frequency and bias, any
// other's by what it is and where it was measured.
func fitPointRow(p fit.Point, bead bool) []string {
	note := ""
	if !p.Used {
		note = "not fitted: " + p.Why
	}
	meas, mod := spec.FormatSI(p.Measured, spec.Unit(p.Unit)), spec.FormatSI(p.Fitted, spec.Unit(p.Unit))
	if p.What == "z" {
		meas, mod = complexText(p.MeasuredRe, p.MeasuredIm), complexText(p.FittedRe, p.FittedIm)
	}
	res := signedPercent(100 * p.Residual)
	if p.What == "z" {
		res = fitPercent(100 * p.Residual) // a distance in the complex plane has no sign
	}
	if bead {
		return []string{p.Where, spec.FormatSI(p.X, "Hz"), spec.FormatSI(p.Bias, "A"), meas, mod, res, note}
	}
	return []string{p.Where, p.What, spec.FormatSI(p.X, spec.Unit(p.XUnit)), meas, mod, res, note}
}

func article(kind string) string {
	if kind != "" && strings.ContainsRune("aeiou", rune(kind[0])) {
		return "an"
	}
	return "a"
}

func complexText(re, im float64) string {
	sign := "+"
	if im < 0 {
		sign, im = "−", -im
	}
	return fmt.Sprintf("%s %s j%s", strings.TrimSuffix(spec.FormatSI(re, "Ω"), " Ω"), sign, spec.FormatSI(im, "Ω"))
}

// fitPercent shows a fit's small percentages to two decimals.
func fitPercent(p float64) string { return fmt.Sprintf("%.2f %%", p) }

func signedPercent(p float64) string {
	switch {
	case math.Abs(p) < 0.005:
		return fitPercent(0)
	case p > 0:
		return "+" + fitPercent(p)
	}
	return "−" + fitPercent(-p)
}
