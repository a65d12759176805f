"""Canonical JSON of the program's objects, and back: the form stored in a record and fingerprinted.

Objects are turned into plain JSON data guided by their type annotations, so that a value is
written the same way whatever Python or numpy type it arrived as (a float field always as a float,
written by ``repr``). Non-finite floats are written as the strings "NaN", "Infinity" and
"-Infinity". The canonical text has sorted keys, no whitespace and is encoded as UTF-8; the
decision record resources/decisions/record-fingerprint.md describes it. A field added to a type
later, with a default, may be missing from data written before; it reads back as its default.
"""

from __future__ import annotations

import dataclasses
import enum
import hashlib
import json
import math
import types
import typing
from collections.abc import Callable
from datetime import datetime
from functools import lru_cache
from typing import Any

from rankwise.records.errors import RecordError
from rankwise.stats.frozen_floats import FrozenFloats

_NON_FINITE = {"NaN": math.nan, "Infinity": math.inf, "-Infinity": -math.inf}


def canonical_bytes(data: Any) -> bytes:
    """The canonical text of plain JSON data: sorted keys, no whitespace, floats by repr, UTF-8."""
    return json.dumps(data, sort_keys=True, separators=(",", ":"), ensure_ascii=False,
                      allow_nan=False).encode("utf-8")


def sha256_hex(data: Any) -> str:
    """SHA-256 of the canonical text of ``data``, as 64 lower-case hex digits."""
    return hashlib.sha256(canonical_bytes(data)).hexdigest()


def encode(value: Any, hint: Any) -> Any:
    """``value`` as plain JSON data, following the type annotation ``hint``."""
    arms = _union_arms(hint)
    if arms is not None:
        return _through_union(value, arms, encode, _tagged)
    if hint is FrozenFloats:
        return [_encode_float(item) for item in value]
    if typing.get_origin(hint) is tuple:
        scalar = _ENCODE_SCALAR.get(_repeated_item(hint))
        if scalar is not None:  # a long run of numbers: one conversion each, no dispatch
            return [scalar(item) for item in value]
        return [encode(item, item_hint) for item, item_hint in zip(value, _item_hints(hint, len(value)))]
    if dataclasses.is_dataclass(hint):
        hints = _field_hints(hint)
        return {f.name: encode(getattr(value, f.name), hints[f.name]) for f in dataclasses.fields(hint)}
    if isinstance(hint, type) and issubclass(hint, enum.Enum):
        return hint(value).value
    if hint in _ENCODE_SCALAR:
        return _ENCODE_SCALAR[hint](value)
    if hint is datetime:
        return value.isoformat()
    raise ValueError(f"no canonical form for {hint!r}")


def decode(data: Any, hint: Any) -> Any:
    """The object of type ``hint`` that ``encode`` turned into ``data``; ``RecordError`` if damaged."""
    try:
        return _decode(data, hint)
    except (KeyError, TypeError, ValueError, AttributeError) as error:
        raise RecordError(
            "The program data in the record are damaged and cannot be read back; "
            "use the original file or an intact copy of the record."
        ) from error


def _decode(data: Any, hint: Any) -> Any:
    arms = _union_arms(hint)
    if arms is not None:
        return _through_union(data, arms, _decode, _untagged)
    if hint is FrozenFloats:
        return FrozenFloats(_decode(data, tuple[float, ...]))
    if typing.get_origin(hint) is tuple:
        _require(data, list)
        scalar = _DECODE_SCALAR.get(_repeated_item(hint))
        if scalar is not None:
            return tuple(scalar(item) for item in data)
        return tuple(_decode(item, item_hint) for item, item_hint in zip(data, _item_hints(hint, len(data))))
    if dataclasses.is_dataclass(hint):
        _require(data, dict)
        hints = _field_hints(hint)
        if not _required_fields(hint) <= set(data) <= {f.name for f in dataclasses.fields(hint)}:
            raise ValueError(f"fields of {hint.__name__} do not match")
        return hint(**{name: _decode(data[name], hints[name]) for name in data})
    if isinstance(hint, type) and issubclass(hint, enum.Enum):
        return hint(data)
    if hint in _DECODE_SCALAR:
        return _DECODE_SCALAR[hint](data)
    if hint is datetime:
        return datetime.fromisoformat(_require(data, str))
    raise ValueError(f"no canonical form for {hint!r}")


def with_defaults(data: Any, hint: Any) -> Any:
    """``data`` (as ``encode`` wrote it for type ``hint``) with every field added since it was
    written filled in with the field's default, e.g. a record written before confidence intervals
    had open ends reads back with closed ends; data that do not fit ``hint`` are returned as they are."""
    arms = _union_arms(hint)
    if arms is not None:
        if data is None:
            return None
        if len(arms) == 1:
            return with_defaults(data, arms[0])
        chosen = next((arm for arm in arms if isinstance(data, dict) and dataclasses.is_dataclass(arm)
                       and arm.__name__ == data.get("type")), None)
        if chosen is None:
            return data
        return {**data, "fields": with_defaults(data.get("fields"), chosen)}
    if typing.get_origin(hint) is tuple and isinstance(data, list):
        try:
            item_hints = _item_hints(hint, len(data))
        except ValueError:
            return data
        return [with_defaults(item, item_hint) for item, item_hint in zip(data, item_hints)]
    if dataclasses.is_dataclass(hint) and isinstance(data, dict):
        hints = _field_hints(hint)
        completed = {}
        for field in dataclasses.fields(hint):
            if field.name in data:
                completed[field.name] = with_defaults(data[field.name], hints[field.name])
            elif field.default is not dataclasses.MISSING:
                completed[field.name] = encode(field.default, hints[field.name])
        return {**data, **completed}
    return data


@lru_cache(maxsize=None)
def _field_hints(cls: type) -> dict[str, Any]:
    """The annotation of each field of the dataclass ``cls``, worked out once per class (a record
    of many characteristics asks for the same few classes hundreds of thousands of times)."""
    return typing.get_type_hints(cls)


def _required_fields(hint: Any) -> set[str]:
    """The fields of a dataclass that have no default (every record holds them)."""
    return {f.name for f in dataclasses.fields(hint)
            if f.default is dataclasses.MISSING and f.default_factory is dataclasses.MISSING}


def _union_arms(hint: Any) -> list[Any] | None:
    """The types an optional or union annotation allows, None left out; None when ``hint`` is no union."""
    if typing.get_origin(hint) not in (typing.Union, types.UnionType):
        return None
    return [arm for arm in typing.get_args(hint) if arm is not type(None)]


def _through_union(item: Any, arms: list[Any], convert: Callable[[Any, Any], Any],
                   convert_variant: Callable[[Any, list[Any]], Any]) -> Any:
    """One step of ``encode`` or ``_decode`` through a union: None stays None, an optional value is
    converted as its one type, a choice of result types goes through ``convert_variant``."""
    if item is None:
        return None
    if len(arms) == 1:
        return convert(item, arms[0])
    return convert_variant(item, arms)


def _tagged(value: Any, arms: list[Any]) -> dict[str, Any]:
    """A value of one of several dataclasses, with the name of its type beside its fields."""
    for arm in arms:
        if dataclasses.is_dataclass(arm) and isinstance(value, arm):
            return {"type": arm.__name__, "fields": encode(value, arm)}
    raise ValueError(f"value of type {type(value).__name__} fits none of {arms}")


def _untagged(data: Any, arms: list[Any]) -> Any:
    """The dataclass that ``_tagged`` wrote, found by its type name."""
    chosen = next((arm for arm in arms if dataclasses.is_dataclass(arm) and arm.__name__ == data["type"]), None)
    if chosen is None:
        raise ValueError(f"no result type is named {data['type']!r}")
    return _decode(data["fields"], chosen)


def _item_hints(hint: Any, length: int) -> list[Any]:
    """The annotation of each item of a tuple of ``length`` items."""
    args = typing.get_args(hint)
    if len(args) == 2 and args[1] is Ellipsis:
        return [args[0]] * length
    if len(args) != length:
        raise ValueError(f"expected {len(args)} items, found {length}")
    return list(args)


def _repeated_item(hint: Any) -> Any:
    """The item annotation of ``tuple[X, ...]``, else None."""
    args = typing.get_args(hint)
    return args[0] if len(args) == 2 and args[1] is Ellipsis else None


def _encode_float(value: Any) -> float | str:
    number = float(value)
    if math.isfinite(number):
        return number
    return "NaN" if math.isnan(number) else ("Infinity" if number > 0 else "-Infinity")


def _decode_int(data: Any) -> int:
    if isinstance(data, bool):
        raise TypeError("a whole number was expected")
    return _require(data, int)


def _decode_float(data: Any) -> float:
    if isinstance(data, str):
        return _NON_FINITE[data]
    if isinstance(data, bool) or not isinstance(data, (int, float)):
        raise TypeError("a number was expected")
    return float(data)


_ENCODE_SCALAR: dict[Any, Callable[[Any], Any]] = {bool: bool, int: int, float: _encode_float, str: str}
"""How a value of each plain type is written."""
_DECODE_SCALAR: dict[Any, Callable[[Any], Any]] = {
    bool: lambda data: _require(data, bool), int: _decode_int, float: _decode_float,
    str: lambda data: _require(data, str),
}
"""How a value of each plain type is read back, refusing data of another type."""


def _require(data: Any, kind: type) -> Any:
    if not isinstance(data, kind):
        raise TypeError(f"{kind.__name__} expected")
    return data
