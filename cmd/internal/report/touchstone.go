package report

import (
	"fmt"
	"io"
	"math"
	"strings"
)

// Touchstone writes a two-port's scattering parameters as a Touchstone
// file of version 1 (.s2p), the open standard RF tools exchange them in:
//
//	! comment lines (each of comments, then the caution)
//	# Hz S RI R <z0>
//	<freq> <S11 re> <S11 im> <S21 re> <S21 im> <S12 re> <S12 im> <S22 re> <S22 im>
//
// The option line states every field rather than leaning on the format's
// defaults (GHz, MA, 50 Ω): frequencies in hertz, real and imaginary parts,
// one reference impedance z0 for both ports (version 1 has no other). A
// two-port's data lines keep the format's order N11 N21 N12 N22. s[k][i][j]
// is S(i+1)(j+1) at freq[k]. Numbers are %.12g.
func Touchstone(w io.Writer, freq []float64, s [][2][2]complex128, z0 float64, comments []string) error {
	if len(freq) != len(s) {
		panic("report: Touchstone: len(freq) != len(s)")
	}
	if !(z0 > 0) || math.IsInf(z0, 0) {
		return fmt.Errorf("touchstone: the reference impedance must be positive and finite, have %g Ω", z0)
	}
	var b strings.Builder
	for _, c := range comments {
		for _, line := range strings.Split(c, "\n") {
			fmt.Fprintf(&b, "! %s\n", line)
		}
	}
	fmt.Fprintf(&b, "! %s\n", Caution)
	fmt.Fprintf(&b, "# Hz S RI R %.12g\n", z0)
	for k, f := range freq {
		if k > 0 && !(f > freq[k-1]) {
			return fmt.Errorf("touchstone: frequencies must increase, have %g Hz after %g Hz", f, freq[k-1])
		}
		m := s[k]
		fmt.Fprintf(&b, "%.12g", f)
		for _, v := range []complex128{m[0][0], m[1][0], m[0][1], m[1][1]} {
			fmt.Fprintf(&b, " %.12g %.12g", real(v), imag(v))
		}
		b.WriteByte('\n')
	}
	_, err := io.WriteString(w, b.String())
	return err
}
