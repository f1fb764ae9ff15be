"""Many engines at once: run a fleet of cases on all cores, or on a Dask cluster.

:func:`run_many` takes case files, folders of them, dicts or loaded :class:`Case` objects and runs them
with threads (the C++ run releases the GIL, so the threads use every core) or, given a
``dask.distributed.Client``, as one Dask task per case. Either way the answer is the same as a serial
run, case by case and figure by figure: each case is run by the same C++ code from the same input,
and nothing in a run depends on the order or the place it runs in.

What travels to a Dask worker is the case's recipe (its YAML text, or its path), never a C++ object;
record CSV files and overlays named in a case are read on the worker, so on a cluster of several
machines they must be at the same path on every machine (a shared folder).
"""
from __future__ import annotations

import os
import pathlib
from concurrent.futures import ThreadPoolExecutor
from typing import Any, Dict, Iterable, List, Mapping, Optional, Sequence, Tuple, Union

import numpy as np

from . import _core
from ._case import Case, _recipe_of, _rebuild
from ._errors import InputError

PathLike = Union[str, "os.PathLike[str]"]
CaseLike = Union[Case, PathLike, Mapping[str, Any]]

#: Columns of :meth:`FleetResult.to_dataframe` taken from each variant's summary (units in the names).
FLEET_COLUMNS = ("drain-interval-h", "limit-reached", "sulfur-share-to-oil", "initial-tbn-rate-mg-koh-per-g-per-h",
                 "floor-reached-at-h", "so3-share", "engine-hours")


class CaseOutcome:
    """One case of a fleet run: its file, title and the summary (exactly the program's summary.json),
    and the variants' trajectories when asked for."""

    __slots__ = ("file", "title", "summary", "trajectories")

    def __init__(self, file: str, title: str, summary: Dict[str, Any],
                 trajectories: Optional[List[Dict[str, np.ndarray]]]) -> None:
        self.file = file
        self.title = title
        self.summary = summary
        self.trajectories = trajectories

    @property
    def names(self) -> List[str]:
        """The variants' names, base first."""
        return [v["name"] for v in self.summary["variants"]]

    def __repr__(self) -> str:
        return f"<acidload.CaseOutcome {self.title or self.file!r}: {len(self.names)} variant(s)>"


class FleetResult:
    """The cases of a fleet run, in the order given."""

    def __init__(self, cases: List[CaseOutcome]) -> None:
        self.cases = cases

    def __len__(self) -> int:
        return len(self.cases)

    def __iter__(self):
        return iter(self.cases)

    def __getitem__(self, i: int) -> CaseOutcome:
        return self.cases[i]

    def rows(self) -> List[Dict[str, Any]]:
        """One row per case and variant: case file, title, variant and the FLEET_COLUMNS figures."""
        out = []
        for c in self.cases:
            for v in c.summary["variants"]:
                row = {"case-file": c.file, "case": c.title, "variant": v["name"]}
                row.update({k: v.get(k) for k in FLEET_COLUMNS})
                out.append(row)
        return out

    @property
    def summary(self) -> Dict[str, Any]:
        """The fleet summary: every case's rows, and the shortest interval of the fleet."""
        rows = self.rows()
        finite = [r for r in rows if isinstance(r["drain-interval-h"], (int, float))]
        shortest = min(finite, key=lambda r: r["drain-interval-h"]) if finite else None
        return {"acidload-version": _core.version(), "cases": len(self.cases), "variants": len(rows),
                "shortest-drain-interval": shortest, "rows": rows}

    def to_dataframe(self):
        """The rows as a pandas DataFrame (pandas needed)."""
        from ._results import _pandas

        return _pandas().DataFrame(self.rows())

    def __repr__(self) -> str:
        return f"<acidload.FleetResult: {len(self.cases)} case(s)>"


def _expand(cases: Union[CaseLike, Iterable[CaseLike]]) -> List[CaseLike]:
    """A case, a folder (its *.yaml and *.yml files, sorted) or a sequence of them, as a flat list."""
    if isinstance(cases, (str, os.PathLike, Case, Mapping)):
        cases = [cases]
    out: List[CaseLike] = []
    for c in cases:
        if isinstance(c, (str, os.PathLike)) and pathlib.Path(c).is_dir():
            files = sorted(p for p in pathlib.Path(c).iterdir() if p.suffix in (".yaml", ".yml") and p.is_file())
            if not files:
                raise InputError(f"{os.fspath(c)}: the folder holds no case files (*.yaml, *.yml)")
            out.extend(str(p) for p in files)
        elif isinstance(c, (str, os.PathLike, Case, Mapping)):
            out.append(c)
        else:
            raise TypeError(f"run_many: a case is a Case, a path or a dict, not {type(c).__name__}")
    return out


def _loaded(c: CaseLike) -> Case:
    if isinstance(c, Case):
        return c
    if isinstance(c, Mapping):
        from ._case import case_from_dict

        return case_from_dict(c)
    from ._case import load_case

    return load_case(c)


def _recipe(c: CaseLike, portable: bool) -> Tuple:
    """What rebuilds the case on a worker. With ``portable``, a case file travels as its text (so the
    worker need not see the file itself; records still resolve against the file's folder)."""
    if isinstance(c, Case):
        recipe = _recipe_of(c)
    elif isinstance(c, Mapping):
        from ._case import case_from_dict

        recipe = _recipe_of(case_from_dict(c))
    else:
        recipe = ("file", os.fspath(c), ())
    if portable and recipe[0] == "file":
        path = pathlib.Path(recipe[1])
        try:
            text = path.read_text(encoding="utf-8")
        except OSError as e:
            raise InputError(f"{recipe[1]}: cannot read the case file: {e.strerror}") from None
        recipe = ("text", text, recipe[1], str(path.resolve().parent), recipe[2])
    return recipe


def _run_recipe(recipe: Tuple, trajectories: bool) -> CaseOutcome:
    """Loads and runs one case on a Dask worker."""
    return _run_case(_rebuild(recipe), trajectories)


def _run_case(case: Case, trajectories: bool) -> CaseOutcome:
    """Runs one loaded case (on a thread or a worker); reading, running and the summary release the GIL."""
    import json

    run = _core.run_case(case._file)
    summary = json.loads(run.summary_json())
    traj = [dict(run.trajectory(i)) for i in range(len(run.names))] if trajectories else None
    return CaseOutcome(case.file, case.title, summary, traj)


def run_many(cases: Union[CaseLike, Iterable[CaseLike]], *, client: Any = None, threads: Optional[int] = None,
             trajectories: bool = False) -> FleetResult:
    """Runs many cases: threads on this machine by default (``threads`` of them, all cores when None;
    ``threads=1`` is a serial run), or one Dask task per case when ``client`` is a
    ``dask.distributed.Client`` (``pip install .[fleet]``). The results equal a serial run's.

    ``cases``: case files, folders of case files, dicts (as :func:`case_from_dict` takes) or loaded
    :class:`Case` objects. ``trajectories=True`` also returns every variant's trajectory arrays (memory:
    about 0.1 MB per variant-year at the default output interval). A case with a mistake raises
    :class:`InputError` naming its file, line and column before anything runs.
    """
    if threads is not None and (isinstance(threads, bool) or not isinstance(threads, int) or threads < 1):
        raise InputError(f"run_many: threads = {threads!r}: expected a whole number of at least 1")
    items = _expand(cases)
    if client is None:
        workers = min(threads or os.cpu_count() or 1, max(1, len(items)))
        # every case read first (on the threads too): a mistake is reported before any case runs
        with ThreadPoolExecutor(max_workers=workers) as pool:
            loaded = list(pool.map(_loaded, items))
            return FleetResult(list(pool.map(lambda c: _run_case(c, trajectories), loaded)))
    recipes = [_recipe(c, portable=True) for c in items]
    futures = client.map(_run_recipe, recipes, [trajectories] * len(recipes), pure=False)
    return FleetResult(client.gather(futures))


def _monte_carlo_recipe(recipe: Tuple, variant: Optional[str], draws: Optional[int],
                        seed: Optional[int]) -> Dict[str, Any]:
    from ._calibration import monte_carlo

    return monte_carlo(_rebuild(recipe), draws=draws, seed=seed, threads=1, variant=variant)


def monte_carlo_many(cases: Union[CaseLike, Iterable[CaseLike]], *, client: Any = None,
                     threads: Optional[int] = None, draws: Optional[int] = None, seed: Optional[int] = None,
                     variant: Optional[str] = None) -> List[Dict[str, Any]]:
    """Monte Carlo over a fleet (engines × draws): each case's uncertainty section, one task per case —
    threads here, or Dask tasks given ``client``. Each case's draws come from its own counter-based
    stream, so the answer equals :func:`acidload.monte_carlo` run on each case alone."""
    if threads is not None and (isinstance(threads, bool) or not isinstance(threads, int) or threads < 1):
        raise InputError(f"monte_carlo_many: threads = {threads!r}: expected a whole number of at least 1")
    items = _expand(cases)
    if client is None:
        from ._calibration import monte_carlo

        n = threads or os.cpu_count() or 1
        with ThreadPoolExecutor(max_workers=max(1, min(n, len(items)))) as pool:
            loaded = list(pool.map(_loaded, items))
        # engines one after another, each one's draws dealt over the threads: the engines' work is
        # unequal (a draw runs until its figures are known), so one task per engine leaves threads idle
        return [monte_carlo(c, draws=draws, seed=seed, threads=n, variant=variant) for c in loaded]
    recipes = [_recipe(c, portable=True) for c in items]
    n = len(recipes)
    futures = client.map(_monte_carlo_recipe, recipes, [variant] * n, [draws] * n, [seed] * n, pure=False)
    return client.gather(futures)
