"""Every citation in the repository points at something the repository contains.

Checks every tracked (and new, not ignored) text file:
- no mention of a design document the repository does not carry (the names are assembled below, so
  this file does not cite them itself);
- every ``docs/…`` path and every ``*.md`` file named exists in the repository;
- every ``docs/model.md §N`` (and every ``§N`` inside docs/model.md) is a section of docs/model.md;
- a ``§`` anywhere else follows ``docs/model.md`` on its line (or is the text of a Markdown link to
  docs/model.md), or belongs to an outside standard listed in OUTSIDE_SECTIONS;
- every ``docs/references.md [VB1974]``-style key (and every such key inside docs/) is an entry of
  docs/references.md;
- relative Markdown links in docs/, README.md and DEVELOPERS.md resolve.
Needs neither the build nor the acidload module.
"""
import os
import re
import subprocess
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
MODEL = ROOT / "docs" / "model.md"
REFERENCES = ROOT / "docs" / "references.md"

# Names of documents that are not part of the repository (assembled so that this file does not match).
FORBIDDEN = [
    re.compile(r"\b" + "MO" + r"DEL(\.md)?\s*§"),
    re.compile("MO" + r"DEL\.md"),
    re.compile("BUILD" + "-NOTES"),
    re.compile("REFER" + r"ENCES\.md"),
    re.compile("ARCHI" + r"TECTURE\.md"),
    re.compile(r"\.\./" + "shared"),
    re.compile("/work/" + "shared"),
]
# Outside documents whose own sections a line may cite with § (the source named on the same line).
OUTSIDE_SECTIONS = [re.compile(r"TA Luft( 2002)?,? §\d")]
# Paths acidload writes when it runs; a file may mention them without the repository holding them.
GENERATED = ("build/", "build-py/", "out/")
SKIP_PREFIXES = ("tests/fuzz/corpus/",)

SECTION = re.compile(r"§\s?(\d+(?:\.\d+)*)")
KEY = re.compile(r"\[([A-Za-z][A-Za-z0-9]*(?:-[A-Za-z0-9]+)*)\](?!\()")


def repository_files():
    try:
        out = subprocess.run(["git", "ls-files", "--cached", "--others", "--exclude-standard", "-z"], cwd=ROOT,
                             check=True, capture_output=True).stdout.decode()
        names = [n for n in out.split("\0") if n]
    except (OSError, subprocess.CalledProcessError):  # a source tree without git: walk it
        names = [str(p.relative_to(ROOT)) for p in ROOT.rglob("*") if p.is_file()
                 and not any(part in (".git", "build", "build-py", "out") for part in p.relative_to(ROOT).parts)]
    return sorted(n for n in names if (ROOT / n).is_file() and not n.startswith(SKIP_PREFIXES))


def text_files():
    this = Path(__file__).resolve().relative_to(ROOT).as_posix()  # it names the patterns, not documents
    for name in repository_files():
        if name == this:
            continue
        try:
            text = (ROOT / name).read_text(encoding="utf-8")
        except (UnicodeDecodeError, OSError):
            continue  # binary
        if "\0" in text:
            continue
        yield name, text


def model_sections():
    sections = set()
    for line in MODEL.read_text(encoding="utf-8").splitlines():
        m = re.match(r"#{2,4}\s+(\d+(?:\.\d+)*)\.?\s", line)
        if m:
            sections.add(m.group(1))
    return sections


def reference_keys():
    return set(re.findall(r'<a id="([^"]+)"></a>', REFERENCES.read_text(encoding="utf-8")))


def test_the_documents_exist_and_have_sections():
    assert MODEL.is_file() and REFERENCES.is_file()
    sections = model_sections()
    assert {"1", "2", "5", "8", "9", "12"} <= sections, sorted(sections)
    assert len(reference_keys()) >= 20


def test_no_citation_of_documents_outside_the_repository():
    this = Path(__file__).resolve().relative_to(ROOT).as_posix()
    bad = []
    for name, text in text_files():
        if name == this:
            continue
        for no, line in enumerate(text.splitlines(), 1):
            for pattern in FORBIDDEN:
                if pattern.search(line):
                    bad.append(f"{name}:{no}: {line.strip()}")
    assert not bad, "cites a document the repository does not contain:\n" + "\n".join(bad)


def test_named_files_exist():
    files = set(repository_files())
    basenames = {os.path.basename(f) for f in files}
    bad = []
    path = re.compile(r"(?<![\w./-])(docs/[\w./-]*\w)")
    md = re.compile(r"(?<![\w.-])([\w./-]*[\w-]\.md)\b")
    for name, text in text_files():
        for no, line in enumerate(text.splitlines(), 1):
            for m in path.finditer(line):
                p = m.group(1)
                if p not in files and not any(f.startswith(p.rstrip("/") + "/") for f in files):
                    bad.append(f"{name}:{no}: {p}")
            for m in md.finditer(line):
                p = m.group(1)
                if p.startswith(GENERATED) or p.startswith(("http", "//")):
                    continue
                if "/" in p:
                    if p not in files and (Path(name).parent / p).as_posix() not in files and not p.startswith("../"):
                        bad.append(f"{name}:{no}: {p}")
                elif p not in basenames:
                    bad.append(f"{name}:{no}: {p}")
    assert not bad, "names a file the repository does not contain:\n" + "\n".join(bad)


def test_model_sections_cited_exist():
    sections = model_sections()
    this = Path(__file__).resolve().relative_to(ROOT).as_posix()
    bad = []
    for name, text in text_files():
        if name == this:
            continue
        own = name == "docs/model.md"
        for no, line in enumerate(text.splitlines(), 1):
            if "§" not in line:
                continue
            start = 0 if own or "](docs/model.md" in line else line.find("docs/model.md")
            if start < 0:
                if not any(p.search(line) for p in OUTSIDE_SECTIONS):
                    bad.append(f"{name}:{no}: a § without 'docs/model.md' before it: {line.strip()}")
                continue
            for m in SECTION.finditer(line, start):
                cut = line[start:m.start()]
                if not own and any(p.search(cut + line[m.start():m.end()]) for p in OUTSIDE_SECTIONS):
                    continue
                if m.group(1) not in sections:
                    bad.append(f"{name}:{no}: docs/model.md has no §{m.group(1)}")
    assert not bad, "\n".join(bad)


def test_reference_keys_cited_exist():
    keys = reference_keys()
    bad = []
    cite = re.compile(r"docs/references\.md\s*(?:#|\[)([A-Za-z][\w-]*)")
    for name, text in text_files():
        in_docs = name.startswith("docs/") and name.endswith(".md")
        for no, line in enumerate(text.splitlines(), 1):
            for m in cite.finditer(line):
                if m.group(1) not in keys:
                    bad.append(f"{name}:{no}: docs/references.md has no [{m.group(1)}]")
            if in_docs and name in ("docs/model.md", "docs/references.md"):
                for m in KEY.finditer(line):
                    k = m.group(1)
                    if len(k) >= 4 and k not in keys:
                        bad.append(f"{name}:{no}: docs/references.md has no [{k}]")
    assert not bad, "\n".join(bad)


@pytest.mark.parametrize("doc", ["README.md", "DEVELOPERS.md", "docs/model.md", "docs/references.md",
                                 "docs/case-format.md", "docs/lab-results.md"])
def test_relative_links_resolve(doc):
    path = ROOT / doc
    if not path.is_file():
        pytest.skip(f"{doc} is not in this tree")
    bad = []
    for m in re.finditer(r"\]\(([^)\s]+)\)", path.read_text(encoding="utf-8")):
        target = m.group(1)
        if re.match(r"[a-z]+:", target) or target.startswith("#"):
            continue
        file_part, _, anchor = target.partition("#")
        resolved = (path.parent / file_part).resolve()
        if not resolved.exists():
            bad.append(target)
        elif anchor and resolved.suffix == ".md":
            text = resolved.read_text(encoding="utf-8")
            if f'id="{anchor}"' not in text and not re.search(r"^#+\s", text, re.M):
                bad.append(target)
    assert not bad, f"{doc}: links that do not resolve: {bad}"


def test_every_reference_entry_has_a_mark():
    # each entry states its confidence in bold: **seen**, **derived**, **memory** or **practice** (or a
    # qualified form such as **seen in transcription**)
    text = REFERENCES.read_text(encoding="utf-8")
    entries = re.split(r'(?=<a id=")', text)[1:]
    bad = [re.match(r'<a id="([^"]+)"', e).group(1) for e in entries
           if not re.search(r"\*\*(seen|derived|memory|practice)[^*]*\*\*", e)]
    assert entries and not bad, f"entries without a confidence mark: {bad}"
