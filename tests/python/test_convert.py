"""acidload.convert and acidload.convert_figure take the units the program takes: both read them with
the case reader's one C++ parser (io/quantity.cpp), so a spelling the program's `convert` accepts is
accepted from Python with the same value, and one it refuses is refused."""
import re
import subprocess

import pytest

from conftest import ROOT, acidload_program, need_acidload

CASE = ROOT / "cases" / "demo-site.yaml"
# every spelling of a contaminant unit the format documents (docs/case-format.md), with and without a basis
SPELLINGS = ["ppmv", "ppm", "ppmv dry", "ppmv wet", "ppm wet", "mg/Nm3", "mg/m3", "mg/Nm3 dry", "mg/Nm3 wet", "mg/m3 wet",
             "mg/Nm³", "mg/MJ", "mg/kWh", "mg/Nm3 CH4", "mg/m3 CH4", "mol/h"]
REFUSED = ["mg/Nm3 CH4 wet", "ppb", "mg", "mg Cl/Nm3", "g/Nm3", "mg/MJ dry", ""]


def program_figure(figure, species="H2S"):
    """The program's `convert` for the demo case: (exit code, ppmv dry of the first row or None)."""
    r = subprocess.run([str(acidload_program()), "convert", figure, "--case", str(CASE), "--as", species],
                       capture_output=True, text=True, timeout=60)
    if r.returncode != 0:
        return r.returncode, None
    first = r.stdout.splitlines()[1]
    return 0, float(re.search(r"([-0-9.eE+]+) ppmv dry", first).group(1))


def gas_arguments(acidload):
    g = acidload.convert_figure("1 ppmv", acidload.load_case(CASE))["gas"]
    return dict(molar_mass_kg_per_mol=acidload.molar_mass("H2S"), reference_temperature_k=g["reference_temperature_k"],
                reference_pressure_pa=g["reference_pressure_pa"], water_fraction=g["water_fraction"],
                methane_fraction=g["methane_fraction"], lhv_j_per_mol=g["lhv_j_per_m3"] * acidload.molar_volume(g["reference_temperature_k"], g["reference_pressure_pa"]),
                flow_mol_per_h=g["flow_mol_per_h"])


@pytest.mark.parametrize("unit", SPELLINGS)
def test_python_takes_every_spelling_the_program_takes_with_the_same_value(unit):
    acidload = need_acidload()
    code, program_ppmv = program_figure(f"40 {unit}")
    assert code == 0, unit
    case = acidload.load_case(CASE)
    row = acidload.convert_figure(f"40 {unit}", case)["rows"][0]
    assert row["ppmv_dry"] == pytest.approx(program_ppmv, rel=1e-4)  # the program prints 5 significant figures
    args = gas_arguments(acidload)  # the demo case's gas, as convert_figure reports it
    got = acidload.convert(40, unit, "ppmv", **args)
    assert got == pytest.approx(row["ppmv_dry"], rel=1e-9), unit


@pytest.mark.parametrize("unit", REFUSED)
def test_python_refuses_what_the_program_refuses(unit):
    acidload = need_acidload()
    code, _ = program_figure(f"40 {unit}".strip())
    assert code in (2, 3), unit
    with pytest.raises(acidload.InputError):
        acidload.convert(40, unit, "ppmv", molar_mass_kg_per_mol=acidload.molar_mass("H2S"), methane_fraction=0.5,
                         lhv_j_per_mol=4e5, flow_mol_per_h=1e4)
    with pytest.raises(acidload.InputError):
        acidload.convert_figure(f"40 {unit}".strip(), acidload.load_case(CASE))


def test_mg_per_nm3_of_methane_as_the_program_writes_it():
    # the example: 'mg/Nm3 CH4' was refused by Python (it took only 'mg/m3 CH4')
    acidload = need_acidload()
    args = dict(molar_mass_kg_per_mol=acidload.molar_mass("H2S"), water_fraction=0.04, methane_fraction=0.55)
    a = acidload.convert(60, "mg/Nm3 CH4", "ppmv", **args)
    assert a == acidload.convert(60, "mg/m3 CH4", "ppmv", **args)
    # by hand: 60 mg per Nm3 of CH4 = 60 × 0.55 mg per Nm3 of wet gas = 33 mg/Nm3 wet; as ppmv wet
    # 33 / (34.081 g/mol) × 22.41397 L/mol = 21.70 ppmv wet; dry: ÷ (1 − 0.04) = 22.61 ppmv
    # (IUPAC standard atomic weights H 1.008, S 32.06 and CODATA 2018 V_m; from memory)
    assert a == pytest.approx(60 * 0.55 / 34.081 * 22.41397 / 0.96, rel=2e-4)


def test_a_basis_in_the_unit_and_one_in_the_argument_must_agree():
    acidload = need_acidload()
    args = dict(molar_mass_kg_per_mol=acidload.molar_mass("H2S"), water_fraction=0.04)
    wet = acidload.convert(100, "ppmv wet", "ppmv", **args)
    assert wet == pytest.approx(100 / 0.96, rel=1e-12)  # x_dry = x_wet / (1 − x_H2O), by definition
    assert acidload.convert(100, "ppmv", "ppmv", from_basis="wet", **args) == wet
    with pytest.raises(acidload.InputError, match="basis"):
        acidload.convert(100, "ppmv wet", "ppmv", from_basis="dry", **args)


def test_convert_figure_is_the_program_s_convert_for_a_case_variant_and_halocarbon():
    acidload = need_acidload()
    case = acidload.load_case(CASE)
    table = acidload.convert_figure("25 mg/Nm3", case, species="C2Cl4")  # tetrachloroethene
    assert [r["what"] for r in table["rows"]] == ["C2Cl4", "as Cl"]
    # as Cl: 4 Cl per molecule, so ppmv of Cl atoms = 4 × ppmv of the compound (stoichiometry)
    assert table["rows"][1]["ppmv_dry"] == pytest.approx(4 * table["rows"][0]["ppmv_dry"], rel=1e-12)
    r = subprocess.run([str(acidload_program()), "convert", "25 mg/Nm3", "--case", str(CASE), "--as", "C2Cl4"],
                       capture_output=True, text=True, timeout=60)
    assert r.returncode == 0
    printed = [float(x) for x in re.findall(r"([-0-9.eE+]+) ppmv dry", r.stdout)]
    assert printed == pytest.approx([row["ppmv_dry"] for row in table["rows"]], rel=1e-4)
    # a Variant and a path work alike
    assert acidload.convert_figure("25 mg/Nm3", case.variant(), species="C2Cl4") == table
    assert acidload.convert_figure("25 mg/Nm3", CASE, species="C2Cl4") == table
    with pytest.raises(acidload.InputError):
        acidload.convert_figure("25 mg/Nm3", case, species="no such gas")
