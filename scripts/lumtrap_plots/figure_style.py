"""Figures: the common style, the caption line, and saving charts.

Every chart is a matplotlib Figure with a caption line at the bottom (scene
name · spectrum · "model estimate" · lumtrap version). `save_chart` writes
NAME.png and NAME.svg atomically (a temporary file renamed into place), the
SVG reproducibly: fixed `svg.hashsalt`, no date, ids of series set by the
chart modules (`series-<k>-...`), text kept as text (`svg.fonttype` none) so
labels stay readable and searchable. `svg_for_html` turns the SVG into an
element for inline use in the HTML report (no XML prolog, no namespace or
metadata URLs).
"""
from __future__ import annotations

import io
import os
import re
import tempfile

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

PNG_DPI = 110
CAPTION_SIZE = 7.5

STYLE = {
    "svg.hashsalt": "lumtrap",
    "svg.fonttype": "none",
    "font.family": "DejaVu Sans",
    "font.size": 9,
    "axes.titlesize": 9.5,
    "axes.labelsize": 9,
    "legend.fontsize": 7.5,
    "xtick.labelsize": 8,
    "ytick.labelsize": 8,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.grid": True,
    "grid.color": "#e4e4e4",
    "grid.linewidth": 0.6,
    "axes.axisbelow": True,
    "path.simplify": False,
    "figure.dpi": PNG_DPI,
}
plt.rcParams.update(STYLE)

SVG_METADATA = {"Date": None, "Creator": None, "Format": None, "Type": None}


class Chart:
    """A finished figure and the file stem it is saved under."""

    def __init__(self, name: str, fig, title: str, svg: bool = True):
        self.name = name      # file stem, also the report element id: chart-<name>
        self.fig = fig
        self.title = title    # one line for the report's figure caption
        self.svg = svg        # False: PNG only (images with a colour bar)


def new_figure(width_in: float, height_in: float, **kw):
    return plt.figure(figsize=(width_in, height_in), **kw)


def caption_text(scene_names: list[str], spectra: list[str], version: str, extra: str = "") -> str:
    names = "; ".join(dict.fromkeys(scene_names)) or "(unnamed scene)"
    if len(names) > 80:  # several long scene names: keep the caption on one line with the essentials
        names = names[:77] + "..."
    spec = " / ".join(dict.fromkeys(spectra)) or "spectrum unknown"
    parts = [names, spec, "model estimate"]
    if extra:
        parts.append(extra)
    parts.append(f"lumtrap {version}")
    return "  ·  ".join(parts)


def add_caption(fig, text: str) -> None:
    """The caption line at the bottom left of the figure."""
    if len(text) > 150:
        text = text[:147] + "..."
    fig.text(0.01, 0.008, text, ha="left", va="bottom", fontsize=CAPTION_SIZE, color="#444444",
             gid="caption")


def _atomic_write(path: str, data: bytes) -> None:
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(prefix=".tmp-", dir=folder)
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


_CLIP_ID = re.compile(rb'<clipPath id="([^"]+)"')


def svg_bytes(fig) -> bytes:
    """The figure as SVG, reproducible: matplotlib names the clip path of a
    non-rectangular clip (e.g. a polar plot) from a memory address, so clip
    paths are renamed clip1, clip2, ... in the order they are defined."""
    buf = io.BytesIO()
    fig.savefig(buf, format="svg", metadata=SVG_METADATA)
    data = buf.getvalue()
    names = list(dict.fromkeys(_CLIP_ID.findall(data)))
    for n, old in enumerate(names, 1):
        new = b"clip%d" % n
        data = data.replace(b'id="' + old + b'"', b'id="' + new + b'"').replace(b"url(#" + old + b")",
                                                                                 b"url(#" + new + b")")
    return data


def png_bytes(fig) -> bytes:
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=PNG_DPI, metadata={"Software": None})
    return buf.getvalue()


def save_chart(chart: Chart, folder: str) -> list[str]:
    """Writes the chart's PNG (and SVG) into `folder`; returns the paths."""
    written = []
    png = os.path.join(folder, chart.name + ".png")
    _atomic_write(png, png_bytes(chart.fig))
    written.append(png)
    if chart.svg:
        svg = os.path.join(folder, chart.name + ".svg")
        _atomic_write(svg, svg_bytes(chart.fig))
        written.append(svg)
    return written


def close(chart: Chart) -> None:
    plt.close(chart.fig)


_PROLOG = re.compile(rb"^.*?(?=<svg[\s>])", re.S)
_METADATA = re.compile(rb"<metadata>.*?</metadata>\s*", re.S)
_NAMESPACES = re.compile(rb'\s+xmlns(:\w+)?="[^"]*"')


def svg_for_html(svg: bytes, element_id: str) -> str:
    """The SVG as an inline element with id `element_id`: without the XML
    prolog and DOCTYPE, metadata and namespace declarations (the HTML parser
    puts <svg> and xlink:href into their namespaces by itself), and with its
    internal ids prefixed so that several charts can share one page."""
    s = _PROLOG.sub(b"", svg, count=1)
    s = _METADATA.sub(b"", s)
    s = _NAMESPACES.sub(b"", s)
    text = s.decode("utf-8")
    prefix = element_id + "--"
    text = re.sub(r'\bid="([^"]+)"', lambda m: f'id="{prefix}{m.group(1)}"', text)
    text = re.sub(r'url\(#([^)]+)\)', lambda m: f"url(#{prefix}{m.group(1)})", text)
    text = re.sub(r'href="#([^"]+)"', lambda m: f'href="#{prefix}{m.group(1)}"', text)
    text = text.replace("<svg ", f'<svg id="{element_id}" role="img" ', 1)
    return text
