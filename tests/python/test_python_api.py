"""The Python package's API: inputs (keywords, file, YAML text, dict), results (numpy, dicts, pandas),
errors, sweeps with the GIL released, inverse answers, version, stubs.

Most checks here are consistency checks of one route into the library against another (a dict
against the file it came from, a sweep against single runs): acidload against acidload, so they are
not reference checks — those are in test_reference_libraries.py and test_oil_reference.py. Sources
named beside the others. Cases under cases/ and tests/ are invented data.
"""
import ast
import json
import pathlib
import re
import subprocess
import threading
import time

import pytest

from conftest import ROOT, acidload_program, need, need_acidload

DEMO = ROOT / "cases" / "demo-site.yaml"
MINIMAL = ROOT / "tests" / "cases" / "format-v1" / "minimal.yaml"


def without_file(summary):
    s = dict(summary)
    s.pop("case-file")
    return s


# ---- version --------------------------------------------------------------------------------------

def test_one_version_for_cmake_program_and_package():
    acidload = need_acidload()
    cmake = re.search(r"project\(acidload\s+VERSION\s+([0-9.]+)", (ROOT / "CMakeLists.txt").read_text()).group(1)
    assert acidload.__version__ == cmake  # source: project(VERSION) in CMakeLists.txt
    out = subprocess.run([str(acidload_program()), "--version"], capture_output=True, text=True, timeout=60)
    assert out.returncode == 0 and acidload.__version__ in out.stdout, out.stdout  # source: the program


# ---- inputs ---------------------------------------------------------------------------------------

def test_case_file_text_and_dict_give_the_same_case():
    acidload = need_acidload()
    yaml = need("yaml")
    from_file = acidload.run(acidload.load_case(DEMO)).summary
    text = DEMO.read_text(encoding="utf-8")
    from_text = acidload.run(acidload.load_case_text(text, file_name="demo.yaml")).summary
    from_dict = acidload.run(acidload.case_from_dict(yaml.safe_load(text))).summary
    assert from_text["case-file"] == "demo.yaml" and from_dict["case-file"] == "<dict>"
    assert without_file(from_text) == without_file(from_file)
    assert without_file(from_dict) == without_file(from_file)
    # variant names as the file writes them (PyYAML reading the same file)
    data = yaml.safe_load(text)
    assert acidload.load_case(DEMO).names == [data["base-name"]] + [v["name"] for v in data["variants"]]


def test_dicts_are_written_as_yaml_that_pyyaml_reads_back():
    acidload = need_acidload()
    yaml = need("yaml")
    from acidload import _yaml

    for path in sorted((ROOT / "cases").glob("*.yaml")) + sorted((ROOT / "tests" / "cases").rglob("*.yaml")):
        data = yaml.safe_load(path.read_text(encoding="utf-8"))
        assert yaml.safe_load(_yaml.dump(data)) == data, path.name  # PyYAML (an independent YAML parser)
    odd = {"a": [], "b": {}, "c": [[1, 2], [3]], "d": [{"x": 1.5, "y": [True, None]}, "z"],
           "quote": 'it"s: {x} # not a comment', "key with space": -0.25, "π": "ü"}
    assert yaml.safe_load(_yaml.dump(odd)) == odd


def test_dict_with_a_record_csv_resolves_it_against_base_dir():
    acidload = need_acidload()
    yaml = need("yaml")
    path = ROOT / "cases" / "drifting-gas.yaml"
    data = yaml.safe_load(path.read_text(encoding="utf-8"))
    a = acidload.run(acidload.load_case(path)).summary
    b = acidload.run(acidload.case_from_dict(data, base_dir=path.parent)).summary
    assert without_file(a) == without_file(b)


def test_keyword_arguments_equal_the_case_file_they_spell():
    acidload = need_acidload()
    # tests/cases/format-v1/minimal.yaml, key by key, as keyword arguments
    kw = acidload.case(ch4_pct=55, co2_pct=45, h2s_ppmv=200, power_kw=800, electrical_efficiency_pct=39,
                       oil_volume_l=500)
    assert without_file(acidload.run(kw).summary) == without_file(acidload.run(acidload.load_case(MINIMAL)).summary)
    # the example keywords, with everything else a case needs
    c = acidload.case(h2s_ppmv=300, oil_volume_l=600, jacket_water_out_c=90, ch4_pct=55, co2_pct=45, power_kw=1000,
                      electrical_efficiency_pct=40, nox_mg_per_nm3=500, model={"so3-share": "2 %"},
                      limits={"max-hours": "6000 h"})
    text = """format-version: 1
fuel: {composition: {CH4: 55 %, CO2: 45 %}, h2s: 300 ppmv}
engine: {power: 1000 kW, electrical-efficiency: 40 %, jacket-water-out: 90 degC, nox: 500 mg/Nm3 at 5 % O2}
oil: {volume: 600 L}
model: {so3-share: 2 %}
limits: {max-hours: 6000 h}
"""
    assert without_file(acidload.run(c).summary) == without_file(acidload.run(acidload.load_case_text(text)).summary)


def test_keyword_arguments_over_a_case_file_act_on_every_variant():
    acidload = need_acidload()
    base = acidload.run(acidload.load_case(DEMO))
    over = acidload.run(acidload.case(DEMO, h2s_ppmv=50))
    # the base now has the H2S of the demo's 'iron oxide to 50 ppmv' variant (same file, same reader)
    a, b = over["raw gas"].summary, base["iron oxide to 50 ppmv"].summary
    a, b = dict(a, name=None), dict(b, name=None)
    assert a == b
    # variants that set their own H2S keep it
    assert over["iron oxide + carbon to 10 ppmv"].summary == base["iron oxide + carbon to 10 ppmv"].summary
    assert over.summary["case-file"] == str(DEMO)


def test_every_keyword_names_a_key_of_the_case_format():
    acidload = need_acidload()
    for name, (path, unit) in acidload.KEYWORDS.items():
        section = "" if len(path) == 1 else path[0]
        keys = acidload._core.section_keys(section)
        assert path[0 if len(path) == 1 else 1] in keys or path[1] == "composition", (name, path)
        if unit is not None:  # the unit is written into the name (docs/case-format.md, "Units by kind")
            suffix = {"%": "_pct", "degC": "_c", "kW": "_kw", "kPa": "_kpa", "L": "_l", "h": "_h", "ppmv": "_ppmv",
                      "mg/Nm3": "_mg_per_nm3", "mg KOH/g": "_mg_koh_per_g", "g/kWh": "_g_per_kwh",
                      "kg/m3": "_kg_per_m3", "Nm3/h": "_nm3_per_h", "A/cm": "_a_per_cm"}[unit]
            assert name.endswith(suffix), (name, unit)


def test_unknown_keyword_is_a_type_error_naming_the_closest():
    acidload = need_acidload()
    with pytest.raises(TypeError, match="h2s_ppmv"):
        acidload.case(DEMO, h2s_ppm=50)


# ---- errors ---------------------------------------------------------------------------------------

def test_file_errors_carry_file_line_column_and_the_programs_message():
    acidload = need_acidload()
    program = acidload_program()
    corpus = sorted((ROOT / "tests" / "badinput" / "cases").glob("*.yaml"))
    assert len(corpus) >= 40
    positioned = 0
    for path in corpus:
        site = "\nsite:" in path.read_text(encoding="utf-8", errors="replace")  # a site file: acidload.Site reads it
        with pytest.raises(acidload.Error) as info:
            (acidload.Site if site else acidload.load_case)(path)
        e = info.value
        assert isinstance(e, ValueError)
        r = subprocess.run([str(program), "check", str(path)], capture_output=True, text=True, timeout=60)
        assert r.returncode == 3, (path.name, r.stderr)
        message = r.stderr.strip()
        prefix = {acidload.NotModelledError: "acidload: not modelled: ",
                  acidload.NoAnswerError: "acidload: no answer: "}.get(type(e), "acidload: ")
        assert message == prefix + str(e).strip(), f"{path.name}: Python {str(e)!r}, program {message!r}"
        if isinstance(e, acidload.InputError) and e.line is not None:
            positioned += 1
            assert e.file is not None and e.column >= 1 and e.key
            assert f"{pathlib.Path(e.file).name}:{e.line}:{e.column}:" in str(e)
    assert positioned >= 35


def test_text_error_attributes():
    acidload = need_acidload()
    text = "format-version: 1\nfuel:\n  composition: {CH4: 55 %, CO2: 45 %}\n  h2s: lots\nengine: {power: 1 MW}\noil: {volume: 600 L}\n"
    with pytest.raises(acidload.InputError) as info:
        acidload.load_case_text(text, file_name="site.yaml")
    e = info.value
    assert (e.file, e.line, e.column, e.key, e.value) == ("site.yaml", 4, 8, "fuel.h2s", "lots")
    assert e.expected.startswith("a concentration") and e.line_text == "  h2s: lots"
    assert str(e).startswith("site.yaml:4:8: 'fuel.h2s' = 'lots': expected a concentration")


def test_dict_and_keyword_errors_carry_the_key_path():
    acidload = need_acidload()
    d = {"fuel": {"composition": {"CH4": "55 %", "CO2": "45 %"}},
         "engine": {"power": "1 MW", "electrical-efficiency": "40 %"},
         "oil": {"volume": "600 L"},
         "variants": [{"name": "hot", "engine": {"jacket-water-out": "500 degC"}}]}
    with pytest.raises(acidload.InputError) as info:
        acidload.case_from_dict(d)
    e = info.value
    assert e.key == "variants[0].engine.jacket-water-out" and e.value == "500 degC"
    assert e.file is None and e.line is None and e.column is None and e.line_text is None
    assert str(e) == f"'{e.key}' = '500 degC': expected {e.expected}"
    with pytest.raises(acidload.InputError) as info:
        acidload.case(DEMO, oil_volume_l=-5)
    e = info.value
    assert (e.key, e.keyword, e.file) == ("oil.volume", "oil_volume_l", None)
    assert "from the keyword argument oil_volume_l" in str(e)
    with pytest.raises(ValueError):  # the same hierarchy
        acidload.case(ch4_pct=55, co2_pct=45, power_kw=800, electrical_efficiency_pct=39, oil_volume_l=500,
                      excess_air_ratio=0.8)
    with pytest.raises(acidload.InputError) as info:
        acidload.molar_mass("C2H(")
    assert info.value.file is None


# ---- results --------------------------------------------------------------------------------------

def test_results_are_arrays_and_dicts():
    acidload = need_acidload()
    np = need("numpy")
    result = acidload.run(acidload.load_case(DEMO))
    assert isinstance(result.summary, dict) and len(result.summary["variants"]) == 6
    v = result["raw gas"]
    t = v.trajectory
    assert set(t) == set(acidload.TRAJECTORY_UNITS)
    n = len(t["tan"])
    for k, a in t.items():
        assert isinstance(a, np.ndarray) and a.shape == (n,) and not a.flags.writeable, k
    assert t["tan"].dtype == np.float64 and t["charge"].dtype.kind == "i"
    assert v.drain_interval_h == v.summary["drain-interval-h"] and v.limit_reached == "tbn-fall"
    # 'tbn' is read by the limits' method (the demo's limits: D4739)
    assert np.array_equal(t["tbn"], t["tbn_d4739"])
    # the readings from the states (oil.hpp: TBN = b + weak base; SAN = s)
    assert np.allclose(t["tbn_d2896"], t["base"] + 0.6, rtol=0, atol=1e-12)
    assert np.array_equal(t["san"], t["strong_acid"])
    long = result.trajectory
    assert len(long["variant"]) == sum(len(x.trajectory["tan"]) for x in result)
    assert list(dict.fromkeys(long["variant"])) == result.names


def test_trajectory_arrays_equal_the_csv_the_program_writes():
    acidload = need_acidload()
    np = need("numpy")
    result = acidload.run(acidload.load_case(DEMO))
    lines = result.trajectories_csv().splitlines()
    header = lines[0].split(",")
    rows = [l.split(",") for l in lines[1:]]
    col = {h: i for i, h in enumerate(header)}
    t = result.trajectory
    for name, key in (("tan_mg_koh_per_g", "tan"), ("san_mg_koh_per_g", "san"), ("oil_hours_h", "oil_hours"),
                      ("tbn_d4739_mg_koh_per_g", "tbn_d4739"), ("oil_mass_kg", "oil_mass"),
                      ("antioxidant_remaining_pct_of_fresh", "antioxidant_remaining"),
                      ("viscosity_change_100c_pct", "viscosity_change")):
        csv = np.array([float(r[col[name]]) for r in rows])
        assert np.allclose(t[key], csv, rtol=1e-9, atol=1e-12), name  # the CSV has 10 significant digits
    # the percentage columns are the shares in percent; a fresh charge (oil hours 0) has all its
    # antioxidant and its own viscosity (by the definitions of docs/model.md §16 and §17.1)
    assert np.allclose(t["antioxidant_remaining"], 100 * t["antioxidant"], rtol=1e-15)
    assert np.allclose(t["viscosity_change"], 100 * t["viscosity_rise"], rtol=1e-15)
    fresh = (t["oil_hours"] == 0) & (t["charge"] == 1)  # the first charge starts fresh; later ones keep a residual
    assert fresh.any()
    assert np.all(t["antioxidant_remaining"][fresh] == 100) and np.all(t["viscosity_change"][fresh] == 0)
    assert acidload.TRAJECTORY_UNITS["antioxidant_remaining"] == "% of fresh"


def test_to_dataframe_with_pandas():
    acidload = need_acidload()
    pd = need("pandas")
    result = acidload.run(acidload.load_case(DEMO))
    df = result.to_dataframe()
    assert isinstance(df, pd.DataFrame) and list(df.columns) == ["variant"] + list(acidload.TRAJECTORY_UNITS)
    assert len(df) == len(result.trajectory["tan"])
    one = result["TBN 9 oil"].to_dataframe()
    assert one["tan"].to_numpy().tolist() == result["TBN 9 oil"].trajectory["tan"].tolist()
    table = result.summary_table()
    assert list(table.index) == result.names
    assert table.loc["raw gas", "drain_interval_h"] == result["raw gas"].drain_interval_h


def test_result_write_equals_program_folder(tmp_path):
    acidload = need_acidload()
    case = acidload.load_case(str(DEMO))
    acidload.run(case).write(tmp_path / "py")
    r = subprocess.run([str(acidload_program()), "run", str(DEMO), "--out", str(tmp_path / "prog")],
                       capture_output=True, text=True, timeout=300)
    assert r.returncode == 0, r.stderr
    for f in ("summary.json", "trajectories.csv"):
        assert (tmp_path / "py" / f).read_bytes() == (tmp_path / "prog" / f).read_bytes(), f


# ---- sweeps and inverse answers --------------------------------------------------------------------

def test_sweeps_equal_single_runs_and_the_variants():
    acidload = need_acidload()
    np = need("numpy")
    case = acidload.load_case(DEMO)
    res = acidload.run(case)
    h2s = np.array([300.0, 50.0, 150.0, 600.0])
    swept = acidload.drain_interval(case, h2s_ppmv=h2s)
    assert swept.shape == h2s.shape and swept.dtype == np.float64
    # consistency: the variants of the demo file set the same levers through the case reader
    assert swept[0] == pytest.approx(res["raw gas"].drain_interval_h, rel=1e-9)
    # 50 ppmv: the antioxidant reserve, not the acid, ends the charge
    assert swept[1] == pytest.approx(res["iron oxide to 50 ppmv"].drain_interval_h, rel=1e-9)
    assert res["iron oxide to 50 ppmv"].limit_reached == "antioxidant"
    assert acidload.drain_interval(case, jacket_water_out_c=98) == pytest.approx(
        res["jacket water 98 degC"].drain_interval_h, rel=1e-9)
    assert acidload.drain_interval(case, fresh_tbn_mg_koh_per_g=[9.0])[0] == pytest.approx(
        res["TBN 9 oil"].drain_interval_h, rel=1e-9)
    # and a sweep over the reader's own input (H2S through the file, power and efficiency kept)
    for v, d in zip(h2s[2:], swept[2:]):
        single = acidload.run(acidload.case(DEMO, h2s_ppmv=float(v)))["raw gas"].drain_interval_h
        assert d == pytest.approx(single, rel=1e-7), v
    vols = np.array([[400.0, 720.0], [1000.0, 1500.0]])
    by_volume = acidload.drain_interval(case, oil_volume_l=vols)
    assert by_volume.shape == (2, 2)
    assert by_volume[0, 1] == pytest.approx(res["raw gas"].drain_interval_h, rel=1e-9)
    for v, d in zip(vols.ravel(), by_volume.ravel()):
        assert d == pytest.approx(acidload.drain_interval(acidload.case(DEMO, oil_volume_l=float(v))), rel=1e-9)
    assert np.all(np.diff(acidload.drain_interval(case, h2s_ppmv=np.linspace(100, 900, 9))) < 0)
    assert isinstance(acidload.drain_interval(case, h2s_ppmv=300), float)


def test_sweep_value_out_of_range_names_the_element():
    acidload = need_acidload()
    with pytest.raises(acidload.InputError, match="element 2 of the sweep"):
        acidload.drain_interval(acidload.load_case(DEMO), h2s_ppmv=[10, 20, -5])


def test_sweep_releases_the_gil():
    acidload = need_acidload()
    np = need("numpy")
    case = acidload.load_case(DEMO)

    def sweep(values):
        done = {}

        def work():
            done["out"] = acidload.drain_interval(case, h2s_ppmv=values)

        start = time.perf_counter()
        t = threading.Thread(target=work)
        t.start()
        ticks = 0
        while t.is_alive():  # Python work on this thread while the sweep runs: possible only without the GIL
            ticks += 1
            time.sleep(0.001)
        t.join()
        assert done["out"].shape == values.shape
        return time.perf_counter() - start, ticks

    # long enough to tell on any machine: the sweep grows until it takes a quarter of a second
    values = np.tile(np.linspace(100, 900, 50), 200)  # 10000 runs in C++
    for _ in range(6):
        elapsed, ticks = sweep(values)
        if elapsed > 0.25:
            break
        values = np.tile(values, 4)
    assert elapsed > 0.25, "the sweep is too short to tell"
    assert ticks >= 20, f"the main thread ran {ticks} times during a {elapsed:.2f} s sweep: the GIL was held"


def test_solve_for_interval_answers_as_the_program():
    acidload = need_acidload()
    case = acidload.load_case(DEMO)
    a = acidload.solve_for_interval(case, target_h=1500, h2s_ppmv=(0, 800))
    assert a.found and a.interval_at_value_h == pytest.approx(1500, rel=1e-6)
    assert acidload.drain_interval(case, h2s_ppmv=a.value) == pytest.approx(1500, rel=1e-5)
    r = subprocess.run([str(acidload_program()), "solve", str(DEMO), "--for", "h2s", "--target", "1500 h", "--range",
                        "0 ppmv", "800 ppmv"], capture_output=True, text=True, timeout=300)
    assert r.returncode == 0, r.stderr
    # the program prints three significant figures and the root beside them (6 significant figures)
    shown = float(re.search(r"answer: ([0-9.]+) ppmv", r.stdout).group(1))
    program_answer = float(re.search(r"root ([0-9.eE+-]+)\)", r.stdout).group(1))
    assert a.value == pytest.approx(program_answer, rel=1e-5)
    assert shown == pytest.approx(a.value, rel=5e-3)
    # a larger charge dilutes the acid but is refreshed less by makeup: keep to the rising side
    b = acidload.solve_for_interval(case, target_h=1200, oil_volume_l=(300, 900))
    assert b.found and b.unit == "L"
    assert acidload.drain_interval(case, oil_volume_l=b.value) == pytest.approx(1200, rel=1e-5)
    c = acidload.solve_for_interval(case, target_h=1500, jacket_water_out_c=(60, 120))
    assert c.found and 60 <= c.value <= 120
    none = acidload.solve_for_interval(case, target_h=1500, h2s_ppmv=(400, 800))
    assert not none.found and none.value is None and none.reason


# ---- the package's face -----------------------------------------------------------------------------

def test_all_names_exist_and_have_docstrings():
    acidload = need_acidload()
    for name in acidload.__all__:
        obj = getattr(acidload, name)
        if callable(obj) and not isinstance(obj, type) or isinstance(obj, type):
            assert obj.__doc__, name
    for sub in (acidload.water, acidload.so3, acidload.oil):
        for name in sub.__all__:
            assert getattr(sub, name).__doc__, f"{sub.__name__}.{name}"
    for name in dir(acidload._core):
        obj = getattr(acidload._core, name)
        if callable(obj) and not name.startswith("_"):
            assert obj.__doc__, f"_core.{name}"


def test_type_stubs_cover_the_module():
    acidload = need_acidload()
    pkg = pathlib.Path(acidload.__file__).parent
    assert (pkg / "py.typed").exists()
    stub = ast.parse((pkg / "_core.pyi").read_text(encoding="utf-8"))
    declared = {n.name for n in stub.body if isinstance(n, (ast.FunctionDef, ast.ClassDef))}
    declared |= {t.id for n in stub.body if isinstance(n, ast.AnnAssign) for t in [n.target]}
    public = {n for n in dir(acidload._core) if not n.startswith("_")}
    assert public <= declared, f"not in _core.pyi: {sorted(public - declared)}"
