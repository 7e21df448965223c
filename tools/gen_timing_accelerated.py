#!/usr/bin/env python3
"""Generate tests/data/timing_accelerated_reference.hpp, the reference table for
uniform_acceleration<T> (include/eigenzeit/timing/accelerated.hpp).

Usage:
    python3 tools/gen_timing_accelerated.py [--output PATH] [--no-check]

Each row is one rapidity phi = a tau / c, an exact binary64 value, and the
quantities of hyperbolic motion from rest for a = 1 in natural units (c = 1),
so that tau = phi:

    t     = sinh(phi)              coordinate time
    x     = cosh(phi) - 1          distance
    lag   = sinh(phi) - phi        t - tau
    beta  = tanh(phi)              speed
    gamma = cosh(phi)              Lorentz factor

For any other acceleration a the same row holds with tau = phi / a and t, x,
lag divided by a (exact when a is a power of two); in SI units multiply t and
lag by c / a and x by c^2 / a.

The values are computed with mpmath at WORK_DPS = 50 significant digits of
working precision *beyond* the cancellation of the definitions (cosh(phi) - 1
and sinh(phi) - phi lose about 2 |log10 phi| digits for small phi; the working
precision is raised by that much), and printed with 40 significant digits.
Before anything is written every row is checked against cancellation-free
forms evaluated independently (x = 2 sinh(phi/2)^2, lag and x from their
Taylor series for phi < 1/8, beta = sinh / cosh) at twice the precision;
a disagreement beyond a relative 1e-45 stops the script.

The output is deterministic; only the generation date in the top comment
changes between runs.  Set SOURCE_DATE_EPOCH (seconds since 1970, UTC) to fix
that date too.  No randomness is used.
"""

import argparse
import datetime
import math
import os
import struct
import sys
from decimal import Decimal

import mpmath
from mpmath import mp, mpf

WORK_DPS = 50        # significant digits beyond the cancellation
OUT_DIGITS = 40      # significant digits printed
CHECK_REL_TOL = mpf(10) ** -45


# --------------------------------------------------------------------------
# binary64 bit patterns (struct only)

def f64_bits(v):
    return struct.unpack("<Q", struct.pack("<d", v))[0]


def f64_from_bits(b):
    return struct.unpack("<d", struct.pack("<Q", b))[0]


def f64_next_up(v):
    return f64_from_bits(f64_bits(v) + 1)


def f64_next_down(v):
    return f64_from_bits(f64_bits(v) - 1)


def exact_decimal(v):
    """Exact decimal expansion of a binary64 value."""
    d = Decimal(v)
    if d == 0:
        return "0"
    if Decimal("1e-4") <= abs(d) < Decimal("1e7"):
        return format(d, "f")
    s = format(d, "e")
    mant, exp = s.split("e")
    exp = int(exp)
    return "%se%s%d" % (mant, "-" if exp < 0 else "+", abs(exp))


def extra_digits(phi):
    """Digits lost to cancellation in cosh(phi) - 1 and sinh(phi) - phi."""
    if phi >= 1:
        return 10
    return int(2 * math.ceil(-math.log10(phi))) + 10


def fmt(x):
    return mpmath.nstr(x, OUT_DIGITS, strip_zeros=False, min_fixed=-4,
                       max_fixed=7)


# --------------------------------------------------------------------------
# Values

def by_definition(phi):
    """The definitions, at WORK_DPS digits beyond the cancellation."""
    with mp.workdps(WORK_DPS + extra_digits(phi)):
        p = mpf(phi)
        s = mp.sinh(p)
        c = mp.cosh(p)
        return {"t": +s, "x": c - 1, "lag": s - p, "beta": s / c,
                "gamma": +c}


def independent(phi):
    """Cancellation-free forms, at twice the precision, for the check."""
    with mp.workdps(2 * (WORK_DPS + extra_digits(phi))):
        p = mpf(phi)
        s = mp.sinh(p)
        c = mp.cosh(p)
        half = mp.sinh(p / 2)
        x = 2 * half * half
        if p < mpf(1) / 8:
            # Taylor series, positive terms: sinh p - p = sum p^(2n+1)/(2n+1)!
            lag = mpf(0)
            term = p ** 3 / 6
            n = 1
            while term > lag * mpf(10) ** (-2 * WORK_DPS) or n < 3:
                lag += term
                term *= p * p / ((2 * n + 2) * (2 * n + 3))
                n += 1
        else:
            lag = s - p
        return {"t": s, "x": x, "lag": lag, "beta": mp.tanh(p), "gamma": c}


def check_row(phi, ref):
    chk = independent(phi)
    with mp.workdps(2 * (WORK_DPS + extra_digits(phi))):
        for k in ("t", "x", "lag", "beta", "gamma"):
            r, c = mpf(ref[k]), chk[k]
            ok = (r == 0) if c == 0 else abs(r - c) <= CHECK_REL_TOL * abs(c)
            if not ok:
                raise SystemExit("check failed: phi = %r, %s: %s vs %s"
                                 % (phi, k, mpmath.nstr(r, 50),
                                    mpmath.nstr(c, 50)))


# --------------------------------------------------------------------------
# Rows: (phi as a binary64 value, note)

def build_rows():
    rows = []
    seen = set()

    def add(v, note):
        if v in seen or not (v > 0) or not math.isfinite(v):
            return
        seen.add(v)
        rows.append((v, note))

    # Decades from 1e-300 to 1e-1: the series tier, down to the tiny end of
    # the accuracy contract.
    for e in (-300, -250, -200, -150, -100, -50, -30, -20, -15, -10, -8,
              -6, -5, -4, -3, -2, -1):
        add(float("1e%d" % e), "phi = 1e%d (nearest double)" % e)
    # Ordinary rapidities, including 1 g for a year (phi ~ 1.03).
    for s in ("0.25", "0.5", "0.75", "1", "1.0322952755535963", "1.5", "2",
              "2.5", "3", "3.5"):
        note = "phi = %s" % s
        if s == "1.0322952755535963":
            note = ("phi ~ 1.0323: 9.80665 m/s^2 for one Julian year "
                    "(31 557 600 s), rounded to double")
        add(float(s), note)
    # Series / exponential switch at phi = 4, and its neighbours.
    add(4.0, "branch: phi = 4 exactly (last series point)")
    add(f64_next_down(4.0), "branch: phi = 4, double below")
    add(f64_next_up(4.0), "branch: phi = 4, double above")
    # The series threshold of the inverse: (a t / c)^2 = 2^-18 for double,
    # i.e. a t / c = 2^-9; the rows give t = sinh(phi) near there.
    for k in (9, 11, 22, 32):
        add(2.0 ** -k, "phi = 2^-%d" % k)
        add(f64_next_down(2.0 ** -k), "phi = 2^-%d, double below" % k)
    # Large rapidities up to the exp limit of double (log(DBL_MAX) ~ 709.78).
    for s in ("5", "7.5", "10", "20", "36", "50", "88", "100", "200", "354",
              "500", "700", "709", "709.75"):
        add(float(s), "phi = %s" % s)
    # Beyond exp's limit but within cosh's (log(2 DBL_MAX) ~ 710.48).
    add(710.25, "phi = 710.25: e^phi beyond double, cosh(phi) not")
    # Near float's exp limit (log(FLT_MAX) ~ 88.72).
    add(88.5, "phi = 88.5: cosh beyond float below 89")
    # Binary fractions that are exact in float too.
    for v in (0.125, 0.375, 1.25, 6.0, 12.0):
        add(v, "phi = %s (exact in float)" % repr(v))
    rows.sort(key=lambda r: r[0])
    return rows


# --------------------------------------------------------------------------
# Output

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
    w("// timing_accelerated_reference.hpp: reference values of hyperbolic")
    w("// motion (uniform proper acceleration from rest) for")
    w("// include/eigenzeit/timing/accelerated.hpp.")
    w("//")
    w("// generated, do not edit.")
    w("// Generator:         tools/gen_timing_accelerated.py")
    w("// mpmath version:    %s" % mpmath.__version__)
    w("// Working precision: %d significant decimal digits beyond the" % WORK_DPS)
    w("//                    cancellation of cosh(phi) - 1 and sinh(phi) - phi")
    w("//                    (mp.dps raised by 2 |log10 phi| + 10 for phi < 1);")
    w("//                    values printed with %d significant digits." % OUT_DIGITS)
    w("// Generated on:      %s (UTC)" % gen_date.strftime("%Y-%m-%d"))
    w("//")
    w("// Every row was checked by the generator against cancellation-free forms")
    w("// (x = 2 sinh(phi/2)^2, Taylor series of sinh(phi) - phi for phi < 1/8)")
    w("// at twice the precision: agreement to a relative 1e-45 for every value.")
    w("//")
    w("// Rows are for a = 1 in natural units (c = 1), so tau = phi:")
    w("//   t = sinh(phi), x = cosh(phi) - 1, lag = t - tau = sinh(phi) - phi,")
    w("//   beta = tanh(phi), gamma = cosh(phi).")
    w("// phi is the exact decimal expansion of a binary64 value, so it parses")
    w("// exactly into double and long double (and into float where it is exact")
    w("// there). For another acceleration a: tau = phi / a, and t, x, lag are")
    w("// divided by a. Values beyond a type's range (gamma ~ 1.4e308 at phi =")
    w("// 710.25) are meant to be refused by the library in that type.")
    w("")
    w("#ifndef EIGENZEIT_TESTS_DATA_TIMING_ACCELERATED_REFERENCE_HPP")
    w("#define EIGENZEIT_TESTS_DATA_TIMING_ACCELERATED_REFERENCE_HPP")
    w("")
    w("#include <cstddef>")
    w("")
    w("namespace eigenzeit_testdata {")
    w("")
    w("struct hyperbolic_row {")
    w("    const char* phi;    // a tau / c, exact binary64 value")
    w("    const char* t;      // sinh(phi)")
    w("    const char* x;      // cosh(phi) - 1")
    w("    const char* lag;    // sinh(phi) - phi")
    w("    const char* beta;   // tanh(phi)")
    w("    const char* gamma;  // cosh(phi)")
    w("    const char* note;   // why the row is there")
    w("};")
    w("")
    w("inline constexpr hyperbolic_row hyperbolic_rows[] = {")
    for phi, note in rows:
        ref = by_definition(phi)
        if check:
            check_row(phi, ref)
        with mp.workdps(WORK_DPS + extra_digits(phi)):
            fields = [exact_decimal(phi)] + [fmt(ref[k]) for k in
                                             ("t", "x", "lag", "beta", "gamma")]
        fields.append(note)
        w("    {" + ", ".join('"%s"' % c_escape(f) for f in fields) + "},")
    w("};")
    w("")
    w("inline constexpr std::size_t hyperbolic_row_count = %d;" % len(rows))
    w("")
    w("}  // namespace eigenzeit_testdata")
    w("")
    w("#endif  // EIGENZEIT_TESTS_DATA_TIMING_ACCELERATED_REFERENCE_HPP")
    text = "\n".join(L) + "\n"
    os.makedirs(os.path.dirname(os.path.abspath(out_path)), exist_ok=True)
    with open(out_path, "w", encoding="ascii", newline="\n") as f:
        f.write(text)


def main(argv=None):
    here = os.path.dirname(os.path.abspath(__file__))
    default_out = os.path.join(here, os.pardir, "tests", "data",
                               "timing_accelerated_reference.hpp")
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--output", default=os.path.normpath(default_out))
    ap.add_argument("--no-check", action="store_true",
                    help="skip the check against the cancellation-free forms")
    args = ap.parse_args(argv)
    rows = build_rows()
    emit(rows, args.output, check=not args.no_check)
    print("wrote %s: %d rows" % (args.output, len(rows)))
    return 0


if __name__ == "__main__":
    sys.exit(main())
