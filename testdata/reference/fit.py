#!/usr/bin/python3
"""Independent reference fits for zapnet's fitting library (mna/fit).

Invents data for a ferrite bead and a TVS clamp from the device equations of
the design contract (MODELS.md), adds noise of up to 1 %, writes the data as
the CSV files zapnet reads, and fits them with SciPy's general-purpose
nonlinear least-squares solver, scipy.optimize.least_squares, minimising the
same residuals zapnet's fits minimise (stated below). It also samples SciPy's
monotone cubic interpolant (PchipInterpolator) on an I-V table, for the
table path's interpolation. Nothing here is taken from the Go code; the two
meet only in mna/fit/reference_test.go and devices/ivtable_ref_test.go.

Usage (from the repository root):
    /usr/bin/python3 testdata/reference/fit.py testdata/reference

Writes fit-bead-a.csv, fit-bead-b.csv, fit-clamp-a.csv (the invented data),
fit-pchip.csv (the interpolant) and fit-summary.csv (the fitted parameters,
the final cost and the optimiser's status) into the given folder.
"""

import datetime
import math
import os
import sys

import numpy as np
import scipy
from scipy.interpolate import PchipInterpolator
from scipy.optimize import brentq, least_squares

KB = 1.380649e-23
QE = 1.602176634e-19
VT = KB * 300.0 / QE

# Noise: every measured value is multiplied by (1 + 0.01*u), u uniform in
# [-1, 1]; a complex impedance also by exp(j*0.01*u') (phase noise up to
# 0.01 rad). One generator, seeded, drawn in the order the rows are written.
RNG = np.random.RandomState(20261203)


def u():
    return RNG.uniform(-1.0, 1.0)


# ---------------------------------------------------------------------------
# Bead (MODELS.md): Z = rdc + 1/(1/rac + 1/(j w l(i)) + j w c),
# l(i) = l/(1 + (i/isat)^2), the incremental inductance of the flux
# l*isat*atan(i/isat) at the bias i.

def bead_z(f, idc, rdc, l, c, rac, isat=None):
    w = 2 * np.pi * f
    leff = l if isat is None else l / (1 + (idc / isat) ** 2)
    y = 1 / (1j * w * leff) + 1j * w * c + 1 / rac
    return rdc + 1 / y


BEAD = dict(rdc=0.15, l=1.1e-6, c=1.3e-12, rac=650.0, isat=0.3)


def bead_data(freqs, biases, with_isat):
    rows = []
    for idc in biases:
        for f in freqs:
            p = dict(BEAD)
            if not with_isat:
                p.pop("isat")
            z = bead_z(f, idc, **p)
            z = z * (1 + 0.01 * u()) * np.exp(1j * 0.01 * u())
            rows.append((f, z, idc))
    return rows


def fit_bead(rows, with_isat, x0):
    """Residuals: (Z_model - Z_data)/|Z_data|, real and imaginary parts;
    parameters: logarithms of rdc, l, c, rac (and isat)."""
    f = np.array([r[0] for r in rows])
    z = np.array([r[1] for r in rows])
    idc = np.array([r[2] for r in rows])
    a = np.abs(z)

    def res(x):
        p = np.exp(x)
        isat = p[4] if with_isat else None
        zm = bead_z(f, idc, p[0], p[1], p[2], p[3], isat)
        d = (zm - z) / a
        return np.concatenate([d.real, d.imag])

    return least_squares(res, np.log(x0), method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=20000)


# ---------------------------------------------------------------------------
# Clamp (MODELS.md), uni: junction current from j to b
#   i(u) = it*(exp((u-vbr)/(nbr*Vt)) - exp(-vbr/(nbr*Vt))) - is*(exp(-u/(n*Vt)) - 1)
# and the static voltage V(I) = u(I) + I*rdyn, u(I) the root of i(u) = I.

CLAMP = dict(vbr=6.6, it=1e-3, nbr=6.0, is_=1e-12, n=1.3, rdyn=0.35)


def clamp_i(uu, vbr, it, nbr, is_, n):
    a, b = nbr * VT, n * VT
    return it * (math.exp((uu - vbr) / a) - math.exp(-vbr / a)) - is_ * (math.exp(-uu / b) - 1)


def clamp_v(i, vbr, it, nbr, is_, n, rdyn):
    if i == 0:
        return 0.0
    a, b = nbr * VT, n * VT
    if i > 0:
        hi = vbr + a * math.log(i / it + math.exp(-vbr / a)) + 1e-9
        lo = 0.0
    else:
        lo = -b * math.log1p(-i / is_) - 1e-9
        hi = 0.0
    uu = brentq(lambda x: clamp_i(x, vbr, it, nbr, is_, n) - i, lo, hi, xtol=1e-15, rtol=8.9e-16, maxiter=500)
    return uu + i * rdyn


def clamp_data(currents):
    rows = []
    for i in currents:
        v = clamp_v(i, **CLAMP)
        rows.append((v * (1 + 0.01 * u()), i * (1 + 0.01 * u())))
    return rows


def fit_clamp(rows, x0):
    """Residuals: (V_model(I) - V)/|V| at each row's current; parameters:
    logarithms of vbr, rdyn, nbr, is, n (it fixed at 1 mA)."""
    def res(x):
        vbr, rdyn, nbr, is_, n = np.exp(x)
        return np.array([(clamp_v(i, vbr, 1e-3, nbr, is_, n, rdyn) - v) / abs(v) for v, i in rows])

    return least_squares(res, np.log(x0), method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=20000)


# ---------------------------------------------------------------------------

def header(fh, what):
    fh.write("# %s\n" % what)
    fh.write("# written by testdata/reference/fit.py on %s\n" % datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d %H:%M UTC"))
    fh.write("# Python %s, NumPy %s, SciPy %s\n" % (sys.version.split()[0], np.__version__, scipy.__version__))


def main(out):
    summary = []

    # Bead A: one curve, complex, 61 frequencies 10 kHz - 3 GHz.
    freqs = np.logspace(4, math.log10(3e9), 61)
    rows = bead_data(freqs, [0.0], False)
    with open(os.path.join(out, "fit-bead-a.csv"), "w") as fh:
        header(fh, "invented bead A (rdc 0.15 ohm, l 1.1 uH, c 1.3 pF, rac 650 ohm) with noise up to 1 %")
        fh.write("f [Hz],r [ohm],x [ohm]\n")
        for f, z, _ in rows:
            fh.write("%.17g,%.17g,%.17g\n" % (f, z.real, z.imag))
    r = fit_bead(rows, False, [0.1, 1e-6, 1e-12, 500.0])
    for name, v in zip(["rdc", "l", "c", "rac"], np.exp(r.x)):
        summary.append(("bead-a", name, v))
    summary.append(("bead-a", "cost", r.cost))
    summary.append(("bead-a", "status", r.status))

    # Bead B: three curves at 0, 0.15 and 0.4 A, 41 frequencies each.
    freqs = np.logspace(4, math.log10(3e9), 41)
    rows = bead_data(freqs, [0.0, 0.15, 0.4], True)
    with open(os.path.join(out, "fit-bead-b.csv"), "w") as fh:
        header(fh, "invented bead B (bead A saturating at isat 0.3 A) at three DC biases, noise up to 1 %")
        fh.write("f [Hz],r [ohm],x [ohm],idc [A]\n")
        for f, z, idc in rows:
            fh.write("%.17g,%.17g,%.17g,%.17g\n" % (f, z.real, z.imag, idc))
    r = fit_bead(rows, True, [0.1, 1e-6, 1e-12, 500.0, 0.5])
    for name, v in zip(["rdc", "l", "c", "rac", "isat"], np.exp(r.x)):
        summary.append(("bead-b", name, v))
    summary.append(("bead-b", "cost", r.cost))
    summary.append(("bead-b", "status", r.status))

    # Clamp A: a TLP curve, 18 positive rows 0.1 mA - 30 A, 8 negative
    # rows -1 mA to -20 A.
    currents = list(np.logspace(-4, math.log10(30), 18)) + [-i for i in np.logspace(-3, math.log10(20), 8)]
    rows = clamp_data(currents)
    with open(os.path.join(out, "fit-clamp-a.csv"), "w") as fh:
        header(fh, "invented uni clamp A (vbr 6.6 V, it 1 mA, nbr 6, is 1 pA, n 1.3, rdyn 0.35 ohm): TLP rows with noise up to 1 %")
        fh.write("v [V],i [A]\n")
        for v, i in rows:
            fh.write("%.17g,%.17g\n" % (v, i))
    r = fit_clamp(rows, [6.0, 0.5, 3.0, 1e-13, 1.0])
    for name, v in zip(["vbr", "rdyn", "nbr", "is", "n"], np.exp(r.x)):
        summary.append(("clamp-a", name, v))
    summary.append(("clamp-a", "cost", r.cost))
    summary.append(("clamp-a", "status", r.status))

    with open(os.path.join(out, "fit-summary.csv"), "w") as fh:
        header(fh, "scipy.optimize.least_squares(method='lm', xtol=ftol=gtol=1e-15) on the files above; cost = 0.5*sum(r^2)")
        fh.write("case,param,value\n")
        for case, name, v in summary:
            fh.write("%s,%s,%.17g\n" % (case, name, v))

    # PCHIP on an invented pin table (both polarities), sampled inside it.
    tv = [-3, -1.2, -0.9, -0.7, -0.5, 0, 3.3, 6.0, 6.5, 7.0, 8.0, 10.0]
    ti = [-1.9, -0.45, -0.2, -0.02, -1e-4, 0, 1e-8, 1e-4, 0.05, 0.3, 0.95, 2.4]
    pc = PchipInterpolator(tv, ti)
    with open(os.path.join(out, "fit-pchip.csv"), "w") as fh:
        header(fh, "scipy.interpolate.PchipInterpolator through v=%s, i=%s, and its derivative" % (tv, ti))
        fh.write("v [V],i [A],di/dv [S]\n")
        for v in np.linspace(-3, 10, 131):
            fh.write("%.17g,%.17g,%.17g\n" % (v, pc(v), pc(v, 1)))


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else ".")
