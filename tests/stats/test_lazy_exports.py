"""The packages' public names load their modules on first use, so the window starts without scipy.stats or pandas."""

from __future__ import annotations

import importlib
import subprocess
import sys

import pytest

import rankwise.readings
import rankwise.stats

HEAVY = ("scipy.stats", "pandas")


def _modules_loaded_by(statement: str) -> set[str]:
    """Which of HEAVY a fresh interpreter has loaded after running ``statement``."""
    code = f"import sys\n{statement}\nprint(' '.join(m for m in {HEAVY!r} if m in sys.modules))"
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120)
    return set(done.stdout.split())


@pytest.mark.parametrize("package", [rankwise.stats, rankwise.readings])
def test_every_public_name_is_the_defining_modules_object(package):
    """Each name in __all__ resolves, to the very object of the module the table names."""
    for name in package.__all__:
        module = importlib.import_module(f"{package.__name__}.{package._MODULE_OF[name]}")
        assert getattr(package, name) is getattr(module, name)
    assert set(package.__all__) <= set(dir(package))


@pytest.mark.parametrize("package", [rankwise.stats, rankwise.readings])
def test_an_unknown_name_is_an_attribute_error(package):
    with pytest.raises(AttributeError, match="no_such_name"):
        package.no_such_name  # noqa: B018


def test_from_import_still_works():
    from rankwise.readings import ReadingSheet  # noqa: F401
    from rankwise.stats import compare_two, run  # noqa: F401

    assert callable(compare_two) and callable(run)


def test_the_window_module_loads_neither_scipy_stats_nor_pandas():
    """Start-up path: the main window's module and the readings' grid check stay light."""
    assert _modules_loaded_by("import rankwise.ui.main_window") == set()
    assert _modules_loaded_by("import rankwise.readings.columns") == set()


def test_the_first_use_of_a_test_loads_scipy_stats():
    """The lazy table really defers: scipy.stats arrives with compare_two, not before."""
    assert _modules_loaded_by("import rankwise.stats") == set()
    assert _modules_loaded_by("from rankwise.stats import compare_two") == {"scipy.stats"}
