"""Shared helpers for the readings tests: demo file paths and a byte-exact file check."""

import hashlib
import pathlib

import pytest

def digest(path: pathlib.Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.fixture
def unchanged():
    """Call with a path before opening it; at the end of the test its bytes and times must be the same."""
    watched = []

    def watch(path):
        path = pathlib.Path(path)
        watched.append((path, digest(path), path.stat().st_mtime_ns))
        return path

    yield watch
    for path, before, mtime in watched:
        assert digest(path) == before, f"{path.name} was changed by opening it"
        assert path.stat().st_mtime_ns == mtime
