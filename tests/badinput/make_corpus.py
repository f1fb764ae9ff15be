"""Writes the bad-input corpus: each case file carries its expectation in its first line,
'# expect: LINE:COL | message fragment' (LINE:COL of the error, 1-based; checked by run.py).
Positions were worked out by hand from the text below. Run once; the files are committed."""
import pathlib

here = pathlib.Path(__file__).parent / "cases"
here.mkdir(exist_ok=True)

HEAD = "format-version: 1\n"
FUEL = "fuel:\n  composition: {CH4: 55 %, CO2: 45 %}\n  h2s: 300 ppmv\n"
ENGINE = "engine:\n  power: 1 MW\n  electrical-efficiency: 40 %\n"
OIL = "oil:\n  volume: 600 L\n"

cases = {
    # name: (text after the expectation line, "LINE:COL", fragment)
    "unknown-top-key": (HEAD + FUEL + ENGINE + OIL + "engin:\n  power: 1 MW\n", "11:1", "closest: 'engine'"),
    "misspelt-fuel-key": (HEAD + "fuel:\n  composition: {CH4: 55 %, CO2: 45 %}\n  h2z: 300 ppmv\n" + ENGINE + OIL, "5:3", "closest: 'h2s'"),
    "wrong-unit-kind": (HEAD + FUEL + "engine:\n  power: 600 L\n  electrical-efficiency: 40 %\n" + OIL, "7:10", "W, kW, MW"),
    "unknown-unit": (HEAD + "fuel:\n  composition: {CH4: 55 %, CO2: 45 %}\n  h2s: 300 ppmw\n" + ENGINE + OIL, "5:8", "ppmv"),
    "missing-unit": (HEAD + FUEL + ENGINE + "  jacket-water-out: 90\n" + OIL, "9:21", "degC"),
    "negative-volume": (HEAD + FUEL + ENGINE + "oil:\n  volume: -600 L\n", "10:11", "from 0.001 to 100"),
    "nan-value": (HEAD + FUEL + ENGINE + "oil:\n  volume: .nan L\n", "10:11", "volume"),
    "huge-number": (HEAD + FUEL + ENGINE + "oil:\n  volume: 1e400 L\n", "10:11", "volume"),
    "fraction-over-one": (HEAD + FUEL + "engine:\n  power: 1 MW\n  electrical-efficiency: 140 %\n" + OIL, "8:26", "5 to 60 %"),
    "below-absolute-zero": (HEAD + FUEL + ENGINE + "  jacket-water-out: -300 degC\n" + OIL, "9:21", "absolute zero"),
    "jacket-too-hot": (HEAD + FUEL + ENGINE + "  jacket-water-out: 180 degC\n" + OIL, "9:21", "0 to 150 degC"),
    "no-format-version": (FUEL + ENGINE + OIL, "1:1", "format-version"),
    "future-format-version": ("format-version: 7\n" + FUEL + ENGINE + OIL, "2:17", "newer acidload"),
    "no-fuel-section": (HEAD + ENGINE + OIL, "2:1", "'fuel' section"),
    "no-oil-volume": (HEAD + FUEL + ENGINE + "oil:\n  fresh-tbn: 6 mg KOH/g\n", "10:3", "oil volume"),
    "no-efficiency": (HEAD + FUEL + "engine:\n  power: 1 MW\n" + OIL, "7:3", "electrical-efficiency"),
    "power-and-load": (HEAD + FUEL + "engine:\n  rated-power: 1 MW\n  power: 1 MW\n  load: 80 %\n  electrical-efficiency: 40 %\n" + OIL, "9:9", "not both"),
    "composition-sum": (HEAD + "fuel:\n  composition: {CH4: 55 %, CO2: 25 %}\n" + ENGINE + OIL, "4:16", "summing to 100"),
    "unknown-species": (HEAD + "fuel:\n  composition: {CH4: 55 %, CO2: 44 %, NH3: 1 %}\n" + ENGINE + OIL, "4:39", "CH4, CO2"),
    "unknown-halocarbon": (HEAD + FUEL + "  halocarbons:\n    unobtainium: 5 mg/Nm3\n" + ENGINE + OIL, "7:18", "halocarbon"),
    "rich-combustion": (HEAD + FUEL + ENGINE + "  excess-air-ratio: 0.9\n" + OIL, "9:21", "1 to 4"),
    "bad-method": (HEAD + FUEL + ENGINE + OIL + "  tbn-method: D664\n", "11:15", "D2896, D4739"),
    "bad-makeup-word": (HEAD + FUEL + ENGINE + OIL + "  makeup: sometimes\n", "11:11", "continuous, top-ups"),
    "variant-unknown-key": (HEAD + FUEL + ENGINE + OIL + "variants:\n  - name: hot\n    engine:\n      jacket-water: 98 degC\n", "14:7", "closest: 'jacket-water-out'"),
    "variant-no-name": (HEAD + FUEL + ENGINE + OIL + "variants:\n  - engine:\n      jacket-water-out: 98 degC\n", "12:5", "'name'"),
    "variant-duplicate-name": (HEAD + FUEL + ENGINE + OIL + "variants:\n  - name: a\n    oil: {fresh-tbn: 9 mg KOH/g}\n  - name: a\n    oil: {fresh-tbn: 7 mg KOH/g}\n", "14:11", "not used before"),
    "variant-bad-value": (HEAD + FUEL + ENGINE + OIL + "variants:\n  - name: sour\n    fuel:\n      h2s: lots\n", "14:12", "concentration"),
    "nox-bad-form": (HEAD + FUEL + ENGINE + "  nox: 500 mg/Nm3\n" + OIL, "9:8", "at <number> % O2"),
    "limits-ignore-unknown": (HEAD + FUEL + ENGINE + OIL + "limits:\n  ignore: [tbn, san]\n", "12:12", "tbn-fall"),
    "missing-csv": (HEAD + FUEL + ENGINE + OIL + "record:\n  file: no-such-record.csv\n", "12:9", "CSV"),
    "csv-bad-cell": (HEAD + FUEL + ENGINE + OIL + "record:\n  file: ../csv/bad-cell.csv\n", "bad-cell.csv:4:8", "concentration"),
    "csv-ragged-row": (HEAD + FUEL + ENGINE + OIL + "record:\n  file: ../csv/ragged-row.csv\n", "ragged-row.csv:3:", "cells"),
    "csv-unknown-column": (HEAD + FUEL + ENGINE + OIL + "record:\n  file: ../csv/unknown-column.csv\n", "unknown-column.csv:1:1", "closest: 'h2s'"),
    "csv-no-hours": (HEAD + FUEL + ENGINE + OIL + "record:\n  file: ../csv/no-hours.csv\n", "no-hours.csv:2:1", "running hours"),
    "segment-partial-drain-no-amount": (HEAD + FUEL + ENGINE + OIL + "record:\n  segments:\n    - {hours: 500 h}\n    - {hours: 500 h, event: partial-drain}\n", "14:29", "event-amount"),
    "duplicate-key": (HEAD + FUEL + ENGINE + OIL + "  volume: 700 L\n", "11:3", "duplicate key 'volume'"),
    "duplicate-section": (HEAD + FUEL + ENGINE + OIL + "engine:\n  power: 2 MW\n", "11:1", "duplicate key 'engine'"),
    "syntax-unclosed-flow": (HEAD + "fuel:\n  composition: {CH4: 55 %, CO2: 45 %\n  h2s: 300 ppmv\n" + ENGINE + OIL, "5:6", "end of map flow"),
    "syntax-bad-indent": (HEAD + "fuel:\n  composition:\n    CH4: 55 %\n   CO2: 45 %\n" + ENGINE + OIL, "6:4", "end of map not found"),
    "tabs": (HEAD + "fuel:\n\tcomposition: {CH4: 55 %, CO2: 45 %}\n" + ENGINE + OIL, "4:13", "valid YAML"),
    "not-a-map": ("- just\n- a list\n", "1:1", "a case"),
    "empty-file": ("", "1:1", "empty"),
    "too-deep": (HEAD + "fuel:\n  composition: " + "[" * 40 + "]" * 40 + "\n" + ENGINE + OIL, "4:38", "at most 24 levels"),
    "anchor-alias": (HEAD + FUEL + "engine: &e\n  power: 1 MW\n  electrical-efficiency: 40 %\n" + OIL + "variants:\n  - name: x\n    engine: *e\n", "6:9", "anchors and aliases"),
}

# Site files (docs/case-format.md, "Sites"): the shared sections above, then `site`; line 11 is `site:`.
SITE = "site:\n  engines:\n    - name: a\n"
cases.update({
    "site-engine-own-fuel": (HEAD + FUEL + ENGINE + OIL + SITE + "      fuel: {h2s: 5 ppmv}\n", "14:13", "one gas supply"),
    "site-engine-name-twice": (HEAD + FUEL + ENGINE + OIL + SITE + "    - name: a\n", "14:13", "not used before"),
    "site-engine-shared-price": (HEAD + FUEL + ENGINE + OIL + SITE + "      economics: {carbon-price: 3 per kg}\n", "14:33",
                                 "the train's prices and the currency are the site's"),
    "site-engine-record-gas": (HEAD + FUEL + ENGINE + OIL + SITE + "      record:\n        segments:\n          - {hours: 100 h, h2s: 3 ppmv}\n",
                               "16:33", "no gas figures in an engine's record"),
    "site-record-past-gas-record": (HEAD + FUEL + ENGINE + OIL + "site:\n  gas-record: {segments: [{hours: 100 h}]}\n  engines:\n"
                                    "    - name: a\n", "14:7", "no longer than the site's gas record"),
    "site-top-level-record": (HEAD + FUEL + ENGINE + OIL + "record: {segments: [{hours: 10 h}]}\n" + SITE, "11:9", "each engine's record"),
    "site-without-engines": (HEAD + FUEL + ENGINE + OIL + "site:\n  name: x\n", "12:3", "the site's 'engines'"),
    "site-misspelt-key": (HEAD + FUEL + ENGINE + OIL + "site:\n  engins: []\n", "12:3", "closest: 'engines'"),
    "site-gas-negative-hours": (HEAD + FUEL + ENGINE + OIL + "site:\n  gas-record: {segments: [{hours: -5 h}]}\n  engines: [{name: a}]\n",
                                "12:35", "from 0 to 1e+06 h"),
    "site-with-variants": (HEAD + FUEL + ENGINE + OIL + "variants: []\n" + SITE, "11:11", "no 'variants' in a site file"),
    "site-engine-without-power": (HEAD + FUEL + "engine:\n  rated-power: 1 MW\n  electrical-efficiency: 40 %\n" + OIL + SITE, "7:3",
                                  "for the site's engine 'a'"),
    "site-engine-not-a-map": (HEAD + FUEL + ENGINE + OIL + "site:\n  engines:\n    - engine 1\n", "13:7", "keys of site.engines[0]"),
})

for name, (text, loc, frag) in cases.items():
    (here / f"{name}.yaml").write_text(f"# expect: {loc} | {frag}\n" + text)

csv = here.parent / "csv"
csv.mkdir(exist_ok=True)
(csv / "bad-cell.csv").write_text("# a record with one bad cell (invented data)\nhours [h],h2s [ppmv]\n500,300\n500,   lots\n")
(csv / "ragged-row.csv").write_text("hours [h],h2s [ppmv]\n500,300\n500,300,7\n")
(csv / "unknown-column.csv").write_text("hours [h],h2z [ppmv]\n500,300\n")
(csv / "no-hours.csv").write_text("h2s [ppmv]\n300\n")
print(len(cases), "cases")
