/** The report's stylesheet: plain and sober on screen, paged and ink-light in print. */
export const REPORT_CSS = `
:root {
  --ink: #1f2428; --muted: #5b6470; --line: #d5d9de; --soft: #f3f4f6; --accent: #2f5d8a;
  --warn-bg: #fbf6e6; --warn-line: #b08d2a;
}
* { box-sizing: border-box; }
html { -webkit-text-size-adjust: 100%; }
body {
  margin: 0; color: var(--ink); background: #fff;
  font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif;
}
a { color: var(--accent); }
code, .mono { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, "Liberation Mono", monospace; font-size: 12px; }
.page-head { border-top: 4px solid var(--accent); border-bottom: 1px solid var(--line); padding: 20px 32px 14px; }
.page-head h1 { margin: 0 0 2px; font-size: 22px; font-weight: 650; letter-spacing: -0.01em; }
.page-head .sub { margin: 0; color: var(--muted); }
nav.toc { margin-top: 10px; font-size: 13px; }
nav.toc a { margin-right: 16px; text-decoration: none; }
nav.toc a:hover { text-decoration: underline; }
main { max-width: 1240px; margin: 0 auto; padding: 8px 32px 48px; }
h2 { font-size: 18px; font-weight: 650; margin: 34px 0 10px; padding-bottom: 5px; border-bottom: 1px solid var(--line); }
h3 { font-size: 15px; font-weight: 650; margin: 26px 0 8px; }
h4 { font-size: 14px; font-weight: 600; margin: 0 0 6px; }
p { margin: 6px 0; }
.caution { margin: 18px 0; padding: 10px 14px; background: var(--warn-bg); border-left: 4px solid var(--warn-line); font-weight: 500; }
.note { color: var(--muted); font-size: 13px; }
.muted { color: var(--muted); }
dl.provenance { display: grid; grid-template-columns: max-content minmax(0, 1fr); gap: 3px 22px; margin: 8px 0; font-size: 13px; }
dl.provenance dt { color: var(--muted); }
dl.provenance dd { margin: 0; overflow-wrap: anywhere; }
.controls { display: flex; flex-wrap: wrap; gap: 10px 16px; align-items: center; margin: 6px 0 8px; font-size: 13px; }
.controls input, .controls select { font: inherit; padding: 4px 8px; border: 1px solid #b9bec5; border-radius: 3px; background: #fff; color: var(--ink); }
.controls input { width: 260px; }
.controls output { color: var(--muted); }
.scroll { max-height: 560px; overflow: auto; border: 1px solid var(--line); }
table { border-collapse: collapse; width: 100%; font-size: 13px; }
th, td { padding: 5px 8px; border-bottom: 1px solid var(--line); text-align: left; vertical-align: top; }
thead th { background: var(--soft); font-weight: 600; vertical-align: bottom; }
.scroll thead th { position: sticky; top: 0; z-index: 1; }
tbody tr:hover { background: #f8f9fa; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
td.num { white-space: nowrap; }
tr.over td { color: #8a3b3b; font-weight: 600; }
#ranking-table td:nth-child(4) { min-width: 300px; }
#ranking-table td:nth-child(5) { min-width: 200px; }
th button { font: inherit; font-weight: 600; color: inherit; background: none; border: 0; padding: 0; cursor: pointer; text-align: inherit; }
th button::after { content: "\\2195"; color: #9aa1a9; margin-left: 4px; font-weight: 400; }
th[aria-sort="ascending"] button::after { content: "\\25B2"; color: var(--ink); font-size: 10px; }
th[aria-sort="descending"] button::after { content: "\\25BC"; color: var(--ink); font-size: 10px; }
th button:focus-visible, .controls :focus-visible, a:focus-visible { outline: 2px solid var(--accent); outline-offset: 2px; }
td .detail { display: block; color: var(--muted); font-size: 12px; }
td.out, span.out { color: #8a2b16; font-weight: 600; }
.badge { display: inline-block; padding: 0 7px; border-radius: 3px; font-size: 12px; font-weight: 600; line-height: 19px; border: 1px solid; white-space: nowrap; }
.badge-safety { color: #6d1a10; background: #f6e2de; border-color: #d9a79e; }
.badge-statutory { color: #6a4300; background: #f6ecd6; border-color: #d8bd83; }
.badge-planning { color: #1f4468; background: #e1eaf4; border-color: #a8bfd8; }
.badge-hosting { color: #2f5326; background: #e4eee0; border-color: #a9c59f; }
.status { font-size: 12px; font-weight: 600; color: var(--muted); border: 1px solid var(--line); border-radius: 3px; padding: 0 6px; }
.status-failed, .status-set_aside { color: #8a2b16; border-color: #d9a79e; }
.charts { display: flex; flex-wrap: wrap; gap: 20px 36px; }
figure { margin: 8px 0; }
figcaption { font-size: 13px; color: var(--muted); margin-bottom: 4px; max-width: 640px; }
figcaption strong { color: var(--ink); font-weight: 600; }
svg { max-width: 100%; height: auto; }
section.feeder { margin-top: 40px; border-top: 2px solid var(--ink); }
section.feeder > h2 { border-bottom: 0; margin-top: 10px; display: flex; align-items: baseline; gap: 10px; flex-wrap: wrap; }
section.feeder > h2 .back { margin-left: auto; font-size: 13px; font-weight: 400; }
.figures { display: grid; grid-template-columns: repeat(auto-fill, minmax(160px, 1fr)); gap: 8px; margin: 8px 0 12px; }
.fig { border: 1px solid var(--line); border-radius: 3px; padding: 7px 10px; }
.fig .k { display: block; color: var(--muted); font-size: 12px; }
.fig .v { display: block; font-size: 17px; font-weight: 600; font-variant-numeric: tabular-nums; }
.fig .d { display: block; color: var(--muted); font-size: 12px; }
.need { border: 1px solid var(--line); border-left: 4px solid #9aa1a9; border-radius: 3px; padding: 10px 14px; margin: 10px 0; }
.need-safety { border-left-color: #a3412f; }
.need-statutory { border-left-color: #b08d2a; }
.need-planning { border-left-color: #4f79a3; }
.need-hosting { border-left-color: #5c8a4f; }
.need table, table.findings { margin: 6px 0; width: auto; min-width: 55%; }
.need ul { margin: 4px 0; padding-left: 20px; }
.schematic-wrap { display: flex; flex-wrap: wrap; gap: 12px 28px; align-items: flex-start; }
table.hosting-buses td.num .detail, table.hosting-strategies td.num .detail { white-space: normal; }
table.hosting-buses td:first-child { white-space: nowrap; }
ul.legend { list-style: none; padding: 0; margin: 4px 0; font-size: 12px; }
ul.legend li { margin: 3px 0; display: flex; align-items: center; gap: 8px; }
ul.legend .swatch { width: 12px; height: 12px; border-radius: 50%; border: 1px solid #2b2f33; display: inline-block; flex: none; }
.page-foot { border-top: 1px solid var(--line); padding: 14px 32px 28px; color: var(--muted); font-size: 13px; }
.page-foot .caution { color: var(--ink); }
@media print {
  @page { size: A4 landscape; margin: 12mm; }
  body { font-size: 9.5pt; }
  .page-head { padding: 0 0 8px; border-top: 0; }
  main { max-width: none; padding: 0; }
  nav.toc, .controls, .back, .no-print { display: none !important; }
  .scroll { max-height: none; overflow: visible; border: 0; }
  .scroll thead th { position: static; }
  thead { display: table-header-group; }
  tr, figure, .fig, .need, .caution { break-inside: avoid; }
  h2, h3 { break-after: avoid; }
  section.feeder { break-before: page; margin-top: 0; }
  a { color: inherit; text-decoration: none; }
  th button::after { content: none !important; }
  tbody tr:hover { background: none; }
  .page-foot { padding: 8px 0 0; }
}
`;
