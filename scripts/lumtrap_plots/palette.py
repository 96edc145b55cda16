"""Colours of the charts: one categorical palette and one sequential colour map.

Inputs: none. Outputs: hex sRGB colours; `bin_colours` assigns them to end
states by group; `SEQUENTIAL` is a matplotlib colour map (dark to light).

How the palette was chosen (common practice, not a published palette): a
greedy max-min search over an 18-level sRGB grid picked, one at a time, the
colour whose smallest CIE 1976 L*a*b* difference (CIE 15:2004) to the colours
already chosen is largest, at once for normal vision and for simulated
protanopia, deuteranopia and tritanopia (Machado, Oliveira & Fernandes, "A
physiologically-based model for simulation of color vision deficiency",
IEEE TVCG 15, 1291, 2009; severity 1.0 matrices below, from memory), within
30 <= L* <= 80 and chroma <= 75 so that every colour shows on white. Starting
from a dark blue, ten colours keep at least ΔE = 20 between any two in all
four visions; `palette_min_difference()` recomputes this and
tests/cli/test_plots.sh checks it. Lines additionally differ by marker and
dash so that series stay apart in grey-scale print.
"""
from __future__ import annotations

import math

# role colours first, then the pool for parasitic and unknown groups
SILICON = "#1e4b96"      # dark blue: absorbed in silicon (J_G)
REFLECTION = "#e1691e"   # orange
ESCAPE = "#87b4ff"       # light blue
TRANSMISSION = "#d2b4b4"  # pale rose
NUMERICAL = "#786987"    # grey violet
POOL = ["#693c2d", "#a5d269", "#8778f0", "#c3785a", "#963c00"]
PALETTE = [SILICON, REFLECTION, ESCAPE, TRANSMISSION, NUMERICAL] + POOL

# for series of lines (folders, sweep series): darker colours first
LINE_COLOURS = [SILICON, REFLECTION, "#693c2d", "#8778f0", ESCAPE, "#963c00", NUMERICAL, "#a5d269",
                "#c3785a", TRANSMISSION]
LINE_MARKERS = ["o", "s", "^", "D", "v", "P", "X", "<", ">", "*"]
LINE_DASHES = ["-", "--", "-.", ":"]

# the order of groups in stacks and tables; unknown groups come after, by name
GROUP_ORDER = ["generation", "parasitic", "shading", "transmission", "escape", "reflection", "numerical"]
GROUP_COLOUR = {"generation": SILICON, "reflection": REFLECTION, "escape": ESCAPE,
                "transmission": TRANSMISSION, "numerical": NUMERICAL}

# Machado et al. 2009, severity 1.0, acting on linear sRGB (from memory)
CVD_MATRICES = {
    "normal": ((1, 0, 0), (0, 1, 0), (0, 0, 1)),
    "protanopia": ((0.152286, 1.052583, -0.204868), (0.114503, 0.786281, 0.099216),
                   (-0.003882, -0.048116, 1.051998)),
    "deuteranopia": ((0.367322, 0.860646, -0.227968), (0.280085, 0.672501, 0.047413),
                     (-0.011820, 0.042940, 0.968881)),
    "tritanopia": ((1.255528, -0.076749, -0.178779), (-0.078411, 0.930809, 0.147602),
                   (0.004733, 0.691367, 0.303900)),
}

# sequential map for images and heat maps: lightness rises monotonically
SEQUENTIAL_STOPS = ["#101a33", "#1e4b96", "#4f88c6", "#8fc1b8", "#e8e6a6"]


def line_style(k: int) -> dict:
    """Colour, marker and dash of series k."""
    return {"color": LINE_COLOURS[k % len(LINE_COLOURS)], "marker": LINE_MARKERS[k % len(LINE_MARKERS)],
            "linestyle": LINE_DASHES[(k // len(LINE_COLOURS)) % len(LINE_DASHES)]}


def group_rank(group: str) -> tuple:
    return (GROUP_ORDER.index(group), "") if group in GROUP_ORDER else (len(GROUP_ORDER), group)


def bin_colours(bins: list[tuple[str, str]]) -> dict[str, str]:
    """Colour per bin name for (name, group) pairs: the first bin of the
    generation, reflection, escape, transmission and numerical groups gets its
    role colour, every other bin the next colour of the pool (cycling)."""
    out: dict[str, str] = {}
    used_roles: set[str] = set()
    k = 0
    for name, group in bins:
        if group in GROUP_COLOUR and group not in used_roles:
            out[name] = GROUP_COLOUR[group]
            used_roles.add(group)
        else:
            out[name] = POOL[k % len(POOL)]
            k += 1
    return out


def _linear(c: float) -> float:  # IEC 61966-2-1 (sRGB) transfer function
    return c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4


def lab_of(hex_colour: str, vision: str = "normal") -> tuple[float, float, float]:
    """CIE L*a*b* (D65) of an sRGB colour as seen with `vision`."""
    rgb = [_linear(int(hex_colour[i:i + 2], 16) / 255) for i in (1, 3, 5)]
    m = CVD_MATRICES[vision]
    rgb = [min(1.0, max(0.0, sum(m[r][c] * rgb[c] for c in range(3)))) for r in range(3)]
    xyz_m = ((0.4124, 0.3576, 0.1805), (0.2126, 0.7152, 0.0722), (0.0193, 0.1192, 0.9505))
    white = [sum(row) for row in xyz_m]
    xyz = [sum(xyz_m[r][c] * rgb[c] for c in range(3)) / white[r] for r in range(3)]
    f = [v ** (1 / 3) if v > (6 / 29) ** 3 else v / (3 * (6 / 29) ** 2) + 4 / 29 for v in xyz]
    return 116 * f[1] - 16, 500 * (f[0] - f[1]), 200 * (f[1] - f[2])


def palette_min_difference(colours: list[str] = PALETTE) -> float:
    """Smallest ΔE*ab between two palette colours over the four visions."""
    best = math.inf
    for vision in CVD_MATRICES:
        labs = [lab_of(c, vision) for c in colours]
        for i in range(len(labs)):
            for j in range(i):
                best = min(best, math.dist(labs[i], labs[j]))
    return best


def sequential_cmap():
    from matplotlib.colors import LinearSegmentedColormap
    return LinearSegmentedColormap.from_list("lumtrap_sequential", SEQUENTIAL_STOPS, N=256)
