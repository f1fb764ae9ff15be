"""The metamorphic properties use the Python suite's helpers (need, need_acidload) from
tests/python/conftest.py."""
import importlib.util
import pathlib

_spec = importlib.util.spec_from_file_location(
    "acidload_python_suite_conftest", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_suite = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_suite)
need = _suite.need
need_acidload = _suite.need_acidload
