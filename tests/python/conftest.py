"""Shared settings of the pytest suite. With CI=true a missing reference library fails the test
instead of skipping it, so that CI can never pass by skipping a check."""
import importlib
import os
import pathlib

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]


def need(module: str):
    """Imports a reference library; skips the test without it, or fails under CI=true."""
    try:
        return importlib.import_module(module)
    except ImportError:
        if os.environ.get("CI", "").lower() == "true":
            pytest.fail(f"reference library '{module}' is missing (CI=true: missing libraries fail)")
        pytest.skip(f"reference library '{module}' is not installed")


@pytest.fixture
def root():
    return ROOT


def need_acidload():
    """Imports the acidload Python package: as installed or on PYTHONPATH (scripts/test sets it to
    build/python), else from a CMake build folder's python/ (build, then build-py). Skips without it,
    or fails under CI=true, like need()."""
    try:
        return importlib.import_module("acidload")
    except ImportError:
        pass
    import sys

    for folder in ("build", "build-py"):
        candidate = ROOT / folder / "python"
        if (candidate / "acidload" / "__init__.py").exists() and list((candidate / "acidload").glob("_core*")):
            sys.path.insert(0, str(candidate))
            break
    return need("acidload")


def demo_site_base():
    """The demo site's case (cases/demo-site.yaml) without its record, variants, uncertainty and run
    sections, for a test to give its own."""
    keep, skip = [], False
    for line in (ROOT / "cases" / "demo-site.yaml").read_text().splitlines():
        if line and not line.startswith((" ", "#")):
            skip = line.split(":")[0] in ("record", "variants", "uncertainty", "run")
        if not skip:
            keep.append(line)
    return "\n".join(keep)


def acidload_program():
    """The acidload program to compare with: $ACIDLOAD_PROGRAM (scripts/test sets it), else the CMake
    build's. Skips without it, or fails under CI=true."""
    path = os.environ.get("ACIDLOAD_PROGRAM")
    candidates = [pathlib.Path(path)] if path else [ROOT / f / "bindings" / "cli" / "acidload" for f in ("build", "build-py")]
    for c in candidates:
        if c.is_file() and os.access(c, os.X_OK):
            return c
    if os.environ.get("CI", "").lower() == "true":
        pytest.fail(f"the acidload program is missing (looked for {', '.join(map(str, candidates))})")
    pytest.skip("the acidload program is not built")


# ---- the validation table: tests marked reference(...) add a row when ACIDLOAD_VALIDATION_TSV is set
def pytest_configure(config):
    config.addinivalue_line("markers", "reference(quantity, tolerance, unit, source): a check against a library or "
                                       "published value, listed in the validation table")


@pytest.hookimpl(hookwrapper=True)
def pytest_runtest_makereport(item, call):
    outcome = yield
    rep = outcome.get_result()
    mark = item.get_closest_marker("reference")
    path = os.environ.get("ACIDLOAD_VALIDATION_TSV")
    if mark is None or rep.when != "call" or not path:
        return
    k = mark.kwargs
    with open(path, "a", encoding="utf-8") as f:
        f.write("\t".join(["Python", k["quantity"], "every point of the test", k.get("expected", "(library values)"),
                           k["tolerance"], k.get("unit", ""), k["source"], "pass" if rep.passed else "FAIL"]) + "\n")
