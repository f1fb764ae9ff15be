"""Runs every file of the bad-input corpus through `acidload check` and requires, for each:
exit code 3, nothing on standard output (no half result), and on standard error the file name
with the expected line and column and the expected message fragment (from the file's first line,
'# expect: LINE:COL | fragment'; a location naming another file, such as a CSV, is matched as is).
Also: a file over the size cap is generated and refused."""
import pathlib
import subprocess
import sys
import tempfile

program = sys.argv[1]
here = pathlib.Path(__file__).parent
failures = []
count = 0


def check(path, loc, frag):
    global count
    count += 1
    r = subprocess.run([program, "check", str(path)], capture_output=True, text=True, timeout=60)
    problems = []
    if r.returncode != 3:
        problems.append(f"exit code {r.returncode}, expected 3")
    if r.stdout:
        problems.append(f"wrote to standard output: {r.stdout[:200]!r}")
    if loc:
        where = loc if ".csv:" in loc else f"{path.name}:{loc}:"
        if where not in r.stderr:
            problems.append(f"no '{where}' in the message")
    elif f"{path.name}:" not in r.stderr:
        problems.append("the message does not name the file")
    if frag and frag not in r.stderr:
        problems.append(f"no '{frag}' in the message")
    if "^" not in r.stderr and loc:
        problems.append("no caret line")
    if problems:
        failures.append(f"{path.name}: " + "; ".join(problems) + f"\n    stderr: {r.stderr.strip()[:400]}")


for path in sorted((here / "cases").glob("*.yaml")):
    first = path.read_text(encoding="utf-8", errors="replace").split("\n", 1)[0]
    assert first.startswith("# expect:"), path
    loc, _, frag = first[len("# expect:"):].partition("|")
    check(path, loc.strip(), frag.strip())

with tempfile.TemporaryDirectory() as d:
    big = pathlib.Path(d) / "oversized.yaml"
    big.write_text("format-version: 1\n" + "# padding\n" * 600000)
    check(big, "", "bytes")

print(f"{count} bad inputs checked, {len(failures)} failed")
for f in failures:
    print(f)
print(f"{count - len(failures)} passed, {len(failures)} failed")
sys.exit(1 if failures else 0)
