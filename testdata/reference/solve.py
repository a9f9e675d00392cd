#!/usr/bin/python3
"""Independent reference solutions of the decks net-a.zap ... net-e.zap.

Each network is written out by hand as a system of ordinary differential
equations in its natural states (inductor currents, capacitor voltages, the
junction charge of the clamp), with the nodes that carry no capacitance solved
algebraically inside the right-hand side, and integrated with SciPy's Radau
(an implicit Runge-Kutta method of order 5, L-stable) at tight tolerances.
The device equations are those of the design contract (MODELS.md), the strike
current the informative-annex formula of IEC 61000-4-2 (CHECKS.md). Nothing
here is taken from the Go engine; the two meet only in mna/reference_test.go.

Usage (from the repository root):
    /usr/bin/python3 testdata/reference/solve.py testdata/reference

Writes net-X.csv (time series on a 0.1 ns grid, coarser after the fast
part of the long windows) and summary.csv (extremes, peak currents and
energies) into the given folder. See README.md there.

    /usr/bin/python3 testdata/reference/solve.py --time [NAMES]

only times the solves (process CPU time) at the reference tolerance and at
looser ones, for the comparison of cost with the engine.
"""

import datetime
import math
import os
import sys
import time

import numpy as np
import scipy
from scipy.integrate import solve_ivp
from scipy.optimize import brentq, minimize_scalar
from scipy.special import wrightomega

# Thermal voltage at 300 K with the exact SI constants (MODELS.md).
KB = 1.380649e-23
QE = 1.602176634e-19
VT = KB * 300.0 / QE

RTOL = 1e-10
GRID = 0.1e-9      # time step of the committed time series, s
SLOW_GRID = 5e-9   # its step after the fast part of a long window, s
FINE = 1e-12       # scan step for the extremes before refinement, s
SLOW_FINE = 20e-12 # the same after the fast part
MAX_STEP = 0.05e-9
SLOW_MAX_STEP = 2e-9
FIRST_STEP = 1e-15

# ---------------------------------------------------------------------------
# IEC 61000-4-2 annex current (CHECKS.md): constants at 4 kV, I1 and I2 scale
# linearly with the level.


class Strike:
    def __init__(self, level_v):
        s = level_v / 4000.0
        self.I1, self.I2 = 16.6 * s, 9.3 * s
        self.t1, self.t2, self.t3, self.t4, self.n = 1.1e-9, 2e-9, 12e-9, 37e-9, 1.8
        n = self.n
        self.k1 = math.exp(-(self.t1 / self.t2) * (n * self.t2 / self.t1) ** (1 / n))
        self.k2 = math.exp(-(self.t3 / self.t4) * (n * self.t4 / self.t3) ** (1 / n))

    def _term(self, t, A, k, ta, tb):
        x = (t / ta) ** self.n
        e = math.exp(-t / tb)
        f = A / k * x / (1 + x) * e
        df = A / k * e * (self.n * x / (t * (1 + x) ** 2) - x / ((1 + x) * tb))
        return f, df

    def __call__(self, t):
        """Current and its time derivative at t (zero for t <= 0)."""
        if t <= 0:
            return 0.0, 0.0
        a, da = self._term(t, self.I1, self.k1, self.t1, self.t2)
        b, db = self._term(t, self.I2, self.k2, self.t3, self.t4)
        return a + b, da + db


class TLP:
    """Transmission-line pulse as the project defines it (README.md, `tlp`;
    CHECKS.md for the 50 Ω system): open-circuit voltage level·50 Ω behind
    50 Ω, linear edges taking `rise` each (0 to 100 %), `width` the full
    width at half maximum, so the flat top runs from rise to width and the
    fall ends at width + rise. Its corners are breakpoints: the solve
    restarts there."""

    R = 50.0

    def __init__(self, level_a, width, rise):
        self.voc, self.width, self.rise = level_a * self.R, width, rise
        self.breaks = [0.0, rise, width, width + rise]

    def __call__(self, t):
        if t <= 0:
            return 0.0
        if t < self.rise:
            return self.voc * t / self.rise
        if t <= self.width:
            return self.voc
        if t < self.width + self.rise:
            return self.voc * (self.width + self.rise - t) / self.rise
        return 0.0


# ---------------------------------------------------------------------------
# Device equations (MODELS.md).

XLIM = 200.0


def limexp(x):
    """exp(x), continued linearly beyond x = 200 so that trial iterates far
    off the solution do not overflow. No point of a solution comes near it:
    exp(200)·1 mA is 7e83 A."""
    if x < XLIM:
        return math.exp(x)
    return math.exp(XLIM) * (1.0 + x - XLIM)


def clamp_bi(u, vbr, it=1e-3, nbr=1.0):
    a = nbr * VT
    return math.copysign(1.0, u) * it * (limexp((abs(u) - vbr) / a) - math.exp(-vbr / a))


def clamp_uni(u, vbr, it=1e-3, nbr=1.0, is_=1e-14, n=1.0):
    a = nbr * VT
    return (it * (limexp((u - vbr) / a) - math.exp(-vbr / a))
            - is_ * (limexp(-u / (n * VT)) - 1.0))


def junction_u(q, cj, vj, m):
    """Inverse of the junction charge q(u) of MODELS.md."""
    if m == 0:
        return q / cj
    g = 1.0 - m
    return math.copysign(vj * ((1.0 + abs(q) * g / (cj * vj)) ** (1.0 / g) - 1.0), q)


def junction_q(u, cj, vj, m):
    if m == 0:
        return cj * u
    g = 1.0 - m
    return math.copysign(cj * vj / g * ((1.0 + abs(u) / vj) ** g - 1.0), u)


def diode_rs(v, rs, is_=1e-14, n=1.0):
    """Current of a diode i = is·(exp(vd/(n·Vt)) − 1) in series with rs, for
    the voltage v across the pair, in closed form: with y = i + is,
    (rs·y/a)·exp(rs·y/a) = (rs·is/a)·exp((v + rs·is)/a), so
    rs·y/a = ω(ln(rs·is/a) + (v + rs·is)/a) with ω the Wright omega
    function (the Lambert W of an exponential, free of overflow)."""
    a = n * VT
    if rs == 0:
        return is_ * (limexp(v / a) - 1.0)
    z = math.log(rs * is_ / a) + (v + rs * is_) / a
    return a / rs * float(np.real(wrightomega(z))) - is_


def series_clamp_uni(v, r, vbr, it=1e-3, nbr=1.0, is_=1e-14, n=1.0):
    """Current of a unidirectional clamp junction in series with r for the
    voltage v across the pair: the junction voltage u solves
    u + r·i(u) = v, found by bracketing between 0 and v (i(u) has the sign
    of u and is increasing)."""
    if v == 0:
        return 0.0, 0.0
    if r == 0:
        return clamp_uni(v, vbr, it, nbr, is_, n), v
    g = lambda u: u + r * clamp_uni(u, vbr, it, nbr, is_, n) - v
    lo, hi = min(0.0, v), max(0.0, v)
    u = brentq(g, lo, hi, xtol=1e-300, rtol=4 * np.finfo(float).eps, maxiter=500)
    return clamp_uni(u, vbr, it, nbr, is_, n), u


# ---------------------------------------------------------------------------
# Networks A, C and D (net-a.zap, net-c.zap, net-d.zap): one topology,
#
#   strike s·I(t) into tip –L(r)– n1; clamp D1 from n1 to gnd;
#   bead FB1 from n1 to n2; C1 (esr, esl) from n2 to gnd; pin U1 at n2.
#
# The strike current flows through the series inductor (its current is
# fixed) into n1, which has no capacitance: KCL there gives the bead's
# current i_b = s·I − i_ls exactly and v(n1) = v(n2) + v_c + rdc·i_b;
# v(tip) = v(n1) + r·s·I + L·s·dI/dt. The pin's lower path is either its
# lower diode behind rs (closed form, Wright omega) or, with vbr, its
# internal uni clamp behind rs + rdyn (junction voltage by brentq); the
# internal clamp's forward term is the lower diode (MODELS.md).
# States:
#   0 i_ls  clamp current through ls (n1 → junction → gnd)
#   1 q_j   clamp junction charge
#   2 v_c   bead core voltage v(k) − v(n2) across l ∥ rac ∥ c
#   3 i_l   bead inductive-branch current (with isat:
#           dλ/di = l/(1+(i/isat)²), so di/dt = v_c·(1+(i/isat)²)/l)
#   4 i_c1  C1 current through esl
#   5 v_c1  C1 voltage
#   6 v2    v(n2), across the pin's cin
#   7..     energy ledger ∫ Σ v·i dt of zap, L, D1, FB1, C1, U1

CLAMP = dict(it=1e-3, nbr=1.0, is_=1e-14, n=1.0, vj=0.7, m=0.0)

A = dict(name="net-a", level=8000.0, sign=+1.0, L="Lpad", Ls=1.5e-9, rs_ser=0.0,
         clamp=dict(CLAMP, vbr=6.8, rdyn=0.35, cj=8e-12, ls=0.4e-9, bi=True),
         rdc=0.15, rac=520.0, lb=1.1e-6, cb=1.3e-12, isat=None,
         C1=100e-9, esr=20e-3, esl=0.5e-9,
         cin=6e-12, prs=1.0, pin_clamp=None, stop=400e-9, fast=400e-9)

C = dict(name="net-c", level=8000.0, sign=+1.0, L="Lpad", Ls=1.5e-9, rs_ser=0.0,
         clamp=dict(CLAMP, vbr=6.6, rdyn=0.4, cj=6e-12, vj=0.8, m=0.3,
                    ls=0.45e-9, bi=True),
         rdc=0.08, rac=260.0, lb=0.55e-6, cb=1.1e-12, isat=None,
         C1=220e-9, esr=20e-3, esl=0.5e-9,
         cin=7e-12, prs=1.0, pin_clamp=None, stop=2.2e-6, fast=250e-9)

D = dict(name="net-d", level=8000.0, sign=-1.0, L="Ltr", Ls=1.8e-9, rs_ser=0.0,
         clamp=dict(CLAMP, vbr=7.2, nbr=1.1, rdyn=0.3, cj=20e-12, vj=0.6, m=0.4,
                    ls=0.5e-9, bi=False),
         rdc=0.18, rac=640.0, lb=1.3e-6, cb=1.4e-12, isat=0.2,
         C1=47e-9, esr=25e-3, esl=0.55e-9,
         cin=5e-12, prs=1.0, pin_clamp=dict(vbr=6.0, rdyn=1.5, it=1e-3, nbr=1.0),
         stop=1.6e-6, fast=250e-9)


def clamp_current(cl, u):
    if cl["bi"]:
        return clamp_bi(u, cl["vbr"], cl["it"], cl["nbr"])
    return clamp_uni(u, cl["vbr"], cl["it"], cl["nbr"], cl["is_"], cl["n"])


def front(p):
    strike = Strike(p["level"])
    s = p["sign"]
    cl = p["clamp"]
    elems = ["zap", p["L"], "D1", "FB1", "C1", "U1"]
    pc = p["pin_clamp"]

    def pin_path(v2):
        """Current out of n2 through the pin's lower path."""
        if pc is None:
            # lower diode: anode gnd, cathode n2; its current flows gnd → n2
            return -diode_rs(-v2, p["prs"])
        i, _ = series_clamp_uni(v2, p["prs"] + pc["rdyn"], pc["vbr"], pc["it"], pc["nbr"])
        return i

    def algebra(t, y):
        i_ls, q_j, v_c, i_l, i_c1, v_c1, v2 = y[:7]
        I, dI = strike(t)
        I, dI = s * I, s * dI
        u = junction_u(q_j, cl["cj"], cl["vj"], cl["m"])
        i_j = clamp_current(cl, u)
        i_b = I - i_ls
        v1 = v2 + v_c + p["rdc"] * i_b
        vtip = v1 + p["rs_ser"] * I + p["Ls"] * dI
        ipath = pin_path(v2)
        dv2 = (i_b - i_c1 - ipath) / p["cin"]
        i_pin = p["cin"] * dv2 + ipath  # into the pin at n2
        return dict(I=I, dI=dI, u=u, i_j=i_j, i_b=i_b, v1=v1, vtip=vtip,
                    ipath=ipath, dv2=dv2, i_pin=i_pin, v2=v2, i_ls=i_ls,
                    i_c1=i_c1, i_fb=i_b, i_zap=-I)

    def rhs(t, y):
        i_ls, q_j, v_c, i_l, i_c1, v_c1, v2 = y[:7]
        a = algebra(t, y)
        d = np.empty_like(y)
        d[0] = (a["v1"] - cl["rdyn"] * i_ls - a["u"]) / cl["ls"]
        d[1] = i_ls - a["i_j"]
        d[2] = (a["i_b"] - i_l - v_c / p["rac"]) / p["cb"]
        sat = 1.0 if p["isat"] is None else 1.0 + (i_l / p["isat"]) ** 2
        d[3] = v_c * sat / p["lb"]
        d[4] = (v2 - p["esr"] * i_c1 - v_c1) / p["esl"]
        d[5] = i_c1 / p["C1"]
        d[6] = a["dv2"]
        v1, vtip, I = a["v1"], a["vtip"], a["I"]
        # current into each element's terminals, times the terminal voltage
        d[7] = -vtip * I                     # zap: I leaves into tip
        d[8] = (vtip - v1) * I               # the series inductor
        d[9] = v1 * i_ls                     # D1
        d[10] = (v1 - v2) * a["i_b"]         # FB1
        d[11] = v2 * i_c1                    # C1
        d[12] = v2 * a["i_pin"]              # U1
        return d

    y0 = np.zeros(7 + len(elems))
    qtol = 1e-22 if cl["m"] == 0 else 1e-21
    atol = np.array([1e-10, qtol, 1e-10, 1e-12, 1e-10, 1e-12, 1e-10]
                    + [1e-18] * len(elems))
    cols = [("v(tip)", "V", lambda a: a["vtip"]),
            ("v(n1)", "V", lambda a: a["v1"]),
            ("v(n2)", "V", lambda a: a["v2"]),
            ("i(zap)", "A", lambda a: a["i_zap"]),
            ("i(%s)" % p["L"], "A", lambda a: a["I"]),
            ("i(D1)", "A", lambda a: a["i_ls"]),
            ("i(FB1)", "A", lambda a: a["i_fb"]),
            ("i(C1)", "A", lambda a: a["i_c1"]),
            ("i(U1)", "A", lambda a: a["i_pin"]),
            ("ipath(U1)", "A", lambda a: a["ipath"])]
    return dict(name=p["name"], rhs=rhs, algebra=algebra, y0=y0, atol=atol,
                stop=p["stop"], fast=p["fast"], breaks=[0.0], elems=elems,
                cols=cols, nstate=7)


def net_a():
    return front(A)


def net_c():
    return front(C)


def net_d():
    return front(D)


# ---------------------------------------------------------------------------
# Network B (net-b.zap), polarity neg (s = −1).
#
# As in A, n1 has no capacitance, so i_b = s·I − i_ls and
# v(n1) = v(n2) + v_c + rdc·i_b. The pin's internal clamp path (rdyn, rs = 0)
# is solved for its junction voltage inside the right-hand side; its upper
# diode (rs = 0) is explicit in v(n2) − v(vdd). The internal clamp replaces
# the lower diode (MODELS.md: "instead of the lower diode alone"); its
# forward branch is the uni clamp's is-term.
# States:
#   0 i_ls  D1 current through ls
#   1 q_j   D1 junction charge (cj, vj, m > 0)
#   2 v_c   bead core voltage
#   3 i_l   bead inductive-branch current (saturating:
#           dλ/di = l/(1+(i/isat)²), so di/dt = v_c·(1+(i/isat)²)/l)
#   4 i_c1  C1 current through esl
#   5 v_c1  C1 voltage
#   6 v2    v(n2), across the pin's cin
#   7 vdd   v(vdd), across Cdd
#   8..     energy ledger of zap, Ltr, D1, FB1, C1, U1, Vs, Cdd, Rpu

B = dict(level=8000.0, sign=-1.0, Ltr=2.2e-9, rtr=0.05,
         vbr=5.6, it=2e-3, nbr=1.2, rdyn=0.25, cj=30e-12, vj=0.7, m=0.33,
         ls=0.6e-9,
         rdc=0.08, rac=220.0, lb=0.6e-6, cb=0.9e-12, isat=0.4,
         C1=10e-9, esr=30e-3, esl=0.7e-9,
         cin=4e-12, prs=0.0, pvbr=7.5, prdyn=2.0,
         Vs=3.3, rsup=0.1, Cdd=1e-6, Rpu=10e3, stop=300e-9)


def net_b():
    p = B
    strike = Strike(p["level"])
    s = p["sign"]
    elems = ["zap", "Ltr", "D1", "FB1", "C1", "U1", "Vs", "Cdd", "Rpu"]

    def algebra(t, y, on=True):
        i_ls, q_j, v_c, i_l, i_c1, v_c1, v2, vdd = y[:8]
        I, dI = strike(t) if on else (0.0, 0.0)
        I, dI = s * I, s * dI
        u = junction_u(q_j, p["cj"], p["vj"], p["m"])
        i_j = clamp_uni(u, p["vbr"], p["it"], p["nbr"])
        i_b = I - i_ls
        v1 = v2 + v_c + p["rdc"] * i_b
        vtip = v1 + p["rtr"] * I + p["Ltr"] * dI
        i_int, _ = series_clamp_uni(v2, p["prdyn"] + p["prs"], p["pvbr"])
        i_up = diode_rs(v2 - vdd, p["prs"])           # n2 → vdd
        i_pu = (vdd - v2) / p["Rpu"]                  # vdd → n2
        i_sup = (p["Vs"] - vdd) / p["rsup"]           # out of the supply into vdd
        dv2 = (i_b - i_c1 - i_int - i_up + i_pu) / p["cin"]
        dvdd = (i_sup - i_pu + i_up) / p["Cdd"]
        i_pin = p["cin"] * dv2 + i_int + i_up         # into the pin at n2
        return dict(I=I, dI=dI, u=u, i_j=i_j, i_b=i_b, v1=v1, vtip=vtip,
                    i_int=i_int, i_up=i_up, i_pu=i_pu, i_sup=i_sup,
                    dv2=dv2, dvdd=dvdd, i_pin=i_pin, v2=v2, vdd=vdd,
                    i_ls=i_ls, i_c1=i_c1, i_fb=i_b, i_l=i_l, i_zap=-I,
                    ipath=i_int + i_up)

    def core(t, y, on=True):
        i_ls, q_j, v_c, i_l, i_c1, v_c1, v2, vdd = y[:8]
        a = algebra(t, y, on)
        d = np.empty(8)
        d[0] = (a["v1"] - p["rdyn"] * i_ls - a["u"]) / p["ls"]
        d[1] = i_ls - a["i_j"]
        d[2] = (a["i_b"] - i_l - v_c / p["rac"]) / p["cb"]
        d[3] = v_c * (1.0 + (i_l / p["isat"]) ** 2) / p["lb"]
        d[4] = (v2 - p["esr"] * i_c1 - v_c1) / p["esl"]
        d[5] = i_c1 / p["C1"]
        d[6] = a["dv2"]
        d[7] = a["dvdd"]
        return d, a

    def rhs(t, y):
        d8, a = core(t, y)
        v1, v2, vdd, vtip, I = a["v1"], a["v2"], a["vdd"], a["vtip"], a["I"]
        d = np.empty_like(y)
        d[:8] = d8
        d[8] = -vtip * I                                  # zap
        d[9] = (vtip - v1) * I                            # Ltr
        d[10] = v1 * a["i_ls"]                            # D1
        d[11] = (v1 - v2) * a["i_b"]                      # FB1
        d[12] = v2 * a["i_c1"]                            # C1
        d[13] = v2 * a["i_pin"] - vdd * a["i_up"]         # U1 (p and rail)
        d[14] = -vdd * a["i_sup"]                         # Vs
        d[15] = vdd * p["Cdd"] * a["dvdd"]                # Cdd
        d[16] = (vdd - v2) * a["i_pu"]                    # Rpu
        return d

    # DC operating point: strike off, every d/dt zero. With v_c = 0 the
    # bead carries i_l = −i_ls; C1 carries nothing, so v_c1 = v2. Nested
    # one-dimensional roots (each bracketed, so each is certain): for a
    # trial v2, the clamp's junction voltage u from its series path
    # (v(n1) = v2 − rdc·i_ls), then vdd from KCL at vdd; the outer root is
    # KCL at n2.
    bt = dict(xtol=1e-300, rtol=4 * np.finfo(float).eps, maxiter=500)

    def inner(v2):
        i_of = lambda u: clamp_uni(u, p["vbr"], p["it"], p["nbr"])
        u = brentq(lambda u: v2 - (p["rdc"] + p["rdyn"]) * i_of(u) - u,
                   min(0.0, v2) - 1.0, max(0.0, v2) + 1.0, **bt)
        kcl = lambda vdd: ((p["Vs"] - vdd) / p["rsup"] - (vdd - v2) / p["Rpu"]
                           + diode_rs(v2 - vdd, p["prs"]))
        vdd = brentq(kcl, 0.0, p["Vs"] + 1.0, **bt)
        return u, vdd

    def kcl_n2(v2):
        u, vdd = inner(v2)
        i_ls = clamp_uni(u, p["vbr"], p["it"], p["nbr"])
        i_int, _ = series_clamp_uni(v2, p["prdyn"] + p["prs"], p["pvbr"])
        return -i_ls - i_int - diode_rs(v2 - vdd, p["prs"]) + (vdd - v2) / p["Rpu"]

    v2 = brentq(kcl_n2, 0.0, p["Vs"], **bt)
    u, vdd = inner(v2)
    i_ls = clamp_uni(u, p["vbr"], p["it"], p["nbr"])
    y0 = np.zeros(8 + len(elems))
    y0[:8] = [i_ls, junction_q(u, p["cj"], p["vj"], p["m"]), 0.0, -i_ls,
              0.0, v2, v2, vdd]
    d0, _ = core(0.0, y0[:8], on=False)
    scale = np.array([1 / p["ls"], 1 / p["cj"], 1 / p["cb"], 1 / p["lb"],
                      1 / p["esl"], 1 / p["C1"], 1 / p["cin"], 1 / p["Cdd"]])
    if np.max(np.abs(d0 / scale)) > 1e-13:  # V and A, near roundoff
        raise SystemExit("net-b: operating point not found: %r" % (d0 / scale,))
    atol = np.array([1e-10, 1e-21, 1e-10, 1e-12, 1e-10, 1e-12, 1e-10, 1e-12]
                    + [1e-18] * len(elems))
    cols = [("v(tip)", "V", lambda a: a["vtip"]),
            ("v(n1)", "V", lambda a: a["v1"]),
            ("v(n2)", "V", lambda a: a["v2"]),
            ("v(vdd)", "V", lambda a: a["vdd"]),
            ("i(zap)", "A", lambda a: a["i_zap"]),
            ("i(Ltr)", "A", lambda a: a["I"]),
            ("i(D1)", "A", lambda a: a["i_ls"]),
            ("i(FB1)", "A", lambda a: a["i_fb"]),
            ("i(C1)", "A", lambda a: a["i_c1"]),
            ("i(U1)", "A", lambda a: a["i_pin"]),
            ("ipath(U1)", "A", lambda a: a["ipath"]),
            ("i(Vs)", "A", lambda a: -a["i_sup"]),
            ("i(Rpu)", "A", lambda a: a["i_pu"])]
    return dict(name="net-b", rhs=rhs, algebra=algebra, y0=y0, atol=atol,
                stop=p["stop"], fast=p["stop"], breaks=[0.0], elems=elems,
                cols=cols, nstate=8, op=dict(vdd=vdd, v2=v2, u=u, i_ls=i_ls))


# ---------------------------------------------------------------------------
# Network E (net-e.zap): a transmission-line pulse, polarity pos.
#
#   TLP (open-circuit v_s(t) behind 50 Ω) into tip –Lc– n1; clamp D1 (uni,
#   constant cj) from n1 to gnd; R1 from n1 to n2; C1 (esl only) from n2 to
#   gnd; pin U1 at n2 with an internal clamp behind rs + rdyn.
#
# tip and n1 carry no capacitance. KCL at tip: the source current
# (v_s − v(tip))/50 is the inductor's, so v(tip) = v_s − 50·i_Lc. KCL at n1:
# i_Lc = i_ls + (v(n1) − v(n2))/R1, so v(n1) = v(n2) + R1·(i_Lc − i_ls).
# States:
#   0 i_Lc  Lc current (tip → n1)
#   1 i_ls  clamp current through ls
#   2 q_j   clamp junction charge (u = q_j/cj)
#   3 i_c1  C1 current through esl
#   4 v_c1  C1 voltage
#   5 v2    v(n2), across the pin's cin
#   6..     energy ledger of zap, Lc, D1, R1, C1, U1

E = dict(name="net-e", level=8.0, width=50e-9, rise=0.5e-9, Lc=2e-9,
         clamp=dict(CLAMP, vbr=5.6, rdyn=0.5, cj=40e-12, ls=0.4e-9, bi=False),
         R1=2.2, C1=47e-12, esl=0.3e-9,
         cin=4e-12, prs=1.0, pin_clamp=dict(vbr=5.5, rdyn=2.0, it=1e-3, nbr=1.0),
         stop=100e-9)


def net_e():
    p = E
    src = TLP(p["level"], p["width"], p["rise"])
    cl = p["clamp"]
    pc = p["pin_clamp"]
    elems = ["zap", "Lc", "D1", "R1", "C1", "U1"]

    def algebra(t, y):
        i_lc, i_ls, q_j, i_c1, v_c1, v2 = y[:6]
        vs = src(t)
        vtip = vs - src.R * i_lc
        v1 = v2 + p["R1"] * (i_lc - i_ls)
        i_r = (v1 - v2) / p["R1"]
        u = q_j / cl["cj"]
        i_j = clamp_current(cl, u)
        ipath, _ = series_clamp_uni(v2, p["prs"] + pc["rdyn"], pc["vbr"], pc["it"], pc["nbr"])
        dv2 = (i_r - i_c1 - ipath) / p["cin"]
        i_pin = p["cin"] * dv2 + ipath
        return dict(vs=vs, vtip=vtip, v1=v1, v2=v2, i_lc=i_lc, i_ls=i_ls,
                    i_r=i_r, u=u, i_j=i_j, ipath=ipath, dv2=dv2, i_pin=i_pin,
                    i_c1=i_c1, i_zap=-i_lc)

    def rhs(t, y):
        i_lc, i_ls, q_j, i_c1, v_c1, v2 = y[:6]
        a = algebra(t, y)
        v1, vtip = a["v1"], a["vtip"]
        d = np.empty_like(y)
        d[0] = (vtip - v1) / p["Lc"]
        d[1] = (v1 - cl["rdyn"] * i_ls - a["u"]) / cl["ls"]
        d[2] = i_ls - a["i_j"]
        d[3] = (v2 - v_c1) / p["esl"]
        d[4] = i_c1 / p["C1"]
        d[5] = a["dv2"]
        d[6] = -vtip * i_lc                  # zap: i_lc leaves it into tip
        d[7] = (vtip - v1) * i_lc            # Lc
        d[8] = v1 * i_ls                     # D1
        d[9] = (v1 - v2) * a["i_r"]          # R1
        d[10] = v2 * i_c1                    # C1
        d[11] = v2 * a["i_pin"]              # U1
        return d

    y0 = np.zeros(6 + len(elems))
    atol = np.array([1e-10, 1e-10, 1e-22, 1e-10, 1e-12, 1e-10]
                    + [1e-18] * len(elems))
    cols = [("v(tip)", "V", lambda a: a["vtip"]),
            ("v(n1)", "V", lambda a: a["v1"]),
            ("v(n2)", "V", lambda a: a["v2"]),
            ("i(zap)", "A", lambda a: a["i_zap"]),
            ("i(Lc)", "A", lambda a: a["i_lc"]),
            ("i(D1)", "A", lambda a: a["i_ls"]),
            ("i(R1)", "A", lambda a: a["i_r"]),
            ("i(C1)", "A", lambda a: a["i_c1"]),
            ("i(U1)", "A", lambda a: a["i_pin"]),
            ("ipath(U1)", "A", lambda a: a["ipath"])]
    return dict(name="net-e", rhs=rhs, algebra=algebra, y0=y0, atol=atol,
                stop=p["stop"], fast=p["stop"], breaks=src.breaks, elems=elems,
                cols=cols, nstate=6)


# ---------------------------------------------------------------------------


def jacobian(net):
    """Central differences over the circuit states. The energy states feed
    nothing back, so their columns are zero; SciPy's own difference
    Jacobian keeps growing its increment on such columns until it
    overflows, hence this one."""
    rhs, n, atol = net["rhs"], net["nstate"], net["atol"]

    def jac(t, y):
        J = np.zeros((len(y), len(y)))
        for j in range(n):
            h = 1e-6 * max(abs(y[j]), 1e4 * atol[j])
            yp, ym = y.copy(), y.copy()
            yp[j] += h
            ym[j] -= h
            J[:, j] = (rhs(t, yp) - rhs(t, ym)) / (2 * h)
        return J
    return jac


class Piecewise:
    """Solutions of consecutive spans joined into one: accepted times, final
    state, dense output (each time evaluated on the span holding it; at a
    joint both spans agree) and work counts."""

    def __init__(self, pieces):
        self.pieces = pieces
        self.t = np.unique(np.concatenate([p.t for p in pieces]))
        self.y = pieces[-1].y
        self.success = all(p.success for p in pieces)
        self.message = "; ".join(p.message for p in pieces if not p.success)
        self.nfev = sum(p.nfev for p in pieces)
        self.njev = sum(p.njev for p in pieces)
        self.nlu = sum(p.nlu for p in pieces)
        self.nstep = sum(len(p.t) - 1 for p in pieces)

    def sol(self, t):
        if np.ndim(t) == 0:
            for p in self.pieces:
                if t <= p.t[-1]:
                    return p.sol(t)
            return self.pieces[-1].sol(t)
        t = np.asarray(t)
        out = np.empty((len(self.y), len(t)))
        lo = -np.inf
        for k, p in enumerate(self.pieces):
            hi = p.t[-1] if k < len(self.pieces) - 1 else np.inf
            m = (t > lo) & (t <= hi) if k > 0 else (t <= hi)
            if np.any(m):
                out[:, m] = p.sol(t[m])
            lo = hi
        return out


def spans(net):
    """The spans solved one after the other: cut at every breakpoint of the
    stimulus (a corner of its waveform, where the solver restarts with a
    tiny step) and where the fast part of a long window ends (after which
    the steps may grow to SLOW_MAX_STEP)."""
    cuts = sorted(set([b for b in net["breaks"] if 0 < b < net["stop"]]
                      + ([net["fast"]] if net["fast"] < net["stop"] else [])))
    edges = [0.0] + cuts + [net["stop"]]
    return [(a, b, MAX_STEP if a < net["fast"] else SLOW_MAX_STEP)
            for a, b in zip(edges[:-1], edges[1:])]


def solve(net, rtol):
    y0, pieces = net["y0"], []
    for a, b, hmax in spans(net):
        sol = solve_ivp(net["rhs"], (a, b), y0, method="Radau",
                        rtol=rtol, atol=net["atol"] * (rtol / RTOL),
                        max_step=hmax, first_step=FIRST_STEP,
                        dense_output=True, jac=jacobian(net))
        pieces.append(sol)
        if not sol.success:
            break
        y0 = sol.y[:, -1]
    return Piecewise(pieces)


def columns(net, sol, ts):
    ys = sol.sol(ts)
    out = np.empty((len(net["cols"]), len(ts)))
    for k, t in enumerate(ts):
        a = net["algebra"](t, ys[:, k])
        for c, (_, _, f) in enumerate(net["cols"]):
            out[c, k] = f(a)
    return out


def extreme(net, sol, scan, col, sign):
    """Largest value of sign·column over the span: the scan (a fine grid that
    also holds every accepted step and every breakpoint), then a bounded
    refinement around the best scanned point on the dense output."""
    ts, vals = scan[0], sign * scan[1][col]
    f = net["cols"][col][2]
    g = lambda t: sign * f(net["algebra"](t, sol.sol(t)))
    k = int(np.argmax(vals))
    lo, hi = ts[max(k - 1, 0)], ts[min(k + 1, len(ts) - 1)]
    best_t, best = ts[k], vals[k]
    if hi > lo:
        r = minimize_scalar(lambda t: -g(t), bounds=(lo, hi), method="bounded",
                            options=dict(xatol=1e-16))
        if -r.fun > best:
            best_t, best = r.x, -r.fun
    return sign * best, best_t


def scan_times(net, sol):
    """FINE steps over the fast part, SLOW_FINE after it, every accepted step
    and every breakpoint."""
    fast, stop = min(net["fast"], net["stop"]), net["stop"]
    ts = np.concatenate([np.arange(0.0, fast, FINE), np.arange(fast, stop, SLOW_FINE),
                         sol.t, net["breaks"], [stop]])
    ts = np.unique(ts)
    return ts[(ts >= 0) & (ts <= stop)]


def quantities(net, sol):
    """(quantity, value, unit, time) rows of the summary: the highest and
    lowest of every voltage, the largest magnitude of every current, and
    every element's energy at the stop time."""
    rows = []
    ts = scan_times(net, sol)
    scan = (ts, columns(net, sol, ts))
    for c, (name, unit, _) in enumerate(net["cols"]):
        if name.startswith("v("):
            v, t = extreme(net, sol, scan, c, +1)
            rows.append(("max " + name, v, unit, t))
            v, t = extreme(net, sol, scan, c, -1)
            rows.append(("min " + name, v, unit, t))
            continue
        vmax, tmax = extreme(net, sol, scan, c, +1)
        vmin, tmin = extreme(net, sol, scan, c, -1)
        if abs(vmax) >= abs(vmin):
            rows.append(("peak |%s|" % name, abs(vmax), unit, tmax))
        else:
            rows.append(("peak |%s|" % name, abs(vmin), unit, tmin))
    end = sol.y[:, -1]
    for k, e in enumerate(net["elems"]):
        rows.append(("energy " + e, end[net["nstate"] + k], "J", net["stop"]))
    rows.append(("energy balance", float(np.sum(end[net["nstate"]:])), "J",
                 net["stop"]))
    return rows


NETWORKS = dict(a=net_a, b=net_b, c=net_c, d=net_d, e=net_e)


def grid(net):
    """Times of the committed series: GRID over the fast part, SLOW_GRID after."""
    fast, stop = min(net["fast"], net["stop"]), net["stop"]
    ts = np.arange(0.0, fast + GRID / 2, GRID)
    if fast < stop:
        ts = np.concatenate([ts, np.arange(fast + SLOW_GRID, stop + SLOW_GRID / 2, SLOW_GRID)])
    return np.round(ts, 15)


def timing(names):
    """CPU time of one solve per network at the reference tolerance and at
    two looser ones (the looser ones agree with the reference to about
    0.01 % and 0.2 %: the engine's targets), best of three."""
    for name in names:
        net = NETWORKS[name]()
        for rtol in (RTOL, 1e-6, 1e-4):
            best = math.inf
            for _ in range(3):
                t0 = time.process_time()
                sol = solve(net, rtol)
                best = min(best, time.process_time() - t0)
            print("%s rtol %g: %.3f s CPU, %d steps, %d rhs calls" % (
                net["name"], rtol, best, sol.nstep, sol.nfev))


def main(outdir, names):
    versions = "python %s, numpy %s, scipy %s" % (
        sys.version.split()[0], np.__version__, scipy.__version__)
    stamp = datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    head = ["# Generated by testdata/reference/solve.py (%s) on %s." % (versions, stamp),
            "# SciPy solve_ivp method=Radau rtol=%g atol per state (README.md)"
            " max_step=%g s (%g s after the fast part) first_step=%g s;"
            " extremes scanned every %g s (%g s after the fast part) and refined on"
            " the dense output; see README.md." % (
                RTOL, MAX_STEP, SLOW_MAX_STEP, FIRST_STEP, FINE, SLOW_FINE)]
    summary = []
    for name in names:
        net = NETWORKS[name]()
        t0 = time.process_time()
        sol = solve(net, RTOL)
        cpu = time.process_time() - t0
        if not sol.success:
            raise SystemExit("%s: %s" % (net["name"], sol.message))
        # the same solve a hundred times looser estimates the error of the answer
        loose = solve(net, RTOL * 100)
        if not loose.success:
            raise SystemExit("%s: %s" % (net["name"], loose.message))
        rows = quantities(net, sol)
        lrows = quantities(net, loose)
        for (q, v, u, t), (_, lv, _, _) in zip(rows, lrows):
            summary.append((net["name"], q, v, u, t, abs(v - lv)))
        print("%s: %d steps, %d rhs calls, %d jacobians, %d LU, %.1f s CPU" % (
            net["name"], sol.nstep, sol.nfev, sol.njev, sol.nlu, cpu), file=sys.stderr)
        if "op" in net:
            print("%s: operating point %r" % (net["name"], net["op"]), file=sys.stderr)
        ts = grid(net)
        data = columns(net, sol, ts)
        with open(os.path.join(outdir, net["name"] + ".csv"), "w") as f:
            for h in head:
                f.write(h + "\n")
            f.write("# Deck %s.zap; columns in V and A, currents into the element's"
                    " first terminal.\n" % net["name"])
            f.write(",".join(["t"] + [n for n, _, _ in net["cols"]]) + "\n")
            for k, t in enumerate(ts):
                f.write(",".join(["%.9g" % t] + ["%.9g" % x for x in data[:, k]]) + "\n")
    with open(os.path.join(outdir, "summary.csv"), "w") as f:
        for h in head:
            f.write(h + "\n")
        f.write("# value: extreme over the span (or energy at the stop time);"
                " time: where it occurs, s; change: |value at rtol=%g minus value"
                " at rtol=%g|, an error estimate.\n" % (RTOL * 100, RTOL))
        f.write("network,quantity,value,unit,time,change\n")
        for net, q, v, u, t, ch in summary:
            f.write("%s,%s,%.9g,%s,%.9g,%.2g\n" % (net, q, v, u, t, ch))
            print("%-6s %-18s %16.9g %s  at %.6g s  (change %.2g)" % (net, q, v, u, t, ch))


if __name__ == "__main__":
    args = sys.argv[1:]
    if args and args[0] == "--time":
        timing(args[1:] or sorted(NETWORKS))
    else:
        here = os.path.dirname(os.path.abspath(__file__))
        main(args[0] if args else here, args[1:] or sorted(NETWORKS))
