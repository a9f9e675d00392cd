#!/usr/bin/python3
"""Independent small-signal reference solutions of ac-a.zap and ac-b.zap.

Each network is written out here by hand in its natural form, A as a cascade
of chain (ABCD) matrices, B as a nodal admittance matrix: series chains (a clamp's ls–rdyn–junction, a bead's
rdc–(l ∥ rac ∥ c), a capacitor's esr–esl–C) as closed-form impedances, the
lossless lines as their two-port admittance parameters, the junctions at the
DC operating point found here with bracketed roots. The equations are those of
the design contract (MODELS.md) and of transmission-line theory; nothing is
taken from the Go engine, which uses modified nodal analysis with branch
currents and reads the same quantities from its transient stamps. The two meet
only in mna/ac_reference_test.go.

The script also reads back, with scikit-rf (a general-purpose RF library,
Debian's python3-scikit-rf), the Touchstone file ac-a.s2p that zapnet wrote
for network A, and compares its S-parameters with the ones computed here; and
ac-order.s2p, a non-reciprocal two-port zapnet's writer produced, to see that
the reader finds S21 and S12 where the writer put them.

Usage (from the repository root):
    /usr/bin/python3 testdata/reference/ac.py testdata/reference

Writes ac-a.csv, ac-b.csv (complex responses over the sweep), ac-peak.csv
(network B's peaking) and ac-touchstone.csv (the read-back comparison) into the
given folder. Exits 1 if the read-back disagrees. See README.md there.
"""

import datetime
import math
import os
import sys

import numpy as np
import scipy
from scipy.optimize import brentq, minimize_scalar
import skrf

# Thermal voltage at 300 K with the exact SI constants (MODELS.md).
KB = 1.380649e-23
QE = 1.602176634e-19
VT = KB * 300.0 / QE

# The sweep: 10 kHz to 6 GHz on a grid of ten points a decade aligned to the
# decades (10^(m/10)), and 6 GHz.
F_FROM, F_TO, PER_DECADE = 10e3, 6e9, 10


def sweep():
    lo = math.ceil(math.log10(F_FROM) * PER_DECADE - 1e-9)
    hi = math.floor(math.log10(F_TO) * PER_DECADE + 1e-9)
    f = [10.0 ** (m / PER_DECADE) for m in range(lo, hi + 1)]
    if F_TO / f[-1] - 1 > 1e-9:
        f.append(F_TO)
    return np.array(f)


# ---------------------------------------------------------------------------
# Device laws (MODELS.md)


def clamp_uni(u, vbr, it=1e-3, nbr=1.0, is_=1e-14, n=1.0):
    """Uni clamp junction current from j to b and its derivative."""
    a = it * math.exp((u - vbr) / (nbr * VT))
    b = is_ * math.exp(-u / (n * VT))
    i = a - it * math.exp(-vbr / (nbr * VT)) - (b - is_)
    g = a / (nbr * VT) + b / (n * VT)
    return i, g


def diode(v, is_=1e-14, n=1.0):
    """Diode current from anode to cathode and its derivative."""
    e = is_ * math.exp(v / (n * VT))
    return e - is_, e / (n * VT)


def cj_at(u, cj, vj, m):
    """Junction capacitance C(u) = cj·(1 + |u|/vj)^(−m)."""
    return cj * (1 + abs(u) / vj) ** (-m)


def abcd_line(w, z0, delay):
    """Chain (ABCD) matrix of a lossless line: [[cos θ, j·z0·sin θ],
    [j·sin θ/z0, cos θ]], θ = ωT."""
    th = w * delay
    return np.array([[math.cos(th), 1j * z0 * math.sin(th)], [1j * math.sin(th) / z0, math.cos(th)]])


def abcd_shunt(y):
    """Chain matrix of a shunt admittance."""
    return np.array([[1, 0], [y, 1]], dtype=complex)


def abcd_to_s(m, z0):
    """S-parameters of a two-port from its chain matrix, both ports on the
    same real reference (e.g. Pozar, Microwave Engineering, the two-port
    conversion table)."""
    a, b, c, d = m[0, 0], m[0, 1], m[1, 0], m[1, 1]
    den = a + b / z0 + c * z0 + d
    return np.array([[(a + b / z0 - c * z0 - d) / den, 2 * (a * d - b * c) / den],
                     [2 / den, (-a + b / z0 - c * z0 + d) / den]])


def stamp(Y, i, j, y):
    """An admittance y between nodes i and j (None: gnd)."""
    if i is not None:
        Y[i, i] += y
    if j is not None:
        Y[j, j] += y
    if i is not None and j is not None:
        Y[i, j] -= y
        Y[j, i] -= y


# ---------------------------------------------------------------------------
# Network A (ac-a.zap): conn –TL1– a –TL2– p; clamp D1 at a; pin U1 at p with
# its rail vdd; Rpu from vdd to a; V1 holds vdd at 3.3 V (AC ground).

A = dict(z1=50.0, t1=20e-12, z2=60.0, t2=35e-12,
         vbr=6.2, cj=0.6e-12, m=0.33, vj=0.7, ls=0.4e-9, rdyn=0.5,
         cin=1.5e-12, rs=1.0, rpu=10e3, vdd=3.3, z0=50.0)


def a_operating_point():
    """DC: the lines are wires, so conn = a = p = v; the pull-up's current
    leaves through the clamp and the pin's two diodes."""
    p = A

    def clamp_i(v):
        # junction u with v = u + rdyn·i(u)
        u = brentq(lambda u: u + p["rdyn"] * clamp_uni(u, p["vbr"])[0] - v, v - 1, v + 1, xtol=1e-15, rtol=1e-15)
        return clamp_uni(u, p["vbr"])[0], u

    def lower_i(v):
        # diode anode gnd, cathode kl; kl = v + rs·i_d; current out of p = −i_d
        f = lambda i: i - diode(-(v + p["rs"] * i))[0]
        i = brentq(f, -1e-3, 1e-3, xtol=1e-30, rtol=1e-15)
        return -i, -(v + p["rs"] * i)

    def upper_i(v):
        # diode anode ku, cathode vdd; ku = v − rs·i_d; current out of p = i_d
        f = lambda i: i - diode(v - p["rs"] * i - p["vdd"])[0]
        i = brentq(f, -1e-3, 1e-3, xtol=1e-30, rtol=1e-15)
        return i, v - p["rs"] * i - p["vdd"]

    def kcl(v):
        return (p["vdd"] - v) / p["rpu"] - clamp_i(v)[0] - lower_i(v)[0] - upper_i(v)[0]

    v = brentq(kcl, 3.0, 3.3 + 1e-6, xtol=1e-15, rtol=1e-15)
    return v, clamp_i(v)[1], lower_i(v)[1], upper_i(v)[1]


def a_shunts(w, op):
    """The admittances to AC ground at a (clamp and pull-up) and at p (the
    pin's cin and its two diode paths)."""
    p = A
    v, u, vlo, vup = op
    gj = clamp_uni(u, p["vbr"])[1]
    zj = 1 / (gj + 1j * w * cj_at(u, p["cj"], p["vj"], p["m"]))
    ya = 1 / (1j * w * p["ls"] + p["rdyn"] + zj) + 1 / p["rpu"]
    yp = 1j * w * p["cin"] + 1 / (p["rs"] + 1 / diode(vlo)[1]) + 1 / (p["rs"] + 1 / diode(vup)[1])
    return ya, yp


def a_chain(w, op):
    """A is a cascade from conn to p: TL1, the shunt at a, TL2, the shunt
    at p. Chain matrices keep a short line at low frequency well
    conditioned (in a nodal matrix its series admittance, 1/(j·z0·sin ωT),
    is 1e4 S at 10 kHz beside shunts of 1e-8 S)."""
    ya, yp = a_shunts(w, op)
    return (abcd_line(w, A["z1"], A["t1"]) @ abcd_shunt(ya) @
            abcd_line(w, A["z2"], A["t2"]) @ abcd_shunt(yp))


def a_twoport(f, op):
    return abcd_to_s(a_chain(2 * math.pi * f, op), A["z0"])


def a_responses(freq, op):
    rows = []
    z0 = A["z0"]
    for f in freq:
        w = 2 * math.pi * f
        ya, yp = a_shunts(w, op)
        # Walk back from p, terminated by port 2, with v(p) = 1.
        vp, ip = 1.0, 1.0 / z0 + yp          # current into p from TL2
        va, ia = abcd_line(w, A["z2"], A["t2"]) @ np.array([vp, ip])
        ia = ia + ya * va                      # current into a from TL1
        vc, ic = abcd_line(w, A["z1"], A["t1"]) @ np.array([va, ia])
        drive = ic + vc / z0                   # port 1 in parallel with the drive
        S = a_twoport(f, op)
        rows.append([f, va / vc, vp / vc, vc / drive, S[0, 0], S[1, 0], S[0, 1], S[1, 1]])
    return ["H_a", "H_p", "Zin", "S11", "S21", "S12", "S22"], rows


# ---------------------------------------------------------------------------
# Network B (ac-b.zap): V1 (5 V behind 0.1 Ω) at src, Lc (100 nH, 20 mΩ) to
# in; clamp D1 (ls, no rdyn) and C1 at in; bead FB1 from in to out; C2 and
# the 50 Ω load at out.

B = dict(vs=5.0, rs=0.1, lc=100e-9, rlc=0.02,
         vbr=6.8, cj=50e-12, m=0.4, vj=0.7, ls=0.5e-9,
         c1=1e-6, esr1=10e-3, esl1=0.6e-9,
         rdc=0.3, lb=1.2e-6, cb=1.7e-12, rac=1.1e3,
         c2=1e-6, esr2=5e-3, esl2=0.5e-9, rl=50.0)


def b_operating_point():
    p = B
    rsrc = p["rs"] + p["rlc"]

    def kcl(v):
        return (p["vs"] - v) / rsrc - clamp_uni(v, p["vbr"])[0] - v / (p["rdc"] + p["rl"])

    return brentq(kcl, 4.0, 5.0, xtol=1e-15, rtol=1e-15)


def z_cap(w, c, esr, esl):
    return esr + 1j * w * esl + 1 / (1j * w * c)


def z_bead(w):
    p = B
    return p["rdc"] + 1 / (1 / p["rac"] + 1 / (1j * w * p["lb"]) + 1j * w * p["cb"])


def b_network(w, u):
    """Nodal matrix over in (0) and out (1)."""
    p = B
    Y = np.zeros((2, 2), dtype=complex)
    stamp(Y, 0, None, 1 / (p["rs"] + p["rlc"] + 1j * w * p["lc"]))
    gj = clamp_uni(u, p["vbr"])[1]
    stamp(Y, 0, None, 1 / (1j * w * p["ls"] + 1 / (gj + 1j * w * cj_at(u, p["cj"], p["vj"], p["m"]))))
    stamp(Y, 0, None, 1 / z_cap(w, p["c1"], p["esr1"], p["esl1"]))
    stamp(Y, 0, 1, 1 / z_bead(w))
    stamp(Y, 1, None, 1 / z_cap(w, p["c2"], p["esr2"], p["esl2"]))
    stamp(Y, 1, None, 1 / p["rl"])
    return Y


def b_h(f, u):
    x = np.linalg.solve(b_network(2 * math.pi * f, u), np.array([1, 0], dtype=complex))
    return x[1] / x[0], x[0]


def b_responses(freq, u):
    rows = []
    for f in freq:
        w = 2 * math.pi * f
        h, zin = b_h(f, u)
        rows.append([f, h, zin, z_bead(w), z_cap(w, B["c2"], B["esr2"], B["esl2"])])
    return ["H_out", "Zin", "Z_FB1", "Z_C2"], rows


def b_peak(freq, u):
    """Largest |H_out| above its value at the sweep's first frequency,
    refined by a bounded scalar search on log f between the sampled
    neighbours."""
    mag = np.array([abs(b_h(f, u)[0]) for f in freq])
    k = int(np.argmax(mag))
    r = minimize_scalar(lambda x: -abs(b_h(math.exp(x), u)[0]),
                        bounds=(math.log(freq[k - 1]), math.log(freq[k + 1])),
                        method="bounded", options={"xatol": 1e-12})
    fp = math.exp(r.x)
    gain = abs(b_h(fp, u)[0])
    return fp, gain, 20 * math.log10(gain / mag[0])


# ---------------------------------------------------------------------------


def header(out, what):
    now = datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d %H:%M UTC")
    out.write(f"# {what}\n")
    out.write(f"# written by testdata/reference/ac.py on {now}; Python {sys.version.split()[0]}, "
              f"NumPy {np.__version__}, SciPy {scipy.__version__}, scikit-rf {skrf.__version__}\n")


def write_complex(path, what, names, rows):
    with open(path, "w") as out:
        header(out, what)
        cols = ["freq"] + [f"{n}_{part}" for n in names for part in ("re", "im")]
        out.write(",".join(cols) + "\n")
        for r in rows:
            vals = [f"{r[0]:.17g}"]
            for z in r[1:]:
                vals += [f"{z.real:.17g}", f"{z.imag:.17g}"]
            out.write(",".join(vals) + "\n")


def main():
    folder = sys.argv[1] if len(sys.argv) > 1 else os.path.dirname(os.path.abspath(__file__))
    freq = sweep()

    op = a_operating_point()
    names, rows = a_responses(freq, op)
    write_complex(os.path.join(folder, "ac-a.csv"),
                  f"network A (ac-a.zap) at its operating point v(a) = {op[0]:.15g} V, clamp junction {op[1]:.15g} V; "
                  "transfer from conn and impedance at conn with P1 and P2 terminated in 50 ohm; S-parameters P1 conn, P2 p, 50 ohm",
                  names, rows)

    u = b_operating_point()
    names, rows = b_responses(freq, u)
    write_complex(os.path.join(folder, "ac-b.csv"),
                  f"network B (ac-b.zap) at its operating point v(in) = {u:.15g} V; transfer from in, impedance at in, elements alone",
                  names, rows)
    fp, gain, rise = b_peak(freq, u)
    with open(os.path.join(folder, "ac-peak.csv"), "w") as out:
        header(out, "network B: largest |v(out)/v(in)| above its value at 10 kHz")
        out.write("node,freq,gain,rise_db\n")
        out.write(f"out,{fp:.12g},{gain:.12g},{rise:.12g}\n")

    # Read back zapnet's Touchstone file with scikit-rf and compare.
    ntw = skrf.Network(os.path.join(folder, "ac-a.s2p"))
    worst = 0.0
    for k, f in enumerate(ntw.f):
        worst = max(worst, float(np.max(np.abs(ntw.s[k] - a_twoport(f, op)))))
    z0 = ntw.z0
    # The order of a two-port's data (N11 N21 N12 N22) seen on a
    # non-reciprocal file that zapnet's writer produced for the purpose.
    order = skrf.Network(os.path.join(folder, "ac-order.s2p"))
    want = np.array([[0.1 + 0.2j, 0.5 + 0.6j], [0.3 + 0.4j, 0.7 + 0.8j]])
    order_ok = bool(np.allclose(order.f, [1e9, 2e9], rtol=0, atol=0) and
                    all(np.allclose(order.s[k], want, rtol=0, atol=1e-15) for k in range(2)))
    ok = order_ok and worst < 1e-9 and np.allclose(z0, 50) and ntw.nports == 2 and len(ntw.f) == len(freq) \
        and np.allclose(ntw.f, freq, rtol=1e-11, atol=0)
    with open(os.path.join(folder, "ac-touchstone.csv"), "w") as out:
        header(out, "ac-a.s2p (written by zapnet) read back with scikit-rf, against the S-parameters computed here")
        out.write("file,reader,nports,points,z0_port1,z0_port2,max_abs_ds,order_ok,ok\n")
        out.write(f"ac-a.s2p,skrf.Network,{ntw.nports},{len(ntw.f)},{z0[0, 0].real:.6g},{z0[0, 1].real:.6g},{worst:.3e},{order_ok},{ok}\n")
    print(f"A: v(a) = {op[0]:.12g} V; B: v(in) = {u:.12g} V; B peak {rise:.4f} dB at {fp:.6g} Hz")
    print(f"Touchstone read-back: {len(ntw.f)} points, z0 {z0[0]}, max |dS| {worst:.3e}, order {order_ok}, ok {ok}")
    if not ok:
        sys.exit(1)


if __name__ == "__main__":
    main()
