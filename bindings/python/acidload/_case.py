"""Cases: from a case file, a YAML text, a dict or keyword arguments — all read by the one C++ reader."""
from __future__ import annotations

import math
import os
import tempfile
from typing import Any, Dict, Iterable, List, Mapping, Optional, Sequence, Tuple, Union

from . import _core, _yaml
from ._errors import InputError

__all__ = ["Case", "Variant", "load_case", "load_case_text", "case_from_dict", "case", "KEYWORDS"]

PathLike = Union[str, "os.PathLike[str]"]

#: The name a case built from a dict or keyword arguments carries as its "file".
DICT_SOURCE = "<dict>"


class Variant:
    """One variant of a case: everything one run needs (acidload::EngineCase).

    Get it from :attr:`Case.variants` or :meth:`Case.variant`; pass it to :func:`acidload.run`,
    :func:`acidload.drain_interval` or :func:`acidload.solve_for_interval`.
    """

    __slots__ = ("_engine_case", "_case")

    def __init__(self, engine_case: "_core.EngineCase", case: "Case") -> None:
        self._engine_case = engine_case
        self._case = case

    @property
    def name(self) -> str:
        """The variant's name ("raw gas", "scrubbed to 50 ppmv", …)."""
        return self._engine_case.name

    @property
    def case(self) -> "Case":
        """The case the variant belongs to."""
        return self._case

    @property
    def max_hours_h(self) -> float:
        """The plant's planned maximum hours on a charge [h]: the horizon, not a limit."""
        return self._engine_case.max_hours

    def __repr__(self) -> str:
        return f"<acidload.Variant {self.name!r} of {self._case.file!r}>"


class Case:
    """A loaded case: its base variant and the named variants to compare (acidload::io::CaseFile).

    Make one with :func:`load_case`, :func:`load_case_text`, :func:`case_from_dict` or :func:`case`;
    run it with :func:`acidload.run` (or :meth:`run`).
    """

    __slots__ = ("_file", "_recipe", "_held")

    def __init__(self, case_file: "_core.CaseFile", recipe: Optional[Tuple] = None) -> None:
        self._file = case_file
        self._recipe = recipe  # how to read the case again (pickling, Dask workers): see _rebuild
        self._held = None  # the case with its records read into segments, made when first needed

    def _held_file(self) -> "_core.CaseFile":
        # A CSV record is loaded as its checked description and streamed by run(); the studies a
        # Variant goes to (fit, Monte Carlo, sweeps ...) index segments, so its variants are read
        # in once, on first use (at most 1 000 000 segments per record; longer ones stream only).
        if not self._file.streamed:
            return self._file
        if self._held is None:
            self._held = self._file.held()
        return self._held

    def __reduce__(self):
        # a Case pickles as its recipe (the file's path or the YAML text), never as C++ state
        return (_rebuild, (_recipe_of(self),))

    @property
    def file(self) -> str:
        """The file name as given (``"<dict>"`` for dicts and keyword arguments)."""
        return self._file.file

    @property
    def title(self) -> str:
        """The ``case`` key: a title for reports."""
        return self._file.title

    @property
    def format_version(self) -> int:
        """The case-file format version the input is written in."""
        return self._file.format_version

    @property
    def overlays(self) -> List[str]:
        """Overlay files merged over the base, in order."""
        return list(self._file.overlays)

    @property
    def lab(self) -> Dict[str, Any]:
        """The ``lab`` section as a dict (only what the case states): ``precision`` {reading: sd},
        ``labs`` {lab name: {precision, oxidation_baseline, nitration_baseline}} and ``alarm_levels``
        {quantity: (caution, critical)}; readings tbn_d2896, tbn_d4739, tan, san [mg KOH/g], oxidation,
        nitration [A/cm]. :func:`acidload.fit` uses it where the call states nothing (docs/lab-results.md)."""
        return self._file.lab.to_dict()

    @property
    def variants(self) -> List[Variant]:
        """Every variant; ``[0]`` is the base case. (A record read from a CSV file is read into
        segments here, once: at most 1 000 000 per record; :func:`acidload.run` streams any length.)"""
        return [Variant(v, self) for v in self._held_file().variants]

    @property
    def names(self) -> List[str]:
        """The variants' names, base first."""
        return list(self._file.names)

    def variant(self, name: Optional[str] = None) -> Variant:
        """The variant called ``name`` (the base case when None). Raises KeyError naming the variants."""
        variants = self.variants
        if name is None:
            return variants[0]
        for v in variants:
            if v.name == name:
                return v
        raise KeyError(f"no variant named {name!r} (the case has: {', '.join(self.names)})")

    def run(self):
        """Runs every variant: same as :func:`acidload.run` (case)."""
        from ._results import run

        return run(self)

    def __repr__(self) -> str:
        return f"<acidload.Case {self.title or self.file!r}: {len(self._file.names)} variant(s)>"


# ---- loading ------------------------------------------------------------------------------------

def load_case(path: PathLike, overlays: Sequence[PathLike] = ()) -> Case:
    """Reads a case file (YAML, docs/case-format.md) and any overlay files merged over it in order.

    Raises :class:`acidload.InputError` with ``.file``, ``.line``, ``.column``, ``.key`` (the key path),
    ``.value`` and ``.expected`` — the same message the ``acidload`` program prints.
    """
    recipe = ("file", os.fspath(path), tuple(os.fspath(o) for o in overlays))
    return Case(_core.load_case(recipe[1], list(recipe[2]), stream=True), recipe)


def load_case_text(text: str, *, file_name: str = "<text>", base_dir: PathLike = ".",
                   overlays: Sequence[PathLike] = ()) -> Case:
    """Reads a case from YAML text. ``file_name`` names it in error messages; relative file names in it
    (a record CSV) resolve against ``base_dir``. Errors as for :func:`load_case`."""
    recipe = ("text", text, file_name, os.fspath(base_dir), tuple(os.fspath(o) for o in overlays))
    return Case(_core.load_case_text(text, file_name, recipe[3], list(recipe[4]), stream=True), recipe)


def _from_dict_error(e: InputError, keywords: Optional[Dict[str, str]] = None) -> InputError:
    """The error of a dict or keyword case: the key path and the program's message, no text position."""
    message = f"'{e.key}' = '{e.value}': expected {e.expected}"
    keyword = (keywords or {}).get(e.key or "")
    if keyword:
        message += f" (from the keyword argument {keyword})"
    return InputError(message, key=e.key, value=e.value, expected=e.expected, keyword=keyword)


def case_from_dict(data: Mapping[str, Any], *, base_dir: PathLike = ".") -> Case:
    """Reads a case given as a dict of the case-file format (kebab-case keys, values with units as text,
    e.g. ``{"fuel": {"h2s": "300 ppmv"}}``); ``format-version`` defaults to the newest.

    The dict is written out as YAML text and read by the same reader as a file, so errors carry the
    key path (``InputError.key``, e.g. ``"engine.power"``) and the program's message; ``.file`` and
    ``.line`` are None since a dict has no lines.
    """
    if not isinstance(data, Mapping):
        raise TypeError(f"case_from_dict takes a mapping, not {type(data).__name__}")
    doc = dict(data)
    doc.setdefault("format-version", _core.CASE_FORMAT_VERSION)
    return _load_dict(doc, base_dir, None)


def _load_dict(doc: Mapping[str, Any], base_dir: PathLike, keywords: Optional[Dict[str, str]],
               base: Optional[PathLike] = None, overlays: Sequence[PathLike] = ()) -> Case:
    # written out as YAML text: the reader reads it as it reads a file
    text = _yaml.dump(doc)
    try:
        if base is None:
            return load_case_text(text, file_name=DICT_SOURCE, base_dir=base_dir, overlays=overlays)
        return _load_with_text_overlay(os.fspath(base), tuple(os.fspath(o) for o in overlays), text)
    except InputError as e:
        if e.file is not None and os.path.basename(e.file) == DICT_SOURCE:
            raise _from_dict_error(e, keywords) from None
        raise


def _load_with_text_overlay(base: str, overlays: Tuple[str, ...], text: str) -> Case:
    """Keyword arguments over a case file: their YAML text as a last overlay, merged over the base
    before its variants (written to a private temporary file, removed after reading)."""
    with tempfile.TemporaryDirectory(prefix="acidload-") as tmp:
        overlay = os.path.join(tmp, DICT_SOURCE)
        with open(overlay, "w", encoding="utf-8") as f:
            f.write(text)
        return Case(_core.load_case(base, list(overlays) + [overlay], stream=True), ("file+text", base, overlays, text))


def _recipe_of(c: Case) -> Tuple:
    """The recipe a case was read from; a Case made from a bare C++ CaseFile cannot be read again."""
    if c._recipe is None:
        raise TypeError("this Case was not read through acidload.load_case/load_case_text/case_from_dict/case, "
                        "so it cannot be pickled or sent to another process")
    return c._recipe


def _rebuild(recipe: Tuple) -> Case:
    """Reads a case again from its recipe: ("file", path, overlays), ("text", text, file name, base
    folder, overlays) or ("file+text", path, overlays, keyword overlay text)."""
    kind = recipe[0]
    if kind == "file":
        return load_case(recipe[1], recipe[2])
    if kind == "text":
        return load_case_text(recipe[1], file_name=recipe[2], base_dir=recipe[3], overlays=recipe[4])
    if kind == "file+text":
        return _load_with_text_overlay(recipe[1], tuple(recipe[2]), recipe[3])
    raise ValueError(f"unknown case recipe {kind!r}")


# ---- keyword arguments ------------------------------------------------------------------------------
# keyword → (key path in the case format, unit written after the number; None: the value as it is)
KEYWORDS: Dict[str, Tuple[Tuple[str, ...], Optional[str]]] = {
    # top level
    "title": (("case",), None),
    "base_name": (("base-name",), None),
    "reference_state": (("reference-state",), None),
    "combustion_reference_c": (("combustion-reference",), "degC"),
    # fuel
    "fuel_basis": (("fuel", "basis"), None),
    "ch4_pct": (("fuel", "composition", "CH4"), "%"),
    "co2_pct": (("fuel", "composition", "CO2"), "%"),
    "n2_pct": (("fuel", "composition", "N2"), "%"),
    "o2_pct": (("fuel", "composition", "O2"), "%"),
    "h2_pct": (("fuel", "composition", "H2"), "%"),
    "c2h6_pct": (("fuel", "composition", "C2H6"), "%"),
    "c3h8_pct": (("fuel", "composition", "C3H8"), "%"),
    "ar_pct": (("fuel", "composition", "Ar"), "%"),
    "water_pct": (("fuel", "water"), "%"),
    "water_dew_point_c": (("fuel", "water-dew-point"), "degC"),
    "gas_pressure_kpa": (("fuel", "gas-pressure"), "kPa"),
    "h2s_ppmv": (("fuel", "h2s"), "ppmv"),
    "h2s_mg_per_nm3": (("fuel", "h2s"), "mg/Nm3"),
    "other_sulfur_mg_per_nm3": (("fuel", "other-sulfur"), "mg/Nm3"),
    "chlorine_mg_per_nm3": (("fuel", "chlorine"), "mg/Nm3"),
    "fluorine_mg_per_nm3": (("fuel", "fluorine"), "mg/Nm3"),
    # engine
    "rated_power_kw": (("engine", "rated-power"), "kW"),
    "power_kw": (("engine", "power"), "kW"),
    "load_pct": (("engine", "load"), "%"),
    "electrical_efficiency_pct": (("engine", "electrical-efficiency"), "%"),
    "fuel_flow_nm3_per_h": (("engine", "fuel-flow"), "Nm3/h"),
    "excess_air_ratio": (("engine", "excess-air-ratio"), None),
    "air_water_pct": (("engine", "air-water"), "%"),
    "air_humidity_pct": (("engine", "air-humidity"), "%"),
    "air_temperature_c": (("engine", "air-temperature"), "degC"),
    "air_pressure_kpa": (("engine", "air-pressure"), "kPa"),
    "blow_by_pct": (("engine", "blow-by"), "%"),
    "blow_by_flow_nm3_per_h": (("engine", "blow-by-flow"), "Nm3/h"),
    "jacket_water_out_c": (("engine", "jacket-water-out"), "degC"),
    "coldest_crankcase_surface_c": (("engine", "coldest-crankcase-surface"), "degC"),
    "oil_temperature_c": (("engine", "oil-temperature"), "degC"),
    "crankcase_pressure_kpa": (("engine", "crankcase-pressure"), "kPa"),
    "exhaust_pressure_kpa": (("engine", "exhaust-pressure"), "kPa"),
    "exhaust_temperature_c": (("engine", "exhaust-temperature"), "degC"),
    "start_every_h": (("engine", "start-every"), "h"),
    "nox_g_per_kwh": (("engine", "nox"), "g/kWh"),
    # nox_mg_per_nm3 (with nox_reference_o2_pct, default 5) is composed below
    # oil
    "oil_volume_l": (("oil", "volume"), "L"),
    "oil_density_kg_per_m3": (("oil", "density"), "kg/m3"),
    "fresh_tbn_mg_koh_per_g": (("oil", "fresh-tbn"), "mg KOH/g"),
    "tbn_method": (("oil", "tbn-method"), None),
    "fresh_tan_mg_koh_per_g": (("oil", "fresh-tan"), "mg KOH/g"),
    "oil_consumption_g_per_kwh": (("oil", "consumption"), "g/kWh"),
    "makeup": (("oil", "makeup"), None),
    "residual_share_pct": (("oil", "residual-share"), "%"),
    # limits
    "limit_tbn_share_of_fresh_pct": (("limits", "tbn-share-of-fresh"), "%"),
    "limit_tbn_method": (("limits", "tbn-method"), None),
    "limit_tan_rise_mg_koh_per_g": (("limits", "tan-rise"), "mg KOH/g"),
    "limit_crossover": (("limits", "crossover"), None),
    "limit_san_mg_koh_per_g": (("limits", "san"), "mg KOH/g"),
    "limit_oxidation_a_per_cm": (("limits", "oxidation"), "A/cm"),
    "limit_nitration_a_per_cm": (("limits", "nitration"), "A/cm"),
    "max_hours_h": (("limits", "max-hours"), "h"),
    "ignore_limits": (("limits", "ignore"), None),
    # run
    "hours_h": (("run", "hours"), "h"),
    "output_interval_h": (("run", "output-interval"), "h"),
    "detection_step_h": (("run", "detection-step"), "h"),
}
_SECTIONS = ("fuel", "engine", "oil", "model", "limits", "run", "record", "variants")


def _number(keyword: str, v: Any) -> str:
    if isinstance(v, bool) or not isinstance(v, (int, float)) and not hasattr(v, "__float__"):
        raise TypeError(f"{keyword} takes a number, not {type(v).__name__} ({v!r})")
    if isinstance(v, int):  # exact; beyond ±1e300 the reader refuses it with the key
        return str(v) if abs(v) <= 10**300 else ("1e301" if v > 0 else "-1e301")
    try:
        x = float(v)
    except (OverflowError, ValueError):
        return "1e301"
    if isinstance(v, int) or (math.isfinite(x) and x == int(x) and abs(x) < 1e15):
        return str(int(x))
    return repr(x)


def _value(keyword: str, v: Any, unit: Optional[str]) -> Any:
    if unit is None:
        if isinstance(v, bool):
            return "true" if v else "false"
        if hasattr(v, "tolist"):
            return v.tolist()
        return v
    return f"{_number(keyword, v)} {unit}"


def _merge(into: Dict[str, Any], layer: Mapping[str, Any]) -> None:
    for k, v in layer.items():
        if isinstance(v, Mapping) and isinstance(into.get(k), dict):
            _merge(into[k], v)
        else:
            into[k] = dict(v) if isinstance(v, Mapping) else v


def case(base: Union[None, PathLike, Mapping[str, Any]] = None, *, base_dir: PathLike = ".",
         overlays: Sequence[PathLike] = (), **inputs: Any) -> Case:
    """A case from keyword arguments with the unit in each name, e.g.::

        acidload.case(ch4_pct=55, co2_pct=45, h2s_ppmv=300, power_kw=1000, electrical_efficiency_pct=40,
                      oil_volume_l=600, jacket_water_out_c=90)
        acidload.case("cases/demo-site.yaml", h2s_ppmv=50)   # over a case file (and all its variants)

    Units by suffix: ``_pct`` %, ``_c`` °C, ``_kw`` kW, ``_kpa`` kPa, ``_l`` L, ``_h`` hours,
    ``_ppmv`` ppmv (dry unless the fuel basis is wet), ``_mg_per_nm3`` mg/Nm³, ``_mg_koh_per_g``
    mg KOH/g, ``_g_per_kwh`` g/kWh, ``_kg_per_m3`` kg/m³, ``_nm3_per_h`` Nm³/h, ``_a_per_cm`` A/cm.
    Every keyword is listed in :data:`acidload.KEYWORDS` with the case-file key it sets (see
    docs/case-format.md for meanings and defaults). ``nox_mg_per_nm3`` (dry, 0 °C) is taken at
    ``nox_reference_o2_pct`` (default 5) % O2. Sections may also be given whole as dicts in the
    case-file form — ``fuel=``, ``engine=``, ``oil=``, ``model=``, ``limits=``, ``run=``,
    ``record=``, ``variants=`` (a list) — and the keywords are merged over them.

    ``base`` is a case file (the keywords then form an overlay merged over it before its variants)
    or a dict of the case-file form. The inputs are read by the same reader as a file: an
    :class:`acidload.InputError` names the key path, the value, what is expected and ``.keyword``.
    """
    doc: Dict[str, Any] = {}
    if isinstance(base, Mapping):
        _merge(doc, base)
        base_file = None
    else:
        base_file = base
    for section in _SECTIONS:
        if section in inputs:
            given = inputs.pop(section)
            if section == "variants":
                doc["variants"] = list(given)
            elif isinstance(given, Mapping):
                _merge(doc, {section: given})
            else:
                raise TypeError(f"{section}= takes a dict of the case-file section, not {type(given).__name__}")
    keywords: Dict[str, str] = {}
    if "nox_mg_per_nm3" in inputs:
        o2 = inputs.pop("nox_reference_o2_pct", 5)
        value = f"{_number('nox_mg_per_nm3', inputs.pop('nox_mg_per_nm3'))} mg/Nm3 at {_number('nox_reference_o2_pct', o2)} % O2"
        _merge(doc, {"engine": {"nox": value}})
        keywords["engine.nox"] = "nox_mg_per_nm3"
    elif "nox_reference_o2_pct" in inputs:
        raise TypeError("nox_reference_o2_pct goes with nox_mg_per_nm3")
    unknown = [k for k in inputs if k not in KEYWORDS]
    if unknown:
        import difflib

        hints = []
        for k in unknown:
            close = difflib.get_close_matches(k, list(KEYWORDS) + ["nox_mg_per_nm3"], n=1)
            hints.append(f"{k}" + (f" (closest: {close[0]})" if close else ""))
        raise TypeError("unknown keyword argument(s): " + ", ".join(hints) +
                        "; acidload.KEYWORDS lists them all")
    for k, v in inputs.items():
        path, unit = KEYWORDS[k]
        node = doc
        for p in path[:-1]:
            node = node.setdefault(p, {})
            if not isinstance(node, dict):
                raise TypeError(f"{k} sets {'.'.join(path)}, but {p} is not a map")
        node[path[-1]] = _value(k, v, unit)
        keywords[".".join(path)] = k
    if base_file is None:
        doc.setdefault("format-version", _core.CASE_FORMAT_VERSION)
        return _load_dict(doc, base_dir, keywords, overlays=overlays)
    if "variants" in doc:
        raise TypeError("variants= cannot be added over a case file (an overlay holds no variants)")
    doc["format-version"] = _core.CASE_FORMAT_VERSION
    return _load_dict(doc, base_dir, keywords, base=base_file, overlays=overlays)


def _engine_case(case_or_variant: Union[Case, Variant], variant: Optional[str]) -> "_core.EngineCase":
    if isinstance(case_or_variant, Variant):
        if variant is not None and variant != case_or_variant.name:
            raise KeyError(f"variant={variant!r} given with the variant {case_or_variant.name!r}")
        return case_or_variant._engine_case
    if isinstance(case_or_variant, Case):
        return case_or_variant.variant(variant)._engine_case
    raise TypeError(f"expected an acidload.Case or acidload.Variant, not {type(case_or_variant).__name__}")
