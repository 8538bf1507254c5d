"""A real browser draws the live view: a notebook executed with its widget state stored, exported to HTML by
nbconvert and rendered by headless Chromium (Debian's ``chromium`` package, installed by ``.ci/run``).

The widgets are rendered by the standalone Jupyter widget manager (``@jupyter-widgets/html-manager``, fetched
once with npm into ``build/``), served from a local file because the browser has no network here.
"""

from __future__ import annotations

import shutil
import subprocess
import tarfile
from pathlib import Path

import numpy as np
import pytest

pytestmark = pytest.mark.slow

ROOT = Path(__file__).resolve().parents[2]
CACHE = ROOT / "build" / "browser-check"
HTML_MANAGER = "@jupyter-widgets/html-manager@1.0.15"  # the widget manager for ipywidgets 8
TRIAL_BLUE = np.array([0x00, 0x72, 0xB2]) / 255  # groundkit.widgets.palette.TRIAL
EXACT_VERMILION = np.array([0xD5, 0x5E, 0x00]) / 255  # groundkit.widgets.palette.EXACT

CELLS = [
    "import groundkit as gk",
    "h2 = gk.MoleculeSpec(symbols=('H', 'H'), coordinates=((0, 0, 0), (0, 0, 0.7414)), name='hydrogen')",
    "result = gk.Pipeline(h2).run(live=True)",
]


def chromium() -> str:
    for name in ("chromium", "chromium-browser"):
        if shutil.which(name):
            return shutil.which(name)
    pytest.skip("headless Chromium is not installed (Debian package 'chromium'; .ci/run installs it): "
                "the browser check did not run")


def widget_renderer() -> Path:
    """embed.js of the standalone widget manager, fetched with npm on first use."""
    target = CACHE / "embed.js"
    if target.exists():
        return target
    if shutil.which("npm") is None:
        pytest.skip(f"npm is not installed, so {HTML_MANAGER} (the widget renderer) cannot be fetched: "
                    "the browser check did not run")
    CACHE.mkdir(parents=True, exist_ok=True)
    done = subprocess.run(["npm", "pack", "--silent", HTML_MANAGER, "--pack-destination", str(CACHE)],
                          capture_output=True, text=True, timeout=300)
    packs = sorted(CACHE.glob("jupyter-widgets-html-manager-*.tgz"))
    if done.returncode != 0 or not packs:
        pytest.skip(f"npm could not fetch {HTML_MANAGER}: {done.stderr.strip()[:300]}; the browser check did not run")
    with tarfile.open(packs[-1]) as pack:
        source = pack.extractfile("package/dist/embed.js")
        target.write_bytes(source.read())
    return target


def executed_notebook(tmp_path: Path):
    import nbformat
    from nbclient import NotebookClient

    nb = nbformat.v4.new_notebook(cells=[nbformat.v4.new_code_cell(c) for c in CELLS])
    NotebookClient(nb, timeout=300, kernel_name="python3", store_widget_state=True,
                   resources={"metadata": {"path": str(tmp_path)}}).execute()
    assert "application/vnd.jupyter.widget-state+json" in nb.metadata["widgets"]
    return nb


def screenshot(browser: str, nb, renderer_url: str, tmp_path: Path, name: str) -> np.ndarray:
    import matplotlib.image
    from nbconvert import HTMLExporter

    exporter = HTMLExporter(template_name="lab", exclude_input=True)
    exporter.widget_renderer_url = renderer_url
    exporter.require_js_url = ""
    body, _ = exporter.from_notebook_node(nb)
    page = tmp_path / f"{name}.html"
    page.write_text(body, encoding="utf-8")
    picture = tmp_path / f"{name}.png"
    profile = tmp_path / f"profile-{name}"
    subprocess.run([browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
                    "--disable-background-networking", "--disable-component-update", "--disable-sync",
                    "--hide-scrollbars", f"--user-data-dir={profile}", "--virtual-time-budget=20000",
                    f"--screenshot={picture}", "--window-size=1200,900", page.as_uri()],
                   capture_output=True, timeout=180, check=False)
    assert picture.exists(), "Chromium wrote no screenshot"
    return matplotlib.image.imread(str(picture))[..., :3]


def coloured(pixels: np.ndarray, colour: np.ndarray, tolerance: float = 0.08) -> np.ndarray:
    return np.all(np.abs(pixels - colour) < tolerance, axis=-1)


def test_live_view_is_drawn_in_a_browser(tmp_path):
    browser = chromium()
    renderer = widget_renderer()
    nb = executed_notebook(tmp_path)
    drawn = screenshot(browser, nb, renderer.as_uri(), tmp_path, "with-widgets")
    blue, vermilion = coloured(drawn, TRIAL_BLUE), coloured(drawn, EXACT_VERMILION)
    assert blue.sum() > 2000 and vermilion.sum() > 2000, "the plot area is blank: no trial or exact marks drawn"
    rows, columns = np.nonzero(blue | vermilion)
    assert np.ptp(columns) > 300 and np.ptp(rows) > 100, "the coloured marks do not span a plot area"
    # control: the same page without a widget renderer shows no plot, so the picture above is the widget's
    bare = screenshot(browser, nb, (tmp_path / "missing.js").as_uri(), tmp_path, "without-widgets")
    assert coloured(bare, TRIAL_BLUE).sum() < 50
