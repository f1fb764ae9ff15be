"""Property tests of the program's command line (README "Using the program": one exit-code rule).
For any argument list: the exit code is 0, 2 or 3, never a crash; a failing command writes nothing
to standard output and says why on standard error; an option a command does not take is exit 2."""
import subprocess

from hypothesis import given, settings
from hypothesis import strategies as st

from conftest import ROOT, acidload_program

COMMANDS = ["check", "run", "solve", "convert", "fit", "forecast", "predict", "uncertainty", "report", "demo"]
TAKES = {"check": {"--overlay"}, "run": {"--overlay", "--out", "--summary-csv", "--threads"},
         "report": {"--overlay", "--lab", "--parameters", "--out"},
         "solve": {"--for", "--target", "--range", "--variant", "--overlay"},
         "convert": {"--case", "--as", "--variant", "--overlay"},
         "fit": {"--lab", "--parameters", "--precision", "--variant", "--overlay", "--write-overlay"},
         "forecast": {"--lab", "--parameters", "--precision", "--variant", "--overlay"},
         "predict": {"--lab", "--parameters", "--precision", "--variant", "--overlay", "--plan", "--draws", "--seed",
                     "--current"},
         "uncertainty": {"--draws", "--seed", "--threads", "--variant", "--overlay", "--lab", "--parameters",
                         "--first-charge"}, "demo": set()}
OPTIONS = sorted(set().union(*TAKES.values()) | {"--bogus"})
CASE = str(ROOT / "cases" / "demo-site.yaml")
words = st.one_of(st.sampled_from(OPTIONS), st.sampled_from([CASE, "h2s", "4000 h", "-5 h", "1.5", "0", "abc", "",
                                                             "300 ppmv", "--", "-x", "raw gas"]),
                  # what a command line can carry: no NUL (the C strings of argv end there) and no lone
                  # surrogates (not encodable); anything else goes
                  st.text(alphabet=st.characters(blacklist_characters="\x00", blacklist_categories=("Cs",)),
                          max_size=6))


def run(args):
    return subprocess.run([str(acidload_program()), *args], capture_output=True, timeout=60,
                          stdin=subprocess.DEVNULL)


@settings(max_examples=120, deadline=None)
@given(command=st.sampled_from(COMMANDS + ["frob"]), rest=st.lists(words, max_size=6))
def test_property_any_command_line_follows_the_exit_code_rule(command, rest):
    writes = ("--out", "--write-overlay", "--summary-csv")  # no writes here
    rest = [w for w in rest if w not in writes and not w.startswith(tuple(x + "=" for x in writes))]
    if "--help" in rest or "-h" in rest:
        return
    r = run([command, *rest])
    assert r.returncode in (0, 2, 3), (r.returncode, r.stderr[:300])
    if r.returncode:
        assert not r.stdout and r.stderr.startswith(b"acidload: ")


@settings(max_examples=40, deadline=None)
@given(command=st.sampled_from(COMMANDS), option=st.sampled_from(OPTIONS))
def test_property_an_option_a_command_does_not_take_is_refused_naming_it(command, option):
    if option in TAKES[command]:
        return
    r = run([command, CASE, option, "x"] if command != "demo" else [command, option, "x"])
    assert r.returncode == 2 and option.encode() in r.stderr and not r.stdout


def test_the_draws_range_a_help_text_states_is_the_range_the_command_takes():
    """Each command's help states '--draws A to B'; B + 1 must be refused naming --draws, and the range the
    refusal states must end at B, so the help says what the command takes (a help text says what is so)."""
    import re
    for command in ("uncertainty", "predict"):
        text = run([command, "--help"]).stdout.decode()
        m = re.search(r"--draws (\d+) to (\d+)", text)
        if not m:
            assert command != "uncertainty", "uncertainty --help no longer states its --draws range"
            continue
        stated = int(m.group(2))
        r = run([command, CASE, "--draws", str(stated + 1)])
        assert r.returncode in (2, 3) and b"--draws" in r.stderr, (command, r.returncode, r.stderr[:200])
        taken = re.search(rb"from 1 to ([0-9]+)\b", r.stderr)  # the range the refusal states
        assert taken and float(taken.group(1)) == stated, (command, stated, r.stderr[:200])
