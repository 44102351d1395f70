"""The built wheel, installed in a fresh virtual environment, carries cost_data and runs a case."""

import subprocess
import sys
import sysconfig
import venv
from pathlib import Path

from conftest import EXAMPLES, ROOT

DATA_SUFFIXES = {".csv", ".toml", ".md"}


def test_wheel_ships_cost_data_and_runs_an_example(tmp_path):
    dist = tmp_path / "dist"
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist), str(ROOT)],
                   check=True)
    (wheel,) = dist.glob("disteco-*.whl")
    env_dir = tmp_path / "env"
    venv.create(env_dir, with_pip=True)
    python = env_dir / "bin" / "python"
    site = Path(subprocess.run([str(python), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
                               check=True, capture_output=True, text=True).stdout.strip())
    # Dependencies come from this interpreter's site-packages; disteco itself only from the wheel.
    (site / "dependencies.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    subprocess.run([str(python), "-m", "pip", "install", "--no-deps", "-q", str(wheel)], check=True)

    shipped = subprocess.run(
        [str(python), "-c",
         "import importlib.resources as r, disteco; print(disteco.__file__); "
         "print('\\n'.join(sorted(p.name for p in r.files('disteco.cost_data').iterdir())))"],
        check=True, capture_output=True, text=True, cwd=tmp_path).stdout.split()
    assert str(env_dir) in shipped[0]
    expected = {p.name for p in (ROOT / "cost_data").iterdir() if p.suffix in DATA_SUFFIXES}
    assert expected <= set(shipped[1:])

    run = subprocess.run([str(env_dir / "bin" / "disteco"), "design", str(EXAMPLES / "aromatics_binary.toml"),
                          "--out", str(tmp_path / "out")], capture_output=True, text=True, cwd=tmp_path)
    assert run.returncode == 0, run.stderr
    assert (tmp_path / "out" / "result.json").is_file()
