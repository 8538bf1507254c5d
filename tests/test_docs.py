"""The documentation stays true to the code: the generated API reference and every relative link."""

from __future__ import annotations

import importlib.util
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
DOCS = ROOT / "docs"
LINK = re.compile(r"\[[^\]]*\]\(([^)\s]+)\)")
FENCE = re.compile(r"^```.*?^```", re.MULTILINE | re.DOTALL)


def load_generator():
    spec = importlib.util.spec_from_file_location("make_api", DOCS / "make_api.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_api_reference_matches_docstrings(tmp_path):
    target = tmp_path / "api.md"
    load_generator().main(["make_api.py", str(target)])
    assert target.read_text(encoding="utf-8") == (DOCS / "api.md").read_text(encoding="utf-8"), (
        "docs/api.md is out of date: run `make docs`")


def test_api_reference_lists_every_public_name():
    import groundkit

    text = (DOCS / "api.md").read_text(encoding="utf-8")
    missing = [name for name in groundkit.__all__ if f"`{name}" not in text and f"`gk.{name}`" not in text]
    assert missing == []


def relative_links(path: Path) -> list[str]:
    text = FENCE.sub("", path.read_text(encoding="utf-8"))
    links = []
    for target in LINK.findall(text):
        if re.match(r"^[a-z][a-z0-9+.-]*:", target) or target.startswith("#"):
            continue                                     # URLs, mailto:, anchors on the same page
        links.append(target.split("#")[0])
    return links


PAGES = sorted(DOCS.glob("*.md")) + [ROOT / "README.md"]


@pytest.mark.parametrize("page", PAGES, ids=lambda p: p.name)
def test_relative_links_point_to_existing_files(page):
    broken = [target for target in relative_links(page) if not (page.parent / target).exists()]
    assert broken == [], f"{page.name} links to missing files: {broken}"


def test_index_and_readme_link_the_guide_methods_and_api():
    index = relative_links(DOCS / "index.md")
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    for page in ("guide.md", "methods.md", "api.md"):
        assert page in index
        assert f"docs/{page}" in readme
