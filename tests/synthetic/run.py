#!/usr/bin/env python3
"""Recovery and coverage of acidload's prediction on synthetic plants (tests/synthetic/plant.py):
three recorded charges with lab samples every 150 h are fitted (parameters chosen by acidload for
what the lab reports), the fourth charge is predicted under its planned H2S, and the plant's own
interval is the truth. Prints the figures; tests/python/test_synthetic_plants.py asserts on them.

    PYTHONPATH=build/python python3 tests/synthetic/run.py [PLANTS_PER_KIND] [DRAWS]
"""
from __future__ import annotations

import pathlib
import sys
import tempfile
from typing import Dict, List

import numpy as np

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent))
import plant as synthetic  # noqa: E402


def evaluate(acidload, plants_per_kind: int = 15, draws: int = 200, first_seed: int = 1) -> List[Dict]:
    out = []
    with tempfile.TemporaryDirectory() as tmp:
        folder = pathlib.Path(tmp)
        for kind in (False, True):
            for i in range(plants_per_kind):
                seed = first_seed + i + (1000 if kind else 0)
                p = synthetic.make_plant(seed, kind)
                rows, truth = synthetic.history(p)
                (folder / "lab.csv").write_text(synthetic.lab_csv(rows))
                case = acidload.load_case_text(synthetic.case_yaml(p), file_name=f"plant-{seed}.yaml")
                plan = acidload.load_case_text(synthetic.plan_yaml(p), file_name=f"plan-{seed}.yaml")
                fit = acidload.fit(case, folder / "lab.csv")
                pred = acidload.predict(fit, conditions=plan, draws=draws, seed=seed)
                out.append({"seed": seed, "differing": kind, "truth": truth, "p5": pred["p5_h"], "p50": pred["p50_h"],
                            "p95": pred["p95_h"], "limit": pred["limit"], "s2": fit.s2,
                            "model_form": pred["model_form_spread"], "parameters": pred["parameter_spread"]})
    return out


def figures(rows: List[Dict]) -> Dict[str, float]:
    def part(sel):
        r = [x for x in rows if sel(x)]
        err = np.array([x["p50"] / x["truth"] - 1 for x in r])
        inside = np.array([x["p5"] <= x["truth"] <= x["p95"] for x in r])
        width = np.array([(x["p95"] - x["p5"]) / x["p50"] for x in r])
        return {"plants": len(r), "within_10pct": float(np.mean(np.abs(err) <= 0.10)),
                "median_abs_error": float(np.median(np.abs(err))), "coverage_90": float(np.mean(inside)),
                "median_band_width": float(np.median(width))}

    return {"all": part(lambda x: True), "following the model": part(lambda x: not x["differing"]),
            "differing from it": part(lambda x: x["differing"])}


def main() -> int:
    import acidload

    n = int(sys.argv[1]) if len(sys.argv) > 1 else 15
    draws = int(sys.argv[2]) if len(sys.argv) > 2 else 200
    rows = evaluate(acidload, n, draws)
    for x in rows:
        print(f"  plant {x['seed']:5d} {'differing' if x['differing'] else 'model    '}  truth {x['truth']:6.0f} h   "
              f"P5 {x['p5']:6.0f}  P50 {x['p50']:6.0f}  P95 {x['p95']:6.0f}  ({x['p50'] / x['truth'] - 1:+.1%}, {x['limit']}, "
              f"chi2r {x['s2']:.2f})")
    print()
    for name, f in figures(rows).items():
        print(f"{name:20s} plants {f['plants']:3d}   within +-10 %: {f['within_10pct']:.0%}   median |error| "
              f"{f['median_abs_error']:.1%}   P5-P95 holds the truth: {f['coverage_90']:.0%}   median band width "
              f"{f['median_band_width']:.0%} of P50")
    return 0


if __name__ == "__main__":
    sys.exit(main())
