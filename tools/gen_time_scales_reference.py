#!/usr/bin/env python3
"""Generate tests/data/time_scales_reference.hpp, the reference table for the
linear time-scale relations of include/eigenzeit/timing/time_scales.hpp.

Usage:
    python3 tools/gen_time_scales_reference.py [--output PATH] [--no-check]

Source of the relations: IERS Conventions (2010), IERS Technical Note 36,
chapter 10, section 10.1 (IAU 2000 Resolution B1.9, IAU 2006 Resolution B3):

    TT  = TCG - L_G (JD_TCG - T0) 86400 s
    TDB = TCB - L_B (JD_TCB - T0) 86400 s + TDB0

with L_G = 6.969290134e-10, L_B = 1.550519768e-8, TDB0 = -6.55e-5 s and
T0 = 2443144.5003725 (Julian date), all taken here as exact decimals;
JD - T0 is formed exactly in rational arithmetic.

Every row is one Julian date JD = whole + frac, both parts exactly
representable in binary32 (so exactly in float, double and long double),
and four offsets in seconds, each the exact real value for that date taken
in the scale named first, printed with 55 significant digits:

    tcg_minus_tt   TCG - TT   for JD a TT date:   L_G/(1-L_G) (JD - T0) 86400
    tt_minus_tcg   TT - TCG   for JD a TCG date:  -L_G (JD - T0) 86400
    tdb_minus_tcb  TDB - TCB  for JD a TCB date:  -L_B (JD - T0) 86400 + TDB0
    tcb_minus_tdb  TCB - TDB  for JD a TDB date:  (L_B (JD - T0) 86400 - TDB0)/(1-L_B)

The closed forms are evaluated at 60 decimal digits.  Before anything is
written, the two solved forms (tcg_minus_tt, tcb_minus_tdb) are checked at
120 digits against the defining relations themselves, solved by fixed-point
iteration, and all four against a recomputation at 120 digits; a relative
disagreement above 1e-55 stops the script.

The dates are a fixed list (J2000 and dates every 50 years from 1800 to
2200 in the style of Julian dates of the Gregorian 1 January, 0h or 12h)
plus 24 dates from a fixed linear congruential generator over +-200 years
around J2000, with fractions k / 2^24.  The output is deterministic; only the
generation date in the top comment changes between runs.  Set
SOURCE_DATE_EPOCH (seconds since 1970, UTC) to fix that date too.
"""

import argparse
import datetime
import os
import struct
import sys
from decimal import Decimal
from fractions import Fraction

import mpmath
from mpmath import mp, mpf

WORK_DPS = 60
CHECK_DPS = 120
OUT_DIGITS = 55
CHECK_REL_TOL = mpf(10) ** -55

L_G = "6.969290134e-10"
L_B = "1.550519768e-8"
TDB0 = "-6.55e-5"
T0 = "2443144.5003725"
SECONDS_PER_DAY = 86400

J2000 = 2451545


def is_f32(v):
    """Whether the Python float v is exactly a binary32 value."""
    return struct.unpack("<f", struct.pack("<f", v))[0] == v


def seconds_since_t0(whole, frac):
    """(JD - T0) 86400 as an mpf, the difference taken exactly in rationals
    (so no digits are lost to the cancellation of JD - T0 near T0)."""
    exact = (Fraction(whole) + Fraction(frac) - Fraction(T0)) * SECONDS_PER_DAY
    return mpf(exact.numerator) / exact.denominator


def offsets(whole, frac, dps):
    """The four offsets (seconds) at JD = whole + frac, closed forms."""
    with mp.workdps(dps):
        y = seconds_since_t0(whole, frac)
        lg, lb, tdb0 = mpf(L_G), mpf(L_B), mpf(TDB0)
        return {
            "tcg_minus_tt": lg / (1 - lg) * y,
            "tt_minus_tcg": -lg * y,
            "tdb_minus_tcb": -lb * y + tdb0,
            "tcb_minus_tdb": (lb * y - tdb0) / (1 - lb),
        }


def solved_by_iteration(whole, frac, dps):
    """tcg_minus_tt and tcb_minus_tdb from the defining relations, solved for
    the coordinate time by fixed-point iteration (independent of the closed
    forms above)."""
    with mp.workdps(dps):
        lg, lb, tdb0 = mpf(L_G), mpf(L_B), mpf(TDB0)
        # TT = TCG - L_G (TCG - T0) 86400  (all in seconds since T0 here)
        tt = seconds_since_t0(whole, frac)
        tcg = tt
        for _ in range(80):
            tcg = tt + lg * tcg
        # TDB = TCB - L_B (TCB - T0) 86400 + TDB0
        tdb = tt
        tcb = tdb
        for _ in range(80):
            tcb = tdb + lb * tcb - tdb0
        return {"tcg_minus_tt": tcg - tt, "tcb_minus_tdb": tcb - tdb}


def check_close(label, ref, chk):
    for k, v in chk.items():
        r = ref[k]
        err = abs(v - r) / abs(r) if r != 0 else abs(v)
        if err > CHECK_REL_TOL:
            sys.exit("check failed: %s %s: %s vs %s (rel %s)"
                     % (label, k, mpmath.nstr(r, 45), mpmath.nstr(v, 45),
                        mpmath.nstr(err, 5)))


def fmt(x):
    return mpmath.nstr(x, OUT_DIGITS, strip_zeros=False, min_fixed=-4,
                       max_fixed=6)


def exact_decimal(v):
    """The exact decimal expansion of the binary value v (finite: v is dyadic),
    so that it parses exactly into any binary type wide enough, not only into
    double."""
    s = format(Decimal(v), "f")
    if "." not in s:
        s += ".0"
    assert Fraction(s) == Fraction(v)
    return s


def build_rows():
    rows = []
    fixed = [
        (2451545.0, 0.0, "J2000.0, 2000 January 1 12h"),
        (2451545.0, 0.3125, "J2000.0 + 0.3125 d"),
        (2451544.5, 0.5, "whole part ending in .5: 2451544.5 + 0.5 = J2000.0"),
        (2451545.0, -0.25, "negative fraction: J2000.0 - 0.25 d"),
        (2443144.5, 0.0, "1977 January 1 0h, 32.184 s before T0"),
        (2443144.0, 0.5, "1977 January 1 0h split as 2443144 + 0.5"),
        (2378496.5, 0.0, "1800 January 1 0h"),
        (2396758.5, 0.25, "1850 January 1 6h"),
        (2415020.5, 0.75, "1900 January 1 18h"),
        (2433282.5, 0.125, "1950 January 1 3h"),
        (2469807.5, 0.6171875, "2050 January 1, fraction 79/128"),
        (2488069.5, 0.9999999403953552, "2100 January 1, fraction 1 - 2^-24"),
        (2506331.5, 5.960464477539063e-08, "2150 January 1, fraction 2^-24"),
        (2524593.5, 0.5, "2200 January 1 12h"),
        (2378496.0, 0.0, "about 200.2 years before J2000"),
        (2524594.0, 0.0, "about 200 years after J2000"),
    ]
    for w, f, note in fixed:
        rows.append((w, f, note))
    # Fixed LCG (Knuth's MMIX constants), so the table is reproducible.
    state = 20260101
    span = 73050  # 200 Julian years in days

    def nxt():
        nonlocal state
        state = (6364136223846793005 * state + 1442695040888963407) % (1 << 64)
        return state >> 11

    for i in range(24):
        day = J2000 - span + nxt() % (2 * span + 1)
        k = nxt() % (1 << 24)
        frac = k / float(1 << 24)
        rows.append((float(day), frac, "fixed pseudo-random date %d" % (i + 1)))
    for w, f, _ in rows:
        assert is_f32(w) and is_f32(f), (w, f)
    return rows


def emit(rows, out_path, check=True):
    gen_date = datetime.datetime.now(datetime.timezone.utc)
    if os.environ.get("SOURCE_DATE_EPOCH"):
        gen_date = datetime.datetime.fromtimestamp(
            int(os.environ["SOURCE_DATE_EPOCH"]), datetime.timezone.utc)
    mp.dps = WORK_DPS
    L = []
    w = L.append
    w("// time_scales_reference.hpp: reference offsets of the linear relations")
    w("// TT <-> TCG and TCB <-> TDB (IERS Conventions (2010), chapter 10).")
    w("//")
    w("// generated, do not edit.")
    w("// Generator:         tools/gen_time_scales_reference.py")
    w("// mpmath version:    %s" % mpmath.__version__)
    w("// Working precision: %d decimal digits (mpmath mp.dps = %d); values"
      % (WORK_DPS, WORK_DPS))
    w("//                    printed with %d significant digits." % OUT_DIGITS)
    w("// Generated on:      %s (UTC)" % gen_date.strftime("%Y-%m-%d"))
    w("//")
    w("// Constants (exact decimals): L_G = %s, L_B = %s, TDB0 = %s s," % (L_G, L_B, TDB0))
    w("// T0 = %s (Julian date).  Each row: a Julian date whole + frac, both" % T0)
    w("// parts exact in binary32, and the offsets in seconds at that date taken")
    w("// in the scale named last:")
    w("//   tcg_minus_tt  = L_G/(1-L_G) (JD_TT - T0) 86400")
    w("//   tt_minus_tcg  = -L_G (JD_TCG - T0) 86400")
    w("//   tdb_minus_tcb = -L_B (JD_TCB - T0) 86400 + TDB0")
    w("//   tcb_minus_tdb = (L_B (JD_TDB - T0) 86400 - TDB0) / (1 - L_B)")
    w("// The solved forms were checked by the generator against the defining")
    w("// relations solved by fixed-point iteration at %d digits (relative" % CHECK_DPS)
    w("// agreement 1e-55 or better).  Julian-date parts are exact decimal")
    w("// expansions of binary32 values.")
    w("")
    w("#ifndef EIGENZEIT_TESTS_DATA_TIME_SCALES_REFERENCE_HPP")
    w("#define EIGENZEIT_TESTS_DATA_TIME_SCALES_REFERENCE_HPP")
    w("")
    w("#include <cstddef>")
    w("")
    w("namespace eigenzeit_testdata {")
    w("")
    w("struct time_scales_row {")
    w("    const char* whole;          // Julian date, first part (binary32-exact)")
    w("    const char* frac;           // Julian date, second part (binary32-exact)")
    w("    const char* tcg_minus_tt;   // seconds")
    w("    const char* tt_minus_tcg;   // seconds")
    w("    const char* tdb_minus_tcb;  // seconds")
    w("    const char* tcb_minus_tdb;  // seconds")
    w("    const char* note;")
    w("};")
    w("")
    w("inline constexpr time_scales_row time_scales_rows[] = {")
    keys = ("tcg_minus_tt", "tt_minus_tcg", "tdb_minus_tcb", "tcb_minus_tdb")
    for whole, frac, note in rows:
        vals = offsets(whole, frac, WORK_DPS)
        if check:
            label = "%r + %r" % (whole, frac)
            check_close(label, vals, solved_by_iteration(whole, frac, CHECK_DPS))
            check_close(label, vals, offsets(whole, frac, CHECK_DPS))
        fields = [exact_decimal(whole), exact_decimal(frac)]
        fields += [fmt(vals[k]) for k in keys]
        fields.append(note)
        w("    {" + ", ".join('"%s"' % f for f in fields) + "},")
    w("};")
    w("")
    w("inline constexpr std::size_t time_scales_row_count = %d;" % len(rows))
    w("")
    w("}  // namespace eigenzeit_testdata")
    w("")
    w("#endif  // EIGENZEIT_TESTS_DATA_TIME_SCALES_REFERENCE_HPP")
    with open(out_path, "w") as fh:
        fh.write("\n".join(L) + "\n")


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--output", default=os.path.join(
        here, "..", "tests", "data", "time_scales_reference.hpp"))
    ap.add_argument("--no-check", action="store_true",
                    help="skip the independent 100-digit check")
    args = ap.parse_args()
    emit(build_rows(), args.output, check=not args.no_check)


if __name__ == "__main__":
    main()
