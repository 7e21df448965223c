#!/usr/bin/env python3
"""Generate tests/data/two_body_decay.hpp, the reference table of two-body
decays (rest-frame kinematics, Lorentz boost to the lab, invariant mass).

Usage:
    python3 tools/gen_two_body_decay.py [--output PATH] [--no-check]

Conventions: c = 1, energies and momenta in MeV, passive convention (the boost
takes coordinates in the parent's rest frame to coordinates in the lab).

A parent of mass M decays at rest into daughters of masses m1 and m2
(standard two-body kinematics, common practice, no source):

    p*  = sqrt((M^2 - (m1+m2)^2) (M^2 - (m1-m2)^2)) / (2M)
    E1* = (M^2 + m1^2 - m2^2) / (2M)        E2* = (M^2 - m1^2 + m2^2) / (2M)

Daughter 1 goes along u = (sin th* cos ph*, sin th* sin ph*, cos th*),
daughter 2 along -u.  The parent moves in the lab with momentum P along
n = (sin Th cos Ph, sin Th sin Ph, cos Th): E = sqrt(M^2 + P^2),
beta = P/E (vector beta n), gamma = E/M.  Lab four-momenta (E', p') of a
daughter with rest-frame (E*, p*):

    E' = gamma (E* + beta n.p*)
    p' = p* + ((gamma - 1)(n.p*) + gamma beta E*) n

For P = 0 the boost is the identity and the lab values are the rest values.

Masses (MeV), typed from memory; each input is the nearest binary64 double
of the quoted decimal, and everything is computed from that double exactly:
    electron  0.51099895000   CODATA 2018 recommended value (energy equivalent)
    muon      105.6583755     CODATA 2018 recommended value (energy equivalent)
    proton    938.27208816    CODATA 2018 recommended value (energy equivalent)
    pi+-      139.57039       PDG, Review of Particle Physics 2020
    pi0       134.9768        PDG, Review of Particle Physics 2020
    K0        497.611         PDG, Review of Particle Physics 2020
    Lambda    1115.683        PDG, Review of Particle Physics 2020
    Z         91187.6         PDG, Review of Particle Physics 2020
    neutrino, photon: 0 (massless)

Every input of a row (M, m1, m2, P, Th, Ph, th*, ph*) is a binary64 double,
printed as its exact decimal expansion, so it reads into double without
rounding.  The outputs are evaluated with mpmath at 60 decimal digits and
printed with 50 significant digits.  At 60 digits the lab values are formed
from rearranged, cancellation-free expressions (gamma - 1 = P^2/(M(E + M));
for backward emission E' = gamma (m^2 + |p*_perp|^2 + (n.p*)^2/gamma^2) /
(E* - beta n.p*), and similarly for the parallel momentum), so that even
backward emission at gamma ~ 1e8 keeps all printed digits.

Self-check before anything is written (a failure stops the script):
  * every output is recomputed at 120 digits from the plain formulas above
    and must agree with the 60-digit value to 1e-50 relative (zeros must be
    exact zeros in both);
  * on the 120-digit values, to 1e-45 relative: the invariant mass of the
    two lab daughters equals M; each daughter's E'^2 - |p'|^2 equals its m^2
    (relative to E'^2 for massless daughters); the sum of the two lab
    four-momenta equals (E, P n); boosting the lab daughters back
    (beta -> -beta) recovers the rest-frame four-momenta.

Configurations per decay: a fixed list of (P/M, th*, parent direction) plus
two drawn from the same sets by a fixed linear congruential generator
(Knuth's MMIX constants, fixed seed), which also gives the pseudo-random
parent directions and the azimuths ph*.  P/M is taken from
{0, 1e-9, 1e-3, 1, 1e3, 1e8} (P = double(M * factor)) and th* from
{0, 1e-6, 0.3, pi/2, pi - 1e-6, pi} (each rounded to double).  Some fixed
rows put the parent along +z exactly (Th = Ph = 0), so that th* near pi is
backward emission, the case of the largest cancellation in the boost.

The output is deterministic; only the generation date in the top comment
changes between runs.  Set SOURCE_DATE_EPOCH (seconds since 1970, UTC) to fix
that date too.
"""

import argparse
import datetime
import math
import os
import sys
from decimal import Decimal
from fractions import Fraction

import mpmath
from mpmath import mp, mpf

WORK_DPS = 60
CHECK_DPS = 120
OUT_DIGITS = 50
AGREE_REL_TOL = mpf(10) ** -50
IDENTITY_REL_TOL = mpf(10) ** -45

# Masses in MeV, (quoted decimal, source).  All typed from memory.
MASSES = {
    "e": ("0.51099895000", "CODATA 2018 (from memory)"),
    "mu": ("105.6583755", "CODATA 2018 (from memory)"),
    "p": ("938.27208816", "CODATA 2018 (from memory)"),
    "pi+-": ("139.57039", "PDG 2020 (from memory)"),
    "pi0": ("134.9768", "PDG 2020 (from memory)"),
    "K0": ("497.611", "PDG 2020 (from memory)"),
    "Lambda": ("1115.683", "PDG 2020 (from memory)"),
    "Z": ("91187.6", "PDG 2020 (from memory)"),
    "0": ("0", "massless"),
}

# (name, parent, daughter 1, daughter 2)
DECAYS = [
    ("pi+ -> mu+ nu", "pi+-", "mu", "0"),
    ("K0_S -> pi+ pi-", "K0", "pi+-", "pi+-"),
    ("Lambda -> p pi-", "Lambda", "p", "pi+-"),
    ("Z -> mu+ mu-", "Z", "mu", "mu"),
    ("Z -> e+ e-", "Z", "e", "e"),
    ("pi0 -> gamma gamma", "pi0", "0", "0"),
]

P_FACTORS = [("P = 0 (parent at rest)", 0.0), ("P = 1e-9 M", 1e-9),
             ("P = 1e-3 M", 1e-3), ("P = M", 1.0), ("P = 1e3 M", 1e3),
             ("P = 1e8 M", 1e8)]
THETA_STARS = [("0", 0.0), ("1e-6", 1e-6), ("0.3", 0.3),
               ("pi/2", math.pi / 2), ("pi - 1e-6", math.pi - 1e-6),
               ("pi", math.pi)]

# Fixed configurations: (index into P_FACTORS, index into THETA_STARS,
# parent along +z exactly?)
FIXED_CONFIGS = [
    (0, 2, False),   # parent at rest, th* = 0.3
    (1, 3, False),   # slow parent, th* = pi/2
    (2, 1, False),   # P = 1e-3 M, th* = 1e-6
    (3, 2, False),   # P = M, th* = 0.3
    (3, 4, False),   # P = M, th* = pi - 1e-6
    (4, 3, False),   # P = 1e3 M, th* = pi/2
    (4, 5, True),    # P = 1e3 M along +z, th* = pi: backward emission
    (5, 0, True),    # P = 1e8 M along +z, th* = 0: forward emission
    (5, 4, True),    # P = 1e8 M along +z, th* = pi - 1e-6: near backward
]
RANDOM_CONFIGS_PER_DECAY = 2
LCG_SEED = 20260315


class Lcg:
    """Fixed 64-bit linear congruential generator (Knuth's MMIX constants),
    independent of Python's random module."""

    def __init__(self, seed):
        self.state = seed % (1 << 64)

    def next_bits(self):
        self.state = (6364136223846793005 * self.state
                      + 1442695040888963407) % (1 << 64)
        return self.state >> 11  # 53 bits

    def unit(self):
        """A double in [0, 1), exactly k / 2^53."""
        return self.next_bits() / float(1 << 53)

    def index(self, n):
        return self.next_bits() % n


def exact_decimal(v):
    """The exact decimal expansion of the binary64 value v."""
    s = format(Decimal(v), "f")
    if "." not in s:
        s += ".0"
    assert Fraction(s) == Fraction(v)
    return s


def fmt(x):
    return mpmath.nstr(x, OUT_DIGITS, strip_zeros=False, min_fixed=-4,
                       max_fixed=6)


def unit_vector(theta, phi):
    st, ct = mpmath.sin(theta), mpmath.cos(theta)
    sp, cp = mpmath.sin(phi), mpmath.cos(phi)
    return [st * cp, st * sp, ct]


def dot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


OUT_KEYS = ("p_star", "E1_star", "E2_star", "beta_x", "beta_y", "beta_z",
            "gamma", "E1", "p1x", "p1y", "p1z", "E2", "p2x", "p2y", "p2z",
            "p1x_star", "p1y_star", "p1z_star")


def careful_boost(m, e_s, p_s, n, beta, gamma, gm1, inv_g2):
    """Lab (E', p') of a daughter of mass m with rest-frame energy e_s and
    momentum vector p_s, for a parent moving with speed beta along n, using
    cancellation-free rearrangements of the boost formulas."""
    c = dot(n, p_s)
    if c >= 0:
        e_lab = gamma * (e_s + beta * c)
        p_par = gamma * (c + beta * e_s)
    else:
        perp = [p_s[i] - c * n[i] for i in range(3)]
        perp2 = dot(perp, perp)
        # E*^2 - beta^2 c^2 = m^2 + |p_perp|^2 + c^2/gamma^2
        e_lab = gamma * (m * m + perp2 + c * c * inv_g2) / (e_s - beta * c)
        # c + beta E* directly, or as (beta^2 E*^2 - c^2)/(beta E* - c) with
        # beta^2 E*^2 - c^2 = m^2 + |p_perp|^2 - E*^2/gamma^2: take the form
        # with the smaller cancellation.
        direct_scale = abs(c) * (beta * e_s + abs(c))
        alt_scale = e_s * e_s * inv_g2
        if alt_scale < direct_scale:
            p_par = gamma * (m * m + perp2 - alt_scale) / (beta * e_s - c)
        else:
            p_par = gamma * (c + beta * e_s)
    if beta <= mpf("0.5"):
        # Slow parent: p' = p* + K n with K = (gamma-1) c + gamma beta E*;
        # |(gamma-1) c| < 0.27 gamma beta E* here, so K does not cancel.
        k = gm1 * c + gamma * beta * e_s
        p_lab = [p_s[i] + k * n[i] for i in range(3)]
    else:
        # Fast parent: p' = (p* - c n) + p'_par n.
        p_lab = [(p_s[i] - c * n[i]) + p_par * n[i] for i in range(3)]
    return e_lab, p_lab


def careful_row(inp, dps):
    """All outputs of one row at dps digits, cancellation-free forms."""
    with mp.workdps(dps):
        M, m1, m2, P = (mpf(inp[k]) for k in ("M", "m1", "m2", "P"))
        Th, Ph, ths, phs = (mpf(inp[k]) for k in
                            ("Theta", "Phi", "theta_star", "phi_star"))
        s, d = m1 + m2, m1 - m2
        p_s = mpmath.sqrt((M - s) * (M + s) * (M - d) * (M + d)) / (2 * M)
        e1_s = (M * M + d * s) / (2 * M)
        e2_s = (M * M - d * s) / (2 * M)
        u = unit_vector(ths, phs)
        p1_s = [p_s * x for x in u]
        p2_s = [-x for x in p1_s]
        n = unit_vector(Th, Ph)
        E = mpmath.sqrt(M * M + P * P)
        beta = P / E
        gamma = E / M
        gm1 = P * P / (M * (E + M))
        inv_g2 = (M / E) ** 2
        if P == 0:
            e1, p1 = e1_s, list(p1_s)
            e2, p2 = e2_s, list(p2_s)
        else:
            e1, p1 = careful_boost(m1, e1_s, p1_s, n, beta, gamma, gm1, inv_g2)
            e2, p2 = careful_boost(m2, e2_s, p2_s, n, beta, gamma, gm1, inv_g2)
        out = {
            "p_star": p_s, "E1_star": e1_s, "E2_star": e2_s,
            "beta_x": beta * n[0], "beta_y": beta * n[1], "beta_z": beta * n[2],
            "gamma": gamma,
            "E1": e1, "p1x": p1[0], "p1y": p1[1], "p1z": p1[2],
            "E2": e2, "p2x": p2[0], "p2y": p2[1], "p2z": p2[2],
            "p1x_star": p1_s[0], "p1y_star": p1_s[1], "p1z_star": p1_s[2],
        }
        return {k: +v for k, v in out.items()}


def plain_boost(e_s, p_s, n, beta, gamma):
    """The boost formulas exactly as written in the module docstring."""
    c = dot(n, p_s)
    e_lab = gamma * (e_s + beta * c)
    k = (gamma - 1) * c + gamma * beta * e_s
    return e_lab, [p_s[i] + k * n[i] for i in range(3)]


def plain_row(inp, dps):
    """All outputs of one row at dps digits from the plain formulas, plus the
    quantities the identity checks need."""
    with mp.workdps(dps):
        M, m1, m2, P = (mpf(inp[k]) for k in ("M", "m1", "m2", "P"))
        Th, Ph, ths, phs = (mpf(inp[k]) for k in
                            ("Theta", "Phi", "theta_star", "phi_star"))
        p_s = mpmath.sqrt((M ** 2 - (m1 + m2) ** 2)
                          * (M ** 2 - (m1 - m2) ** 2)) / (2 * M)
        e1_s = (M ** 2 + m1 ** 2 - m2 ** 2) / (2 * M)
        e2_s = (M ** 2 - m1 ** 2 + m2 ** 2) / (2 * M)
        u = unit_vector(ths, phs)
        p1_s = [p_s * x for x in u]
        p2_s = [-p_s * x for x in u]
        n = unit_vector(Th, Ph)
        E = mpmath.sqrt(M ** 2 + P ** 2)
        beta = P / E
        gamma = E / M
        e1, p1 = plain_boost(e1_s, p1_s, n, beta, gamma)
        e2, p2 = plain_boost(e2_s, p2_s, n, beta, gamma)
        out = {
            "p_star": p_s, "E1_star": e1_s, "E2_star": e2_s,
            "beta_x": beta * n[0], "beta_y": beta * n[1], "beta_z": beta * n[2],
            "gamma": gamma,
            "E1": e1, "p1x": p1[0], "p1y": p1[1], "p1z": p1[2],
            "E2": e2, "p2x": p2[0], "p2y": p2[1], "p2z": p2[2],
            "p1x_star": p1_s[0], "p1y_star": p1_s[1], "p1z_star": p1_s[2],
        }
        extra = {"M": M, "m1": m1, "m2": m2, "E": E, "P": P, "n": n,
                 "beta": beta, "gamma": gamma,
                 "rest": [(e1_s, p1_s), (e2_s, p2_s)],
                 "lab": [(e1, p1), (e2, p2)]}
        return out, extra


def fail(label, what, a, b, err):
    sys.exit("check failed: %s: %s: %s vs %s (rel %s)"
             % (label, what, mpmath.nstr(a, 50), mpmath.nstr(b, 50),
                mpmath.nstr(err, 5)))


def check_agreement(label, work, ref):
    """60-digit values against the 120-digit plain recomputation."""
    with mp.workdps(CHECK_DPS):
        for k in OUT_KEYS:
            a, b = work[k], ref[k]
            if b == 0 or a == 0:
                if a != b:
                    fail(label, k + " (zero expected in both)", a, b, mpf(1))
                continue
            err = abs(a - b) / abs(b)
            if err > AGREE_REL_TOL:
                fail(label, k, a, b, err)


def check_identities(label, x):
    """Physics identities on the 120-digit values, at 120 digits."""
    tol = IDENTITY_REL_TOL
    with mp.workdps(CHECK_DPS):
        (e1, p1), (e2, p2) = x["lab"]
        M, E, P, n = x["M"], x["E"], x["P"], x["n"]
        # invariant mass of the pair
        es = e1 + e2
        ps = [p1[i] + p2[i] for i in range(3)]
        minv = mpmath.sqrt(es * es - dot(ps, ps))
        err = abs(minv - M) / M
        if err > tol:
            fail(label, "invariant mass", minv, M, err)
        # each daughter on its mass shell
        for idx, (e, p), m in ((1, x["lab"][0], x["m1"]),
                               (2, x["lab"][1], x["m2"])):
            m2_lab = e * e - dot(p, p)
            scale = m * m if m != 0 else e * e
            err = abs(m2_lab - m * m) / scale
            if err > tol:
                fail(label, "E^2 - p^2 of daughter %d" % idx, m2_lab, m * m,
                     err)
        # four-momentum conservation
        err = abs(es - E) / E
        if err > tol:
            fail(label, "E1 + E2", es, E, err)
        scale = P if P != 0 else x["rest"][0][0]
        for i in range(3):
            err = abs(ps[i] - P * n[i]) / scale
            if err > tol:
                fail(label, "p1 + p2 component %d" % i, ps[i], P * n[i], err)
        # boost back with -beta
        beta, gamma = x["beta"], x["gamma"]
        for idx in (0, 1):
            e, p = x["lab"][idx]
            e_s, p_s = x["rest"][idx]
            c = dot(n, p)
            e_back = gamma * (e - beta * c)
            k = (gamma - 1) * c - gamma * beta * e
            p_back = [p[i] + k * n[i] for i in range(3)]
            err = abs(e_back - e_s) / e_s
            if err > tol:
                fail(label, "E* of daughter %d after back-boost" % (idx + 1),
                     e_back, e_s, err)
            for i in range(3):
                err = abs(p_back[i] - p_s[i]) / e_s
                if err > tol:
                    fail(label, "p* component %d of daughter %d after "
                         "back-boost" % (i, idx + 1), p_back[i], p_s[i], err)


def build_rows():
    rng = Lcg(LCG_SEED)
    rows = []
    for name, parent, d1, d2 in DECAYS:
        M = float(MASSES[parent][0])
        m1 = float(MASSES[d1][0])
        m2 = float(MASSES[d2][0])
        configs = list(FIXED_CONFIGS)
        for _ in range(RANDOM_CONFIGS_PER_DECAY):
            configs.append((rng.index(len(P_FACTORS)),
                            rng.index(len(THETA_STARS)), None))
        for ip, it, along_z in configs:
            Theta = rng.unit() * math.pi
            Phi = rng.unit() * (2.0 * math.pi)
            phi_star = rng.unit() * (2.0 * math.pi)
            pname, pf = P_FACTORS[ip]
            tname, theta_star = THETA_STARS[it]
            P = M * pf
            if along_z:
                Theta, Phi = 0.0, 0.0
                direction = "parent along +z"
            else:
                direction = "parent direction pseudo-random"
            if along_z is None:
                how = "drawn by the generator"
            else:
                how = "fixed"
            note = "%s: %s, theta* = %s, %s" % (how, pname, tname,
                                                        direction)
            for v in (M, m1, m2, P, Theta, Phi, theta_star, phi_star):
                assert math.isfinite(v) and v >= 0.0
            rows.append({
                "name": name, "M": M, "m1": m1, "m2": m2, "P": P,
                "Theta": Theta, "Phi": Phi, "theta_star": theta_star,
                "phi_star": phi_star,
                "M_quoted": MASSES[parent][0], "m1_quoted": MASSES[d1][0],
                "m2_quoted": MASSES[d2][0], "note": note,
            })
    return rows


IN_KEYS = ("M", "m1", "m2", "P", "Theta", "Phi", "theta_star", "phi_star")


def emit(rows, out_path, check=True):
    gen_date = datetime.datetime.now(datetime.timezone.utc)
    if os.environ.get("SOURCE_DATE_EPOCH"):
        gen_date = datetime.datetime.fromtimestamp(
            int(os.environ["SOURCE_DATE_EPOCH"]), datetime.timezone.utc)
    mp.dps = WORK_DPS
    body = []
    for i, row in enumerate(rows):
        vals = careful_row(row, WORK_DPS)
        if check:
            label = "row %d (%s, %s)" % (i, row["name"], row["note"])
            ref, extra = plain_row(row, CHECK_DPS)
            check_agreement(label, vals, ref)
            check_identities(label, extra)
        fields = [row["name"]]
        fields += [exact_decimal(row[k]) for k in IN_KEYS]
        fields += [fmt(vals[k]) for k in OUT_KEYS]
        fields += [row["M_quoted"], row["m1_quoted"], row["m2_quoted"],
                   row["note"]]
        body.append("    {" + ", ".join('"%s"' % f for f in fields) + "},")

    L = []
    w = L.append
    w("// two_body_decay.hpp: reference two-body decays, rest-frame kinematics")
    w("// and the Lorentz boost of both daughters to the lab.")
    w("//")
    w("// generated, do not edit.")
    w("// Generator:         tools/gen_two_body_decay.py")
    w("// mpmath version:    %s" % mpmath.__version__)
    w("// Working precision: %d decimal digits (mpmath mp.dps = %d); values"
      % (WORK_DPS, WORK_DPS))
    w("//                    printed with %d significant digits." % OUT_DIGITS)
    w("// Generated on:      %s (UTC)" % gen_date.strftime("%Y-%m-%d"))
    w("//")
    w("// Units and conventions: c = 1, energies and momenta in MeV, passive")
    w("// convention (the boost takes rest-frame coordinates of the parent to")
    w("// lab coordinates).")
    w("//")
    w("// Masses in MeV, all typed from memory; the input used is the nearest")
    w("// binary64 double of the quoted decimal (fields M_quoted, m1_quoted,")
    w("// m2_quoted hold the quoted decimal, M, m1, m2 the double exactly):")
    for key in ("e", "mu", "p"):
        w("//   %-8s %-14s CODATA 2018 recommended value (energy equivalent)"
          % ({"e": "electron", "mu": "muon", "p": "proton"}[key],
             MASSES[key][0]))
    for key, label in (("pi+-", "pi+-"), ("pi0", "pi0"), ("K0", "K0"),
                       ("Lambda", "Lambda"), ("Z", "Z")):
        w("//   %-8s %-14s PDG, Review of Particle Physics 2020"
          % (label, MASSES[key][0]))
    w("//   neutrino, photon: 0 (massless)")
    w("//")
    w("// Formulas (standard two-body kinematics, common practice, no source):")
    w("//   p*  = sqrt((M^2 - (m1+m2)^2) (M^2 - (m1-m2)^2)) / (2M)")
    w("//   E1* = (M^2 + m1^2 - m2^2) / (2M),  E2* = (M^2 - m1^2 + m2^2) / (2M)")
    w("//   u   = (sin th* cos ph*, sin th* sin ph*, cos th*);  p1* = p* u,")
    w("//         p2* = -p* u")
    w("//   n   = (sin Th cos Ph, sin Th sin Ph, cos Th);  E = sqrt(M^2 + P^2),")
    w("//         beta = P/E (parent velocity beta n), gamma = E/M")
    w("//   E'  = gamma (E* + beta n.p*)")
    w("//   p'  = p* + ((gamma - 1)(n.p*) + gamma beta E*) n")
    w("// (for P = 0 the lab values are the rest values).  The 60-digit values")
    w("// come from cancellation-free rearrangements of these formulas; the")
    w("// generator checked every value against the plain formulas at %d"
      % CHECK_DPS)
    w("// digits (relative agreement 1e-50, zeros exact), and on the %d-digit"
      % CHECK_DPS)
    w("// values the invariant mass of the pair (= M), each daughter's")
    w("// E'^2 - |p'|^2 (= m^2), the sum of the lab four-momenta (= (E, P n))")
    w("// and the boost back with -beta (= rest-frame four-momenta), all to")
    w("// 1e-45 relative.")
    w("//")
    w("// Inputs (M, m1, m2, P, Theta, Phi, theta_star, phi_star) are exact")
    w("// decimal expansions of binary64 doubles; P = double(M * factor) with")
    w("// factor in {0, 1e-9, 1e-3, 1, 1e3, 1e8}; theta_star is the double of")
    w("// 0, 1e-6, 0.3, pi/2, pi - 1e-6 or pi (so sin(theta_star) is not 0 for")
    w("// the double nearest pi).  Parent directions and phi_star come from a")
    w("// fixed linear congruential generator, except rows whose note says")
    w("// \"parent along +z\" (Theta = Phi = 0), where theta_star near pi is")
    w("// backward emission.  Daughter 1 is the first particle after \"->\".")
    w("// Recomputing E'^2 - |p'|^2 or the pair mass from the printed lab")
    w("// values loses about log10(gamma^2) digits to cancellation.")
    w("")
    w("#ifndef EIGENZEIT_TESTS_DATA_TWO_BODY_DECAY_HPP")
    w("#define EIGENZEIT_TESTS_DATA_TWO_BODY_DECAY_HPP")
    w("")
    w("#include <cstddef>")
    w("")
    w("namespace eigenzeit_testdata {")
    w("")
    w("struct two_body_row {")
    w("    const char* name;        // decay, daughter 1 listed first")
    w("    const char* M;           // parent mass (binary64-exact), MeV")
    w("    const char* m1;          // daughter 1 mass (binary64-exact), MeV")
    w("    const char* m2;          // daughter 2 mass (binary64-exact), MeV")
    w("    const char* P;           // parent lab momentum (binary64-exact), MeV")
    w("    const char* Theta;       // parent direction, polar angle, rad")
    w("    const char* Phi;         // parent direction, azimuth, rad")
    w("    const char* theta_star;  // daughter 1 rest-frame polar angle, rad")
    w("    const char* phi_star;    // daughter 1 rest-frame azimuth, rad")
    w("    const char* p_star;      // rest-frame momentum magnitude, MeV")
    w("    const char* E1_star;     // rest-frame energy of daughter 1, MeV")
    w("    const char* E2_star;     // rest-frame energy of daughter 2, MeV")
    w("    const char* beta_x;      // parent lab velocity (units of c)")
    w("    const char* beta_y;")
    w("    const char* beta_z;")
    w("    const char* gamma;       // parent Lorentz factor E/M")
    w("    const char* E1;          // daughter 1 lab energy, MeV")
    w("    const char* p1x;         // daughter 1 lab momentum, MeV")
    w("    const char* p1y;")
    w("    const char* p1z;")
    w("    const char* E2;          // daughter 2 lab energy, MeV")
    w("    const char* p2x;         // daughter 2 lab momentum, MeV")
    w("    const char* p2y;")
    w("    const char* p2z;")
    w("    const char* p1x_star;    // daughter 1 rest-frame momentum, MeV")
    w("    const char* p1y_star;")
    w("    const char* p1z_star;")
    w("    const char* M_quoted;    // parent mass as quoted by its source")
    w("    const char* m1_quoted;   // daughter 1 mass as quoted by its source")
    w("    const char* m2_quoted;   // daughter 2 mass as quoted by its source")
    w("    const char* note;        // configuration")
    w("};")
    w("")
    w("inline constexpr two_body_row two_body_rows[] = {")
    L.extend(body)
    w("};")
    w("")
    w("inline constexpr std::size_t two_body_row_count = %d;" % len(rows))
    w("")
    w("}  // namespace eigenzeit_testdata")
    w("")
    w("#endif  // EIGENZEIT_TESTS_DATA_TWO_BODY_DECAY_HPP")
    with open(out_path, "w") as fh:
        fh.write("\n".join(L) + "\n")


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--output", default=os.path.join(
        here, "..", "tests", "data", "two_body_decay.hpp"))
    ap.add_argument("--no-check", action="store_true",
                    help="skip the %d-digit check" % CHECK_DPS)
    args = ap.parse_args()
    rows = build_rows()
    emit(rows, args.output, check=not args.no_check)
    print("two_body_decay.hpp: %d rows written to %s (%s)"
          % (len(rows), os.path.normpath(args.output),
             "checked at %d digits" % CHECK_DPS if not args.no_check
             else "NOT checked"))


if __name__ == "__main__":
    main()
