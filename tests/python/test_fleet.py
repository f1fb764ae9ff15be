"""Fleets: acidload.run_many and monte_carlo_many on threads and on a Dask LocalCluster (two worker
processes), and the pickling that carries a case to a worker.

The check is the one the feature promises: every figure equals the serial run's (acidload.run and
acidload.monte_carlo case by case, in this process), exactly — the same C++ code on the same input,
wherever and in whatever order it runs. The cases are the shipped demo cases (invented data) and
variations of them made here.
"""
import os
import pathlib
import pickle

import pytest

from conftest import ROOT, need, need_acidload

acidload = need_acidload()

DEMO = ROOT / "cases" / "demo-site.yaml"
HISTORY = ROOT / "cases" / "demo-site-history.yaml"


def demo_dict(h2s):
    """The demo case as a dict (PyYAML reads the file), with another H2S in its base."""
    yaml = need("yaml")
    data = yaml.safe_load(DEMO.read_text(encoding="utf-8"))
    data["fuel"]["h2s"] = h2s
    return data


def fleet_cases():
    """Six engines: the demo file, a text case, a dict case, keywords over the file, and two H2S levels."""
    text = DEMO.read_text(encoding="utf-8")
    return [
        str(DEMO),
        acidload.load_case_text(text, file_name="demo-as-text.yaml", base_dir=DEMO.parent),
        demo_dict(h2s="150 ppmv"),
        acidload.case(DEMO, h2s_ppmv=80),
        acidload.case(DEMO, h2s_ppmv=450, oil_volume_l=900),
        acidload.case(h2s_ppmv=300, ch4_pct=55, co2_pct=45, power_kw=1000, electrical_efficiency_pct=40,
                      oil_volume_l=600, jacket_water_out_c=90),
    ]


def serial_summaries(cases):
    out = []
    for c in cases:
        if isinstance(c, str):
            c = acidload.load_case(c)
        elif isinstance(c, dict):
            c = acidload.case_from_dict(c)
        out.append(acidload.run(c).summary)
    return out


@pytest.mark.parametrize("make", [
    lambda: acidload.load_case(DEMO),
    lambda: acidload.load_case_text(DEMO.read_text(encoding="utf-8"), file_name="t.yaml", base_dir=DEMO.parent),
    lambda: acidload.case_from_dict(demo_dict(h2s="200 ppmv")),
    lambda: acidload.case(DEMO, h2s_ppmv=120),
], ids=["file", "text", "dict", "keywords-over-file"])
def test_a_case_pickles_as_its_recipe_and_runs_the_same(make):
    c = make()
    again = pickle.loads(pickle.dumps(c))
    assert again.names == c.names and again.file == c.file
    assert acidload.run(again).summary == acidload.run(c).summary


def test_run_many_on_threads_equals_the_serial_run():
    cases = fleet_cases()
    expected = serial_summaries(cases)
    for threads in (1, 2, 4):
        fleet = acidload.run_many(cases, threads=threads)
        assert [c.summary for c in fleet] == expected, threads
    rows = fleet.rows()
    assert len(rows) == sum(len(s["variants"]) for s in expected)
    assert rows[0]["drain-interval-h"] == expected[0]["variants"][0]["drain-interval-h"]
    shortest = min(v["drain-interval-h"] for s in expected for v in s["variants"])
    assert fleet.summary["shortest-drain-interval"]["drain-interval-h"] == shortest


def test_run_many_takes_a_folder_and_returns_trajectories(tmp_path):
    for name in ("b-engine.yaml", "a-engine.yaml"):
        (tmp_path / name).write_text(DEMO.read_text(encoding="utf-8"), encoding="utf-8")
    (tmp_path / "notes.txt").write_text("not a case", encoding="utf-8")
    fleet = acidload.run_many(tmp_path, trajectories=True)
    assert [pathlib.Path(c.file).name for c in fleet] == ["a-engine.yaml", "b-engine.yaml"]
    single = acidload.run(acidload.load_case(DEMO))
    for c in fleet:
        assert len(c.trajectories) == len(single.names)
        for got, name in zip(c.trajectories, single.names):
            assert (got["tbn"] == single[name].trajectory["tbn"]).all()


def test_run_many_refuses_bad_input_before_running(tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text(DEMO.read_text(encoding="utf-8").replace("format-version", "format-versoin", 1), encoding="utf-8")
    with pytest.raises(acidload.InputError) as e:
        acidload.run_many([str(DEMO), str(bad)])
    assert e.value.file is not None and "bad.yaml" in e.value.file
    empty = tmp_path / "empty"
    empty.mkdir()
    with pytest.raises(acidload.InputError, match="no case files"):
        acidload.run_many(empty)
    for threads in (0, -2, 1.5, True):
        with pytest.raises(acidload.InputError, match="threads"):
            acidload.run_many([str(DEMO)], threads=threads)
    with pytest.raises(TypeError):
        acidload.run_many([42])


def test_monte_carlo_many_equals_each_case_alone():
    cases = [acidload.load_case(HISTORY), acidload.case(HISTORY, h2s_ppmv=150)]
    got = acidload.monte_carlo_many(cases, draws=40, threads=2)
    for c, g in zip(cases, got):
        alone = acidload.monte_carlo(c, draws=40)
        assert (g["drain_interval_h"] == alone["drain_interval_h"]).all()


@pytest.fixture(scope="module")
def dask_client():
    distributed = need("distributed")
    # the workers are new processes: they find acidload where this process found it
    package_parent = str(pathlib.Path(acidload.__file__).resolve().parents[1])
    old = os.environ.get("PYTHONPATH")
    os.environ["PYTHONPATH"] = package_parent + (os.pathsep + old if old else "")
    cluster = distributed.LocalCluster(n_workers=2, processes=True, threads_per_worker=1, dashboard_address=None)
    client = distributed.Client(cluster)
    yield client
    client.close()
    cluster.close()
    if old is None:
        os.environ.pop("PYTHONPATH", None)
    else:
        os.environ["PYTHONPATH"] = old


def test_run_many_on_a_dask_cluster_equals_the_serial_run(dask_client):
    cases = fleet_cases()
    fleet = acidload.run_many(cases, client=dask_client, trajectories=True)
    assert [c.summary for c in fleet] == serial_summaries(cases)
    # the work was done in the worker processes, not here
    assert len(dask_client.scheduler_info()["workers"]) == 2


def test_monte_carlo_many_on_a_dask_cluster_equals_each_case_alone(dask_client):
    cases = [str(HISTORY), acidload.case(HISTORY, h2s_ppmv=150)]
    got = acidload.monte_carlo_many(cases, client=dask_client, draws=30)
    for c, g in zip(cases, got):
        alone = acidload.monte_carlo(acidload.load_case(c) if isinstance(c, str) else c, draws=30)
        assert (g["drain_interval_h"] == alone["drain_interval_h"]).all()
        assert (g["first_san_h"] == alone["first_san_h"]).all()
