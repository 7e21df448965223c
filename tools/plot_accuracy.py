#!/usr/bin/env python3
"""Draw the plots of the accuracy report with gnuplot.

Usage:
    python3 tools/plot_accuracy.py BINS_CSV OUTPUT_DIR [--type double]
                                   [--format svg|png] [--points-per-region N]
                                   [--main-from BETA] [--gnuplot PROGRAM]

BINS_CSV is the --bins output of eigenzeit_accuracy (tools/accuracy.cpp): for every
routine, view, flavour and region of the input, the largest error in ulps over each
log-spaced bin of the input.  For the chosen type the script writes into OUTPUT_DIR:

    accuracy_main.<fmt>             gamma - 1 from beta: the textbook formula against
                                    eigenzeit and its correctly rounded mode
    accuracy_free_functions.<fmt>   the five free functions of beta
    accuracy_<constructor>.<fmt>    the eight views of speed<T> from each named constructor

y: the largest error per bin in ulps of the correctly rounded value, log scale; bins whose
results were all exact are drawn at the bottom ("0"), inf or NaN results at the top ("inf");
bins where every result was outside the precision contract (subnormal or zero) are gaps.

x in the main plot: beta on a log scale from --main-from (default 1e-30) up to 1/2, then
1 - beta on a log scale from 1/2 down to the last double below 1, so that both ends of
the domain, where the textbook formulas lose their digits, are visible.
x in the other plots: the constructor's input (beta, or gamma - 1, eta, u, K/m, p/m), each
region of the input on a log scale of its own and all regions of equal width (dotted
lines mark the region boundaries), ordered by increasing speed.  Adjacent bins are merged
(largest error kept) down to --points-per-region (default 60) so that the files stay small.

Only the Python standard library and the gnuplot program are used (Debian: gnuplot-nox).
Non-interactive; exits with status 1 if gnuplot fails.
"""

import argparse
import csv
import math
import os
import subprocess
import sys
from collections import defaultdict

FLOOR = 1e-2          # where bins with no error at all are drawn
CEILING = 3e19        # where inf / NaN results are drawn
Y_RANGE = (6e-3, 1e20)

FLAVOURS = [  # drawing order, colour, dash type, legend
    ("naive", "#d62728", 1, "textbook formula"),
    ("eigenzeit", "#1f77b4", 1, "eigenzeit"),
    ("correctly_rounded", "#2ca02c", 2, "eigenzeit, correctly_rounded mode"),
]

VIEW_TEXT = {
    "beta": "β",
    "beta_deficit": "1 − β",
    "gamma": "γ",
    "gamma_m1": "γ − 1",
    "inv_gamma": "1/γ",
    "dilation_fraction": "1 − 1/γ",
    "rapidity": "rapidity η",
    "proper_speed": "βγ",
}
FREE_TEXT = {
    "lorentz_factor": "γ",
    "lorentz_factor_m1": "γ − 1",
    "proper_speed": "βγ",
    "dilation_fraction": "1 − 1/γ",
    "rapidity": "atanh β",
}
VIEW_ORDER = ["beta", "beta_deficit", "gamma", "gamma_m1", "inv_gamma",
              "dilation_fraction", "rapidity", "proper_speed"]
FREE_ORDER = ["lorentz_factor", "lorentz_factor_m1", "proper_speed",
              "dilation_fraction", "rapidity"]
CTOR_ORDER = ["from_beta", "from_beta_deficit", "from_gamma", "from_gamma_m1",
              "from_rapidity", "from_proper_speed", "from_kinetic_energy", "from_momentum"]
VARIABLE_TEXT = {
    "beta": "β",
    "deficit": "β",
    "gamma_m1": "γ − 1",
    "rapidity": "rapidity η",
    "proper_speed": "proper speed u = βγ",
    "kinetic_over_mass": "K / (m c^2)",
    "momentum_over_mass": "p c / (m c^2)",
}


def esc(text):
    """Text for gnuplot's enhanced mode inside double quotes ('_' is literal)."""
    return text.replace("\\", "\\\\").replace('"', '\\"').replace("_", "\\\\_")


def value_label(v):
    """1/2, 2^{k}, 10^{k} or a short decimal, in gnuplot enhanced text."""
    if v == 0.5:
        return "1/2"
    m, e = math.frexp(v)
    if m == 0.5 and abs(e - 1) > 3:
        return f"2^{{{e - 1}}}"
    k = round(math.log10(v))
    if abs(v / 10.0 ** k - 1) < 1e-6:
        return "1" if k == 0 else ("10" if k == 1 else f"10^{{{k}}}")
    return f"{v:.3g}"


def beta_label(v, variable):
    if variable == "deficit" and v != 0.5:
        return "1−" + value_label(v)
    return value_label(v)


def log_pos(v, lo, hi):
    return (math.log(v) - math.log(lo)) / (math.log(hi) - math.log(lo))


def nice_decades(lo, hi, most):
    """Powers of ten strictly inside (lo, hi), thinned to at most `most`."""
    a, b = math.ceil(math.log10(lo) + 1e-9), math.floor(math.log10(hi) - 1e-9)
    if b < a:
        return []
    for step in (1, 2, 5, 10, 20, 25, 50, 100, 200, 500):
        ks = [k for k in range(a, b + 1) if k % step == 0]
        if len(ks) <= most:
            return [10.0 ** k for k in ks]
    return []


class RegionAxis:
    """Every region of the input gets one unit of x, on a log scale of its own."""

    def __init__(self, rows):
        regions = {}
        for r in rows:
            regions[r["region"]] = (r["variable"], float(r["region_lo"]), float(r["region_hi"]))

        def order(item):
            name, (var, lo, hi) = item
            if var == "beta":
                return (0, lo)
            if var == "deficit":
                return (1, -hi)
            return (0, lo)

        self.regions = [(name, var, lo, hi) for name, (var, lo, hi) in sorted(regions.items(), key=order)]
        self.index = {name: i for i, (name, _, _, _) in enumerate(self.regions)}
        variables = {var for _, var, _, _ in self.regions}
        first = self.regions[0][1]
        self.label = VARIABLE_TEXT.get(first, first)
        if variables <= {"beta", "deficit"}:
            self.label = "β  (each region on its own log scale; 1 − β near 1)"
        else:
            self.label += "  (each region on its own log scale)"

    def x(self, value, region):
        i = self.index[region]
        _, var, lo, hi = self.regions[i]
        f = log_pos(value, lo, hi)
        return i + (1 - f if var == "deficit" else f)

    def xrange(self):
        return 0.0, float(len(self.regions))

    def tics(self):
        tics = []
        for i, (_, var, lo, hi) in enumerate(self.regions):
            left = hi if var == "deficit" else lo
            if i == 0:
                tics.append((beta_label(left, var), 0.0))
            else:  # boundary: labelled by the value where this region starts
                tics.append((beta_label(left, var), float(i)))
            for v in nice_decades(lo, hi, 1):
                f = log_pos(v, lo, hi)
                if 0.2 < f < 0.8:
                    tics.append((beta_label(v, var), i + (1 - f if var == "deficit" else f)))
        _, var, lo, hi = self.regions[-1]
        tics.append((beta_label(lo if var == "deficit" else hi, var), float(len(self.regions))))
        return tics

    def boundaries(self):
        return [float(i) for i in range(1, len(self.regions))]


class BetaAxis:
    """beta on a log scale up to 1/2, then 1 - beta on a log scale down from 1/2."""

    def __init__(self, rows, beta_from, right_share=0.45):
        deficits = [float(r["bin_lo"]) for r in rows if r["variable"] == "deficit"]
        self.left = math.log10(0.5) - math.log10(beta_from)
        self.right = math.log10(0.5) - math.log10(min(deficits)) if deficits else 1.0
        self.stretch = right_share / (1 - right_share) * self.left / self.right
        self.beta_from = beta_from
        self.label = "β  (log scale up to 1/2, then 1 − β on a log scale)"

    def x(self, value, region_variable):
        half = math.log10(0.5)
        if region_variable == "beta":
            return math.log10(value)
        return half + self.stretch * (half - math.log10(value))

    def xrange(self):
        half = math.log10(0.5)
        return math.log10(self.beta_from), half + self.stretch * self.right

    def tics(self):
        half = math.log10(0.5)
        lo = math.log10(self.beta_from)
        tics = [(value_label(v), math.log10(v)) for v in nice_decades(10 ** lo / 1.01, 0.3, 5)]
        tics.append(("1/2", half))
        for v in nice_decades(10 ** -(self.right + 0.3), 0.3, 4):
            tics.append(("1−" + value_label(v), self.x(v, "deficit")))
        return tics

    def boundaries(self):
        return [math.log10(0.5)]


def series(rows, axis, points_per_region, is_region_axis):
    """(x, y) points at the bins' log-centres, merged to at most points_per_region per region,
    with a blank line wherever bins are missing."""
    by_region = defaultdict(list)
    for r in rows:
        by_region[r["region"]].append(r)
    pts = []
    for region, rs in by_region.items():
        lo, hi = float(rs[0]["region_lo"]), float(rs[0]["region_hi"])
        span = math.log(hi) - math.log(lo)  # logs apart: hi / lo may overflow
        total = max(1, round(span / (math.log(float(rs[0]["bin_hi"])) - math.log(float(rs[0]["bin_lo"])))))
        group = max(1, math.ceil(total / points_per_region))
        merged = {}
        for r in rs:
            centre = math.sqrt(float(r["bin_lo"])) * math.sqrt(float(r["bin_hi"]))
            idx = min(total - 1, max(0, int(log_pos(centre, lo, hi) * total)))
            y = r["max_ulp"]
            yv = CEILING if y in ("inf", "nan") else max(float(y), FLOOR)
            g = idx // group
            merged[g] = max(merged.get(g, 0.0), yv)
        for g, yv in merged.items():
            a = math.exp(math.log(lo) + span * g * group / total)
            b = math.exp(math.log(lo) + span * min(total, (g + 1) * group) / total)
            var = rs[0]["variable"]
            key = region if is_region_axis else var
            xa, xb = axis.x(a, key), axis.x(b, key)
            xc = axis.x(math.sqrt(a) * math.sqrt(b), key)
            pts.append((xc, yv, min(xa, xb), max(xa, xb)))
    pts.sort()
    out, last = [], None
    for x, y, left, right in pts:
        if last is not None and left - last > 1e-6 * max(1.0, abs(left)):
            out.append("")
        out.append(f"{x:.6g} {y:.4g}")
        last = right
    return out


def panel(name, title, rows, axis, key, bound, points_per_region, is_region_axis, tic_font=9):
    """Datablocks and gnuplot commands for one panel."""
    blocks, plots = [], []
    by_flavour = defaultdict(list)
    for r in rows:
        by_flavour[r["flavour"]].append(r)
    for flavour, colour, dash, legend in FLAVOURS:
        if flavour not in by_flavour:
            continue
        block = f"${name}_{flavour}"
        data = series(by_flavour[flavour], axis, points_per_region, is_region_axis)
        blocks.append(f"{block} << EOD\n" + "\n".join(data) + "\nEOD")
        plots.append(f'{block} using 1:2 with lines lw 1.5 dt {dash} lc rgb "{colour}" '
                     f'title "{esc(legend)}"')
    xr = axis.xrange()
    tics = ", ".join(f'"{label}" {x:.6g}' for label, x in axis.tics())
    cmds = [
        f'set title "{esc(title)}"',
        f"set xrange [{xr[0]:.6g}:{xr[1]:.6g}]",
        f'set xtics ({tics}) font ",{tic_font}"',
        "unset arrow",
        f'set arrow from graph 0, first {bound} to graph 1, first {bound} nohead dt 3 lc rgb "#555555"',
        f'set label 1 "contract: {bound} ulp" at graph 0.01, first {bound * 2.2} left font ",9" '
        'tc rgb "#555555"',
    ]
    for x in axis.boundaries():
        cmds.append(f'set arrow from first {x:.6g}, graph 0 to first {x:.6g}, graph 1 nohead dt 3 '
                    'lc rgb "#aaaaaa"')
    cmds.append("set key " + key if key else "unset key")
    cmds.append("plot " + ", \\\n     ".join(plots) if plots else "plot NaN notitle")
    return blocks, cmds


def header(fmt, path, width, height, font):
    terminal = "svg dynamic" if fmt == "svg" else "pngcairo"
    return [
        f'set terminal {terminal} size {width},{height} enhanced font "{font}"',
        f'set output "{path}"',
        "set encoding utf8",
        "set logscale y",
        f"set yrange [{Y_RANGE[0]}:{Y_RANGE[1]}]",
        'set ytics ("0" 1e-2, "1" 1, "10^{4}" 1e4, "10^{8}" 1e8, "10^{12}" 1e12, "10^{16}" 1e16, '
        '"inf" 3e19)',
        "set mytics default",
        "set grid ytics lc rgb '#e4e4e4'",
        'set ylabel "max error per bin (ulp)"',
    ]


def family_plot(args, family, panels, type_name):
    path = os.path.join(args.output_dir, f"accuracy_{family}.{args.format}")
    cols = 2
    nrows = (len(panels) + cols - 1) // cols
    height = 320 * nrows + 100
    cmds = header(args.format, path, 1100, height, "Helvetica,11")
    what = "Free functions of β" if family == "free_functions" else f"Views of speed<{type_name}>::{family}"
    title = f"{what}: largest error per input bin against MPFR"
    # One legend for the figure, in colour under the title.
    top = 1 - 18 / height
    legend_y = 1 - 44 / height
    cmds.append(f'set label 100 "{esc(title)}" at screen 0.5, screen {top:.4f} center font ",13"')
    for n, (flavour, colour, dash, legend) in enumerate(FLAVOURS):
        line = "━ ━ ━" if dash != 1 else "━━━"
        cmds.append(f'set label {101 + n} "{line} {esc(legend)}" at screen {0.2 + 0.3 * n:.2f}, '
                    f'screen {legend_y:.4f} center tc rgb "{colour}" font ",11"')
    cmds.append(f"set multiplot layout {nrows},{cols} margins 0.07,0.98,0.05,{1 - 100 / height:.4f} "
                "spacing 0.08,0.075")
    blocks = []
    for i, (ptitle, rows, bound) in enumerate(panels):
        axis = RegionAxis(rows)
        b, c = panel(f"p{i}", ptitle, rows, axis, "", bound, args.points_per_region, True)
        blocks += b
        cmds += [f'set xlabel "{esc(axis.label)}" font ",9" offset 0,0.3'] + c
        if i == 0:  # drawn once
            cmds += [f"unset label {k}" for k in (100, 101, 102, 103)]
    cmds.append("unset multiplot")
    return path, "\n".join(blocks + cmds) + "\n"


def main_plot(args, rows, type_name):
    path = os.path.join(args.output_dir, f"accuracy_main.{args.format}")
    cmds = header(args.format, path, 960, 460, "Helvetica,12")
    axis = BetaAxis(rows, args.main_from)
    keep = [r for r in rows if r["variable"] != "beta" or float(r["bin_hi"]) > args.main_from]
    blocks, c = panel("main", f"γ − 1 from β in {type_name}: largest error per input bin, against MPFR",
                      keep, axis, "at graph 0.98, graph 0.62 right font ',11' opaque box", 1,
                      10 ** 6, False, tic_font=11)
    cmds += [f'set xlabel "{esc(axis.label)}"'] + c
    return path, "\n".join(blocks + cmds) + "\n"


def run_gnuplot(program, script, path):
    result = subprocess.run([program], input=script, text=True, capture_output=True)
    if result.returncode != 0 or not os.path.exists(path):
        sys.stderr.write(result.stderr)
        raise SystemExit(f"plot_accuracy: gnuplot failed for {path}")
    if result.stderr.strip():
        sys.stderr.write(result.stderr)


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("bins_csv")
    parser.add_argument("output_dir")
    parser.add_argument("--type", default="double", help="float, double or long_double")
    parser.add_argument("--format", default="svg", choices=["svg", "png"])
    parser.add_argument("--points-per-region", type=int, default=60)
    parser.add_argument("--main-from", type=float, default=1e-30)
    parser.add_argument("--gnuplot", default="gnuplot")
    args = parser.parse_args()

    with open(args.bins_csv, newline="") as f:
        rows = [r for r in csv.DictReader(f) if r["type"] == args.type]
    if not rows:
        raise SystemExit(f"plot_accuracy: no rows of type {args.type} in {args.bins_csv}")
    type_name = args.type.replace("_", " ")
    os.makedirs(args.output_dir, exist_ok=True)

    groups = defaultdict(list)
    for r in rows:
        groups[(r["family"], r["routine"], r["view"])].append(r)

    jobs = []
    main_rows = groups.get(("free_functions", "lorentz_factor_m1", "gamma_m1"))
    if main_rows:
        jobs.append(main_plot(args, main_rows, type_name))
    panels = [(f"{fn}(β) = {FREE_TEXT[fn]}", g, int(g[0]["contract_ulp"]))
              for fn in FREE_ORDER for (family, routine, view), g in groups.items()
              if family == "free_functions" and routine == fn]
    if panels:
        jobs.append(family_plot(args, "free_functions", panels, type_name))
    for ctor in CTOR_ORDER:
        panels = [(VIEW_TEXT[view], groups[(ctor, ctor, view)], int(groups[(ctor, ctor, view)][0]["contract_ulp"]))
                  for view in VIEW_ORDER if (ctor, ctor, view) in groups]
        if panels:
            jobs.append(family_plot(args, ctor, panels, type_name))

    for path, script in jobs:
        run_gnuplot(args.gnuplot, script, path)
        print(f"plot_accuracy: wrote {path} ({os.path.getsize(path) // 1024} KiB)")


if __name__ == "__main__":
    main()
