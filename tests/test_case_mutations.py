"""Property-based: example cases got wrong the way a person would are accepted (exit 0) or refused
with a named field (exit 2), never an internal error (exit 1), a traceback or a raw warning."""

import contextlib
import io
import tempfile
import tomllib
import warnings
from pathlib import Path

from hypothesis import HealthCheck, given, settings

from disteco.cli import main

from case_mutations import EXAMPLE_NAMES, load_example, mutated_cases, to_toml

# check runs the stage design and the fitted forms since it validates what design does before optimising
# (user time 12 -> 19 s for 100 examples), so the budget is 70; bench/bench_case_mutations.py runs thousands
EXAMPLE_BUDGET = 70


def run_check(text: str) -> tuple[int, str, list[warnings.WarningMessage]]:
    """`disteco check` in-process on ``text``: exit code, stderr, RuntimeWarnings raised."""
    with tempfile.TemporaryDirectory() as folder:
        case = Path(folder) / "case.toml"
        case.write_text(text, encoding="utf-8")
        err = io.StringIO()
        with warnings.catch_warnings(record=True) as caught, contextlib.redirect_stderr(err), \
                contextlib.redirect_stdout(io.StringIO()):
            warnings.simplefilter("always")
            code = main(["check", str(case)])
    return code, err.getvalue(), [w for w in caught if issubclass(w.category, RuntimeWarning)]


def test_the_serialiser_round_trips_the_examples():
    for name in EXAMPLE_NAMES:
        data = load_example(name)
        assert tomllib.loads(to_toml(data)) == data


@settings(max_examples=EXAMPLE_BUDGET, deadline=None, derandomize=True,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
@given(mutated_cases())
def test_check_exits_0_or_2_and_names_the_field(text):
    code, err, runtime_warnings = run_check(text)
    assert code in (0, 2), err
    assert "Traceback" not in err and "internal error" not in err
    assert runtime_warnings == []
    if code == 2:
        first = err.splitlines()[0]
        assert first.startswith("error: ") and not first.startswith("error: :"), first
