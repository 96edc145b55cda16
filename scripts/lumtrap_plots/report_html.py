"""`lumtrap report`: one self-contained HTML file per result, sweep or fit folder.

Input: folders (as for plot_files), --out (one folder only) and the
Context facts. Output: FOLDER/report.html (or --out), written atomically,
that opens in any browser from disk: charts inline as SVG, angle-map
images as PNG data URIs, styles and the one small script inline, and a
Content-Security-Policy that forbids loading anything from anywhere
(nothing is fetched; no http(s) URL appears in the file).

Charts that `lumtrap plot` has drawn since the folder last changed are
taken from FOLDER/plots/ instead of being drawn again.

A result report: J_max, J_G and every loss with ±1σ (table-currents), the
warnings (list-warnings), the charts (chart-<name>), the run facts
(table-run) and the resolved scene (scene-toml). A sweep report: best
variant, sweep facts (table-sweep), charts, the table of variants
(table-variants), missing variants and warnings. A fit report: the
parameters with standard errors and correlations (table-parameters), the
fit facts (table-fit) and the fit chart. Every number is labelled
a model estimate. The script makes tables sortable and sets
data-ready="yes" on <body> once it has run, which the Chromium test reads.
"""
from __future__ import annotations

import base64
import html
import math
import os

from . import charts as charts_mod
from .errors import PlotError
from .figure_style import _atomic_write, close, png_bytes, svg_bytes, svg_for_html
from .parallel import run_all
from .plot_files import read_folders
from .result_folder import SILICON_BIN
from . import palette

CSP = "default-src 'none'; img-src data:; style-src 'unsafe-inline'; script-src 'unsafe-inline'"

CSS = """
body{font-family:"DejaVu Sans",Verdana,sans-serif;margin:0;color:#1b1b1b;background:#fafafa;font-size:14px}
header{background:#1e4b96;color:#fff;padding:14px 24px}
header h1{margin:0 0 4px 0;font-size:22px}
.estimate{background:#fff3e8;border-left:5px solid #e1691e;padding:8px 14px;margin:14px 24px}
main{padding:0 24px 24px 24px;max-width:1180px}
section{margin-top:22px}
h2{font-size:17px;border-bottom:1px solid #ccc;padding-bottom:3px}
table{border-collapse:collapse;background:#fff;font-size:13px}
th,td{border:1px solid #d4d4d4;padding:3px 8px;text-align:left;vertical-align:top}
th{background:#eef2f8;cursor:pointer}
td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
tr.best td{background:#fff0d9;font-weight:bold}
figure{margin:14px 0;background:#fff;border:1px solid #ddd;padding:8px;max-width:100%}
figure svg,figure img{max-width:100%;height:auto;display:block}
figcaption{font-size:12px;color:#444;margin-top:4px}
pre{background:#fff;border:1px solid #ddd;padding:10px;overflow:auto;font-size:12px}
ul.warnings li{color:#8a3a00}
footer{color:#666;font-size:12px;padding:12px 24px}
"""

SCRIPT = """
(function(){
  function key(td){var v=td.getAttribute('data-sort');if(v!==null&&v!==''){var n=parseFloat(v);if(!isNaN(n))return n;}
    return td.textContent.trim();}
  document.querySelectorAll('table.sortable').forEach(function(t){
    t.querySelectorAll('thead th').forEach(function(th,i){
      th.title='sort by this column';
      th.addEventListener('click',function(){
        var body=t.tBodies[0],rows=Array.prototype.slice.call(body.rows);
        var asc=th.getAttribute('data-order')!=='asc';th.setAttribute('data-order',asc?'asc':'desc');
        rows.sort(function(a,b){var x=key(a.cells[i]),y=key(b.cells[i]);
          var c=(typeof x==='number'&&typeof y==='number')?x-y:String(x).localeCompare(String(y));return asc?c:-c;});
        rows.forEach(function(r){body.appendChild(r);});
      });
    });
  });
  var charts=document.querySelectorAll('figure.chart svg, figure.chart img').length;
  document.body.setAttribute('data-charts',String(charts));
  document.body.setAttribute('data-ready','yes');
})();
"""

esc = html.escape


def fmt_pm(v: float, s: float, digits: int = 3) -> str:
    if s == 0:
        return f"{v:.{digits}f}"
    return f"{v:.{digits}f} ± {s:.{digits}f}"


def _page(title: str, subtitle: str, body: str, version: str) -> str:
    return (
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
        f"<meta http-equiv=\"Content-Security-Policy\" content=\"{CSP}\">\n"
        "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
        f"<title>{esc(title)} — lumtrap report (model estimate)</title>\n<style>{CSS}</style>\n</head>\n"
        f"<body>\n<header><h1 id=\"report-title\">{esc(title)}</h1><div>{esc(subtitle)}</div></header>\n"
        "<p class=\"estimate\" id=\"model-estimate\"><strong>Model estimate.</strong> Every number and chart here "
        "comes from lumtrap's optical model (geometric optics with the optical constants shipped in materials/), "
        "not from a measurement. The ± values are statistical standard errors (1σ) of the Monte Carlo sampling; "
        "they say how well the model was sampled, not how close the model is to a real wafer.</p>\n"
        f"<main>\n{body}\n</main>\n<footer>Written by lumtrap {esc(version)} (lumtrap report). "
        "Self-contained: nothing in this page is loaded from elsewhere.</footer>\n"
        f"<script>{SCRIPT}</script>\n</body>\n</html>\n")


def _drawn_already(chart, folder: str, inputs: list[str], version: str) -> bytes | None:
    """The chart as `lumtrap plot` wrote it into FOLDER/plots/, when that file
    is newer than every input file and carries this lumtrap version in its
    caption (charts are reproducible, so it equals a fresh drawing); else None."""
    path = os.path.join(folder, "plots", chart.name + (".svg" if chart.svg else ".png"))
    try:
        made = os.path.getmtime(path)
        if any(os.path.getmtime(f) > made for f in inputs if os.path.exists(f)):
            return None
        with open(path, "rb") as f:
            data = f.read()
    except OSError:
        return None
    if chart.svg and f"lumtrap {version}".encode() not in data:
        return None
    return data


def _figure(chart, cached: bytes | None = None) -> str:
    fid = f"chart-{chart.name}"
    if chart.svg:
        inner = svg_for_html(cached or svg_bytes(chart.fig), fid + "-svg")
    else:
        data = base64.b64encode(cached or png_bytes(chart.fig)).decode("ascii")
        inner = f'<img id="{fid}-img" alt="{esc(chart.title)}" src="data:image/png;base64,{data}">'
    close(chart)
    return f'<figure class="chart" id="{fid}">{inner}<figcaption>{esc(chart.title)} (model estimate)</figcaption></figure>'


def _charts_section(chart_list, skipped, folder: str, inputs: list[str], version: str) -> str:
    parts = ['<section id="charts"><h2>Charts</h2>']
    parts += [_figure(c, _drawn_already(c, folder, inputs, version)) for c in chart_list]
    if skipped:
        parts.append("<p>Not drawn: " + esc("; ".join(skipped)) + "</p>")
    parts.append("</section>")
    return "\n".join(parts)


def _warnings(ws: list[str], extra: dict[str, list[str]] | None = None) -> str:
    items = [f"<li>{esc(w)}</li>" for w in ws]
    if extra:
        items += [f"<li>{esc(w)} <small>({esc(', '.join(ids[:12]))}{', ...' if len(ids) > 12 else ''})</small></li>"
                  for w, ids in extra.items()]
    body = "<ul class=\"warnings\" id=\"list-warnings\">" + "".join(items) + "</ul>" if items else \
        "<p id=\"list-warnings\">No warnings.</p>"
    return f'<section id="warnings"><h2>Warnings</h2>{body}</section>'


def _fact(v) -> str:
    if isinstance(v, float):
        return f"{v:.6g}"
    if isinstance(v, list):
        return ", ".join(_fact(x) for x in v)
    if isinstance(v, dict):
        return ", ".join(f"{k} = {_fact(x)}" for k, x in v.items())
    return str(v)


def result_report(r, ctx) -> str:
    s = r.summary
    jmax = float(s["J_max_mA_cm2"])
    rows = [f'<tr><td>J_max</td><td>all photons of the spectrum, {esc(_fact(s.get("wavelength_range_nm", "")))} nm'
            f'</td><td></td><td class="num" data-sort="{jmax}">{jmax:.3f}</td><td class="num">100.0</td></tr>']
    for b in sorted(r.bins, key=lambda b: palette.group_rank(b.group)):
        label = "J_G (absorbed_silicon)" if b.name == SILICON_BIN else b.name
        rows.append(f'<tr><td>{esc(label)}</td><td>{esc(b.meaning)}</td><td>{esc(b.group)}</td>'
                    f'<td class="num" data-sort="{b.mA_cm2}">{fmt_pm(b.mA_cm2, b.sigma_mA_cm2)}</td>'
                    f'<td class="num">{100 * b.mA_cm2 / jmax if jmax else 0:.2f}</td></tr>')
    rows.append(f'<tr><td>closure</td><td>J_G + losses − J_max (round-off)</td><td></td>'
                f'<td class="num">{float(s.get("closure_mA_cm2", 0)):.2e}</td><td></td></tr>')
    err = "exact solver: no sampling error" if r.exact else "±1σ statistical"
    currents = ('<section id="currents"><h2>Currents (mA/cm², model estimate)</h2>'
                f'<p>Under {esc(r.spectrum)}; errors: {err}.</p>'
                '<table id="table-currents" class="sortable"><thead><tr><th>quantity</th><th>meaning</th>'
                '<th>group</th><th>mA/cm²</th><th>% of J_max</th></tr></thead><tbody>'
                + "".join(rows) + "</tbody></table></section>")
    chart_list, skipped = charts_mod.result_charts(r, ctx)
    facts = "".join(f"<tr><td>{esc(k)}</td><td>{esc(_fact(v))}</td></tr>" for k, v in s.items()
                    if k not in ("losses", "warnings") and not (k == "parameters" and not v))
    run = ('<section id="run"><h2>Run facts</h2><table id="table-run"><thead><tr><th>key (summary.json)</th>'
           f'<th>value</th></tr></thead><tbody><tr><td>folder</td><td>{esc(os.path.abspath(r.path))}</td></tr>'
           + facts + "</tbody></table></section>")
    scene = ('<section id="scene"><h2>Resolved scene (scene.toml)</h2>'
             f'<pre id="scene-toml">{esc(r.scene_toml or "(scene.toml is missing)")}</pre></section>')
    inputs = [os.path.join(r.path, f) for f in os.listdir(r.path)] + r.absorption_maps
    inputs = [f for f in inputs if os.path.isfile(f) and os.path.basename(f) != "report.html"]
    body = "\n".join([currents, _warnings(list(s.get("warnings", []))),
                      _charts_section(chart_list, skipped, r.path, inputs, ctx.version), run, scene])
    jg = r.bin(SILICON_BIN)
    subtitle = (f"J_G = {fmt_pm(jg.mA_cm2, jg.sigma_mA_cm2)} mA/cm² of J_max {jmax:.3f} mA/cm² · "
                f"{s.get('method', '')} · {r.spectrum} · model estimate")
    return _page(r.scene_name, subtitle, body, ctx.version)


def sweep_report(sw, ctx) -> str:
    best = sw.best
    params = sw.parameters
    losses = list(sw.losses)
    head = ("<tr><th>id</th>" + "".join(f"<th>{esc(p.column)}</th>" for p in params)
            + "<th>J_G [mA/cm²]</th>" + "".join(f"<th>{esc(n)} [mA/cm²]</th>" for n in losses)
            + "<th>photons</th></tr>")
    rows = []
    for k, vid in enumerate(sw.ids):
        cells = [f"<td>{esc(vid)}</td>"]
        for p in params:
            sort = f' data-sort="{p.numeric[k]}"' if p.numeric is not None else ""
            cells.append(f'<td class="num"{sort}>{esc(p.values[k])}</td>')
        cells.append(f'<td class="num" data-sort="{sw.J_G[k]}">{fmt_pm(sw.J_G[k], sw.J_G_sigma[k])}</td>')
        for n in losses:
            v, e = sw.losses[n]
            cells.append(f'<td class="num" data-sort="{v[k]}">{fmt_pm(v[k], e[k])}</td>')
        cells.append(f'<td class="num" data-sort="{sw.photons[k]}">{int(sw.photons[k])}</td>')
        cls = ' class="best"' if k == best else ""
        rows.append(f'<tr{cls} id="variant-{esc(vid)}">' + "".join(cells) + "</tr>")
    table = ('<section id="variants"><h2>Variants (mA/cm², ±1σ, model estimates)</h2>'
             '<p>Click a column header to sort. The best variant (highest J_G) is highlighted.</p>'
             '<div style="overflow:auto"><table id="table-variants" class="sortable"><thead>' + head
             + "</thead><tbody>" + "".join(rows) + "</tbody></table></div></section>")
    from .sweep_folder import describe
    best_s = (f'<section id="best"><h2>Best variant</h2><p id="best-variant">{esc(describe(sw, best))}: '
              f'J_G = {fmt_pm(sw.J_G[best], sw.J_G_sigma[best])} mA/cm² (model estimate). '
              "Differences smaller than about 2σ between variants are not resolved by this sampling.</p></section>")
    missing = sw.merged.get("missing", []) if isinstance(sw.merged, dict) else []
    facts = {"folder": os.path.abspath(sw.path), "sweep_hash": sw.sweep.get("sweep_hash", ""),
             "tool_version": sw.sweep.get("tool_version", ""), "source": sw.sweep.get("source", ""),
             "variants planned": sw.sweep.get("variant_count", ""), "variants merged": len(sw.ids),
             "complete": sw.merged.get("complete", "") if isinstance(sw.merged, dict) else "",
             "missing": _fact(missing) if missing else "none",
             "swept": ", ".join(p.column for p in params), "spectrum": sw.spectrum,
             "photons (all variants)": int(sw.photons.sum()),
             "trace seconds (all variants)": _fact(sum(float(v.get("trace_seconds", 0) or 0)
                                                       for v in sw.merged.get("variants", [])))
             if isinstance(sw.merged, dict) else ""}
    for k, v in sw.sweep.get("requests", {}).items():
        facts[f"requests.{k}"] = v
    fact_rows = "".join(f"<tr><td>{esc(k)}</td><td>{esc(_fact(v))}</td></tr>" for k, v in facts.items())
    run = ('<section id="run"><h2>Sweep facts</h2><table id="table-sweep"><thead><tr><th>fact</th><th>value</th>'
           "</tr></thead><tbody>" + fact_rows + "</tbody></table></section>")
    chart_list, skipped = charts_mod.sweep_charts(sw, ctx)
    scene = ('<section id="scene"><h2>Resolved scene of the best variant</h2>'
             f'<pre id="scene-toml">{esc(sw.best_scene_toml or "(not found)")}</pre></section>')
    inputs = [os.path.join(sw.path, f) for f in ("merged.csv", "merged.json", "sweep.json")]
    body = "\n".join([best_s, _warnings([], sw.warnings),
                      _charts_section(chart_list, skipped, sw.path, inputs, ctx.version), table, run, scene])
    subtitle = f"sweep of {len(sw.ids)} variants · {sw.spectrum} · model estimate"
    return _page(sw.scene_name, subtitle, body, ctx.version)


def fit_report(f, ctx) -> str:
    params = f.fit.get("parameters", [])
    head = ("<tr><th>parameter</th><th>unit</th><th>start</th><th>bounds</th><th>best ± standard error</th>"
            + "".join(f"<th>correlation with {esc(str(p.get('key', '')))}</th>" for p in params) + "</tr>")
    rows = []
    for p in params:
        corr = p.get("correlation", [])
        rows.append(f"<tr><td>{esc(str(p.get('key', '')))}</td><td>{esc(str(p.get('unit', '')))}</td>"
                    f"<td class=\"num\">{_fact(p.get('start', ''))}</td>"
                    f"<td class=\"num\">{_fact(p.get('min', ''))} .. {_fact(p.get('max', ''))}</td>"
                    f"<td class=\"num\" data-sort=\"{p.get('best', '')}\">{float(p.get('best', math.nan)):.5g} ± "
                    f"{float(p.get('standard_error', math.nan)):.2g}</td>"
                    + "".join(f'<td class="num">{float(c):+.3f}</td>' for c in corr) + "</tr>")
    table = ('<section id="parameters"><h2>Fitted parameters (model estimates)</h2>'
             "<p>The values that make the model curve closest to the measured one, under the model's assumptions; "
             "the standard errors include the Monte Carlo error of the model curve.</p>"
             '<table id="table-parameters" class="sortable"><thead>' + head + "</thead><tbody>" + "".join(rows)
             + "</tbody></table></section>")
    facts = {k: v for k, v in f.fit.items() if k != "parameters"}
    fact_rows = "".join(f"<tr><td>{esc(k)}</td><td>{esc(_fact(v))}</td></tr>" for k, v in facts.items())
    run = ('<section id="run"><h2>Fit facts (fit.json)</h2><table id="table-fit"><thead><tr><th>key</th>'
           f'<th>value</th></tr></thead><tbody><tr><td>folder</td><td>{esc(os.path.abspath(f.path))}</td></tr>'
           + fact_rows + "</tbody></table></section>")
    inputs = [os.path.join(f.path, n) for n in ("fit.json", "curve.csv")]
    body = "\n".join([table, _charts_section(charts_mod.fit_charts(f, ctx), [], f.path, inputs, ctx.version), run])
    chi2 = f.fit.get("chi2_per_degree_of_freedom")
    subtitle = (f"fit of {f.quantity}, {len(f.wavelength_nm)} points"
                + (f", χ²/dof = {chi2:.2f}" if isinstance(chi2, (int, float)) else "") + " · model estimate")
    return _page(f"Fit: {f.scene_name}", subtitle, body, ctx.version)


def report_folders(folders, out, version, materials_dir, lumtrap_exe):
    ctx = charts_mod.Context(version, materials_dir, lumtrap_exe)
    if out and len(folders) != 1:
        raise PlotError("--out names the report file of one folder: give one folder, or leave --out out "
                        "(each folder gets FOLDER/report.html)")
    results, sweeps, fits = read_folders(folders)
    tasks = [(result_report, r, ctx, out or os.path.join(r.path, "report.html")) for r in results]
    tasks += [(sweep_report, s, ctx, out or os.path.join(s.path, "report.html")) for s in sweeps]
    tasks += [(fit_report, f, ctx, out or os.path.join(f.path, "report.html")) for f in fits]
    return run_all(_write_report, tasks), []


def _write_report(make, folder, ctx, path: str) -> str:
    _atomic_write(path, make(folder, ctx).encode("utf-8"))
    return path
