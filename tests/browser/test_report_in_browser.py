"""The report page in a real browser: Debian's chromium, headless, driven by Playwright for Python.

For each shipped case the page must load with no console error and no request leaving the file, every
plot must render (a drawn, non-empty SVG with its title and both axis labels), and printing it to PDF
must give A4 pages with every section and figure caption on them. Screenshots and PDFs are kept in
build/browser/ for a person to look at. Run by scripts/test; needs the acidload program (built) and
/usr/bin/chromium (scripts/setup installs it)."""
from __future__ import annotations

import os
import pathlib
import re
import shutil
import subprocess
import time

import pytest

ROOT = pathlib.Path(__file__).resolve().parents[2]
OUT = ROOT / "build" / "browser"
CHROMIUM = "/usr/bin/chromium"

# (name, case, lab, the sections the page must have)
CASES = [
    ("demo-site", "cases/demo-site.yaml", None),
    ("demo-site-history", "cases/demo-site-history.yaml", "cases/demo-site-lab.csv"),
    ("drifting-gas", "cases/drifting-gas.yaml", None),
    ("demo-site-costs", "cases/demo-site-costs.yaml", None),
]
SECTIONS = ["Cautions", "Comparison of the variants", "Oil condition against oil hours", "Drain interval against H2S",
            "Acid into the oil by species", "The case as understood", "What the model assumes", "Version and input files"]


def _strict() -> bool:
    return os.environ.get("CI", "").lower() == "true"


def _program() -> pathlib.Path:
    path = os.environ.get("ACIDLOAD_PROGRAM")
    p = pathlib.Path(path) if path else ROOT / "build" / "bindings" / "cli" / "acidload"
    if not (p.is_file() and os.access(p, os.X_OK)):
        (pytest.fail if _strict() else pytest.skip)(f"the acidload program is not built ({p})")
    return p


@pytest.fixture(scope="module")
def browser():
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        (pytest.fail if _strict() else pytest.skip)("playwright is not installed (scripts/setup installs it)")
    if not os.access(CHROMIUM, os.X_OK):
        (pytest.fail if _strict() else pytest.skip)(f"{CHROMIUM} is missing (scripts/setup installs Debian's chromium)")
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=["--no-sandbox"])
        yield b
        b.close()


def _make_report(name: str, case: str, lab: str | None) -> pathlib.Path:
    OUT.mkdir(parents=True, exist_ok=True)
    out = OUT / f"{name}.html"
    cmd = [str(_program()), "report", str(ROOT / case), "--out", str(out)]
    if lab:
        cmd += ["--lab", str(ROOT / lab)]
    r = subprocess.run(cmd, capture_output=True, text=True, timeout=300)
    assert r.returncode == 0, r.stderr
    return out


def _open(browser, path: pathlib.Path):
    """Opens the page with every request routed: the file itself passes, anything else is refused and
    recorded. Returns the page, the refused requests, the console errors and the load time [s]."""
    page = browser.new_page(viewport={"width": 1000, "height": 1300})
    refused: list[str] = []
    errors: list[str] = []
    me = path.resolve().as_uri()

    def route(r):
        if r.request.url == me:
            r.continue_()
        else:
            refused.append(r.request.url)
            r.abort()

    page.route("**/*", route)
    page.on("console", lambda m: errors.append(f"{m.type}: {m.text}") if m.type in ("error", "warning") else None)
    page.on("pageerror", lambda e: errors.append(f"page error: {e}"))
    page.on("requestfailed", lambda r: None if r.url in refused else errors.append(f"request failed: {r.url}"))
    start = time.perf_counter()
    page.goto(me, wait_until="load")
    seconds = time.perf_counter() - start
    return page, refused, errors, seconds


@pytest.mark.parametrize("name,case,lab", CASES, ids=[c[0] for c in CASES])
def test_page_loads_offline_and_every_plot_renders(browser, name, case, lab):
    path = _make_report(name, case, lab)
    page, refused, errors, seconds = _open(browser, path)
    print(f"\n{name}: {path.stat().st_size / 1024:.0f} kB, loaded in {seconds * 1000:.0f} ms")
    assert refused == [], f"requests left the file: {refused}"
    assert errors == [], f"console: {errors}"
    assert page.evaluate("document.scripts.length") == 0  # nothing to run: it reads without scripts
    headings = page.eval_on_selector_all("h2", "hs => hs.map(h => h.textContent)")
    for s in SECTIONS:
        assert any(s in h for h in headings), f"no section '{s}' in {headings}"
    if lab:
        assert any("Lab results" in h for h in headings)
    if "costs" in case:
        assert any("Cost per MWh against the scrubbing level" in h for h in headings), headings
    charts = page.eval_on_selector_all("svg.chart", """svgs => svgs.map(s => {
        const r = s.getBoundingClientRect();
        const drawn = [...s.querySelectorAll('path.series, rect.bar, g.points > *')]
            .map(e => e.getBBox()).filter(b => b.width > 0 || b.height > 0).length;
        const text = sel => [...s.querySelectorAll(sel)].map(t => t.textContent.trim()).filter(t => t);
        return {id: s.id, width: r.width, height: r.height, drawn,
                title: (s.querySelector('title') || {}).textContent || '',
                desc: (s.querySelector('desc') || {}).textContent || '',
                x: text('text.x-label'), y: text('text.y-label'), ticks: text('text.tick').length,
                // the browser's own boxes of every horizontal text (the rotated y label left out)
                boxes: [...s.querySelectorAll('text:not([transform])')].map(t => {
                    const b = t.getBBox();
                    return {t: t.textContent, l: b.x, r: b.x + b.width, top: b.y, bottom: b.y + b.height};
                })};
    })""")
    # TBN, TAN, SAN, oxidation, viscosity, antioxidant, H2S, acids (+ the lab readings, + the costs)
    expected = 8 + (4 if lab else 0) + (1 if "costs" in case else 0)
    assert len(charts) >= expected - (1 if lab else 0), [c["id"] for c in charts]
    for c in charts:
        assert c["width"] > 300 and c["height"] > 150, c
        assert c["drawn"] > 0, f"{c['id']}: nothing drawn"
        assert c["title"] and c["desc"], f"{c['id']}: no text alternative"
        assert c["x"] and c["y"], f"{c['id']}: axis labels missing"
        assert c["ticks"] >= 4, f"{c['id']}: too few tick labels"
        # no two labels overlap as drawn (1 px of slack for glyph boxes that merely touch)
        b = c["boxes"]
        for i in range(len(b)):
            for j in range(i + 1, len(b)):
                p, q = b[i], b[j]
                apart = p["r"] <= q["l"] + 1 or q["r"] <= p["l"] + 1 or p["bottom"] <= q["top"] + 1 or q["bottom"] <= p["top"] + 1
                assert apart, f"{c['id']}: '{p['t']}' overlaps '{q['t']}'"
    ids = [c["id"] for c in charts]
    for must in ["chart-viscosity", "chart-antioxidant"] + (["chart-costs"] if "costs" in case else []):
        assert must in ids, ids
    # tables: every header cell has a scope
    assert page.evaluate("[...document.querySelectorAll('th')].every(t => t.hasAttribute('scope'))")
    page.screenshot(path=str(OUT / f"{name}.png"), full_page=True)
    page.close()


def _pdf_pages(pdf: pathlib.Path) -> list[str]:
    """The text of each page, by poppler's pdftotext (form feed between pages)."""
    text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    pages = text.split("\f")
    return pages[:-1] if pages and not pages[-1].strip() else pages


@pytest.mark.parametrize("name,case,lab,pages", [c + (p,) for c, p in zip(CASES, [(7, 9), (8, 10), (6, 8), (7, 9)])],
                         ids=[c[0] for c in CASES])
def test_prints_on_a4_with_every_figure(browser, name, case, lab, pages):
    if not shutil.which("pdfinfo"):
        (pytest.fail if _strict() else pytest.skip)("pdfinfo is missing (scripts/setup installs poppler-utils)")
    path = _make_report(name, case, lab)
    page, refused, errors, _ = _open(browser, path)
    pdf = OUT / f"{name}.pdf"
    page.emulate_media(media="print")
    page.pdf(path=str(pdf), prefer_css_page_size=True, print_background=True)
    page.close()
    assert refused == [] and errors == []
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    count = int(re.search(r"^Pages:\s+(\d+)", info, re.M).group(1))
    size = re.search(r"^Page size:\s+([\d.]+) x ([\d.]+) pts", info, re.M)
    print(f"\n{name}: {count} A4 pages")
    # A4 is 210 mm x 297 mm = 595.28 pt x 841.89 pt (ISO 216)
    assert abs(float(size.group(1)) - 595.28) < 1 and abs(float(size.group(2)) - 841.89) < 1, info
    low, high = pages
    assert low <= count <= high, f"{count} pages, expected {low} to {high}"
    texts = _pdf_pages(pdf)
    assert len(texts) == count
    whole = "\n".join(texts)
    for s in SECTIONS:
        assert s in whole, f"'{s}' not printed"
    captions = re.findall(r"Figure (\d+)\.", whole)
    n = int(max(captions, key=int))
    assert sorted(set(map(int, captions))) == list(range(1, n + 1))
    assert "Cautions" in texts[0], "the cautions are not on the first page"
