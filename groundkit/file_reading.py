"""Reading groundkit files: strict JSON parsing, then validation against the schema documents of
:mod:`groundkit.file_schemas`, with one message shape for every refusal.

Every refusal is a :class:`~groundkit.errors.ResultFieldError` (a ``ResultFileError``) saying
``<file>: <field path> is <value>; expected <what is accepted>``, e.g.
``run.json: history.energies[3] is NaN; expected a finite number``. Nothing deep inside the parser or the
validator escapes: no OverflowError, RecursionError, KeyError or TypeError.
"""

from __future__ import annotations

import json
import math
import os
import re
from collections.abc import Callable, Iterable
from dataclasses import dataclass
from functools import cache
from typing import Any

from jsonschema import Draft202012Validator
from jsonschema.exceptions import ValidationError

from .errors import ResultFieldError, ResultFileError
from .file_schemas import DEFS, DOCUMENTS, DRAFT, ENVELOPES, MAX_DEPTH

MAX_INTEGER_DIGITS = 300
"""Longest integer literal accepted (any longer one cannot even become a float)."""

Path = tuple[str | int, ...]


@dataclass(frozen=True)
class FieldFault:
    """One refusal: the field ``path`` (keys and list indices), the value found there (``missing`` when absent)
    and what is accepted."""

    path: Path
    value: Any
    expected: str
    missing: bool = False

    def error(self, source: str) -> ResultFieldError:
        """The ResultFieldError of this fault in the file ``source``."""
        return ResultFieldError(source, path_text(self.path), None if self.missing else shown(self.value),
                                self.expected)


class Unreadable:
    """What the parser keeps in place of a token no groundkit file may hold (NaN, Infinity, 1e400, an integer of
    thousands of digits, a repeated key), so that validation can name the field it sits in."""

    __slots__ = ("expected", "text")

    def __init__(self, text: str, expected: str) -> None:
        self.text, self.expected = text, expected

    def __repr__(self) -> str:
        return self.text


def _constant(name: str) -> Unreadable:
    return Unreadable(name, "a finite number (JSON has no NaN or Infinity)")


def _float(text: str) -> float | Unreadable:
    value = float(text)
    return value if math.isfinite(value) else Unreadable(text, "a finite number within ±1.8e308")


def _int(text: str) -> int | Unreadable:
    digits = len(text.lstrip("-"))
    if digits > MAX_INTEGER_DIGITS:
        return Unreadable(f"{text[:12]}... ({digits} digits)", f"a number of at most {MAX_INTEGER_DIGITS} digits")
    return int(text)


def _object(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for key, value in pairs:
        if key in out:
            value = Unreadable(f"given twice ({shown(value)} after {shown(out[key])})", "each key once per object")
        out[key] = value
    return out


def parse(text: str, source: str, expected: str) -> Any:
    """JSON of ``text`` with every unreadable token kept as :class:`Unreadable`; ``ResultFileError`` when it is not
    JSON at all (``expected`` names the file kind in the message)."""
    try:
        return json.loads(text, parse_constant=_constant, parse_float=_float, parse_int=_int,
                          object_pairs_hook=_object)
    except json.JSONDecodeError as err:
        raise ResultFileError(f"{source}: not valid JSON ({err.msg} at line {err.lineno}, column {err.colno}); "
                              f"the file may be truncated. Expected {expected}") from None
    except RecursionError:
        line, column = _too_deep_at(text)
        raise ResultFieldError(source, f"(line {line}, column {column})", "nested deeper than the JSON parser "
                               "allows", f"at most {MAX_DEPTH} levels of arrays and objects") from None


def read_text(path: str | os.PathLike, expected: str) -> str:
    """The UTF-8 text of ``path``; ``ResultFileError`` naming ``expected`` when it is not text."""
    with open(path, "rb") as fh:
        raw = fh.read()
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as err:
        raise ResultFileError(f"{path}: not a text file (byte {err.start} is not UTF-8); expected {expected} "
                              "(JSON)") from None


def read_json(path: str | os.PathLike, expected: str) -> Any:
    """Parsed JSON of ``path`` (see :func:`parse`); ``ResultFileError`` naming ``expected`` when it is not JSON."""
    return parse(read_text(path, expected), str(path), expected)


def as_json(data: Any) -> Any:
    """In-memory data as it would read back from a file (tuples become lists, NumPy scalars numbers, NaN an
    :class:`Unreadable`), so that dicts built in memory and files are validated alike."""
    from .persistence import jsonable

    text = json.dumps(data, allow_nan=True, default=jsonable)
    return json.loads(text, parse_constant=_constant, parse_float=_float, parse_int=_int, object_pairs_hook=_object)


def plain_fault(data: Any) -> FieldFault | None:
    """The first unreadable token or over-deep nesting in document order, or None; iterative (no recursion)."""
    stack: list[tuple[Any, Path]] = [(data, ())]
    while stack:
        value, path = stack.pop()
        if isinstance(value, Unreadable):
            return FieldFault(path, value, value.expected)
        if isinstance(value, float) and not math.isfinite(value):
            return FieldFault(path, value, "a finite number")
        if isinstance(value, dict | list) and len(path) >= MAX_DEPTH:
            return FieldFault(path, value, f"at most {MAX_DEPTH} levels of nested arrays and objects")
        if isinstance(value, dict):
            stack.extend((v, (*path, k)) for k, v in reversed(list(value.items())))
        elif isinstance(value, list):
            stack.extend((v, (*path, i)) for i, v in reversed(list(enumerate(value))))
    return None


@cache
def _validator(name: str, envelope: bool) -> Draft202012Validator:
    return Draft202012Validator(ENVELOPES[name] if envelope else DOCUMENTS[name])


@cache
def _definition_validator(name: str) -> Draft202012Validator:
    return Draft202012Validator({"$schema": DRAFT, "$ref": f"#/$defs/{name}", "$defs": DEFS})


def schema_fault(data: Any, definition: str) -> FieldFault | None:
    """The first fault of ``data`` against one shared definition of :data:`groundkit.file_schemas.DEFS`
    (e.g. 'scan_point'), or None."""
    return _first(_definition_validator(definition), data)


Check = Callable[[Any], Iterable[FieldFault]]


def validate(data: Any, schema_name: str, source: str, checks: Iterable[Check] = ()) -> None:
    """Raise :class:`ResultFieldError` for the first fault of ``data`` as a ``schema_name`` file, in this order:
    unreadable tokens and nesting; schema name and version; the schema document; then ``checks`` (functions
    yielding :class:`FieldFault`, for what a schema cannot say)."""
    fault = plain_fault(data)
    if fault is None:
        fault = _first(_validator(schema_name, True), data)
    if fault is None:
        fault = _first(_validator(schema_name, False), data)
    for check in checks:
        if fault is not None:
            break
        fault = next(iter(check(data)), None)
    if fault is not None:
        raise fault.error(source)


def _first(validator: Draft202012Validator, data: Any) -> FieldFault | None:
    errors = list(validator.iter_errors(data))
    if not errors:
        return None
    return fault_of(min(errors, key=lambda e: _order(e.absolute_path)))


def _order(path: Iterable[str | int]) -> tuple:
    return tuple((0, p, "") if isinstance(p, int) else (1, 0, p) for p in path)


def fault_of(error: ValidationError) -> FieldFault:
    """The :class:`FieldFault` of one jsonschema error."""
    path: Path = tuple(error.absolute_path)
    schema = error.schema if isinstance(error.schema, dict) else {}
    if error.validator in ("anyOf", "oneOf") and error.context:
        inner = _matching_branch(error)
        if inner is not None:
            return fault_of(inner)
    if error.validator == "required":
        name = next(n for n in error.validator_value if n not in error.instance)
        return FieldFault((*path, name), None, describe(schema.get("properties", {}).get(name, {})), missing=True)
    if error.validator == "dependentRequired":
        for present, needed in error.validator_value.items():
            absent = [n for n in needed if present in error.instance and n not in error.instance]
            if absent:
                return FieldFault((*path, absent[0]), None, describe(schema.get("properties", {}).get(absent[0], {}))
                                  + f" (required beside {present!r})", missing=True)
    if error.validator == "additionalProperties" and error.validator_value is False:
        known = list(schema.get("properties", {}))
        extra = next(k for k in error.instance if k not in known)
        return FieldFault((*path, extra), error.instance[extra], "only the keys " + ", ".join(known))
    return FieldFault(path, error.instance, describe(schema))


def _matching_branch(error: ValidationError) -> ValidationError | None:
    """The first error of the one alternative whose type the value has (a molecule record against 'molecule or
    null'), or None when several alternatives, or none, fit the value's type."""
    fitting = [e for e in error.context if not (e.validator == "type" and len(e.path) == 0)]
    branches = {e.relative_schema_path[0] for e in fitting}
    if len(branches) != 1:
        return None
    return min(fitting, key=lambda e: _order(e.absolute_path))


def describe(schema: Any) -> str:
    """What a schema node accepts, in words: its ``description``, following ``$ref`` into the shared definitions."""
    if not isinstance(schema, dict):
        return "nothing (no value is accepted here)" if schema is False else "any JSON value"
    if "description" in schema:
        return str(schema["description"])
    ref = schema.get("$ref", "")
    if ref.startswith("#/$defs/") and ref[len("#/$defs/"):] in DEFS:
        return describe(DEFS[ref[len("#/$defs/"):]])
    if "const" in schema:
        return json.dumps(schema["const"])
    return f"a value of type {schema.get('type', 'JSON')}"


_KEY = re.compile(r"[A-Za-z0-9_\-]+")


def path_text(path: Path) -> str:
    """``history.energies[3]``; keys that are not plain words are quoted (``amplitudes["a b"]``), a run of four or
    more equal indices is shortened (``deep[0]×70``); 'the file' for the top level."""
    out, k = "", 0
    while k < len(path):
        part = path[k]
        if isinstance(part, int):
            run = 1
            while k + run < len(path) and path[k + run] == part:
                run += 1
            out += f"[{part}]" * run if run < 4 else f"[{part}]×{run}"
            k += run
            continue
        out += (f".{part}" if out else part) if _KEY.fullmatch(part) else f"[{json.dumps(part)}]"
        k += 1
    return out or "the file"


def shown(value: Any) -> str:
    """A short form of a value for a message (at most about 60 characters)."""
    if isinstance(value, Unreadable):
        text = value.text
    elif isinstance(value, float) and not math.isfinite(value):
        text = repr(value)
    elif isinstance(value, dict):
        keys = list(value)
        text = "an object with keys " + ", ".join(json.dumps(k) for k in keys[:4]) + (", ..." if len(keys) > 4
                                                                                      else "") if keys else "{}"
    elif isinstance(value, list) and len(value) > 6:
        text = f"a list of {len(value)} items"
    else:
        try:
            text = json.dumps(value, default=repr)
        except (ValueError, RecursionError):  # pragma: no cover - values reaching here are plain
            text = repr(value)
    return text if len(text) <= 60 else text[:57] + "..."


def _too_deep_at(text: str) -> tuple[int, int]:
    """(line, column) where nesting first exceeds MAX_DEPTH, strings skipped; only used after the parser gave up."""
    depth, in_string, escaped = 0, False, False
    line, column = 1, 0
    for char in text:
        column += 1
        if char == "\n":
            line, column = line + 1, 0
        if in_string:
            if escaped:
                escaped = False
            elif char == "\\":
                escaped = True
            elif char == '"':
                in_string = False
            continue
        if char == '"':
            in_string = True
        elif char in "[{":
            depth += 1
            if depth > MAX_DEPTH:
                return line, column
        elif char in "]}":
            depth -= 1
    return line, column
