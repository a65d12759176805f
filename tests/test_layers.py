"""The layer rules in pyproject.toml hold: stats knows no Qt, pandas or openpyxl; only ui knows Qt."""

import pathlib
import shutil
import subprocess
import sys

ROOT = pathlib.Path(__file__).resolve().parents[1]


def test_import_contracts_are_kept():
    """import-linter checks every contract written in pyproject.toml."""
    lint_imports = shutil.which("lint-imports", path=str(pathlib.Path(sys.executable).parent))
    assert lint_imports, "import-linter is part of the test extra; install with resources/install.sh --test"
    completed = subprocess.run(
        [lint_imports, str(ROOT / "pyproject.toml")],
        cwd=ROOT, capture_output=True, text=True, check=False,
    )
    assert completed.returncode == 0, completed.stdout + completed.stderr
