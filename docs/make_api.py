"""Write docs/api.md, the API reference, from the docstrings of ``groundkit.__all__``.

Run ``python docs/make_api.py`` (or ``make docs``) after changing a public name or its docstring;
``tests/test_docs.py`` fails while docs/api.md differs from what this script writes.
``python docs/make_api.py PATH`` writes to PATH instead.
"""

from __future__ import annotations

import inspect
import re
import sys
from pathlib import Path

import groundkit

OUTPUT = Path(__file__).resolve().parent / "api.md"
ADDRESS = re.compile(r" at 0x[0-9a-fA-F]+")

HEADER = """# API reference

Generated from the docstrings by `docs/make_api.py` (`make docs`); do not edit by hand. Every name below is in
`groundkit.__all__` and is reached as `gk.<name>` after `import groundkit as gk`. Energies are in Hartree and
angles in radians unless a line says otherwise. The pages linked from [index.md](index.md) explain how the pieces
fit together; [guide.md](guide.md) is the place to start.
"""


def paragraph(obj) -> str:
    """First paragraph of a docstring, joined onto one line."""
    doc = inspect.getdoc(obj) or ""
    first = doc.strip().split("\n\n")[0]
    return " ".join(line.strip() for line in first.splitlines()).strip()


def cell(text: str) -> str:
    """Text made safe for a Markdown table cell."""
    return text.replace("|", "\\|")


def signature(obj) -> str:
    """The call signature, with memory addresses removed so that the text is stable."""
    try:
        text = str(inspect.signature(obj))
    except (TypeError, ValueError):
        return "(...)"
    return ADDRESS.sub("", text)


def kind(obj) -> str:
    if inspect.isclass(obj):
        if issubclass(obj, Warning):
            return "warning"
        if issubclass(obj, BaseException):
            return "error"
        return "class"
    if inspect.ismodule(obj):
        return "module"
    if callable(obj):
        return "function"
    return "constant"


def public_base(cls) -> type | None:
    """The nearest proper base class that is itself a public name of groundkit."""
    for base in cls.__mro__[1:]:
        if base.__module__.split(".")[0] == "groundkit" and getattr(groundkit, base.__name__, None) is base:
            return base
    return None


def own_classes(cls) -> list[type]:
    """The class and its groundkit bases up to (not including) its nearest public base, most derived first."""
    stop = public_base(cls)
    chain = []
    for base in cls.__mro__:
        if base is stop:
            break
        if base.__module__.split(".")[0] == "groundkit":
            chain.append(base)
    return chain


def members(cls) -> list[tuple[str, str, object]]:
    """Public methods and properties a class defines (or takes from private groundkit bases), sorted by name."""
    found: dict[str, tuple[str, object]] = {}
    for base in reversed(own_classes(cls)):
        for name, value in vars(base).items():
            if name.startswith("_"):
                continue
            if isinstance(value, property):
                found[name] = ("property", value.fget)
            elif isinstance(value, classmethod):
                found[name] = ("method", getattr(cls, name))
            elif isinstance(value, staticmethod):
                found[name] = ("method", value.__func__)
            elif inspect.isfunction(value):
                found[name] = ("method", value)
    return [(name, *found[name]) for name in sorted(found)]


def class_section(name: str, cls) -> list[str]:
    lines = [f"### `{name}{signature(cls)}`", "", paragraph(cls) or "(no docstring)", ""]
    base = public_base(cls)
    if base is not None:
        lines += [f"Also has the methods of `{base.__name__}`.", ""]
    rows = members(cls)
    if rows:
        for member, what, func in rows:
            text = paragraph(func)
            if what == "property":
                lines.append(f"- `{member}` (property){': ' + text if text else ''}")
            else:
                lines.append(f"- `{member}{signature(func)}`{': ' + text if text else ''}")
        lines.append("")
    return lines


def function_section(name: str, func) -> list[str]:
    return [f"### `{name}{signature(func)}`", "", paragraph(func) or "(no docstring)", ""]


def render() -> str:
    names = sorted(groundkit.__all__, key=str.lower)
    groups: dict[str, list[str]] = {}
    for name in names:
        groups.setdefault(kind(getattr(groundkit, name)), []).append(name)

    out = [HEADER]
    out += ["## Classes", ""]
    for name in groups.get("class", []):
        out += class_section(name, getattr(groundkit, name))
    out += ["## Functions", ""]
    for name in groups.get("function", []):
        out += function_section(name, getattr(groundkit, name))
    out += ["## Constants", "", "| name | value |", "|---|---|"]
    for name in groups.get("constant", []):
        out.append(f"| `{name}` | `{getattr(groundkit, name)!r}` |")
    out += ["", "## Modules", ""]
    for name in groups.get("module", []):
        out.append(f"- `gk.{name}`: {paragraph(getattr(groundkit, name))}")
    out += ["", "## Errors and warnings", "",
            "Every error is a subclass of `GroundkitError`, itself a `ValueError` (see [errors.md](errors.md)).", "",
            "| name | base | meaning |", "|---|---|---|"]
    for name in groups.get("error", []) + groups.get("warning", []):
        cls = getattr(groundkit, name)
        out.append(f"| `{name}` | `{cls.__bases__[0].__name__}` | {cell(paragraph(cls))} |")
    return "\n".join(out).rstrip() + "\n"


def main(argv: list[str]) -> None:
    target = Path(argv[1]) if len(argv) > 1 else OUTPUT
    target.write_text(render(), encoding="utf-8")
    print(f"wrote {target}")


if __name__ == "__main__":
    main(sys.argv)
