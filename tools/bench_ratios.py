#!/usr/bin/env python3
# eigenzeit: summarise Google Benchmark JSON output as careful/naive ratios.
# Distributed under the Boost Software License, Version 1.0 (see LICENSE).
"""Pair every "careful/X" benchmark with "naive/X" (and "rounded/X", the correctly rounded
mode) from the same JSON file and print a Markdown table of nanoseconds per element and the
ratios careful / naive, rounded / careful and rounded / naive.  "worst/X" benchmarks (the correctly rounded
mode on inputs that need the multiprecision rung) and "rung/X" benchmarks (one evaluation on
each rung of the widening ladder) are listed after the table.

Usage: bench_ratios.py [--time cpu|real] [--batch N] FILE.json [FILE.json ...]

* Each FILE is the output of a benchmark program run with --benchmark_out=FILE (JSON is the
  default --benchmark_out_format).  The build flavour is taken from the program name in the
  JSON context ("executable"): a name ending in "_fma" is the "-O2 -mfma" build, any other
  the plain "-O2" build.
* Time per element = (time per iteration, cpu_time by default or real_time with
  --time real) / N, with N = 4096 elements per iteration (--batch to change).
* With --benchmark_repetitions the "median" aggregate is used when the file has one;
  otherwise the median of the individual repetitions.
* Benchmarks without a twin get a row with the other time and the ratio left blank.
* The last line gives, per flavour, the largest ratio and the geometric mean of the ratios.
* "careful/frames/X" and "naive/frames/X" (bench/bench_frames.cpp) stay out of the table and
  the summary: their batches differ in size and kind (four-vectors, pairs, compositions,
  events), so a "frames" section after the summary gives one line per pair with the time per
  item (time per iteration / the benchmark's items_per_iteration counter), the ratio
  careful / naive, and, for the pairs with a performance target, whether it is met.

Python 3 standard library only.
"""

import argparse
import json
import math
import os
import statistics
import sys

_UNIT_TO_NS = {"ns": 1.0, "us": 1e3, "ms": 1e6, "s": 1e9}
_PREFIXES = ("careful/", "naive/", "rounded/", "worst/", "rung/")
_FRAMES = "frames/"
# Targets for careful / naive (name prefix after "frames/", largest ratio); other pairs are
# for information.
_FRAMES_TARGETS = (("apply/", 1.3), ("apply_in_place/", 1.3), ("apply_in_place_blocked/", 1.3),
                   ("invariant_mass/pair", 2.0))


def flavour_of(executable):
    name = os.path.basename(executable or "")
    if name.lower().endswith(".exe"):
        name = name[:-4]
    return "-O2 -mfma" if name.endswith("_fma") else "-O2"


def load(path, time_key, batch):
    """Returns (flavour, {full benchmark name: ns per element})."""
    with open(path, encoding="utf-8") as handle:
        data = json.load(handle)
    flavour = flavour_of(data.get("context", {}).get("executable", ""))

    medians = {}      # run name -> ns per iteration from the "median" aggregate
    iterations = {}   # run name -> [ns per iteration of each repetition]
    for entry in data.get("benchmarks", []):
        if entry.get("error_occurred"):
            print(f"warning: {path}: {entry.get('name')}: {entry.get('error_message', 'error')}",
                  file=sys.stderr)
            continue
        run_name = entry.get("run_name", entry.get("name"))
        if not run_name or not run_name.startswith(_PREFIXES):
            continue
        scale = _UNIT_TO_NS.get(entry.get("time_unit", "ns"))
        if scale is None or time_key not in entry:
            print(f"warning: {path}: {entry.get('name')}: no usable {time_key}", file=sys.stderr)
            continue
        ns = float(entry[time_key]) * scale
        run_type = entry.get("run_type", "iteration")
        if run_type == "aggregate":
            if entry.get("aggregate_name") == "median":
                medians[run_name] = ns
        elif run_type == "iteration":
            iterations.setdefault(run_name, []).append(ns)

    per_element = {}
    for run_name in set(medians) | set(iterations):
        ns = medians.get(run_name)
        if ns is None:
            ns = statistics.median(iterations[run_name])
        per_element[run_name] = ns / batch
    return flavour, per_element


def load_frames(path, time_key):
    """Returns (flavour, {"careful"|"naive": {name after frames/: ns per item}})."""
    with open(path, encoding="utf-8") as handle:
        data = json.load(handle)
    flavour = flavour_of(data.get("context", {}).get("executable", ""))
    medians, iterations = {}, {}
    for entry in data.get("benchmarks", []):
        run_name = entry.get("run_name", entry.get("name")) or ""
        kind, name = split_name(run_name)
        if kind not in ("careful", "naive") or not name.startswith(_FRAMES):
            continue
        if entry.get("error_occurred"):
            continue  # load() has warned
        run_type = entry.get("run_type", "iteration")
        if run_type == "aggregate" and entry.get("aggregate_name") != "median":
            continue
        scale = _UNIT_TO_NS.get(entry.get("time_unit", "ns"))
        items = entry.get("items_per_iteration")
        if scale is None or time_key not in entry or not items:
            print(f"warning: {path}: {entry.get('name')}: no usable {time_key} or "
                  f"items_per_iteration", file=sys.stderr)
            continue
        ns = float(entry[time_key]) * scale / float(items)
        key = (kind, name[len(_FRAMES):])
        if run_type == "aggregate":
            medians[key] = ns
        elif run_type == "iteration":
            iterations.setdefault(key, []).append(ns)
    times = {"careful": {}, "naive": {}}
    for key in set(medians) | set(iterations):
        ns = medians.get(key)
        if ns is None:
            ns = statistics.median(iterations[key])
        times[key[0]][key[1]] = ns
    return flavour, times


def frames_lines(frames, time_kind, flavour_order):
    """The lines of the frames section from [(flavour, file name, times)]."""
    lines = []
    entries = []
    for flavour, file_name, times in frames:
        careful, naive = times["careful"], times["naive"]
        for name in set(careful) | set(naive):
            entries.append((flavour_order.get(flavour, 2), flavour, name, file_name,
                            careful.get(name), naive.get(name)))
    for _, flavour, name, file_name, careful, naive in sorted(entries):
        target = next((limit for prefix, limit in _FRAMES_TARGETS if name.startswith(prefix)),
                      None)
        if careful is None or naive is None:
            side = "naive" if careful is None else "careful"
            lines.append(f"Frames, {flavour}: {name}: only the {side} form ran ({file_name})")
            continue
        ratio = careful / naive
        if target is None:
            verdict = "information"
        elif ratio <= target:
            verdict = f"target <= {target:g}: met"
        else:
            verdict = f"target <= {target:g}: missed by {(ratio / target - 1) * 100:.0f}%"
        lines.append(f"Frames, {flavour}: {name}: careful {careful:.3f} ns, naive {naive:.3f} ns "
                     f"per item, careful/naive {ratio:.2f} ({verdict})")
    if lines:
        lines.insert(0, f"Frames: time per item = {time_kind}_time per iteration / "
                        f"items_per_iteration (median of repetitions when present).")
    return lines


def split_name(full):
    for prefix in _PREFIXES:
        if full.startswith(prefix):
            return prefix[:-1], full[len(prefix):]
    return None, full


def fmt_ns(value):
    return "" if value is None else f"{value:.3f}"


def main(argv=None):
    parser = argparse.ArgumentParser(
        description="careful/naive ratios from Google Benchmark JSON files")
    parser.add_argument("files", nargs="+", metavar="FILE.json")
    parser.add_argument("--time", choices=("cpu", "real"), default="cpu",
                        help="which time per iteration to use (default: cpu)")
    parser.add_argument("--batch", type=int, default=4096,
                        help="elements per iteration (default: 4096)")
    args = parser.parse_args(argv)
    time_key = f"{args.time}_time"

    rows = []          # (name, flavour order, file, flavour, naive, careful, rounded)
    ratios = {}        # (flavour, kind) -> [(ratio, name)]; kinds careful/naive, rounded/careful, rounded/naive
    worst = []         # (flavour, name, ns)
    rungs = []         # (flavour, name, ns): one careful evaluation on each rung of the ladder
    flavour_order = {"-O2": 0, "-O2 -mfma": 1}
    frames = []        # (flavour, file name, {"careful"|"naive": {name: ns per item}})
    for path in args.files:
        try:
            flavour, times = load(path, time_key, args.batch)
            _, frame_times = load_frames(path, time_key)
            frames.append((flavour, os.path.basename(path), frame_times))
        except (OSError, ValueError) as error:
            print(f"error: {path}: {error}", file=sys.stderr)
            return 1
        pairs = {}
        for full, ns in times.items():
            kind, name = split_name(full)
            if kind == "worst":
                worst.append((flavour, name, ns))
                continue
            if kind == "rung":
                rungs.append((flavour, name, ns))
                continue
            if name.startswith(_FRAMES):
                continue  # the frames section
            pairs.setdefault(name, {})[kind] = ns
        for name, both in pairs.items():
            naive, careful, rounded = both.get("naive"), both.get("careful"), both.get("rounded")
            if naive and careful:
                ratios.setdefault((flavour, "careful/naive"), []).append((careful / naive, name))
            if careful and rounded:
                ratios.setdefault((flavour, "rounded/careful"), []).append((rounded / careful, name))
            if naive and rounded:
                ratios.setdefault((flavour, "rounded/naive"), []).append((rounded / naive, name))
            rows.append((name, flavour_order.get(flavour, 2), os.path.basename(path), flavour,
                         naive, careful, rounded))

    frames_section = frames_lines(frames, args.time, flavour_order)
    if not rows and frames_section:
        print("\n".join(frames_section))
        return 0
    if not rows:
        print("error: no careful/, naive/ or rounded/ benchmarks in the given files", file=sys.stderr)
        return 1

    def ratio_text(a, b):
        return f"{a / b:.2f}" if a and b else ""

    rows.sort(key=lambda r: (r[0], r[1], r[2]))
    print(f"Time per element = {args.time}_time per iteration / {args.batch} "
          f"(median of repetitions when present).")
    print()
    print("| file | build | name | naive ns/elem | careful ns/elem | rounded ns/elem "
          "| careful/naive | rounded/careful | rounded/naive |")
    print("|---|---|---|---:|---:|---:|---:|---:|---:|")
    for name, _, file_name, flavour, naive, careful, rounded in rows:
        print(f"| {file_name} | {flavour} | {name} | {fmt_ns(naive)} | {fmt_ns(careful)} "
              f"| {fmt_ns(rounded)} | {ratio_text(careful, naive)} | {ratio_text(rounded, careful)} "
              f"| {ratio_text(rounded, naive)} |")
    print()
    for flavour, name, ns in sorted(worst, key=lambda w: (flavour_order.get(w[0], 2), w[1])):
        print(f"Worst case, {flavour}: {name} takes {ns:.1f} ns per element in the correctly "
              f"rounded mode (multiprecision rung).")
    if worst:
        print()
    for flavour, name, ns in sorted(rungs, key=lambda w: (flavour_order.get(w[0], 2), w[2])):
        print(f"Ladder rung, {flavour}: {name} takes {ns:.1f} ns per element.")
    if rungs:
        print()

    parts = []
    for (flavour, kind) in sorted(ratios, key=lambda k: (flavour_order.get(k[0], 2), k[0], k[1])):
        values = ratios[(flavour, kind)]
        top, top_name = max(values)
        geo = math.exp(sum(math.log(r) for r, _ in values) / len(values))
        parts.append(f"{flavour} {kind}: max {top:.2f} ({top_name}), geometric mean {geo:.2f} "
                     f"over {len(values)} pairs")
    print("Summary: " + ("; ".join(parts) if parts else "no pairs"))
    if frames_section:
        print()
        print("\n".join(frames_section))
    return 0


if __name__ == "__main__":
    sys.exit(main())
