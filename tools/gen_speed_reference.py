#!/usr/bin/env python3
"""Generate tests/data/speed_reference.hpp, the reference table for speed<T>.

Usage:
    python3 tools/gen_speed_reference.py [--output PATH] [--no-check]

Every row of the table is one construction of a speed from one exact input
(a decimal string that is exactly a binary32 float, so it is exact in float,
double and long double alike) together with all views of that speed.  The
views are evaluated with mpmath at 60 decimal digits from cancellation-free
formulas and printed with 40 significant digits.  Before anything is
written, every row is checked against the plain definition formulas
evaluated at 300 digits (where cancellation cannot reach the printed digits);
a disagreement stops the script.

Definitions (beta in units of c, 0 <= beta < 1):
    gamma = 1/sqrt(1-beta^2)         gamma_m1 = gamma - 1
    inv_gamma = sqrt(1-beta^2)       dilation_fraction = 1 - 1/gamma
    rapidity = atanh(beta)           proper_speed = beta*gamma
    beta_deficit = 1 - beta
    kinetic_energy row: gamma_m1 = kinetic/mass
    momentum row:       proper_speed = momentum/mass

The output is deterministic; only the generation date in the top comment
changes between runs.  Set SOURCE_DATE_EPOCH (seconds since 1970, UTC) to fix
that date too.  No randomness is used.
"""

import argparse
import datetime
import os
import struct
import sys
from decimal import Decimal

import mpmath
from mpmath import mp, mpf

WORK_DPS = 60        # working precision of the reference values
OUT_DIGITS = 40      # significant digits printed
CHECK_DPS = 300      # precision of the independent check
CHECK_REL_TOL = mpf(10) ** -45

mp.dps = WORK_DPS

CTORS = ("beta", "beta_deficit", "gamma", "gamma_m1", "rapidity",
         "proper_speed", "kinetic_energy", "momentum")
VIEWS = ("beta", "beta_deficit", "gamma", "gamma_m1", "inv_gamma",
         "dilation_fraction", "rapidity", "proper_speed")


# --------------------------------------------------------------------------
# binary32 helpers (struct only)

def f32_from_bits(bits):
    return struct.unpack("<f", struct.pack("<I", bits))[0]


def f32_bits(v):
    return struct.unpack("<I", struct.pack("<f", v))[0]


FLT_MAX = f32_from_bits(0x7F7FFFFF)
FLT_MIN = f32_from_bits(0x00800000)          # smallest normal, 2^-126
FLT_TRUE_MIN = f32_from_bits(0x00000001)     # smallest subnormal, 2^-149


def f32_next_up(v):
    """Next binary32 above v, v a non-negative finite binary32 value."""
    return f32_from_bits(f32_bits(v) + 1)


def f32_next_down(v):
    """Next binary32 below v, v a positive finite binary32 value."""
    return f32_from_bits(f32_bits(v) - 1)


def f32_nearest(x):
    """The binary32 value nearest to the mpf x >= 0, or None on overflow.

    The value is rounded through a Python float first and then corrected by
    an exact comparison with its neighbours, so double rounding cannot pick
    a farther float."""
    x = mpf(x)
    if x < 0:
        raise ValueError("negative target")
    try:
        c = struct.unpack("<f", struct.pack("<f", float(x)))[0]
    except OverflowError:
        return None
    cands = [c]
    if c > 0:
        cands.append(f32_next_down(c))
    if c < FLT_MAX:
        cands.append(f32_next_up(c))
    best = min(cands, key=lambda v: (abs(mpf(v) - x), v))
    if mpf(best) > mpf(FLT_MAX):
        return None
    return best


def f32_below_above(x):
    """The binary32 values just below and just above the mpf x (x itself is
    not a binary32 value in the cases used here)."""
    n = f32_nearest(x)
    if mpf(n) < x:
        return n, f32_next_up(n)
    if mpf(n) > x:
        return f32_next_down(n), n
    return f32_next_down(n), f32_next_up(n)


def exact_decimal(v):
    """Exact decimal expansion of a binary (Python float) value."""
    d = Decimal(v)
    if d == 0:
        return "0"
    if Decimal("1e-4") <= abs(d) < Decimal("1e7"):
        s = format(d, "f")
    else:
        s = format(d, "e")
        mant, exp = s.split("e")
        exp = int(exp)
        s = "%se%s%d" % (mant, "-" if exp < 0 else "+", abs(exp))
    return s


def fmt(x):
    """40 significant digits."""
    return mpmath.nstr(x, OUT_DIGITS, strip_zeros=False,
                       min_fixed=-4, max_fixed=7)


# --------------------------------------------------------------------------
# Views at WORK_DPS from cancellation-free formulas.
#
# A state is the tuple (beta, deficit, gamma, gamma_m1, proper_speed), each
# with full relative accuracy.  All remaining views follow without
# cancellation:
#   inv_gamma = 1/gamma, dilation_fraction = gamma_m1/gamma,
#   rapidity = asinh(proper_speed).

def state_from_beta(b):
    d = 1 - b                       # exact: b has at most 24 bits, >= 2^-149
    q = d * (1 + b)                 # 1 - b^2
    sq = mp.sqrt(q)
    g = 1 / sq
    gm1 = b * b / (sq * (1 + sq))   # (1 - sq)/sq with 1 - sq = b^2/(1+sq)
    u = b / sq
    return b, d, g, gm1, u


def state_from_deficit(d):
    b = 1 - d                       # exact at 60 digits for binary32 d
    q = d * (2 - d)
    sq = mp.sqrt(q)
    g = 1 / sq
    gm1 = b * b / (sq * (1 + sq))
    u = b / sq
    return b, d, g, gm1, u


def state_from_gm1(x):
    g = 1 + x
    u = mp.sqrt(x * (x + 2))
    b = u / g
    d = 1 / (g * g * (1 + b))       # 1 - b = (1 - b^2)/(1 + b) = 1/(g^2 (1+b))
    return b, d, g, x, u


def state_from_gamma(g):
    return state_from_gm1(g - 1)    # g - 1 exact at 60 digits for binary32 g


def state_from_proper_speed(u):
    g = mp.sqrt(1 + u * u)
    gm1 = u * u / (g + 1)
    b = u / g
    d = 1 / (g * g * (1 + b))
    return b, d, g, gm1, u


def state_from_rapidity(eta):
    b = mp.tanh(eta)
    g = mp.cosh(eta)
    u = mp.sinh(eta)
    gm1 = 2 * mp.sinh(eta / 2) ** 2
    d = mp.exp(-eta) / g            # 1 - tanh = (cosh - sinh)/cosh
    return b, d, g, gm1, u


def views_from_state(st, rapidity=None):
    b, d, g, gm1, u = st
    return {
        "beta": b,
        "beta_deficit": d,
        "gamma": g,
        "gamma_m1": gm1,
        "inv_gamma": 1 / g,
        "dilation_fraction": gm1 / g,
        "rapidity": mp.asinh(u) if rapidity is None else rapidity,
        "proper_speed": u,
    }


def reference_views(ctor, a, m=None):
    """All views for constructor ctor with exact input a (and mass m)."""
    a = mpf(a)
    if ctor == "beta":
        return views_from_state(state_from_beta(a))
    if ctor == "beta_deficit":
        return views_from_state(state_from_deficit(a))
    if ctor == "gamma":
        return views_from_state(state_from_gamma(a))
    if ctor == "gamma_m1":
        return views_from_state(state_from_gm1(a))
    if ctor == "rapidity":
        return views_from_state(state_from_rapidity(a), rapidity=+a)
    if ctor == "proper_speed":
        return views_from_state(state_from_proper_speed(a))
    if ctor == "kinetic_energy":
        return views_from_state(state_from_gm1(a / mpf(m)))
    if ctor == "momentum":
        return views_from_state(state_from_proper_speed(a / mpf(m)))
    raise ValueError(ctor)


def naive_views(ctor, a, m=None):
    """The definition formulas, at CHECK_DPS, for the independent check."""
    with mp.workdps(CHECK_DPS):
        a = mpf(a)
        if ctor == "beta":
            b = a
        elif ctor == "beta_deficit":
            b = 1 - a
        elif ctor == "gamma":
            b = mp.sqrt(1 - 1 / a ** 2)
        elif ctor == "gamma_m1":
            b = mp.sqrt(1 - 1 / (1 + a) ** 2)
        elif ctor == "rapidity":
            b = mp.tanh(a)
        elif ctor == "proper_speed":
            b = a / mp.sqrt(1 + a ** 2)
        elif ctor == "kinetic_energy":
            b = mp.sqrt(1 - 1 / (1 + a / mpf(m)) ** 2)
        elif ctor == "momentum":
            u = a / mpf(m)
            b = u / mp.sqrt(1 + u ** 2)
        else:
            raise ValueError(ctor)
        g = 1 / mp.sqrt(1 - b ** 2)
        return {
            "beta": b,
            "beta_deficit": 1 - b,
            "gamma": g,
            "gamma_m1": g - 1,
            "inv_gamma": mp.sqrt(1 - b ** 2),
            "dilation_fraction": 1 - 1 / g,
            "rapidity": mp.atanh(b),
            "proper_speed": b * g,
        }


def check_close(label, ref, chk):
    with mp.workdps(CHECK_DPS):
        for k in VIEWS:
            r, c = mpf(ref[k]), chk[k]
            if c == 0:
                ok = r == 0
            else:
                ok = abs(r - c) <= CHECK_REL_TOL * abs(c)
            if not ok:
                raise SystemExit("check failed: %s view %s: %s vs %s"
                                 % (label, k, mpmath.nstr(r, 50),
                                    mpmath.nstr(c, 50)))


# --------------------------------------------------------------------------
# Rows

class Table:
    def __init__(self):
        self.rows = []
        self.seen = set()

    def add(self, ctor, value, note, mass=None):
        """Add a row; value and mass are binary32 values (Python floats)."""
        if value is None:           # no binary32 value (overflow)
            return
        if ctor == "beta" and not (0 <= value < 1):
            return
        if ctor == "beta_deficit" and not (0 < value <= 1):
            return
        if ctor == "gamma" and not (value >= 1):
            return
        if value < 0 or value > FLT_MAX:
            return
        key = (ctor, value, mass)
        if key in self.seen:
            return
        self.seen.add(key)
        assert f32_nearest(mpf(value)) == value
        if mass is not None:
            assert f32_nearest(mpf(mass)) == mass and mass > 0
        self.rows.append((ctor, value, mass, note))


# Binary32 masses used for the energy rows (one unit for all energies).
M_ONE = 1.0
M_PROTON = f32_nearest(mpf("938.27208816"))   # CODATA 2018 proton rest energy, MeV
M_ELECTRON = f32_nearest(mpf("0.51099895000"))  # CODATA 2018 electron rest energy, MeV
MASSES = (M_ONE, M_PROTON, M_ELECTRON)
MASS_NAMES = {M_ONE: "m = 1",
              M_PROTON: "m = proton 938.27208816 MeV (CODATA 2018) as float",
              M_ELECTRON: "m = electron 0.51099895 MeV (CODATA 2018) as float"}

EPS = {
    "float": mpf(2) ** -23,
    "double": mpf(2) ** -52,
    "long double": mpf(2) ** -63,   # x87 80-bit
}


def ctor_value_of_state(ctor, views, mass=None):
    """The ideal (real) input of ctor that gives the speed of views."""
    if ctor in ("beta", "beta_deficit", "gamma", "gamma_m1", "rapidity",
                "proper_speed"):
        return views[ctor]
    if ctor == "kinetic_energy":
        return views["gamma_m1"] * mass
    if ctor == "momentum":
        return views["proper_speed"] * mass
    raise ValueError(ctor)


def speed_targets():
    """Speeds every constructor is asked to build, as (views, note) with
    views computed at WORK_DPS from a real (not necessarily float) value."""
    t = []
    vb = lambda s: views_from_state(state_from_beta(mpf(s)))
    vd = lambda s: views_from_state(state_from_deficit(mpf(s)))
    vg = lambda s: views_from_state(state_from_gamma(mpf(s)))
    for s in ("1e-30", "1e-20", "1e-12", "1e-8"):
        t.append((vb(s), "tiny: beta = %s" % s))
    t.append((vb("5e-9"), "walking pace: beta ~ 5e-9 (~1.5 m/s)"))
    t.append((vb("2.6e-5"), "low-orbit craft: beta ~ 2.6e-5 (~7.8 km/s)"))
    for s in ("0.1", "0.5", "0.9", "0.995"):
        t.append((vb(s), "beta = %s" % s))
    t.append((vd("1e-4"), "beta = 1 - 1e-4"))
    t.append((vd("1e-7"), "beta = 1 - 1e-7"))
    for s in ("1e-8", "1e-12", "1e-16", "1e-20", "1e-30", "1e-38"):
        t.append((vd(s), "near c: beta_deficit = %s" % s))
    for s in ("100", "7000", "1e6", "1e11", "1e20", "1e30"):
        note = "large gamma = %s" % s
        if s == "7000":
            note += " (collider beam scale)"
        if s == "1e11":
            note += " (cosmic ray scale)"
        t.append((vg(s), note))
    return t


def build_rows():
    tab = Table()

    # zero speed for every constructor
    tab.add("beta", 0.0, "zero speed")
    tab.add("beta_deficit", 1.0, "zero speed")
    tab.add("gamma", 1.0, "zero speed")
    tab.add("gamma_m1", 0.0, "zero speed")
    tab.add("rapidity", 0.0, "zero speed")
    tab.add("proper_speed", 0.0, "zero speed")
    tab.add("kinetic_energy", 0.0, "zero speed, m = 1", mass=M_ONE)
    tab.add("momentum", 0.0, "zero speed, m = 1", mass=M_ONE)

    # tiny values of the constructor's own input
    for s in ("1e-30", "1e-20", "1e-12", "1e-8"):
        v = f32_nearest(mpf(s))
        for c in ("beta", "beta_deficit", "gamma_m1", "rapidity",
                  "proper_speed"):
            tab.add(c, v, "tiny input %s" % s)
        for i, c in enumerate(("kinetic_energy", "momentum")):
            m = M_PROTON if i == 0 else M_ELECTRON
            tab.add(c, f32_nearest(mpf(s) * mpf(m)),
                    "tiny input/mass ~ %s, %s" % (s, MASS_NAMES[m]), mass=m)
    # gamma cannot be tiny: the smallest gammas above 1
    g = 1.0
    for k in range(1, 4):
        g = f32_next_up(g)
        tab.add("gamma", g, "smallest gammas: 1 + %d ulp(float)" % k)
    # subnormal and smallest normal binary32 inputs
    for v, nm in ((FLT_TRUE_MIN, "smallest subnormal float 2^-149"),
                  (FLT_MIN, "smallest normal float 2^-126")):
        for c in ("beta", "beta_deficit", "gamma_m1", "rapidity",
                  "proper_speed"):
            tab.add(c, v, "input = " + nm)

    # common speeds, asked of every constructor
    for k, (views, note) in enumerate(speed_targets()):
        for c in CTORS:
            if c in ("kinetic_energy", "momentum"):
                m = MASSES[k % len(MASSES)]
                x = ctor_value_of_state(c, views, m)
                tab.add(c, f32_nearest(x), note + ", " + MASS_NAMES[m],
                        mass=m)
            else:
                tab.add(c, f32_nearest(ctor_value_of_state(c, views)), note)

    # beta closest to 1 in float
    tab.add("beta", f32_next_down(1.0),
            "largest float beta below 1: 1 - 2^-24")
    tab.add("beta", f32_next_down(f32_next_down(1.0)),
            "float beta 1 - 2^-23")

    # largest float inputs
    for c in ("gamma", "gamma_m1", "proper_speed"):
        tab.add(c, FLT_MAX, "largest float input (FLT_MAX)")
    tab.add("rapidity", f32_nearest(mpf(88)), "rapidity 88: gamma ~ 8e37, near float max")
    tab.add("rapidity", f32_nearest(mpf(100)), "rapidity 100: gamma ~ 1.3e43, beyond float")
    tab.add("kinetic_energy", FLT_MAX,
            "K = FLT_MAX, m = 1: gamma_m1 at float max", mass=M_ONE)
    tab.add("momentum", FLT_MAX,
            "p = FLT_MAX, m = 1: proper_speed at float max", mass=M_ONE)

    # branch switch: beta^2 = eps^(1/3), i.e. beta = eps^(1/6), mapped to
    # each constructor; the floats just below and just above
    for tname, eps in EPS.items():
        bstar = mp.cbrt(eps) ** (mpf(1) / 2)
        views = views_from_state(state_from_beta(bstar))
        for c in CTORS:
            m = M_ONE if c in ("kinetic_energy", "momentum") else None
            x = ctor_value_of_state(c, views, m)
            lo, hi = f32_below_above(x)
            for v, side in ((lo, "below"), (hi, "above")):
                tab.add(c, v, "branch: beta^2 = eps_%s^(1/3), float %s"
                        % (tname.replace(" ", "_"), side), mass=m)
        # the constructor's own small input at the same threshold
        for c in ("rapidity", "proper_speed"):
            lo, hi = f32_below_above(bstar)
            for v, side in ((lo, "below"), (hi, "above")):
                tab.add(c, v, "branch: input^2 = eps_%s^(1/3), float %s"
                        % (tname.replace(" ", "_"), side))
        lo, hi = f32_below_above(mp.cbrt(eps))
        for v, side in ((lo, "below"), (hi, "above")):
            tab.add("gamma_m1", v, "branch: gamma_m1 = eps_%s^(1/3), float %s"
                    % (tname.replace(" ", "_"), side))

    # branch switch at beta = 1/sqrt(2): gamma = sqrt(2),
    # gamma_m1 = sqrt(2) - 1, proper_speed = 1, rapidity = asinh(1)
    # exact values at that point, so that a float-exact point (proper_speed
    # = 1, p = m) gets true neighbours on both sides
    views = {"beta": 1 / mp.sqrt(2), "beta_deficit": 1 - 1 / mp.sqrt(2),
             "gamma": mp.sqrt(2), "gamma_m1": mp.sqrt(2) - 1,
             "rapidity": mp.asinh(1), "proper_speed": mpf(1)}
    what = {"beta": "beta = 1/sqrt(2)", "beta_deficit": "deficit = 1 - 1/sqrt(2)",
            "gamma": "gamma = sqrt(2)", "gamma_m1": "gamma_m1 = sqrt(2) - 1",
            "rapidity": "rapidity = asinh(1)", "proper_speed": "proper_speed = 1",
            "kinetic_energy": "K/m = sqrt(2) - 1",
            "momentum": "p/m = 1"}
    for c in CTORS:
        masses = (M_ONE, M_PROTON) if c in ("kinetic_energy", "momentum") \
            else (None,)
        for m in masses:
            x = ctor_value_of_state(c, views, m)
            lo, hi = f32_below_above(x)
            for v, side in ((lo, "below"), (hi, "above")):
                note = "branch: %s, float %s" % (what[c], side)
                if m is not None:
                    note += ", " + MASS_NAMES[m]
                tab.add(c, v, note, mass=m)
    # proper_speed = 1 is itself a float: also the exact point
    tab.add("proper_speed", 1.0, "branch: proper_speed = 1 exactly")
    tab.add("momentum", 1.0, "branch: p/m = 1 exactly, m = 1", mass=M_ONE)
    tab.add("momentum", M_PROTON, "branch: p/m = 1 exactly, "
            + MASS_NAMES[M_PROTON], mass=M_PROTON)

    # energy rows whose naive forms overflow or underflow in float
    half = f32_nearest(mpf(FLT_MAX) / 2)
    tab.add("kinetic_energy", FLT_MAX,
            "K + m overflows float (K = FLT_MAX, m = FLT_MAX/2)", mass=half)
    tab.add("momentum", FLT_MAX,
            "p^2 and m^2 overflow float (p = m = FLT_MAX)", mass=FLT_MAX)
    tab.add("kinetic_energy", FLT_TRUE_MIN,
            "subnormal K and m (K = 2^-149, m = 2^-133)",
            mass=f32_from_bits(0x00010000))
    tab.add("momentum", f32_from_bits(0x00000003),
            "subnormal p and m (p = 3*2^-149, m = 2^-147)",
            mass=f32_from_bits(0x00000004))
    tab.add("kinetic_energy", f32_nearest(mpf("1e-8")),
            "huge mass: K = 1e-8, m = 1e30", mass=f32_nearest(mpf("1e30")))
    tab.add("momentum", f32_nearest(mpf("1e30")),
            "tiny mass: p = 1e30, m = 1e-30", mass=f32_nearest(mpf("1e-30")))
    return tab.rows


# --------------------------------------------------------------------------
# Outside-check constants

def views_from_energy(E, m):
    """Views of a particle of total energy E and rest energy m (exact)."""
    E, m = mpf(E), mpf(m)
    return views_from_state(state_from_gm1((E - m) / m))


def c_escape(s):
    assert '"' not in s and "\\" not in s and all(32 <= ord(ch) < 127 for ch in s)
    return s


def emit(rows, out_path, check=True):
    gen_date = datetime.datetime.now(datetime.timezone.utc)
    if os.environ.get("SOURCE_DATE_EPOCH"):
        gen_date = datetime.datetime.fromtimestamp(
            int(os.environ["SOURCE_DATE_EPOCH"]), datetime.timezone.utc)

    L = []
    w = L.append
    w("// speed_reference.hpp: reference values for speed<T> and the scalar")
    w("// functions of beta.")
    w("//")
    w("// generated, do not edit.")
    w("// Generator:         tools/gen_speed_reference.py")
    w("// mpmath version:    %s" % mpmath.__version__)
    w("// Working precision: %d decimal digits (mpmath mp.dps = %d); values"
      % (WORK_DPS, WORK_DPS))
    w("//                    printed with %d significant digits." % OUT_DIGITS)
    w("// Generated on:      %s (UTC)" % gen_date.strftime("%Y-%m-%d"))
    w("//")
    w("// The views are evaluated from cancellation-free forms and checked by")
    w("// the generator against the definition formulas evaluated at %d digits"
      % CHECK_DPS)
    w("// (agreement to a relative 1e-45 for every view of every row).")
    w("//")
    w("// Definitions (beta in units of c, 0 <= beta < 1):")
    w("//   gamma = 1/sqrt(1-beta^2), gamma_m1 = gamma - 1,")
    w("//   inv_gamma = sqrt(1-beta^2), dilation_fraction = 1 - 1/gamma,")
    w("//   rapidity = atanh(beta), proper_speed = beta*gamma,")
    w("//   beta_deficit = 1 - beta.")
    w("//   ctor \"kinetic_energy\": gamma_m1 = input/input2 (input2 = mass);")
    w("//   ctor \"momentum\": proper_speed = input/input2.")
    w("//")
    w("// speed_rows: input and input2 are exact decimal expansions of binary32")
    w("// values, so they parse exactly into float, double and long double; every")
    w("// view is the exact real value for that exact input, correctly rounded")
    w("// to 40 digits. Some values are beyond the range of a narrow type (for")
    w("// example beta_deficit 1e-80 or gamma 1e43); the test decides what is")
    w("// representable in the type under test.")
    w("// A note names the target of the row; the input is the binary32 value")
    w("// nearest to that target in the constructor's own variable (or the one")
    w("// just below / just above it, where the note says so), and rows whose")
    w("// input would repeat an earlier row of the same constructor are left out.")
    w("// Masses (input2) named after particles are rest energies in MeV from")
    w("// CODATA 2018 recommended values (NIST), rounded to binary32.")
    w("")
    w("#ifndef EIGENZEIT_TESTS_DATA_SPEED_REFERENCE_HPP")
    w("#define EIGENZEIT_TESTS_DATA_SPEED_REFERENCE_HPP")
    w("")
    w("#include <cstddef>")
    w("")
    w("namespace eigenzeit_testdata {")
    w("")
    w("struct speed_row {")
    w("    const char* ctor;     // beta, beta_deficit, gamma, gamma_m1, rapidity,")
    w("                          // proper_speed, kinetic_energy, momentum")
    w("    const char* input;    // exact input (binary32-exact decimal)")
    w("    const char* input2;   // mass for kinetic_energy/momentum, else \"\"")
    for v in VIEWS:
        w("    const char* %s;" % v)
    w("    const char* note;     // why the row is there")
    w("};")
    w("")
    w("inline constexpr speed_row speed_rows[] = {")
    for ctor, a, m, note in rows:
        vals = reference_views(ctor, a, m)
        if check:
            check_close("%s(%r, %r)" % (ctor, a, m), vals,
                        naive_views(ctor, a, m))
        fields = [ctor, exact_decimal(a), "" if m is None else exact_decimal(m)]
        fields += [fmt(vals[v]) for v in VIEWS]
        fields.append(note)
        w("    {" + ", ".join('"%s"' % c_escape(f) for f in fields) + "},")
    w("};")
    w("")
    w("inline constexpr std::size_t speed_row_count = %d;" % len(rows))
    w("")

    # proton beam
    m_p = "938.27208816"
    E_b = "6800000"
    with mp.workdps(WORK_DPS):
        K = mpf(E_b) - mpf(m_p)
    K_str = mpmath.nstr(K, 20, strip_zeros=True)
    assert mpf(K_str) == mpf(E_b) - mpf(m_p)
    pv = views_from_energy(E_b, m_p)
    if check:
        check_close("proton beam", pv, naive_views_energy(E_b, m_p))
    w("// Outside check: a proton of the CERN LHC Run 3 beam.")
    w("// rest_energy_MeV: 938.27208816 MeV, proton rest energy m_p c^2,")
    w("//   CODATA 2018 recommended values (NIST).")
    w("// beam_energy_MeV: 6800000 MeV total energy, the 6.8 TeV per-beam energy")
    w("//   of the CERN LHC Run 3 (from memory).")
    w("// kinetic_energy_MeV = beam_energy_MeV - rest_energy_MeV, exact; it feeds")
    w("//   from_kinetic_energy(kinetic, mass); gamma = beam/rest.")
    w("// The views are exact for the decimal inputs as written; none of the")
    w("// inputs is exact in binary, so a test that parses them into T sees about")
    w("// one rounding per input (condition number at most about 2 for every view).")
    w("struct proton_beam_ref {")
    w("    const char* rest_energy_MeV;")
    w("    const char* beam_energy_MeV;")
    w("    const char* kinetic_energy_MeV;")
    for v in VIEWS:
        w("    const char* %s;" % v)
    w("};")
    w("")
    w("inline constexpr proton_beam_ref proton_lhc_run3 = {")
    w('    "%s", "%s", "%s",' % (m_p, E_b, K_str))
    for v in VIEWS:
        w('    "%s", // %s' % (fmt(pv[v]), v))
    w("};")
    w("")

    # facts of the trade
    w("// Facts of the trade (common practice, no source), each for a double")
    w("// input: beta is the exact decimal expansion of the double nearest to the")
    w("// stated speed; the views are exact for that double, to 40 digits;")
    w("// approx is the rounded figure as usually quoted.")
    w("struct beta_fact_ref {")
    w("    const char* beta;      // exact decimal of a double")
    for v in VIEWS[1:]:
        w("    const char* %s;" % v)
    w("    const char* approx_name;  // which view the rounded figure is for")
    w("    const char* approx;       // the rounded figure")
    w("};")
    w("")
    facts = [
        ("craft_c_over_39000", mpf(1) / 39000,
         "A craft at c/39000: gamma - 1 is close to 3.3e-10 (common practice,\n"
         "// no source). beta is the double nearest to 1/39000.",
         "gamma_m1", "3.3e-10"),
        ("beta_0_995", mpf("0.995"),
         "At beta = 0.995, gamma is close to 10.0 (10.0125...) (common\n"
         "// practice, no source). beta is the double nearest to 0.995.",
         "gamma", "10.0"),
    ]
    for name, target, comment, aname, approx in facts:
        b = float(target)                   # nearest double
        fv = views_from_state(state_from_beta(mpf(b)))
        if check:
            check_close(name, fv, naive_views("beta", mpf(b)))
            rel = abs(fv[aname] / mpf(approx) - 1)
            assert rel < mpf("0.02"), (name, rel)
        w("// " + comment)
        w("inline constexpr beta_fact_ref %s = {" % name)
        w('    "%s", // beta' % exact_decimal(b))
        for v in VIEWS[1:]:
            w('    "%s", // %s' % (fmt(fv[v]), v))
        w('    "%s", "%s",' % (aname, approx))
        w("};")
        w("")

    w("}  // namespace eigenzeit_testdata")
    w("")
    w("#endif  // EIGENZEIT_TESTS_DATA_SPEED_REFERENCE_HPP")

    text = "\n".join(L) + "\n"
    os.makedirs(os.path.dirname(os.path.abspath(out_path)), exist_ok=True)
    with open(out_path, "w", encoding="ascii", newline="\n") as f:
        f.write(text)


def naive_views_energy(E, m):
    """Definition formulas for total energy E and rest energy m."""
    with mp.workdps(CHECK_DPS):
        return naive_views("gamma", mpf(E) / mpf(m))


def main(argv=None):
    here = os.path.dirname(os.path.abspath(__file__))
    default_out = os.path.join(here, os.pardir, "tests", "data",
                               "speed_reference.hpp")
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--output", default=os.path.normpath(default_out))
    ap.add_argument("--no-check", action="store_true",
                    help="skip the check against the definitions at %d digits"
                    % CHECK_DPS)
    args = ap.parse_args(argv)
    rows = build_rows()
    emit(rows, args.output, check=not args.no_check)
    print("wrote %s: %d rows" % (args.output, len(rows)))
    return 0


if __name__ == "__main__":
    sys.exit(main())
