"""acidload through its Python bindings against independent reference libraries.

Each check names its source beside it. The libraries are independent implementations or data sets:
- iapws (IAPWS-IF97 implementation by J. J. Gómez Romera): water saturation, region 4;
- periodictable (its own element table, CIAAW conventional atomic weights): formula masses;
- pint (its own unit registry and CODATA 2018 constants): unit and concentration conversions;
- Cantera (NASA 7-coefficient polynomials of its nasa_gas.yaml species file, from the JANAF tables):
  Kp of SO2 + 1/2 O2 = SO3 and an equilibrium computed by Cantera's own solver.
With CI=true a missing library fails the test (conftest.need).
"""
import math

import pytest

from conftest import need, need_acidload


# ---- iapws: IAPWS-IF97 region 4 ------------------------------------------------------------------

@pytest.mark.reference(quantity="p_sat and T_sat, 0-200 degC every 1 K", tolerance="rel 1e-12", unit="Pa, K", source="iapws (IAPWS-IF97)")
def test_water_saturation_0_to_200_degc_against_iapws():
    acidload = need_acidload()
    iapws97 = need("iapws.iapws97")
    for i in range(201):  # every 1 K from 0 to 200 degC
        t = 273.15 + i
        p_ref = iapws97._PSat_T(t) * 1e6  # iapws (IAPWS-IF97 eq. 30) [MPa → Pa]
        p = acidload.water.saturation_pressure(t)
        # same published equation evaluated by two codes: agreement to rounding (1e-12 relative)
        assert p == pytest.approx(p_ref, rel=1e-12), f"p_sat({t} K): acidload {p}, iapws {p_ref}"
        t_ref = iapws97._TSat_P(p_ref / 1e6)  # iapws (IAPWS-IF97 eq. 31)
        t_back = acidload.water.saturation_temperature(p_ref)
        assert t_back == pytest.approx(t_ref, rel=1e-12), f"T_sat({p_ref} Pa): acidload {t_back}, iapws {t_ref}"


def test_water_saturation_outside_region_4_is_an_input_error():
    acidload = need_acidload()
    with pytest.raises(acidload.InputError):
        acidload.water.saturation_pressure(250.0)  # below 273.15 K: outside IF97 region 4 (IAPWS R7-97)
    with pytest.raises(ValueError):  # InputError is a ValueError
        acidload.water.saturation_temperature(30e6)  # above the critical pressure 22.064 MPa (IAPWS R7-97)


# ---- periodictable: formula masses -----------------------------------------------------------------

# Widths of the IUPAC 2011 standard-atomic-weight intervals (Pure Appl. Chem. 83(2), 2011; docs/references.md [IUPAC2011])
# [g/mol]; F and K have single values (PAC 88(3), 2016; uncertainty 6e-9 and 1e-4).
IUPAC_INTERVAL_WIDTH = {"H": 1.00811 - 1.00784, "C": 12.0116 - 12.0096, "N": 14.00728 - 14.00643,
                        "O": 15.99977 - 15.99903, "S": 32.076 - 32.059, "Cl": 35.457 - 35.446,
                        "F": 2 * 6e-9, "K": 2 * 1e-4}
FORMULAS = ["H2S", "SO2", "SO3", "H2SO4", "HCl", "HF", "HNO3", "KOH", "CH4", "CO2", "H2O", "N2", "O2", "COS",
            "CH3SH", "C2H6", "C3H8", "C2Cl4", "C2HCl3", "C2H3Cl", "CH2Cl2", "C6H5Cl", "CCl2F2", "CCl3F", "CHClF2"]


@pytest.mark.reference(quantity="molar masses of 26 formulas", tolerance="IUPAC 2011 interval widths", unit="g/mol", source="periodictable")
def test_formula_masses_against_periodictable():
    acidload = need_acidload()
    periodictable = need("periodictable")
    for f in FORMULAS:
        ref = periodictable.formula(f)  # periodictable's own parser and element table
        mass = acidload.molar_mass(f) * 1e3  # [kg/mol → g/mol]
        # Both tables hold standard atomic weights inside the IUPAC 2011 intervals, so the two masses
        # can differ by at most Σ n·(interval width): that bound is the tolerance.
        bound = sum(n * IUPAC_INTERVAL_WIDTH[str(el)] for el, n in ref.atoms.items())
        assert abs(mass - ref.mass) <= bound, f"{f}: acidload {mass} g/mol, periodictable {ref.mass} (bound {bound})"


def test_parenthesised_formula_against_periodictable():
    acidload = need_acidload()
    periodictable = need("periodictable")
    # propanethiol written two ways: the groups must expand as periodictable expands them
    ref = periodictable.formula("CH3CH2CH2SH").mass  # periodictable (element table)
    a = acidload.molar_mass("CH3(CH2)2SH") * 1e3
    assert abs(a - ref) <= 3 * 0.002 + 8 * 0.00027 + 0.017, (a, ref)  # IUPAC 2011 interval widths, as above
    with pytest.raises(acidload.InputError):
        acidload.molar_mass("C2Xx4")  # no element Xx (periodictable refuses it too)
    with pytest.raises(ValueError):
        periodictable.formula("C2Xx4")


# ---- pint: units ----------------------------------------------------------------------------------

# pint's R is N_A·k exactly (8.31446261815324); acidload's constant is written to 10 digits
# (8.314462618), 1.8e-11 lower: conversions through R agree to 1e-10, the rest to 1e-12.
REL_R = 1e-10


def _pint():
    pint = need("pint")
    return pint.UnitRegistry()


@pytest.mark.reference(quantity="case-file units to core units", tolerance="rel 1e-10", unit="-", source="pint")
def test_case_file_units_against_pint():
    acidload = need_acidload()
    u = _pint()
    Q = u.Quantity
    R = Q(1, "molar_gas_constant")  # pint's CODATA 2018 R
    normal_m3 = (Q(101325, "Pa") * Q(1, "m**3") / (R * Q(273.15, "K"))).to("mol")  # 1 Nm3 [mol] (ideal gas)
    cases = [  # (text, acidload kind, the same quantity in pint, the core unit)
        ("1.2 MW", "power", Q(1.2, "MW"), "W"),
        ("850 kW", "power", Q(850, "kW"), "W"),
        ("600 L", "volume", Q(600, "L"), "m**3"),
        ("90 degC", "temperature", Q(90, "degC"), "K"),           # pint's offset arithmetic for °C
        ("15 K", "temperature_change", Q(15, "delta_degC"), "K"),
        ("0.25 g/kWh", "specific_consumption", Q(0.25, "g/kWh"), "kg/J"),
        ("2 d", "duration", Q(2, "day"), "h"),
        ("45 min", "duration", Q(45, "min"), "h"),
        ("80 mbar", "pressure", Q(80, "mbar"), "Pa"),
        ("1.2 bar", "pressure", Q(1.2, "bar"), "Pa"),
        ("0.88 kg/L", "density", Q(0.88, "kg/L"), "kg/m**3"),
        ("0.9 g/cm3", "density", Q(0.9, "g/cm**3"), "kg/m**3"),
        ("3 A/0.1mm", "oxidation", 3 / Q(0.1, "mm"), "1/cm"),   # absorbance per path length
        ("80 kJ/mol", "molar_energy", Q(80, "kJ/mol"), "J/mol"),
        ("45 %", "fraction", Q(45, "percent"), "dimensionless"),
        ("2 kmol/h", "molar_flow", Q(2, "kmol/h"), "mol/h"),
        ("503 Nm3/h", "molar_flow", 503 * normal_m3 / Q(1, "h"), "mol/h"),
        ("8 Nm3/min", "molar_flow", 8 * normal_m3 / Q(1, "min"), "mol/h"),
        ("5 t", "mass", Q(5, "metric_ton"), "kg"),
    ]
    for text, kind, q, unit in cases:
        got = acidload.parse_quantity(text, kind)
        want = q.to(unit).magnitude  # pint (unit registry)
        assert got == pytest.approx(want, rel=REL_R), f"{text!r} as {kind}: acidload {got}, pint {want} {unit}"


@pytest.mark.reference(quantity="ppmv, mg/Nm3, mg/MJ, mg/Nm3 CH4, mol/h conversions", tolerance="rel 1e-10", unit="-", source="pint")
def test_concentration_conversions_against_pint():
    acidload = need_acidload()
    u = _pint()
    Q = u.Quantity
    R = Q(1, "molar_gas_constant")  # pint: CODATA 2018
    M = acidload.molar_mass("H2S")  # the species' molar mass is an input of both computations [kg/mol]
    x_w, x_ch4, lhv, flow = 0.04, 0.5, 401e3, 22000.0  # invented gas: wet mole fractions, J/mol, mol/h
    for t_ref in (Q(0, "degC"), Q(15, "degC")):  # normal and standard reference states
        T = t_ref.to("K")
        p = Q(101325, "Pa")
        common = dict(molar_mass_kg_per_mol=M, reference_temperature_k=T.magnitude, reference_pressure_pa=101325.0,
                      water_fraction=x_w, methane_fraction=x_ch4, lhv_j_per_mol=lhv, flow_mol_per_h=flow)
        x_dry = Q(300, "ppm")  # pint's ppm: 1e-6, here of moles (ppmv)
        rho_dry = (x_dry * p / (R * T) * Q(M, "kg/mol")).to("mg/m**3").magnitude  # pint: c = x·p·M/(R·T)
        got = acidload.convert(300, "ppmv", "mg/m3", **common)
        assert got == pytest.approx(rho_dry, rel=REL_R), f"ppmv→mg/m3 at {T}: acidload {got}, pint {rho_dry}"
        back = acidload.convert(rho_dry, "mg/m3", "ppmv", **common)
        assert back == pytest.approx(300, rel=REL_R), "mg/m3→ppmv: pint's figure back to 300 ppmv"
        x_wet = x_dry * (1 - x_w)  # a dry-basis fraction on the wet gas (definition of the bases)
        got = acidload.convert(300, "ppmv", "ppmv", to_basis="wet", **common)
        assert got == pytest.approx(x_wet.to("ppm").magnitude, rel=1e-12), "ppmv dry → wet"
        got = acidload.convert(300, "ppmv", "mg/m3", to_basis="wet", **common)
        want = (x_wet * p / (R * T) * Q(M, "kg/mol")).to("mg/m**3").magnitude
        assert got == pytest.approx(want, rel=REL_R), "ppmv dry → mg/m3 wet (pint)"
        got = acidload.convert(300, "ppmv", "mg/MJ", **common)
        want = (x_wet * Q(M, "kg/mol") / Q(lhv, "J/mol")).to("mg/MJ").magnitude  # pint: per MJ of LHV
        assert got == pytest.approx(want, rel=1e-12), f"ppmv → mg/MJ: acidload {got}, pint {want}"
        got = acidload.convert(300, "ppmv", "mg/m3 CH4", **common)
        want = (x_wet * Q(M, "kg/mol") * p / (R * T) / x_ch4).to("mg/m**3").magnitude  # per m3 of methane
        assert got == pytest.approx(want, rel=REL_R), f"ppmv → mg/m3 CH4: acidload {got}, pint {want}"
        got = acidload.convert(300, "ppmv", "mol/h", **common)
        want = (x_wet * Q(flow, "mol/h")).to("mol/h").magnitude
        assert got == pytest.approx(want, rel=1e-12), "ppmv → mol/h (pint)"


def test_h2s_ppm_to_mg_per_m3_at_25_degc_against_pint_and_niosh():
    acidload = need_acidload()
    u = _pint()
    Q = u.Quantity
    M = acidload.molar_mass("H2S")
    got = acidload.convert(1, "ppmv", "mg/m3", molar_mass_kg_per_mol=M, reference_temperature_k=298.15,
                           reference_pressure_pa=101325.0, water_fraction=0, methane_fraction=0, lhv_j_per_mol=0,
                           flow_mol_per_h=0)
    want = (Q(1, "ppm") * Q(1, "atm") / (Q(1, "molar_gas_constant") * Q(25, "degC").to("K"))
            * Q(M, "kg/mol")).to("mg/m**3").magnitude  # pint
    assert got == pytest.approx(want, rel=REL_R)
    assert got == pytest.approx(1.39, abs=0.005)  # NIOSH: 1 ppm ≈ 1.39 mg/m3 at 25 °C (docs/references.md [NIOSH-H2S], derived)


# ---- Cantera: SO2 + 1/2 O2 = SO3 ---------------------------------------------------------------------

def _cantera_species():
    ct = need("cantera")
    # nasa_gas.yaml ships with the Cantera wheel and carries SO3 (gri30.yaml does not)
    species = {s.name: s for s in ct.Species.list_from_file("nasa_gas.yaml")}
    for name in ("SO2", "SO3", "O2", "N2"):
        assert name in species, f"Cantera's nasa_gas.yaml lacks {name}"
    return ct, species


@pytest.mark.reference(quantity="Kp of SO2 + 1/2 O2 = SO3, 500-2000 K", tolerance="rel 1.5e-2", unit="bar^-1/2", source="Cantera nasa_gas.yaml (JANAF 1965 SO3)")
def test_so3_kp_against_cantera_nasa_polynomials():
    acidload = need_acidload()
    ct, sp = _cantera_species()
    R = ct.gas_constant  # [J/(kmol·K)]
    p_ref = sp["SO3"].thermo.reference_pressure  # Cantera's NASA data: 1 atm
    for T in (500, 600, 700, 800, 900, 1000, 1200, 1500, 2000):
        g = {n: sp[n].thermo.h(T) - T * sp[n].thermo.s(T) for n in ("SO2", "SO3", "O2")}  # [J/kmol] at p_ref
        dg_ref = g["SO3"] - g["SO2"] - 0.5 * g["O2"]
        # to acidload's standard pressure of 1 bar: Δn = −1/2, so Kp(bar) = Kp(p_ref)·(1 bar/p_ref)^(1/2)
        kp_ref = math.exp(-dg_ref / (R * T)) * math.sqrt(acidload.so3.STANDARD_PRESSURE_PA / p_ref)
        kp = acidload.so3.kp(T)
        # Cantera's SO3 polynomial is from the 1965 JANAF edition ("J 9/65"), acidload's data from the
        # 1998 edition (Chase): ΔG° differs by up to ~60 J/mol, 0.6–0.8 % in Kp. Tolerance 1.5 %.
        assert kp == pytest.approx(kp_ref, rel=0.015), f"Kp({T} K): acidload {kp}, Cantera nasa_gas.yaml {kp_ref}"
    # Kp ≈ 1.8 bar^-1/2 at 1000 K (docs/references.md [JANAF1998], derived from JANAF data)
    assert acidload.so3.kp(1000.0) == pytest.approx(1.8, rel=0.02)


@pytest.mark.reference(quantity="equilibrium SO3 share", tolerance="rel 1.5e-2 (1 - share)", unit="-", source="Cantera equilibrate")
def test_so3_equilibrium_share_against_cantera_equilibrate():
    acidload = need_acidload()
    ct, sp = _cantera_species()
    gas = ct.Solution(thermo="ideal-gas", species=[sp[n] for n in ("SO2", "SO3", "O2", "N2")])
    for T, x_o2 in ((700.0, 0.10), (900.0, 0.10), (1100.0, 0.05)):
        gas.TPX = T, ct.one_atm, {"N2": 1 - x_o2 - 1e-5, "O2": x_o2, "SO2": 1e-5}
        gas.equilibrate("TP")  # Cantera's element-potential solver
        share_ref = gas["SO3"].X[0] / (gas["SO2"].X[0] + gas["SO3"].X[0])
        share = acidload.so3.equilibrium_so3_share(T, x_o2, ct.one_atm)
        # the same 1.5 % tolerance on Kp allows (1 − share)·1.5 % on the share
        assert share == pytest.approx(share_ref, rel=0.015 * (1 - share_ref) + 1e-6), \
            f"SO3 share at {T} K: acidload {share}, Cantera equilibrate {share_ref}"
