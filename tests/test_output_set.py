"""A run's files land as one set: old set or new set after any interruption, never a mixture,
no temporary file; one run at a time per folder; the user's umask; a bad --out fails first."""

from __future__ import annotations

import dataclasses
import io
import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

from disteco import api
from disteco._base.errors import OutputFolderError
from disteco.cli import main
from disteco.reports import figures as figures_module
from disteco.reports import files
from disteco.reports.figures import draw
from disteco.reports.json_result import result_json
from disteco.reports.tables import Plot, Series

from conftest import EXAMPLES
from test_reports_tables import design_parts

CASE = str(EXAMPLES / "aromatics_binary.toml")


class Killed(BaseException):
    """Stands for the process being stopped at that moment (not an ordinary Exception)."""


@pytest.fixture(scope="module")
def result():
    found, parts = design_parts()
    return dataclasses.replace(found, parts=parts)


def snapshot(folder: Path) -> dict[str, bytes]:
    """Every entry below ``folder`` (hidden ones included) with its bytes; folders map to b"/"."""
    return {str(p.relative_to(folder)): (b"/" if p.is_dir() else p.read_bytes()) for p in sorted(folder.rglob("*"))}


@pytest.fixture()
def old_set(result, tmp_path):
    """An output folder holding a complete earlier set, marked so that it differs from a new one."""
    out = tmp_path / "out"
    api.write_results(result, out)
    data = json.loads((out / "result.json").read_text())
    data["title"] = "the earlier run"
    (out / "result.json").write_text(json.dumps(data))
    (out / "notes.txt").write_text("the user's own file stays")
    return out, snapshot(out)


def test_new_set_replaces_the_old_one_whole(result, old_set):
    out, before = old_set
    written = api.write_results(result, out, figures=False)
    assert written == [out / "result.json", out / "design.xlsx"]
    after = snapshot(out)
    assert sorted(after) == ["design.xlsx", "notes.txt", "result.json"]  # old figures left with the old set
    assert json.loads(after["result.json"]) == json.loads(json.dumps(result_json(result)))
    assert after["notes.txt"] == before["notes.txt"]


def _raise_on_call(function, n: int):
    calls = []

    def wrapper(*args, **kwargs):
        calls.append(args)
        if len(calls) == n:
            raise Killed(f"stopped at call {n}")
        return function(*args, **kwargs)
    return wrapper


def _commit_replace(n: int, out: Path):
    """os.replace that stops at the n-th rename of the commit (renames into the folder or aside)."""
    real = os.replace
    count = []

    def replace(src, dst):
        parent = Path(dst).parent
        if parent == out or parent.name.startswith(files.ASIDE_PREFIX):
            count.append(dst)
            if len(count) == n:
                raise Killed(f"stopped at commit rename {n}")
        return real(src, dst)
    return replace


MOMENTS = ["workbook", "json", "second figure", "commit 1", "commit 3", "commit 4", "commit 6"]


@pytest.mark.parametrize("moment", MOMENTS)
def test_interrupted_run_leaves_the_old_set(result, old_set, monkeypatch, moment):
    """Stopped while writing or while committing: the folder holds exactly the old set, and no
    staging folder, journal, partial file or lock file is left."""
    out, before = old_set
    if moment == "workbook":
        monkeypatch.setattr(api, "write_workbook", _raise_on_call(api.write_workbook, 1))
    elif moment == "json":
        monkeypatch.setattr(api, "write_json", _raise_on_call(api.write_json, 1))
    elif moment == "second figure":
        monkeypatch.setattr(figures_module, "write_figure", _raise_on_call(figures_module.write_figure, 2))
    else:
        monkeypatch.setattr(os, "replace", _commit_replace(int(moment.split()[1]), out))
    with pytest.raises(Killed):
        api.write_results(result, out)
    assert snapshot(out) == before


def test_a_run_killed_inside_the_commit_is_rolled_back_by_the_next_run(result, old_set, monkeypatch):
    """Killed outright between two renames of the commit (no roll-back in the dying process):
    the journal left beside the folder lets the next run restore the old set as soon as it
    claims the folder, before any computation."""
    out, before = old_set
    monkeypatch.setattr(files, "_roll_back", lambda *args: None)
    monkeypatch.setattr(os, "replace", _commit_replace(4, out))
    with pytest.raises(Killed):
        api.write_results(result, out)
    monkeypatch.undo()
    assert snapshot(out) != before  # a mixture, with the aside folder holding the journal
    assert any(name.startswith(files.ASIDE_PREFIX) for name in os.listdir(out))
    with api.claim_output(out):
        held = snapshot(out)
        held.pop(files.LOCK_FILE)
        assert held == before
    assert snapshot(out) == before


HOLDER = """
import sys
from disteco import api
with api.claim_output(sys.argv[1], case=api.load_case(sys.argv[2])):
    print("held", flush=True)
    sys.stdin.read()
"""


def test_a_second_run_into_a_held_folder_is_refused_naming_the_first(tmp_path, capsys, monkeypatch):
    out = tmp_path / "out"
    holder = subprocess.Popen([sys.executable, "-c", HOLDER, str(out), CASE], stdin=subprocess.PIPE,
                              stdout=subprocess.PIPE, text=True)
    try:
        assert holder.stdout.readline().strip() == "held"
        monkeypatch.setattr(api, "design", lambda *a, **k: pytest.fail("the design ran into a held folder"))
        code = main(["design", CASE, "-o", str(out), "-q"])
        err = capsys.readouterr().err
        assert code == 2
        assert f"--out '{out}': another disteco run is writing into it (pid {holder.pid} on" in err
        assert "aromatics_binary.toml" in err
    finally:
        holder.stdin.close()
        holder.wait(timeout=60)
    assert not (out / files.LOCK_FILE).exists()
    with api.claim_output(out):  # free again once the first run has ended
        with pytest.raises(OutputFolderError, match="another disteco run is writing into it"):
            with api.claim_output(out):
                pass


@pytest.mark.parametrize("mask, file_mode, folder_mode", [(0o022, 0o644, 0o755), (0o027, 0o640, 0o750),
                                                           (0o002, 0o664, 0o775)])
def test_files_follow_the_umask(result, tmp_path, mask, file_mode, folder_mode):
    previous = os.umask(mask)
    try:
        written = api.write_results(result, tmp_path / "out")
    finally:
        os.umask(previous)
    for path in written:
        assert path.stat().st_mode & 0o777 == file_mode, path
    for folder in (tmp_path / "out", tmp_path / "out" / "figures"):
        assert folder.stat().st_mode & 0o777 == folder_mode


def _no_design(monkeypatch):
    monkeypatch.setattr(api, "design", lambda *a, **k: pytest.fail("the design ran before --out was checked"))


def test_out_naming_a_file_fails_before_the_design(tmp_path, capsys, monkeypatch):
    _no_design(monkeypatch)
    target = tmp_path / "taken"
    target.write_text("x")
    assert main(["design", CASE, "-o", str(target), "-q"]) == 2
    assert f"error: --out '{target}': is a file, not a folder" in capsys.readouterr().err


def test_out_below_a_file_fails_before_the_design(tmp_path, capsys, monkeypatch):
    _no_design(monkeypatch)
    (tmp_path / "taken").write_text("x")
    target = tmp_path / "taken" / "out"
    assert main(["design", CASE, "-o", str(target), "-q"]) == 2
    assert f"error: --out '{target}': cannot be created (Not a directory)" in capsys.readouterr().err


def test_read_only_out_fails_before_the_design(tmp_path, capsys, monkeypatch):
    """A folder that refuses new files (as a read-only folder does; simulated, since the tests may
    run with rights that ignore permission bits)."""
    _no_design(monkeypatch)
    real_open = os.open

    def refusing_open(path, flags, mode=0o777, **kwargs):
        if str(path).endswith(files.LOCK_FILE):
            raise PermissionError(13, "Permission denied", str(path))
        return real_open(path, flags, mode, **kwargs)
    monkeypatch.setattr(os, "open", refusing_open)
    assert main(["design", CASE, "-o", str(tmp_path), "-q"]) == 2
    assert f"error: --out '{tmp_path}': cannot be written into (Permission denied)" in capsys.readouterr().err


def test_a_failed_run_leaves_no_folder_it_created(tmp_path, capsys):
    """A design refused after the folder was claimed removes the folder it made, and its lock."""
    out = tmp_path / "new" / "out"
    code = main(["design", CASE, "-o", str(out), "-q", "--reflux", "1.0", "--stages", "30", "--feed-stage", "15"])
    assert code == 2
    assert "below the minimum reflux ratio" in capsys.readouterr().err
    assert not out.exists()


def test_dollar_signs_in_figure_text_are_drawn_literally():
    """A scenario name or currency with dollar signs is not read as mathematical text."""
    plot = Plot("odd", "TAC in $ per year, $x^2$", "reflux [-]", "TAC [$/y]",
                (Series("scenario $x^2$", (1.0, 2.0), (3.0, 4.0)), Series(r"broken $\frac{$", (1.0, 2.0), (2.0, 1.0))))
    figure = draw(plot)
    figure.savefig(io.BytesIO(), format="png")
    axes = figure.axes[0]
    assert [line.get_label() for line in axes.get_lines()] == [r"scenario \$x^2\$", r"broken \$\frac{\$"]
    assert axes.get_title() == r"TAC in \$ per year, \$x^2\$"


def test_a_terminated_design_leaves_nothing(tmp_path):
    """A real `disteco design` process terminated (SIGTERM) during its computation exits with
    code 1 and leaves neither the output folder it created nor its lock file."""
    import signal
    import time

    out = tmp_path / "new-out"
    run = subprocess.Popen([sys.executable, "-m", "disteco.cli", "design", CASE, "-o", str(out), "-q"],
                           stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        deadline = time.monotonic() + 120
        while not (out / files.LOCK_FILE).exists():
            assert run.poll() is None and time.monotonic() < deadline, "the run never claimed its folder"
            time.sleep(0.05)
        run.send_signal(signal.SIGTERM)
        _, err = run.communicate(timeout=120)
    finally:
        run.kill()
    assert run.returncode == 1, err
    assert "interrupted" in err and "Traceback" not in err
    assert not out.exists()


@pytest.mark.parametrize("raised", [RuntimeError("Error calling __set_name__ on 'cached_property' instance"),
                                    "case error"])
def test_an_interrupt_that_comes_back_as_another_error_is_reported_as_one(monkeypatch, capsys, raised):
    """A SIGTERM raised inside a class body under construction (scipy importing) reached the command
    line as Python 3.11's RuntimeError "Error calling __set_name__ ...", which was reported as an
    internal error; any error after a recorded interrupt is now reported as the interruption."""
    from disteco import cli
    from disteco._base import interrupt
    from disteco._base.errors import CaseError

    def terminated(args):
        interrupt.request()  # what the signal handler does before raising
        raise raised if isinstance(raised, Exception) else CaseError("feed.flow", "bad", "good")

    monkeypatch.setattr(cli, "_run", terminated)
    try:
        assert cli.main(["check", CASE]) == 1
    finally:
        interrupt.clear()
    assert capsys.readouterr().err == "interrupted\n"


def test_an_interrupt_the_solver_interface_swallows_still_stops_the_run(monkeypatch):
    """SIGTERM raises KeyboardInterrupt; while the modelling library waits for the solver's process
    its output capture can turn that into a RuntimeError, which used to count as a failed
    configuration: 2 of 12 terminated benzene runs went on and exited 0. The handler also records
    the request, and the solve layer stops on it after every solver call."""
    from disteco._base import interrupt
    from disteco._base.errors import SolverError
    from disteco.optimisation import solve
    from disteco.optimisation.options import model_options

    class Swallowing:
        def solve(self, model, **kwargs):
            if stop:
                interrupt.request()  # what the signal handler does before raising
            raise RuntimeError("KeyboardInterrupt:  (1: <TeeStream>)")

    monkeypatch.setattr(solve, "make_solver", lambda *args, **kwargs: Swallowing())
    model = type("Model", (), {"name": "N=20 NF=10"})()
    try:
        stop = False
        with pytest.raises(SolverError):  # a solver failure of its own stays one
            solve._timed_solve(model, model_options(), "ripopt", 1.0, "failed on")
        stop = True
        with pytest.raises(KeyboardInterrupt):
            solve._timed_solve(model, model_options(), "ripopt", 1.0, "failed on")
    finally:
        interrupt.clear()
