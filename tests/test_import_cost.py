"""The command line answers quickly: importing it (and the API) leaves the heavy libraries unloaded."""

import subprocess
import sys

HEAVY = ("matplotlib", "openpyxl", "pyomo", "scipy.interpolate")


def test_cli_and_api_leave_plotting_workbook_and_solver_interfaces_unloaded():
    # A fresh interpreter: this test process has imported everything already.
    code = ("import sys, disteco.cli, disteco.api; "
            f"print(','.join(m for m in {HEAVY!r} if m in sys.modules))")
    loaded = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.strip()
    assert loaded == ""


def test_check_leaves_the_modelling_layer_and_workbook_unloaded():
    """`check` fits the forms and finds the stage bound without Pyomo (its modelling layer takes a
    quarter of a second to import, its dependency module imports scipy.stats once scipy is loaded,
    half a second), the workbook or the plots; once thermo's packages are kept on disk (the first
    run), without chemicals' data tables and the pandas they are read with."""
    from conftest import EXAMPLES

    example = EXAMPLES / "aromatics_binary.toml"
    heavy = ("pyomo", "scipy.stats._stats_py", "matplotlib", "openpyxl", "pandas", "disteco.optimisation.search")
    code = ("import sys, contextlib, io, disteco.cli\n"
            f"with contextlib.redirect_stdout(io.StringIO()): code = disteco.cli.main(['check', {str(example)!r}])\n"
            f"print(code, ','.join(m for m in {heavy!r} if m in sys.modules))")
    for run in ("fills the cache", "reads it"):
        out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.split() == ["0"]


def test_ready_to_design_imports_the_modelling_layer_and_freezes_what_lasts():
    """Before a design the command line imports what it uses and moves every object alive then out of the
    cyclic collector's reach (gc.freeze, after a collection): the run's full collections no longer walk
    pyomo's and thermo's modules (the benzene design 5.7 -> 5.2 s measured, see api.ready_to_design)."""
    code = ("import gc, sys, disteco.api as api\n"
            "before = gc.get_freeze_count()\n"
            "api.ready_to_design()\n"
            "print(before, gc.get_freeze_count(), 'pyomo.environ' in sys.modules, len(gc.garbage),"
            " gc.get_threshold()[0])")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.split()
    assert out[0] == "0" and int(out[1]) > 50_000 and out[2:] == ["True", "0", "20000"]


def test_the_modelling_layer_leaves_scipy_statistics_to_first_use():
    """Pyomo's dependency module imports scipy.stats and scipy.integrate once scipy is loaded (0.26 s
    of every design); the modelling layer leaves placeholders that import them on first use, so they
    stay unloaded through a model's import and still work when asked for."""
    code = ("import sys, disteco.optimisation.model\n"
            "print('pyomo.environ' in sys.modules, 'scipy.stats._stats_py' in sys.modules, "
            "'scipy.integrate._quadpack_py' in sys.modules)\n"
            "from scipy.stats import norm\n"
            "import scipy.integrate\n"
            "print(norm.cdf(0.0), round(scipy.integrate.quad(lambda x: x * x, 0.0, 3.0)[0], 9), "
            "type(sys.modules['scipy.stats']).__name__)")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.split()
    assert out == ["True", "False", "False", "0.5", "9.0", "module"]
