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
