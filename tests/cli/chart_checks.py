"""Checks of chart files, shared by the plot and report tests.

  python3 chart_checks.py svg FILE --series N [--label TEXT]...   SVG exists, is well-formed XML,
        holds every label as text, the caption ("model estimate"), and exactly N distinct series
        (ids series-<k>-..., set by scripts/lumtrap_plots)
  python3 chart_checks.py png FILE...                             PNG decodes and is not blank
  python3 chart_checks.py same FILE_A FILE_B                      identical bytes (reproducible SVG)

Exit 0, or 1 with a line naming the file and what is wrong.
"""
import re
import sys
import xml.etree.ElementTree as ET


def fail(msg):
    print(f"FAIL: {msg}", file=sys.stderr)
    sys.exit(1)


def svg_texts(path):
    try:
        root = ET.parse(path).getroot()
    except (OSError, ET.ParseError) as e:
        fail(f"{path}: not a readable SVG ({e})")
    texts = ["".join(t.itertext()) for t in root.iter() if t.tag.endswith("}text") or t.tag == "text"]
    ids = [el.get("id") for el in root.iter() if el.get("id")]
    return texts, ids


def check_svg(path, series, labels):
    texts, ids = svg_texts(path)
    joined = "\n".join(texts)
    for label in labels + ["model estimate"]:
        if label not in joined:
            fail(f"{path}: text {label!r} not found (texts: {texts[:12]}...)")
    found = sorted({int(m.group(1)) for i in ids for m in [re.match(r"series-(\d+)-", i)] if m})
    if len(found) != series:
        fail(f"{path}: {len(found)} series {found}, expected {series}")
    print(f"ok: {path}: {series} series, labels {labels}")


def check_png(path):
    import matplotlib
    matplotlib.use("Agg")
    import matplotlib.image as mpimg
    try:
        img = mpimg.imread(path)
    except Exception as e:  # noqa: BLE001 - any decoding problem is a failure
        fail(f"{path}: not a readable PNG ({e})")
    rgb = img[..., :3]
    h, w = rgb.shape[:2]
    nonwhite = float((rgb.min(axis=-1) < 0.9).mean())
    if h < 100 or w < 100 or rgb.std() < 0.05 or nonwhite < 0.02:
        fail(f"{path}: looks blank ({w}x{h} px, pixel sd {rgb.std():.3f}, non-white {nonwhite:.3f})")
    print(f"ok: {path}: {w}x{h} px, pixel sd {rgb.std():.3f}, non-white {100 * nonwhite:.1f} %")


def main(argv):
    kind = argv[0]
    if kind == "svg":
        path, series, labels = argv[1], None, []
        i = 2
        while i < len(argv):
            if argv[i] == "--series":
                series = int(argv[i + 1])
            elif argv[i] == "--label":
                labels.append(argv[i + 1])
            i += 2
        check_svg(path, series, labels)
    elif kind == "png":
        for p in argv[1:]:
            check_png(p)
    elif kind == "same":
        a, b = (open(p, "rb").read() for p in argv[1:3])
        if a != b:
            fail(f"{argv[1]} and {argv[2]} differ: the SVG is not reproducible")
        print(f"ok: {argv[1]} is byte-identical when drawn again")
    else:
        fail(f"unknown check {kind}")


if __name__ == "__main__":
    main(sys.argv[1:])
