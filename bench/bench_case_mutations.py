"""Mutated example cases through `disteco check` in bulk: how many exit 0, 2 and 1.

The suite's property-based test (tests/test_case_mutations.py) runs a fixed small budget; this
runs thousands, random each time unless --seed is given, and prints every case that ended in
exit 1, a traceback or a raw RuntimeWarning, with its TOML, so it can become a table-driven test.
With --design N, the first N cases that `check` accepted also go through `design` (slow: seconds
to a minute each), which finds cases `check` should have refused.

    .venv/bin/python bench/bench_case_mutations.py --examples 2000 [--seed 7] [--design 20]
"""

from __future__ import annotations

import argparse
import contextlib
import io
import sys
import tempfile
import time
from collections import Counter
from pathlib import Path

from hypothesis import HealthCheck, given, seed, settings

from disteco.cli import main as disteco

sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "tests"))

from case_mutations import EXAMPLE_NAMES, EXAMPLES, mutated_cases  # noqa: E402
from test_case_mutations import run_check  # noqa: E402


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--examples", type=int, default=2000)
    parser.add_argument("--seed", type=int, default=None)
    parser.add_argument("--most", type=int, default=3, help="most mutations per case")
    parser.add_argument("--design", type=int, default=0, help="cases accepted by check to design")
    parser.add_argument("--all-examples", action="store_true",
                        help="mutate every example in examples/, not only the three of the suite's test")
    args = parser.parse_args()
    codes: Counter = Counter()
    first_lines: Counter = Counter()
    bad: list[tuple[str, str]] = []
    accepted: list[str] = []

    names = tuple(sorted(p.stem for p in EXAMPLES.glob("*.toml"))) if args.all_examples else EXAMPLE_NAMES

    @settings(max_examples=args.examples, deadline=None, database=None,
              suppress_health_check=list(HealthCheck))
    @given(mutated_cases(args.most, names))
    def run(text):
        code, err, runtime_warnings = run_check(text)
        codes[code] += 1
        first = err.splitlines()[0] if err else ""
        first_lines[first.split(":")[0] + ":" + first.split(":")[1] if first.count(":") > 1 else first] += 1
        if code == 0:
            accepted.append(text)
        if code not in (0, 2) or "Traceback" in err or runtime_warnings or first.startswith("error: :"):
            bad.append((text, err + "".join(f"RuntimeWarning: {w.message}\n" for w in runtime_warnings)))

    if args.seed is not None:
        run = seed(args.seed)(run)
    start = time.monotonic()
    run()
    elapsed = time.monotonic() - start
    total = sum(codes.values())
    print(f"{total} cases in {elapsed:.0f} s ({elapsed / max(total, 1):.3f} s each)")
    for code in sorted(codes):
        print(f"exit {code}: {codes[code]} ({codes[code] / total:.1%})")
    print("most frequent refusals:")
    for line, count in first_lines.most_common(15):
        print(f"  {count:5d}  {line[:110]}")
    if args.design:
        design_codes: Counter = Counter()
        for text in accepted[:args.design]:
            code, err = run_design(text)
            design_codes[code] += 1
            if code not in (0, 2) or "Traceback" in err:
                bad.append((text, "design: " + err))
        print("design of cases check accepted: " + ", ".join(f"exit {c}: {n}" for c, n in sorted(design_codes.items())))
    print(f"cases with exit 1, a traceback or a raw warning: {len(bad)}")
    for text, err in bad:
        print("-" * 70)
        print(text.rstrip())
        print(">>> " + err.strip().replace("\n", "\n>>> "))


def run_design(text: str) -> tuple[int, str]:
    """`disteco design` in-process on ``text`` (no figures): exit code and stderr."""
    with tempfile.TemporaryDirectory() as folder:
        case = Path(folder) / "case.toml"
        case.write_text(text, encoding="utf-8")
        err = io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(io.StringIO()):
            code = disteco(["design", str(case), "-o", str(Path(folder) / "out"), "-q", "--no-figures"])
    return code, err.getvalue()


if __name__ == "__main__":
    main()
