#!/usr/bin/python3
"""Writes zapnet's invented demo data for the fit commands.

Every part here is invented for the README's worked examples: no real part,
maker or product has these values. The curves come from MODELS.md's
equations (and the snapback model's, devices/snapback.go) with a little
measurement noise, so that a fit has something to do.

Usage (from the repository root):
    /usr/bin/python3 testdata/fit/make-demo-data.py testdata/fit
"""

import cmath
import math
import os
import sys

import numpy as np
from scipy.optimize import brentq

VT = 1.380649e-23 * 300 / 1.602176634e-19
RNG = np.random.RandomState(7)


def noise(v, rel):
    return v * (1 + rel * RNG.uniform(-1, 1))


# --- the invented 5 V uni TVS clamp (tvs5u) --------------------------------
TVS = dict(vbr=6.6, it=1e-3, nbr=6.25, is_=1e-12, n=1.25, rdyn=0.233)


def tvs_v(i, vbr, it, nbr, is_, n, rdyn):
    a, b = nbr * VT, n * VT
    f = lambda u: it * (math.exp((u - vbr) / a) - math.exp(-vbr / a)) - is_ * (math.exp(-u / b) - 1) - i
    if i > 0:
        u = brentq(f, 0, vbr + a * math.log(i / it + 1) + 1)
    else:
        u = brentq(f, -b * math.log1p(-i / is_) - 1, 0)
    return u + i * rdyn


def write_tvs_tlp(path):
    with open(path, "w") as fh:
        fh.write("# TLP curve of the invented 5 V clamp tvs5u (demo data, no real part).\n")
        fh.write("# 100 ns pulses, V and I averaged over 70-90 ns; leakage read at 5 V after each pulse.\n")
        fh.write("v [V],i [A],leak [A]\n")
        for i in np.logspace(math.log10(5e-4), math.log10(28), 16):
            leak = noise(52e-9, 0.05) if i < 27 else 4.1e-6
            fh.write("%.4f,%.5g,%.3g\n" % (noise(tvs_v(i, **TVS), 0.004), noise(i, 0.004), leak))
        for i in np.logspace(-3, math.log10(20), 7):
            fh.write("%.4f,%.5g,%.3g\n" % (noise(tvs_v(-i, **TVS), 0.004), noise(-i, 0.004), noise(52e-9, 0.05)))


# --- the invented snapback clamp (esdsnap) ---------------------------------
SNAP = dict(vt1=9.2, it1=0.08, vh=4.6, ih=0.55, ron=1.4, nbr=3.0)


def snap_v(i, vt1, it1, vh, ih, ron, nbr):
    a = nbr * VT
    ub = vt1 - ron * it1 / 2 + a / 2
    for _ in range(100):
        eps = math.exp(-ub / a)
        ub = vt1 - a * math.log1p(eps) - ron * it1 / 2 + a / (2 * (1 + eps))
    eps = math.exp(-ub / a)
    if i <= 0:
        return 0.0
    if i <= it1:
        s1 = a / (it1 * (1 + eps)) + ron
        return ub + a * math.log(i / it1 + eps) + ron * i - s1 * i * i / (2 * it1)
    if i <= ih:
        t = (i - it1) / (ih - it1)
        return vt1 + (vh - vt1) * (3 * t * t - 2 * t ** 3)
    w = ron * (ih - it1) ** 2 / (6 * (vt1 - vh))
    x = i - ih
    return vh + ron * (x - w * (1 - math.exp(-x / w)))


def write_snap_tlp(path):
    with open(path, "w") as fh:
        fh.write("# TLP curve of the invented snapback clamp esdsnap (demo data, no real part).\n")
        fh.write("v [V],i [A],leak [A]\n")
        for lv in np.logspace(math.log10(0.178), math.log10(11), 22):
            i = brentq(lambda i: snap_v(i, **SNAP) + 50 * i - 50 * lv, 0, lv, xtol=1e-300)
            leak = noise(0.4e-9, 0.1) if i < 9.4 else 2.5e-6
            fh.write("%.4f,%.5g,%.3g\n" % (noise(snap_v(i, **SNAP), 0.004), noise(i, 0.004), leak))


# --- the invented IC pin (pinA) ---------------------------------------------
def write_pin_tlp(path):
    # A lower diode and an internal clamp near 6 V behind about 1.6 ohm.
    with open(path, "w") as fh:
        fh.write("# TLP curve of an invented IC input (demo data, no real part): leakage at 3.3 V.\n")
        fh.write("v [V],i [A],leak [A]\n")
        for i in np.logspace(-4, math.log10(2.2), 12):
            v = 5.6 + 0.09 * math.log(i / 1e-4) + 1.6 * i
            leak = noise(2e-9, 0.1) if i < 1.9 else 7e-6
            fh.write("%.4f,%.5g,%.3g\n" % (noise(v, 0.004), noise(i, 0.004), leak))
        for i in np.logspace(-3, math.log10(2), 6):
            v = -(0.045 * math.log(i / 1e-12) + 0.9 * i)
            fh.write("%.4f,%.5g,%.3g\n" % (noise(v, 0.004), -noise(i, 0.004), noise(2e-9, 0.1)))


# --- the invented 600 ohm bead (bead600) -------------------------------------
BEAD = dict(rdc=0.09, l=1.6e-6, c=1.1e-12, rac=600.0, isat=0.5)


def bead_z(f, idc):
    w = 2 * math.pi * f
    leff = BEAD["l"] / (1 + (idc / BEAD["isat"]) ** 2)
    y = 1 / (1j * w * leff) + 1j * w * BEAD["c"] + 1 / BEAD["rac"]
    return BEAD["rdc"] + 1 / y


def write_bead_s2p(path):
    z0 = 50.0
    with open(path, "w") as fh:
        fh.write("! Invented 600 ohm chip bead bead600 (demo data, no real part),\n")
        fh.write("! measured in series between two 50 ohm ports, no DC bias.\n")
        fh.write("# MHz S MA R 50\n")
        for f in np.logspace(6, math.log10(3e9), 61):
            z = bead_z(f, 0) * (1 + 0.004 * RNG.uniform(-1, 1)) * cmath.exp(1j * 0.004 * RNG.uniform(-1, 1))
            s21 = 2 * z0 / (2 * z0 + z)
            s11 = z / (2 * z0 + z)
            cells = []
            for s in (s11, s21, s21, s11):
                cells.append("%.6g %.4f" % (abs(s), math.degrees(cmath.phase(s))))
            fh.write("%.6g %s\n" % (f / 1e6, " ".join(cells)))


def write_bead_bias(path):
    with open(path, "w") as fh:
        fh.write("# |Z| and phase of the invented bead bead600 at three DC bias currents (demo data).\n")
        fh.write("f [MHz],z [ohm],phase [deg],idc [A]\n")
        for idc in (0.0, 0.2, 0.5):
            for f in np.logspace(6, math.log10(3e9), 31):
                z = bead_z(f, idc)
                fh.write("%.5g,%.5g,%.3f,%g\n" % (f / 1e6, noise(abs(z), 0.004), math.degrees(cmath.phase(z)) + 0.2 * RNG.uniform(-1, 1), idc))


def main(out):
    write_tvs_tlp(os.path.join(out, "tvs5-tlp.csv"))
    write_snap_tlp(os.path.join(out, "esdsnap-tlp.csv"))
    write_pin_tlp(os.path.join(out, "pinA-tlp.csv"))
    write_bead_s2p(os.path.join(out, "bead600.s2p"))
    write_bead_bias(os.path.join(out, "bead600-bias.csv"))


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else ".")
