"""Charts and the self-contained HTML report of lumtrap result and sweep folders.

Run by `lumtrap plot` and `lumtrap report` (src/cli/plot_commands.cpp) as
`python3 -m lumtrap_plots plot|report ...`; needs only Python 3 and Debian's
python3-matplotlib (with its numpy). Reads the files lumtrap writes and never
changes them; writes charts into a `plots/` folder and `report.html`.

One module per chart kind (chart_*.py); every chart is a matplotlib Figure
saved as PNG and SVG by figure_style.save_chart. All numbers are model
estimates and every chart says so in its caption line.
"""
