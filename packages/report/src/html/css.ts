/**
 * The page's stylesheet, inlined. System fonts only (no downloads); text and
 * flags are dark on light with a contrast ratio above 7:1; flagged items carry a
 * text label, the colour only repeats it.
 */
export const stylesheet = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { margin: 0; background: #fbfbf9; color: #1f1f1f;
  font: 15px/1.45 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", "Liberation Sans", sans-serif; }
main { max-width: 1180px; margin: 0 auto; padding: 18px 22px 40px; }
header.page { border-bottom: 2px solid #1f1f1f; padding-bottom: 8px; margin-bottom: 10px; }
h1 { font-size: 1.6em; margin: 0 0 2px; }
h2 { font-size: 1.2em; margin: 28px 0 8px; padding-bottom: 3px; border-bottom: 1px solid #c8c8c8; }
h3 { font-size: 1em; margin: 0 0 4px; }
p { margin: 4px 0 8px; }
.subtitle { font-size: 1.05em; color: #3d3d3d; margin: 0; }
.meta { color: #4a4a4a; font-size: 0.9em; }
nav.contents { font-size: 0.9em; margin: 6px 0 0; }
nav.contents a { color: #0b4f8a; margin-right: 14px; }
table { border-collapse: collapse; font-variant-numeric: tabular-nums; font-size: 0.9em; }
th, td { padding: 3px 7px; border-bottom: 1px solid #e0e0e0; text-align: right; white-space: nowrap; }
th { background: #efefec; font-weight: 600; }
th:first-child, td:first-child, td.text, th.text { text-align: left; }
td.text { white-space: normal; }
td.check { min-width: 12em; }
.table-scroll { overflow-x: auto; max-width: 100%; }
tr.flagged td { background: #fff1d6; }
tr.flagged td:first-child { box-shadow: inset 4px 0 0 #b35900; }
.badge { display: inline-block; font-size: 0.75em; font-weight: 700; letter-spacing: 0.04em;
  padding: 0 5px; border-radius: 3px; border: 1.5px solid currentColor; margin-right: 6px; }
.badge.note { color: #0b4f8a; }
.badge.warning { color: #8a4500; background: #fff1d6; }
.badge.problem { color: #ffffff; background: #a33a00; border-color: #a33a00; }
.badge.ok { color: #00613f; }
ul.warnings { list-style: none; padding: 0; margin: 0; }
ul.warnings li { padding: 6px 10px; margin: 0 0 6px; border-left: 4px solid #9a9a9a; background: #f3f3f0; }
ul.warnings li.warning { border-left-color: #b35900; background: #fff6e6; }
ul.warnings li.problem { border-left-color: #a33a00; background: #fde9de; }
.advice { display: block; color: #333; font-size: 0.92em; }
.verdict { font-size: 1.02em; padding: 8px 12px; background: #f0f0ec; border: 1px solid #d6d6d0; }
.caution { font-size: 0.9em; color: #3d3d3d; }
.figure-row { display: flex; flex-wrap: wrap; gap: 8px 14px; align-items: flex-start; }
figure { margin: 0 0 18px; }
figcaption { font-size: 0.88em; color: #3d3d3d; max-width: 900px; }
.quantity { border-top: 1px solid #e0e0e0; padding-top: 8px; margin-top: 8px; }
.quantity .figures { display: flex; flex-wrap: wrap; gap: 4px 10px; }
.quantity .numbers { font-size: 0.88em; color: #333; font-variant-numeric: tabular-nums; }
.legend-row { display: flex; flex-wrap: wrap; gap: 4px 16px; font-size: 0.9em; align-items: center; margin: 4px 0 8px; }
.legend-row > span { display: inline-flex; align-items: center; gap: 5px; }
svg.plot { max-width: 100%; height: auto; background: #ffffff; border: 1px solid #e6e6e2; }
svg.plot text { font-family: system-ui, "DejaVu Sans", "Liberation Sans", sans-serif; fill: #1f1f1f; }
svg.plot .tick-label { font-size: 10px; }
svg.plot .axis-title { font-size: 11px; font-weight: 600; }
svg.plot .note, svg.plot .legend-label { font-size: 10.5px; }
svg.plot .cell-label { font-size: 11px; font-weight: 600; }
svg.plot .correlation { font-size: 13px; }
svg.plot .value-label { font-size: 10.5px; }
svg.plot .value-label.flagged { font-weight: 700; }
footer { margin-top: 30px; font-size: 0.85em; color: #4a4a4a; border-top: 1px solid #c8c8c8; padding-top: 6px; }
@media print { body { background: #fff; } svg.plot { border: none; } }
`;
