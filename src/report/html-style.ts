/** The report's stylesheet: plain, black on white, large enough to read on a plant floor and on paper. */
export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { background: #ffffff; }
body { margin: 0 auto; max-width: 1100px; padding: 24px 28px 48px; color: #000000; background: #ffffff;
  font-family: Helvetica, Arial, "Liberation Sans", sans-serif; font-size: 16px; line-height: 1.45; }
h1 { font-size: 30px; margin: 0 0 4px; letter-spacing: 0.2px; }
h2 { font-size: 22px; margin: 36px 0 12px; padding: 6px 10px; background: #000000; color: #ffffff; break-after: avoid; page-break-after: avoid; }
h3 { font-size: 18px; margin: 22px 0 8px; border-bottom: 2px solid #000000; padding-bottom: 2px; break-after: avoid; page-break-after: avoid; }
h4 { font-size: 15px; margin: 14px 0 6px; break-after: avoid; page-break-after: avoid; }
p { margin: 8px 0; }
.title-block { border: 3px solid #000000; padding: 16px 20px; margin-bottom: 18px; }
.subtitle { font-size: 18px; margin: 0 0 12px; }
.facts { display: grid; grid-template-columns: max-content 1fr; gap: 4px 18px; margin: 0; }
.facts dt { font-weight: bold; }
.facts dd { margin: 0; }
.safety-line { margin: 14px 0 0; padding: 8px 12px; border: 2px solid #000000; font-weight: bold; }
.toc ol { columns: 2; margin: 6px 0 0; padding-left: 24px; }
.toc a { color: #000000; }
.verdict { border: 3px solid #000000; padding: 4px 14px 10px; margin: 18px 0; }
.verdict h2 { margin-top: 8px; }
.kv { border-collapse: collapse; margin: 8px 0 12px; width: 100%; }
.kv th { text-align: left; font-weight: bold; width: 38%; padding: 4px 10px 4px 0; vertical-align: top; border-bottom: 1px solid #999999; }
.kv td { padding: 4px 0; vertical-align: top; border-bottom: 1px solid #999999; }
.table-wrap { overflow-x: auto; margin: 8px 0 14px; }
table.data { border-collapse: collapse; width: 100%; font-size: 14px; }
table.data.narrow { width: auto; min-width: 60%; }
table.data caption { text-align: left; font-weight: bold; padding: 4px 0; caption-side: top; }
table.data th, table.data td { border: 1px solid #000000; padding: 4px 7px; vertical-align: top; }
table.data thead th { background: #e6e6e6; text-align: left; font-weight: bold; }
table.data td.num, table.data th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
table.data tbody tr:nth-child(even) td { background: #f5f5f5; }
.table-note { font-size: 13px; margin: 4px 0 0; }
.note { border-left: 5px solid #555555; padding: 4px 10px; }
.alert { border: 2px solid #000000; padding: 8px 12px; font-weight: bold; }
.callout { border: 2px solid #000000; border-left-width: 10px; padding: 8px 14px; margin: 10px 0; break-inside: avoid; page-break-inside: avoid; }
.callout h4 { margin: 0 0 4px; font-size: 16px; }
.callout h4::before { content: "CAUTION: "; }
.callout .ref { font-size: 13px; margin: 4px 0 0; }
figure { margin: 12px 0 18px; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; width: 100%; height: auto; max-width: 900px; border: 1px solid #000000; }
figcaption { font-size: 13px; margin-top: 4px; }
ul { margin: 6px 0 10px; padding-left: 24px; }
footer { margin-top: 36px; border-top: 2px solid #000000; padding-top: 8px; font-size: 13px; }
@page { size: auto; margin: 15mm; }
@media print {
  body { max-width: none; padding: 0; font-size: 10.5pt; }
  h1 { font-size: 20pt; }
  h2 { font-size: 14pt; margin-top: 18pt; -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  h3 { font-size: 12pt; }
  .toc { break-after: page; page-break-after: always; border: none; padding: 0; }
  .toc a { text-decoration: none; }
  .table-wrap { overflow: visible; }
  table.data { font-size: 8.5pt; }
  table.data thead { display: table-header-group; }
  table.data tr, .kv tr { break-inside: avoid; page-break-inside: avoid; }
  table.keep { break-inside: avoid; page-break-inside: avoid; }
  table.data thead th, table.data tbody tr:nth-child(even) td { -webkit-print-color-adjust: exact; print-color-adjust: exact; }
  figure svg { max-width: 100%; }
}
`;
