"""Reference values of the two functions the oil balance's closed forms are built on, from mpmath at 60
digits or more (an independent arbitrary-precision library): E(x) = (e^x - 1)/x and phi2(x) = (x - 1 + e^-x)/x^2,
at the points the C++ reference test (tests/reference/test_oil_balance.cpp, "E and phi2 against mpmath")
checks. With the digits raised for tiny x the direct forms' cancellation costs nothing. Run it to print the table the test
holds; tests/python/test_series_table.py holds the test's table to this output.
Usage: python3 series_table.py"""
import mpmath

# every argument exact in binary: 0, the hourly range, both sides of the switch at 2^-6 and at 0.1, far out
BASE = [1e-300, 1e-12, 1e-8, 1e-5, 1.2e-4, 3.1e-4, 7.7e-4, 0.0009765625, 0.0023, 0.0061, 0.0078125, 0.011,
        0.015624999999999998, 0.015625, 0.0157, 0.02, 0.05, 0.09999999999999999, 0.1, 0.3, 1.0, 4.0, 30.0]
POINTS = [0.0] + [s * x for x in BASE for s in (1, -1)]


def e_of(x):
    x = mpmath.mpf(x)
    return mpmath.mpf(1) if x == 0 else mpmath.expm1(x) / x


def phi2_of(x):
    if x == 0:
        return mpmath.mpf(1) / 2
    # the numerator is about x^2/2: carry 2·|log10 x| more digits than the answer needs
    with mpmath.workdps(60 + 2 * max(0, int(-mpmath.log10(abs(x))))):
        x = mpmath.mpf(x)
        return +((x - 1 + mpmath.exp(-x)) / (x * x))


def table():
    mpmath.mp.dps = 60
    return [(repr(x), mpmath.nstr(e_of(x), 22, min_fixed=1, max_fixed=0), mpmath.nstr(phi2_of(x), 22, min_fixed=1, max_fixed=0))
            for x in POINTS]


def lines():
    return [f"    {{{x}, {e}, {p}}}," for x, e, p in table()]


if __name__ == "__main__":
    print("\n".join(lines()))
