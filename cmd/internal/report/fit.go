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

	fitted := map[string]bool{}
	for _, k := range d.Fitted {
		fitted[k] = true
	}
	if len(d.Order) > 0 {
		fmt.Fprintln(bw, "Parameters")
		t := newTable(bw, []string{"parameter", "value", "standard error", "from"})
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
		fmt.Fprintln(bw)
	}

	if len(d.Points) > 0 {
		fmt.Fprintln(bw, "Points")
		bead := d.Bead != nil
		head := []string{"where", "what", "at", "measured", "model", "residual", ""}
		if bead {
			head = []string{"where", "frequency", "bias", "measured", "model", "residual", ""}
		}
		t := newTable(bw, head)
		t.Header(toAny(head)...)
		worst, worstAt := 0.0, ""
		for _, p := range d.Points {
			note := ""
			if !p.Used {
				note = "not fitted: " + p.Why
			} else if math.Abs(p.Residual) > math.Abs(worst) {
				worst, worstAt = p.Residual, p.Where
			}
			meas, mod := spec.FormatSI(p.Measured, spec.Unit(p.Unit)), spec.FormatSI(p.Fitted, spec.Unit(p.Unit))
			if p.What == "z" {
				meas, mod = complexText(p.MeasuredRe, p.MeasuredIm), complexText(p.FittedRe, p.FittedIm)
			}
			res := signedPercent(100 * p.Residual)
			if p.What == "z" {
				res = fitPercent(100 * p.Residual) // a distance in the complex plane has no sign
			}
			row := []string{p.Where, p.What, spec.FormatSI(p.X, spec.Unit(p.XUnit)), meas, mod, res, note}
			if bead {
				row = []string{p.Where, spec.FormatSI(p.X, "Hz"), spec.FormatSI(p.Bias, "A"), meas, mod, res, note}
			}
			if err := t.Append(toAny(row)...); err != nil {
				return err
			}
		}
		if err := t.Render(); err != nil {
			return err
		}
		if worstAt != "" || worst != 0 {
			fmt.Fprintf(bw, "Largest residual of the fitted points: %s", fitPercent(100*math.Abs(worst)))
			if worstAt != "" {
				fmt.Fprintf(bw, " (%s)", worstAt)
			}
			fmt.Fprintln(bw)
		}
		fmt.Fprintln(bw)
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
