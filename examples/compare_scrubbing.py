#!/usr/bin/env python3
"""Compare H2S scrubbing levels for the demo site: TBN, TAN and SAN against oil hours, with the limits,
and what each scrubbing option costs per MWh, with the total cost against the bed's changeout level.

The demo site (cases/demo-site.yaml, Harrowfield landfill, engine 2) and its prices
(cases/demo-site-costs.yaml) are INVENTED DATA for illustration; none of the figures is a measurement
or a quotation. Run from the repository (after `pip install .`, or with PYTHONPATH=build/python after a
CMake build with -DACIDLOAD_BUILD_PYTHON=ON):

    python examples/compare_scrubbing.py          # writes compare_scrubbing.png and compare_scrubbing-costs.png
    python examples/compare_scrubbing.py --out plot.png --case cases/demo-site.yaml --costs cases/demo-site-costs.yaml

Results are estimates that support, not replace, the engine maker's and oil supplier's limits and lab
analysis: never extend a drain interval without lab confirmation.
"""
import argparse
import pathlib

import numpy as np

import acidload

HERE = pathlib.Path(__file__).resolve().parent
SCRUBBING = ["raw gas", "iron oxide to 50 ppmv", "iron oxide + carbon to 10 ppmv"]  # variants of the demo case


def compare(case_path):
    """Runs the case; returns the result and a sweep of the drain interval over inlet H2S [ppmv]."""
    case = acidload.load_case(case_path)
    result = acidload.run(case)
    h2s = np.linspace(10, 600, 60)
    sweep = acidload.drain_interval(case, h2s_ppmv=h2s)  # one C++ loop, the GIL released; NaN: no limit within N h
    return result, h2s, sweep


def plot(result, h2s, sweep, variants=SCRUBBING):
    """Four panels: TBN, TAN, SAN against oil hours (limits dashed, drain intervals marked) and the
    drain interval against inlet H2S."""
    import matplotlib.pyplot as plt

    fig, axes = plt.subplots(2, 2, figsize=(11, 8), constrained_layout=True)
    panels = [("tbn", "tbn-fall", "TBN (D4739) [mg KOH/g]"), ("tan", "tan-rise", "TAN (D664) [mg KOH/g]"),
              ("san", "san", "SAN (D664) [mg KOH/g]")]
    for ax, (key, limit, label) in zip(axes.flat, panels):
        limit_values = set()
        for i, name in enumerate(variants):
            v = result[name]
            colour = f"C{i}"
            t = v.trajectory
            ax.plot(t["oil_hours"], t[key], color=colour, label=name)
            limit_values.add(v.limits[limit]["limit"])
            if v.drain_interval_h is not None:  # None: no oil-condition limit within the planned maximum
                ax.axvline(v.drain_interval_h, color=colour, linestyle=":", linewidth=1)
        for value in sorted(limit_values):  # the limit, once per value (the variants share it here)
            ax.axhline(value, color="red", linestyle="--", linewidth=1)
            ax.annotate(f"limit {value:g}", (0, value), xycoords=("axes fraction", "data"), color="red",
                        fontsize=8, xytext=(3, 3), textcoords="offset points")
        ax.set_xlabel("oil hours [h]")
        ax.set_ylabel(label)
        ax.grid(alpha=0.3)
    axes[0, 0].legend(title="red dashed: limit; dotted: drain interval", fontsize=8, title_fontsize=8)
    ax = axes[1, 1]
    ax.plot(h2s, sweep, color="k")
    ax.set_xlabel("H2S in the fuel gas [ppmv, dry]")
    ax.set_ylabel("drain interval [h]")
    ax.set_title("drain interval against inlet H2S (a gap: no limit within the planned maximum)", fontsize=9)
    ax.grid(alpha=0.3)
    fig.suptitle(f"{result.summary['case']} — scrubbing levels (invented demo data)")
    return fig


def table(result, variants=SCRUBBING):
    """The comparison as text: drain interval, the limit that ends it, TBN/TAN/SAN there."""
    lines = [f"{'variant':34s} {'drain interval':>14s}  {'limit':10s} {'TBN':>5s} {'TAN':>5s} {'SAN':>5s}"]
    for name in variants:
        v = result[name]
        d = v.drain_interval_h
        end = v.summary["at-drain-or-end"]
        lines.append(f"{name:34s} {(f'{d:.0f} h' if d is not None else 'not reached'):>14s}  "
                     f"{v.limit_reached or '-':10s} {end['tbn-mg-koh-per-g']:5.2f} {end['tan-mg-koh-per-g']:5.2f} "
                     f"{end['san-mg-koh-per-g']:5.2f}")
    return "\n".join(lines)


BED = "iron-oxide bed"  # the variant of the cost case whose changeout level is swept


def costs(case_path, variant=BED):
    """The costs of every scrubbing option, the cheapest changeout level of the bed and the total per
    MWh against that level (cost against H2S)."""
    case = acidload.load_case(case_path)
    c = acidload.costs(case)
    best = acidload.cheapest_level(case, variant=variant)
    levels = np.linspace(best["scan_ppmv"][0], best["scan_ppmv"][-1], 30)
    totals, items = acidload.cost_sweep(case, levels, variant=variant)
    return c, best, levels, totals, items


def cost_table(c):
    """Total per MWh and the three largest items of each option."""
    lines = [f"{'option':26s} {'rank':>4s} {'H2S at engine':>14s} {'total/MWh':>10s}  largest items per MWh ({c.currency})"]
    for v in c.summary["variants"]:
        top = sorted(v["per-mwh"].items(), key=lambda kv: -kv[1])[:3]
        lines.append(f"{v['name']:26s} {v['rank']:4d} {v['engine-h2s-ppmv']:10.1f} ppmv {v['total-per-mwh']:10.2f}  "
                     + ", ".join(f"{k} {x:.2f}" for k, x in top))
    return "\n".join(lines)


def plot_costs(c, best, levels, totals, items):
    """Left: each option's cost items per MWh, stacked. Right: the bed's total per MWh against its
    changeout level, the cheapest level marked."""
    import matplotlib.pyplot as plt

    fig, (a, b) = plt.subplots(1, 2, figsize=(12, 4.5), constrained_layout=True)
    names = [v["name"] for v in c.summary["variants"]]
    bottom = np.zeros(len(names))
    for j, item in enumerate(acidload.COST_ITEMS):
        values = np.array([v["per-mwh"][item] for v in c.summary["variants"]])
        if values.any():
            a.bar(names, values, bottom=bottom, label=item, color=f"C{j % 10}")
            bottom += values
    a.set_ylabel(f"cost [{c.currency}/MWh]")
    a.tick_params(axis="x", labelrotation=15)
    a.legend(fontsize=7)
    a.set_title("cost items per MWh (invented prices)", fontsize=9)
    b.plot(levels, totals, color="k", label="total")
    for j, item in enumerate(acidload.COST_ITEMS):
        if items[:, j].any():
            b.plot(levels, items[:, j], linewidth=0.8, color=f"C{j % 10}", label=item)
    if best["found"]:
        b.axvline(best["level_ppmv"], color="red", linestyle="--", linewidth=1)
        b.annotate(f"cheapest {best['level_ppmv']:.0f} ppmv", (best["level_ppmv"], best["total_per_mwh"]), color="red",
                   fontsize=8, xytext=(4, 8), textcoords="offset points")
    b.set_xlabel("changeout level of the iron-oxide bed: H2S at its outlet [ppmv, dry]")
    b.set_ylabel(f"cost [{c.currency}/MWh]")
    b.grid(alpha=0.3)
    b.legend(fontsize=7)
    fig.suptitle("What scrubbing costs — invented demo data and prices")
    return fig


def main():
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--case", default=str(HERE.parent / "cases" / "demo-site.yaml"), help="case file")
    parser.add_argument("--costs", default=str(HERE.parent / "cases" / "demo-site-costs.yaml"), help="case file with prices")
    parser.add_argument("--out", default="compare_scrubbing.png", help="PNG file to write (the costs beside it, -costs.png)")
    args = parser.parse_args()
    import matplotlib

    matplotlib.use("Agg")  # a file, no window
    result, h2s, sweep = compare(args.case)
    print(table(result))
    fig = plot(result, h2s, sweep)
    fig.savefig(args.out, dpi=120)
    c, best, levels, totals, items = costs(args.costs)
    print()
    print(cost_table(c))
    if best["found"]:
        print(f"cheapest changeout level of the bed: {best['level_ppmv']:.1f} ppmv, {best['total_per_mwh']:.2f} {c.currency}/MWh")
    out = pathlib.Path(args.out)
    costs_png = out.with_name(out.stem + "-costs" + out.suffix)
    plot_costs(c, best, levels, totals, items).savefig(costs_png, dpi=120)
    print(f"\nwritten to {args.out} and {costs_png} (invented demo data and prices; never extend a drain interval "
          "without lab confirmation; spent iron-oxide media can self-heat and ignite: keep it wet)")


if __name__ == "__main__":
    main()
