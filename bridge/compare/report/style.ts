/** The report's stylesheet, inlined: screen layout plus a print stylesheet (A4, no backgrounds). */
export const REPORT_CSS = `
:root { --ink: #1d2630; --muted: #5f6b78; --rule: #d5dbe1; --paper: #f7f5f0; --card: #ffffff;
  --cmd: #0f7c74; --trk: #d2641c; --smo: #6a3fb5; --bad: #b3261e; }
* { box-sizing: border-box; }
body { margin: 0; background: var(--paper); color: var(--ink); font: 14px/1.45 system-ui, -apple-system, "Segoe UI", sans-serif; }
main { max-width: 1120px; margin: 0 auto; padding: 28px 32px 48px; }
header.run { border-bottom: 3px solid var(--ink); padding-bottom: 10px; margin-bottom: 18px; }
header.run h1 { font-size: 22px; margin: 0 0 4px; letter-spacing: .01em; }
header.run .sub { color: var(--muted); font-size: 13px; }
h2 { font-size: 16px; margin: 28px 0 8px; padding-top: 6px; border-top: 1px solid var(--rule); }
.cards { display: grid; grid-template-columns: repeat(auto-fit, minmax(150px, 1fr)); gap: 10px; }
.card { background: var(--card); border: 1px solid var(--rule); border-left: 4px solid var(--ink); padding: 8px 12px; }
.card .k { font-size: 11px; text-transform: uppercase; letter-spacing: .06em; color: var(--muted); }
.card .v { font-size: 22px; font-variant-numeric: tabular-nums; font-weight: 600; }
.card .n { font-size: 12px; color: var(--muted); }
.card.trk { border-left-color: var(--trk); } .card.smo { border-left-color: var(--smo); } .card.cmd { border-left-color: var(--cmd); }
.row { display: flex; gap: 16px; flex-wrap: wrap; align-items: flex-start; }
figure { margin: 0; max-width: 100%; background: var(--card); border: 1px solid var(--rule); padding: 8px; break-inside: avoid; }
figcaption { font-size: 12px; color: var(--muted); margin: 2px 4px 4px; }
.legend { font-size: 12px; margin: 0 4px 4px; }
.legend span { display: inline-block; margin-right: 14px; }
.legend i { display: inline-block; width: 18px; height: 0; border-top: 3px solid; vertical-align: middle; margin-right: 5px; }
.legend i.dash { border-top-style: dashed; }
svg.chart { display: block; max-width: 100%; height: auto; font-size: 11px; }
svg .grid { stroke: #e6e9ec; stroke-width: 1; }
svg .zero { stroke: #8994a0; stroke-width: 1; }
svg .plot-border { fill: none; stroke: #aeb6bf; }
svg .tick { fill: var(--muted); }
svg .axis-label { fill: var(--ink); font-size: 12px; }
svg .marker { stroke: var(--bad); stroke-dasharray: 2 3; }
svg .marker-label { fill: var(--bad); font-size: 10px; }
svg .band { fill: #6a3fb5; fill-opacity: 0.14; }
svg .radar { fill: var(--ink); }
table { border-collapse: collapse; width: 100%; background: var(--card); font-variant-numeric: tabular-nums; font-size: 13px; }
th, td { border-bottom: 1px solid var(--rule); padding: 4px 8px; text-align: right; }
td { white-space: nowrap; }
th { background: #eef1f4; font-weight: 600; font-size: 12px; }
th:first-child, td:first-child { text-align: left; }
td.group { font-weight: 600; background: #fafbfc; }
.note { color: var(--muted); font-size: 12px; margin: 6px 0; }
.warn { color: var(--bad); }
footer { margin-top: 32px; color: var(--muted); font-size: 12px; border-top: 1px solid var(--rule); padding-top: 8px; }
@media print {
  @page { size: A4; margin: 14mm; }
  body { background: #fff; font-size: 11px; }
  main { max-width: none; padding: 0; }
  .card, figure, table { border-color: #999; }
  h2 { break-after: avoid; }
  figure, table, .cards { break-inside: avoid; }
  /* Pairs of charts stay side by side on paper, scaled to half the page each. */
  .row { flex-wrap: nowrap; gap: 8px; }
  .row > * { flex: 1 1 0; width: auto !important; min-width: 0 !important; }
  .cards { grid-template-columns: repeat(3, 1fr); }
  svg.chart { max-width: 100%; }
}
`;
