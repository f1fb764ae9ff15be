"""A site: several engines on one gas supply and one scrubbing train (docs/model.md §18.4)::

    site = acidload.Site("cases/demo-landfill-site.yaml")   # or a dict of the site-file form
    r = site.run()
    r.site["stages"][0]["bed_interval_h"]                    # the shared bed: running hours per bed
    r.engines["engine 1"]["gas_share"]                        # each engine's figures
    r.to_dataframe()                                          # one row per engine (pandas, when installed)

The site file's form is in docs/case-format.md ("Sites"); the figures are those of the program's
site.json (``acidload run SITE --out DIR``), keys in snake case.
"""
from __future__ import annotations

import os
from typing import Any, Dict, List, Mapping, Union

from . import _core, _yaml
from ._case import DICT_SOURCE, _from_dict_error
from ._errors import InputError

__all__ = ["Site", "SiteResult"]

PathLike = Union[str, "os.PathLike[str]"]


class SiteResult:
    """A site, run: ``site`` (the shared train, the sulfur balance, the shared costs a year) and
    ``engines`` (name → each engine's gas share, H2S behind the train, oil changes, drain intervals,
    costs). Units are in the key names; money in the site's currency."""

    def __init__(self, raw: Dict[str, Any], currency: str) -> None:
        self.site: Dict[str, Any] = raw["site"]
        self.site["currency"] = currency
        self.engines: Dict[str, Dict[str, Any]] = {e["name"]: e for e in raw["engines"]}

    @property
    def engine_names(self) -> List[str]:
        return list(self.engines)

    def to_dataframe(self):
        """One row per engine (pandas); the cost items a year as ``per_year.ITEM`` columns."""
        import pandas as pd
        rows = []
        for e in self.engines.values():
            row = {k: v for k, v in e.items() if k not in ("per_year", "drain_intervals_h")}
            row["first_drain_interval_h"] = e["drain_intervals_h"][0] if e["drain_intervals_h"] else float("nan")
            row.update({f"per_year.{k}": v for k, v in e["per_year"].items()})
            rows.append(row)
        return pd.DataFrame(rows).set_index("name")

    def __repr__(self) -> str:
        return f"<SiteResult {self.site['name']!r}: {len(self.engines)} engines>"


class Site:
    """A site file, read: ``Site(path)`` or ``Site(dict, base_dir=...)`` (a dict of the site-file form,
    kebab-case keys and values with units as text; ``format-version`` defaults to the newest).
    Errors are :class:`acidload.InputError` with the file, line and column (a dict: the key path)."""

    def __init__(self, source: Union[PathLike, Mapping[str, Any]], *, base_dir: PathLike = ".") -> None:
        if isinstance(source, Mapping):
            doc = dict(source)
            doc.setdefault("format-version", _core.CASE_FORMAT_VERSION)
            try:
                self._file = _core.load_site_text(_yaml.dump(doc), DICT_SOURCE, os.fspath(base_dir))
            except InputError as e:
                if e.file is not None and os.path.basename(e.file) == DICT_SOURCE:
                    raise _from_dict_error(e) from None
                raise
        elif isinstance(source, (str, os.PathLike)):
            self._file = _core.load_site(os.fspath(source))
        else:
            raise TypeError(f"Site takes a path or a mapping, not {type(source).__name__}")

    @property
    def file(self) -> str:
        return self._file.file

    @property
    def name(self) -> str:
        return self._file.name

    @property
    def title(self) -> str:
        return self._file.title

    @property
    def engine_names(self) -> List[str]:
        return list(self._file.engine_names)

    @property
    def currency(self) -> str:
        return self._file.currency

    def run(self) -> SiteResult:
        """Runs the site: the train over the engines' summed gas flow, then each engine on the gas behind it."""
        return SiteResult(_core.run_site(self._file), self._file.currency)

    def __repr__(self) -> str:
        return f"<Site {self.name!r}: {len(self.engine_names)} engines>"
