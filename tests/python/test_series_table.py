"""The table of E(x) = (e^x - 1)/x and phi2(x) = (x - 1 + e^-x)/x^2 that the C++ reference test
"E and phi2 against mpmath" (tests/reference/test_oil_balance.cpp) holds acidload's series to is
mpmath's: recomputed here by tests/reference/python/series_table.py (mpmath at 60 digits or more) and
compared line by line, so the table cannot drift from its source."""
import sys

from conftest import ROOT, need

sys.path.insert(0, str(ROOT / "tests" / "reference" / "python"))


def test_cpp_table_is_mpmath_output():
    need("mpmath")
    import series_table

    text = (ROOT / "tests" / "reference" / "test_oil_balance.cpp").read_text()
    held = text.split("// series-table:begin\n")[1].split("    // series-table:end")[0].rstrip("\n").split("\n")
    assert held == series_table.lines()


def test_table_spans_both_switches():
    # the points straddle the series' switches at 2^-6 and 0.1 on both sides of zero
    need("mpmath")
    import series_table

    xs = series_table.POINTS
    for edge in (2.0**-6, 0.1):
        for sign in (1, -1):
            assert any(sign * x < edge and sign * x > 0.9 * edge for x in xs)
            assert sign * edge in xs
