"""acidload's exact oil balance against an independent SciPy integration of the same model.

Reference: tests/reference/python/oil_reference.py — the balance of docs/model.md §8 written as ODEs in the
concentrations and integrated by scipy.integrate.solve_ivp (DOP853, rtol 1e-12) with events for the
floor crossing (b = b_min) and the clearing of free acid (s = 0); it does not call acidload.
Tolerance 1e-7 relative (the integrator is good to about 1e-10; 1e-7 is the bar the C++ Odeint
reference uses too), with a floor of 0.01 mg KOH/g (0.01 A/cm) for states that pass through zero.
The rates and oils below are invented test inputs, not measurements.
"""
import sys

import pytest

from conftest import ROOT, need, need_acidload

sys.path.insert(0, str(ROOT / "tests" / "reference" / "python"))

REL = 1e-7
FIELDS = ("mass", "base", "strong_acid", "weak_acid", "salts", "oxidation", "nitration", "additive_acidity", "antioxidant")
SOURCE = "SciPy solve_ivp reference (tests/reference/python/oil_reference.py)"


def reference():
    need("scipy")
    import oil_reference

    return oil_reference


def assert_states_close(lib, ref, where):
    for f in FIELDS:
        a, b = getattr(lib, f), getattr(ref, f)
        scale = max(abs(b), 0.01)
        assert abs(a - b) <= REL * scale, f"{where}: {f}: acidload {a!r}, {SOURCE} {b!r}"


def make_oil(acidload):
    props = acidload.oil.OilProperties()
    props.fresh_tbn = 6.0          # D2896, weak base 0.6 → reactive base 5.4 mg KOH/g
    props.additive_depletion = 2e-4
    return props


def constants_of(ref, props):
    # from the oil's definition (oil.hpp): b_fresh = fresh TBN − weak base of its method
    return ref.Constants(fresh_base=props.fresh_tbn - props.weak_base_d2896, base_floor=props.base_floor,
                         fresh_additive=props.fresh_tan, additive_depletion=props.additive_depletion,
                         organic_neutralised_share=props.organic_neutralised_share)


def rates_pair(acidload, ref, strong, so2, continuous=True, consumption=0.2):
    values = dict(strong_acid=strong, sulfurous_fresh=so2, nitration=2.1, oxidation=0.007,
                  organic_acid=0.08 * 0.007, consumption=consumption, continuous_makeup=continuous)
    lib = acidload.oil.OilRates()
    for k, v in values.items():
        setattr(lib, k, v)
    return lib, ref.Rates(**values)


@pytest.mark.reference(quantity="oil balance: floor crossing, SAN build-up and recovery", tolerance="rel 1e-7", unit="mg KOH/g", source="SciPy solve_ivp reference (tests/reference/python)")
def test_continuous_makeup_floor_crossing_san_build_up_and_recovery():
    acidload = need_acidload()
    ref = reference()
    props = make_oil(acidload)
    k_lib = acidload.oil.balance_constants(props)
    k_ref = constants_of(ref, props)
    lib = acidload.oil.fresh_oil(props, 528.0)
    state = ref.State(mass=528.0, base=k_ref.fresh_base, additive_acidity=k_ref.fresh_additive)
    ledger = acidload.oil.OilLedger()
    elapsed, lib_cross, ref_cross, lib_clear, ref_clear = 0.0, None, None, None, None
    san_peak = 0.0
    for hours, strong, so2 in ((400, 4.0, 0.5),    # heavy acid: the base falls
                               (600, 4.0, 0.5),    # reaches the floor inside; SAN builds up
                               (1500, 0.3, 0.1),   # scrubber fitted: SAN neutralised, base recovers
                               (300, 0.8, 0.1)):   # acid just under the makeup base
        r_lib, r_ref = rates_pair(acidload, ref, strong, so2)
        lib, out = acidload.oil.advance(lib, k_lib, r_lib, hours, ledger)
        res = ref.integrate(r_ref, k_ref, state, hours)
        state = res.state
        if out.floor_reached_at >= 0 and lib_cross is None:
            lib_cross = elapsed + out.floor_reached_at
        if res.floor_crossings and ref_cross is None:
            ref_cross = elapsed + res.floor_crossings[0]
        if out.acid_cleared_at >= 0 and lib_clear is None:
            lib_clear = elapsed + out.acid_cleared_at
        if res.acid_cleared and ref_clear is None:
            ref_clear = elapsed + res.acid_cleared[0]
        elapsed += hours
        san_peak = max(san_peak, lib.strong_acid)
        assert_states_close(lib, state, f"after {elapsed} h")
    assert lib_cross is not None and ref_cross is not None
    assert abs(lib_cross - ref_cross) <= REL * ref_cross, f"floor crossing: acidload {lib_cross}, {SOURCE} {ref_cross}"
    assert lib_clear is not None and ref_clear is not None
    assert abs(lib_clear - ref_clear) <= REL * ref_clear, f"acid cleared: acidload {lib_clear}, {SOURCE} {ref_clear}"
    assert san_peak > 1.0, "the run must build up free strong acid (SAN) to test that regime"


@pytest.mark.reference(quantity="oil balance: discrete top-ups, floor, SAN", tolerance="rel 1e-7", unit="mg KOH/g", source="SciPy solve_ivp reference")
def test_discrete_top_ups_falling_level_floor_and_san():
    acidload = need_acidload()
    ref = reference()
    props = make_oil(acidload)
    k_lib = acidload.oil.balance_constants(props)
    k_ref = constants_of(ref, props)
    lib = acidload.oil.fresh_oil(props, 528.0)
    state = ref.State(mass=528.0, base=k_ref.fresh_base, additive_acidity=k_ref.fresh_additive)
    ledger = acidload.oil.OilLedger()
    r_lib, r_ref = rates_pair(acidload, ref, 4.0, 0.6, continuous=False, consumption=0.25)
    lib_cross = ref_cross = None
    elapsed = 0.0
    for i in range(8):
        lib, out = acidload.oil.advance(lib, k_lib, r_lib, 150.0, ledger)
        res = ref.integrate(r_ref, k_ref, state, 150.0)
        state = res.state
        if out.floor_reached_at >= 0 and lib_cross is None:
            lib_cross = elapsed + out.floor_reached_at
        if res.floor_crossings and ref_cross is None:
            ref_cross = elapsed + res.floor_crossings[0]
        elapsed += 150.0
        assert_states_close(lib, state, f"before top-up {i}")
        added = 528.0 - lib.mass
        lib = acidload.oil.top_up(lib, props, added, ledger)
        state = ref.add_fresh_oil(state, k_ref, added)
        assert_states_close(lib, state, f"after top-up {i}")
    assert lib_cross is not None and abs(lib_cross - ref_cross) <= REL * ref_cross, (lib_cross, ref_cross)
    assert lib.strong_acid > 0, "free strong acid must remain between top-ups"


@pytest.mark.reference(quantity="oil balance: free acid cleared, organic-limited floor", tolerance="rel 1e-7", unit="mg KOH/g", source="SciPy solve_ivp reference")
def test_free_acid_cleared_into_the_organic_acid_limited_floor():
    acidload = need_acidload()
    ref = reference()
    props = make_oil(acidload)
    k_lib = acidload.oil.balance_constants(props)
    k_ref = constants_of(ref, props)
    start = dict(mass=528.0, base=1.0, strong_acid=2.0, weak_acid=0.4, salts=4.0, oxidation=12.0, nitration=9.0,
                 additive_acidity=0.5)
    lib = acidload.oil.OilState(**start)
    # makeup base 0.2 kg/h × 4.4 = 0.88 g KOH/h: above R = 0.8, below R + φ_B·r_w·M = 0.948
    r_lib, r_ref = rates_pair(acidload, ref, 0.8, 0.1)
    lib, out = acidload.oil.advance(lib, k_lib, r_lib, 12000.0, acidload.oil.OilLedger())
    res = ref.integrate(r_ref, k_ref, ref.State(**start), 12000.0)
    assert res.regimes == [ref.FLOOR_ACID, ref.FLOOR_WEAK]
    assert out.end_regime == acidload.oil.Regime.floor_weak
    assert len(res.acid_cleared) == 1
    assert abs(out.acid_cleared_at - res.acid_cleared[0]) <= REL * res.acid_cleared[0], \
        f"acid cleared: acidload {out.acid_cleared_at}, {SOURCE} {res.acid_cleared[0]}"
    assert_states_close(lib, res.state, "after 12000 h")


@pytest.mark.reference(quantity="demo trajectory point by point", tolerance="rel 1e-7", unit="mg KOH/g", source="SciPy solve_ivp reference")
def test_demo_case_trajectory_with_floor_crossing_and_san():
    """The demo case's 'raw gas' variant (invented data) from the Python run, point by point against the
    reference integrated with the variant's own rates (the rates are the input here: the check is of
    the oil balance and the readings). Oil constants from cases/demo-site.yaml and the documented
    defaults of docs/case-format.md."""
    acidload = need_acidload()
    ref = reference()
    np = need("numpy")
    v = acidload.run(acidload.load_case(ROOT / "cases" / "demo-site.yaml"))["raw gas"]
    tr = v.trajectory
    assert v.summary["floor-reached-at-h"] is not None and tr["san"].max() > 0.1
    # demo oil: 720 L at 880 kg/m3; fresh TBN 6.0 by D2896 (weak base 0.6 by default), TAN 1.5;
    # defaults: base floor 1.0, k_d 2e-4 1/h, φ_B 50 %, β 20 %, D4739 weak base 0
    k_ref = ref.Constants(fresh_base=5.4, base_floor=1.0, fresh_additive=1.5, additive_depletion=2e-4,
                          organic_neutralised_share=0.5)
    beta = 0.2
    state = ref.State(mass=720e-3 * 880, base=5.4, additive_acidity=1.5)
    rates = dict(v.rates)  # k_A and m come with the rates (k_A from the oxidation law: docs/model.md §16)
    hours = tr["oil_hours"]
    assert np.all(tr["charge"] == 1) and np.all(np.diff(hours) > 0)
    crossings = []
    for i in range(1, len(hours)):
        res = ref.integrate(rates, k_ref, state, hours[i] - hours[i - 1])
        crossings += [hours[i - 1] + t for t in res.floor_crossings]
        state = res.state
        tbn_d4739 = state.base                      # b + weak base of D4739 (0)
        tan = state.additive_acidity + state.weak_acid + state.strong_acid + beta * state.salts  # oil.hpp: tan()
        for name, lib, want in (("tbn_d4739", tr["tbn_d4739"][i], tbn_d4739), ("tan", tr["tan"][i], tan),
                                ("san", tr["san"][i], state.strong_acid), ("oxidation", tr["oxidation"][i], state.oxidation),
                                ("nitration", tr["nitration"][i], state.nitration),
                                ("antioxidant", tr["antioxidant"][i], state.antioxidant)):
            assert abs(lib - want) <= REL * max(abs(want), 0.01), \
                f"{name} at {hours[i]} h: acidload {lib}, {SOURCE} {want}"
    assert len(crossings) == 1
    floor = v.summary["floor-reached-at-h"]
    assert abs(floor - crossings[0]) <= REL * crossings[0], f"floor: acidload {floor}, {SOURCE} {crossings[0]}"
