package datafile

import (
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

func near(a, b complex128, tol float64) bool { return cmplx.Abs(a-b) <= tol*math.Max(1, cmplx.Abs(b)) }

// The same two-port written in the three formats of the option line.
// S21 = 0.5∠−30°, S11 = S22 = 0.1∠0°, S12 = S21. In decibels 0.5 is
// 20·log10(0.5) = −6.020599913 dB and 0.1 is −20 dB; in real and imaginary
// parts 0.5∠−30° is 0.4330127019 − j0.25 [calc]. The series-through
// impedance Z = 2·Z0·(1 − S21)/S21 = 100·(2∠30° − 1) = 73.20508076 + j100 Ω
// [calc: CHECKS.md second round, Touchstone, by hand].
var s2pFormats = map[string]string{
	"MA": "! two-port, magnitude and angle\n# MHz S MA R 50\n100 0.1 0 0.5 -30 0.5 -30 0.1 0\n",
	"DB": "# MHz S DB R 50\n100 -20 0 -6.020599913279624 -30 -6.020599913279624 -30 -20 0\n",
	"RI": "# MHz S RI R 50 ! real and imaginary\n100 0.1 0 0.43301270189221935 -0.25 0.43301270189221935 -0.25 0.1 0\n",
}

func TestTouchstoneFormatsAgree(t *testing.T) {
	wantZ := complex(73.20508075688774, 100)
	for format, src := range s2pFormats {
		ts, err := ReadTouchstone("bead."+strings.ToLower(format)+".s2p", []byte(src))
		if err != nil {
			t.Fatalf("%s: %v", format, err)
		}
		if ts.Ports != 2 || ts.Format != format || ts.Freq[0] != 100e6 {
			t.Errorf("%s: ports %d format %s f %g", format, ts.Ports, ts.Format, ts.Freq[0])
		}
		if s21 := ts.At(0, 2, 1); !near(s21, cmplx.Rect(0.5, -math.Pi/6), 1e-12) {
			t.Errorf("%s: S21 = %v", format, s21)
		}
		if s11 := ts.At(0, 1, 1); !near(s11, 0.1, 1e-12) {
			t.Errorf("%s: S11 = %v", format, s11)
		}
		z, how, err := ts.Impedance()
		if err != nil {
			t.Fatalf("%s: %v", format, err)
		}
		if !near(z[0], wantZ, 1e-12) {
			t.Errorf("%s: Z = %v, by hand %v (%s)", format, z[0], wantZ, how)
		}
	}
}

func TestTouchstoneOnePort(t *testing.T) {
	// S11 = 0.6∠45° → Z = 50·(1 + S11)/(1 − S11) = 62.56453647 + j82.94964000 Ω
	// [calc, CHECKS.md second round]; the same data in decibels
	// (20·log10 0.6 = −4.436974992 dB).
	want := complex(62.56453647093081, 82.94964000072795)
	for _, src := range []string{
		"# GHz S MA R 50\n1.5 0.6 45\n",
		"# GHz S DB R 50\n1.5 -4.436974992327127 45\n",
		"# S RI\n1.5 0.4242640687119285 0.42426406871192845\n", // GHz and R 50 by default
	} {
		ts, err := ReadTouchstone("x.s1p", []byte(src))
		if err != nil {
			t.Fatal(err)
		}
		if ts.Freq[0] != 1.5e9 {
			t.Errorf("frequency %g, want 1.5 GHz (GHz is the default unit)", ts.Freq[0])
		}
		z, _, err := ts.Impedance()
		if err != nil {
			t.Fatal(err)
		}
		if !near(z[0], want, 1e-12) {
			t.Errorf("%q: Z = %v, want %v", src, z[0], want)
		}
	}
}

func TestTouchstoneVersion1NormalisesZ(t *testing.T) {
	// The specification's own example: version 1 Z-parameters are
	// normalised to R, so 0.99∠−4° at R 75 is 74.25∠−4° Ω [pub: Touchstone
	// 2.0 specification, example 9]; version 2 data is not normalised.
	v1 := "!1-port Z-parameter file\n# MHz Z MA R 75\n!freq magZ11 angZ11\n100 0.99 -4\n200 0.80 -22\n"
	ts, err := ReadTouchstone("z.s1p", []byte(v1))
	if err != nil {
		t.Fatal(err)
	}
	z, _, _ := ts.Impedance()
	if !near(z[0], cmplx.Rect(74.25, -4*math.Pi/180), 1e-12) {
		t.Errorf("version 1: Z = %v, want 74.25∠−4° Ω", z[0])
	}
	v2 := "[Version] 2.0\n# MHz Z MA R 75\n[Number of Ports] 1\n[Number of Frequencies] 2\n[Network Data]\n100 74.25 -4\n200 60 -22\n[End]\n"
	ts, err = ReadTouchstone("z.ts", []byte(v2))
	if err != nil {
		t.Fatal(err)
	}
	z, _, _ = ts.Impedance()
	if !near(z[0], cmplx.Rect(74.25, -4*math.Pi/180), 1e-12) {
		t.Errorf("version 2: Z = %v, want 74.25∠−4° Ω (not normalised)", z[0])
	}
}

func TestTouchstoneVersion2Order(t *testing.T) {
	// [Two-Port Data Order] 21_12 is version 1's order N11 N21 N12 N22;
	// 12_21 is N11 N12 N21 N22 [pub: Touchstone 2.0 specification].
	head := "[Version] 2.0\n# Hz S RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] %s\n[Reference] 50 50\n[Number of Frequencies] 1\n[Network Data]\n1 11 0 %s 0 %s 0 22 0\n[End]\n"
	for _, c := range []struct{ order, second, third string }{{"21_12", "21", "12"}, {"12_21", "12", "21"}} {
		text := strings.Replace(head, "%s", c.order, 1)
		text = strings.Replace(text, "%s", c.second, 1)
		text = strings.Replace(text, "%s", c.third, 1)
		ts, err := ReadTouchstone("o.s2p", []byte(text))
		if err != nil {
			t.Fatalf("%s: %v", c.order, err)
		}
		if ts.At(0, 2, 1) != 21 || ts.At(0, 1, 2) != 12 || ts.At(0, 2, 2) != 22 {
			t.Errorf("%s: S21 %v S12 %v S22 %v", c.order, ts.At(0, 2, 1), ts.At(0, 1, 2), ts.At(0, 2, 2))
		}
	}
}

func TestTouchstoneSeriesPart(t *testing.T) {
	// A part Z in series between two 50 Ω ports has S21 = 2·Z0/(2·Z0 + Z)
	// and Y21 = −1/Z [calc: two-port definitions]; both read back as Z.
	zs := []complex128{complex(0.3, 12), complex(450, 700), complex(1100, -3)}
	var s, y strings.Builder
	s.WriteString("# Hz S RI R 50\n")
	y.WriteString("[Version] 2.0\n# Hz Y RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Network Data]\n")
	for k, z := range zs {
		s21 := 100 / (100 + z)
		s11 := z / (100 + z)
		f := float64(k+1) * 1e6
		s.WriteString(fmtRow(f, s11, s21, s21, s11))
		y21 := -1 / z
		y.WriteString(fmtRow(f, -y21, y21, y21, -y21))
	}
	y.WriteString("[End]\n")
	for name, src := range map[string]string{"s.s2p": s.String(), "y.s2p": y.String()} {
		ts, err := ReadTouchstone(name, []byte(src))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		got, _, err := ts.Impedance()
		if err != nil {
			t.Fatal(err)
		}
		for k := range zs {
			if !near(got[k], zs[k], 1e-12) {
				t.Errorf("%s: Z[%d] = %v, want %v", name, k, got[k], zs[k])
			}
		}
	}
}

func fmtRow(f float64, n ...complex128) string {
	var b strings.Builder
	b.WriteString(ftoa(f))
	for _, z := range n {
		b.WriteString(" " + ftoa(real(z)) + " " + ftoa(imag(z)))
	}
	return b.String() + "\n"
}

func TestTouchstoneNoiseSkipped(t *testing.T) {
	// Version 1 two-port noise data starts where the frequency falls back.
	src := "# GHz S MA R 50\n1 0.1 0 0.9 -10 0.9 -10 0.1 0\n2 0.2 0 0.8 -20 0.8 -20 0.2 0\n! noise\n1 1.2 0.5 30 0.3\n2 1.5 0.4 40 0.3\n"
	ts, err := ReadTouchstone("n.s2p", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if len(ts.Freq) != 2 {
		t.Errorf("read %d frequencies, want 2 (noise data skipped)", len(ts.Freq))
	}
}

func TestTouchstoneErrors(t *testing.T) {
	for _, c := range []struct {
		name, src, want string
		kind            error
	}{
		{"a.s2p", "# MHz S MA R 50\n100 0.1 0 0.5 -30 0.5 -30 0.1\n", "a.s2p:2:1: the record of frequency 100 has 8 numbers", ErrSyntax},
		{"a.s1p", "# MHz S MA R 50\n100 0.1 0\n200 0.1 x\n", "a.s1p:3:9: \"x\" is not a number", ErrNumber},
		{"a.s1p", "# MHz S MA R 50\n100 0.1 0\n90 0.1 0\n", "a.s1p:3:1: frequency 90 does not rise", ErrOrder},
		{"a.s1p", "# MHz Q MA R 50\n100 0.1 0\n", "a.s1p:1:7: unknown option \"Q\"", ErrSyntax},
		{"a.s1p", "# MHz H MA R 50\n100 0.1 0\n", "a.s1p:1:7: H-parameters are not supported", ErrUnsupported},
		{"a.s1p", "  # MHz S MA R 0\n100 0.1 0\n", "a.s1p:1:16: a reference resistance must be > 0", ErrRange},
		{"a.s1p", "100 0.1 0\n", "a.s1p:1:1: data before the option line", ErrMissing},
		{"a.s2p", "[Version] 2.0\n# MHz S MA R 50\n[Number of Ports] 2\n[Network Data]\n100 0.1 0 0.5 -30 0.5 -30 0.1 0\n[End]\n", "a.s2p: a version 2 two-port file needs [Two-Port Data Order]", ErrMissing},
		{"a.dat", "# MHz S MA\n100 0.1 0 0.5\n", "a.dat:2:1: cannot tell the number of ports", ErrMissing},
		// The version is a number as the data's numbers are: NaN is none.
		{"a.s1p", "[Version] NaN\n# MHz S MA R 50\n[Number of Ports] 1\n[Network Data]\n100 0.1 0\n[End]\n", "a.s1p:1:11: [Version] NaN: zapnet reads versions 1.x and 2.x", ErrUnsupported},
	} {
		_, err := ReadTouchstone(c.name, []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.src, err, c.want)
			continue
		}
		if !errors.Is(err, c.kind) {
			t.Errorf("%q: error %v is not %v", c.src, err, c.kind)
		}
	}
}
