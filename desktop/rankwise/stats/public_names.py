"""Public names of a package that load their module on first use (PEP 562), for a quick start-up."""

from __future__ import annotations

import importlib
from collections.abc import Callable
from typing import Any


def load_on_first_use(package: str, module_of: dict[str, str], namespace: dict[str, Any]) -> tuple[
        Callable[[str], Any], Callable[[], list[str]]]:
    """The module-level ``__getattr__`` and ``__dir__`` for ``package``.

    ``module_of`` maps each public name to the module inside ``package`` that defines it;
    ``namespace`` is the package's ``globals()``, where a loaded name is kept so that later uses
    cost nothing. An unknown name raises ``AttributeError`` as for any module.
    """

    def __getattr__(name: str) -> Any:
        module_name = module_of.get(name)
        if module_name is None:
            raise AttributeError(f"module {package!r} has no attribute {name!r}")
        value = getattr(importlib.import_module(f"{package}.{module_name}"), name)
        namespace[name] = value
        return value

    def __dir__() -> list[str]:
        return sorted(set(namespace) | set(module_of))

    return __getattr__, __dir__
