"""Scrubber beds and cost arithmetic through the Python bindings, against independent libraries:
- SciPy (solve_ivp, quad): the logistic breakthrough as the solution of dF/dphi = beta F (1 - F), and
  the bed loading as the quadrature of (1 - F);
- periodictable (its own element table): the stoichiometric capacities of Fe2O3 and NaOH;
- numpy-financial (its own pmt): the capital recovery factor, CRF = -pmt(i, n, 1).
With CI=true a missing library fails the test (conftest.need).
"""
import math

import pytest

from conftest import need, need_acidload


@pytest.mark.reference(quantity="Thomas breakthrough F(phi), 3 widths", tolerance="rel 1e-8 (abs 1e-12)", unit="-",
                       source="SciPy solve_ivp of dF/dphi = beta F (1 - F)")
def test_breakthrough_solves_the_logistic_equation():
    acidload = need_acidload()
    integrate = need("scipy.integrate")
    for width in (0.1, 0.2, 0.6):
        beta = acidload.scrubber.thomas_steepness(width)
        f0 = 1 / (1 + math.exp(beta))  # F at phi = 0
        phis = [0.2 * i for i in range(1, 9)]
        sol = integrate.solve_ivp(lambda _p, f: beta * f * (1 - f), (0, phis[-1]), [f0], t_eval=phis,
                                  method="DOP853", rtol=1e-12, atol=1e-30)
        assert sol.success
        for phi, ref in zip(phis, sol.y[0]):
            assert acidload.scrubber.breakthrough_share(phi, beta) == pytest.approx(ref, rel=1e-8, abs=1e-12)


@pytest.mark.reference(quantity="Thomas bed loading G(phi)", tolerance="rel 1e-10", unit="-",
                       source="SciPy quad of 1 - F")
def test_loading_is_the_integral_of_what_the_bed_keeps():
    acidload = need_acidload()
    integrate = need("scipy.integrate")
    for width in (0.1, 0.35, 1.0):
        beta = acidload.scrubber.thomas_steepness(width)
        for phi in (0.25, 0.9, 1.0, 1.6):
            ref, _ = integrate.quad(lambda p: 1 - acidload.scrubber.breakthrough_share(p, beta), 0, phi,
                                    epsabs=1e-14, epsrel=1e-13, limit=200)
            assert acidload.scrubber.captured_share(phi, beta) == pytest.approx(ref, rel=1e-10)


@pytest.mark.reference(quantity="Fe2O3 and NaOH stoichiometric capacities", tolerance="rel 2e-4",
                       unit="kg/kg", source="periodictable")
def test_stoichiometric_capacities_against_periodictable():
    acidload = need_acidload()
    pt = need("periodictable")
    s = pt.S.mass
    # Fe2O3 + 3 H2S -> Fe2S3 + 3 H2O; the core uses IUPAC 2007 S (32.065) and conventional Fe 55.845
    assert acidload.scrubber.iron_oxide_theoretical_capacity() == pytest.approx(3 * s / pt.formula("Fe2O3").mass, rel=2e-4)
    # H2S + 2 NaOH -> Na2S + 2 H2O
    assert acidload.scrubber.caustic_per_sulfur() == pytest.approx(2 * pt.formula("NaOH").mass / s, rel=2e-4)


@pytest.mark.reference(quantity="capital recovery factor, 0-20 %, 1-40 years", tolerance="rel 1e-12",
                       unit="1/year", source="numpy-financial pmt")
def test_capital_recovery_factor_against_numpy_financial():
    acidload = need_acidload()
    npf = need("numpy_financial")
    for rate in (0.0, 0.01, 0.06, 0.1, 0.2):
        for life in (1, 5, 15, 40):
            ref = -npf.pmt(rate, life, 1.0)  # the payment that repays 1 over `life` periods at `rate`
            assert acidload.economics.capital_recovery_factor(rate, life) == pytest.approx(ref, rel=1e-12)
