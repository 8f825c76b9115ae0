"""Reading values out of a parsed case table: the shared checks behind every message of the loader.

Every registry module that reads its own keys (load types, and later supports) uses these helpers, so
all messages name the item, the value and the rule the same way. ``item`` is the dotted path of the
entry (e.g. ``part.outline[2].fillet``; array indices count from 0).

:class:`Catalogue` is what the loader needs to know of the registries (analysis models, load types,
standard shapes) that live further down the data flow; the caller passes it in
(:mod:`fekt.registry` builds the default one), so this layer imports none of them.
"""

from __future__ import annotations

import difflib
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any, Protocol

from fekt.case.expr import evaluate
from fekt.errors import CaseError

def path(parent: str, key: str | int) -> str:
    if isinstance(key, int):
        return f"{parent}[{key}]"
    return f"{parent}.{key}" if parent else key


def kind_of(value: object) -> str:
    """The TOML name of a value's type, for messages (users never see Python type names)."""
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, (int, float)):
        return "a number"
    if isinstance(value, str):
        return "a string"
    if isinstance(value, Mapping):
        return "a table"
    if isinstance(value, (list, tuple)):
        return "an array"
    return f"a {type(value).__name__} value"


def suggest(key: str, allowed: Sequence[str]) -> str:
    # Case is compared loosely because 'e' for 'E' is the likeliest slip, and difflib sees
    # 'e' and 'E' as entirely different.
    lowered = {a.lower(): a for a in allowed}
    matches = difflib.get_close_matches(key.lower(), list(lowered), n=3)
    if matches:
        return "did you mean " + " or ".join(repr(lowered[m]) for m in matches) + "?"
    return "allowed keys: " + ", ".join(allowed)


def check_keys(table: Mapping[str, object], allowed: Sequence[str], item: str) -> None:
    for key in table:
        if key not in allowed:
            where = f"in [{item}]" if item else "at the top level"
            raise CaseError(f"unknown key '{key}' {where}", item=path(item, key), hint=suggest(key, allowed))


def table(value: object, item: str) -> Mapping[str, object]:
    if not isinstance(value, Mapping):
        raise CaseError(f"expected a table, got {kind_of(value)}", item=item,
                        hint="write it as [section] or as { key = value, ... }")
    return value


def array(value: object, item: str) -> list:
    if not isinstance(value, list):
        raise CaseError(f"expected an array, got {kind_of(value)}", item=item, hint="write it as [ ..., ... ]")
    return value


def required(table: Mapping[str, object], key: str, item: str) -> object:
    if key not in table:
        where = f"[{item}]" if item else "the case file"
        raise CaseError(f"missing required value '{key}' in {where}", item=path(item, key))
    return table[key]


def text(value: object, item: str) -> str:
    if not isinstance(value, str):
        raise CaseError(f"expected a string, got {kind_of(value)}", item=item, hint='put the text in quotes: "..."')
    return value


def name(value: object, item: str) -> str:
    given = text(value, item)
    if not given.strip():
        raise CaseError("a name must not be empty", item=item)
    return given


def choice(value: object, choices: Sequence[str], item: str) -> str:
    given = text(value, item)
    if given not in choices:
        raise CaseError(f"'{given}' is not one of: {', '.join(choices)}", item=item,
                        hint=close_match(given, choices) + f"allowed: {', '.join(choices)}")
    return given


def flag(value: object, item: str) -> bool:
    # Only true booleans: 0/1 or "yes" are ambiguous in a file meant to be read by people.
    if not isinstance(value, bool):
        raise CaseError(f"expected true or false, got {kind_of(value)}", item=item)
    return value


#: no dimension, load or modulus in any supported unit system comes near this (our own guard against
#: values that overflow later, e.g. a radius of 1e300)
MAX_MAGNITUDE = 1e15


def number(value: object, params: Mapping[str, float], item: str) -> float:
    x = evaluate(value, params, item=item)
    if abs(x) > MAX_MAGNITUDE:
        raise CaseError(f"{x:.6g} is out of range (|value| must be below {MAX_MAGNITUDE:g})", item=item)
    return x


def positive(raw: object, params: Mapping[str, float], item: str, *, zero_ok: bool = False) -> float:
    """Evaluate a value that only makes sense positive (or zero, with ``zero_ok``)."""
    value = number(raw, params, item)
    if value > 0 or (zero_ok and value == 0):
        return value
    rule = "zero or positive" if zero_ok else "positive"
    # Quote the expression too: the user wrote it, not the number it came to.
    shown = f"{raw.strip()!r} evaluates to {value:.6g}, which" if isinstance(raw, str) else f"value {value:.6g}"
    raise CaseError(f"{shown} must be {rule}", item=item)


def optional(table: Mapping[str, object], key: str, default: float, params: Mapping[str, float],
              item: str) -> float:
    return number(table[key], params, path(item, key)) if key in table else default


def unique(names: Sequence[str], item: str, what: str) -> None:
    # Results and messages name features after their items, so two items with one name would be
    # indistinguishable in every report.
    seen: dict[str, int] = {}
    for k, name in enumerate(names):
        if name in seen:
            raise CaseError(f"the {what} name '{name}' is already used by {item}[{seen[name]}]",
                            item=f"{item}[{k}].name", hint=f"give each {what} its own name")
        seen[name] = k


def close_match(name: str, known: Sequence[str]) -> str:
    """A "did you mean" hint for a name that is not among ``known`` (empty when nothing is close)."""
    close = difflib.get_close_matches(name, list(known), n=1)
    return f"did you mean '{close[0]}'? " if close else ""




# --- what the loader needs to know of the registries further down ------------------------------------

class LoadType(Protocol):
    """A load type module (see :mod:`fekt.loads`): its case-file keys and its parser."""

    KIND: str
    KEYS: tuple[str, ...]

    def parse(self, table: Mapping[str, object], ctx: "LoadContext", item: str) -> Any: ...


@dataclass(frozen=True)
class LoadContext:
    """What a load type's parser may check its values against."""

    params: Mapping[str, float]
    edges: tuple[str, ...]
    default_ends: tuple[str, str] | None = None


@dataclass(frozen=True)
class ModelInfo:
    """What the case file needs to know of an analysis model."""

    name: str
    needs_thickness: bool
    default_load: str
    has_thickness: bool = True  # False: a thickness in the case file is an error (a shaft has none)


@dataclass(frozen=True)
class Catalogue:
    """The registries a case file refers to by name: analysis models, load types, standard shapes.

    ``families`` maps a shape name to a record with ``required``, ``optional``, ``edges`` and ``ends``."""

    models: Mapping[str, ModelInfo]
    loads: Mapping[str, LoadType]
    families: Mapping[str, Any]
