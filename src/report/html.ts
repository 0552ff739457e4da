/** The report model as one self-contained HTML document: inline CSS and SVG, no scripts, no external fetches. */
import { chartToSvg } from "./charts/svg.js";
import { escapeHtml as esc } from "./escape.js";
import { REPORT_CSS } from "./html-style.js";
import type { Block, ReportModel, Section } from "./types.js";

export { escapeHtml } from "./escape.js";

/** Tables up to this many rows are kept on one printed page. */
const KEEP_ROWS = 14;
/** Tables of this many columns or fewer take their natural width instead of the page's. */
const NARROW_COLUMNS = 5;

function table(b: Extract<Block, { kind: "table" }>): string {
  const cls = (i: number) => (b.align?.[i] === "right" ? ' class="num"' : "");
  const head = `<thead><tr>${b.header.map((h, i) => `<th scope="col"${cls(i)}>${esc(h)}</th>`).join("")}</tr></thead>`;
  const body = `<tbody>${b.rows.map((r) => `<tr>${r.map((c, i) => `<td${cls(i)}>${esc(c)}</td>`).join("")}</tr>`).join("\n")}</tbody>`;
  const caption = b.title ? `<caption>${esc(b.title)}</caption>` : "";
  const keep = (b.rows.length <= KEEP_ROWS ? " keep" : "") + (b.header.length <= NARROW_COLUMNS ? " narrow" : "");
  const note = b.note ? `<p class="table-note">${esc(b.note)}</p>` : "";
  return `<div class="table-wrap"><table class="data${keep}">${caption}${head}${body}</table>${note}</div>`;
}

function block(b: Block): string {
  switch (b.kind) {
    case "paragraph":
      return `<p${b.tone && b.tone !== "normal" ? ` class="${b.tone}"` : ""}>${esc(b.text)}</p>`;
    case "subheading":
      return `<h3>${esc(b.text)}</h3>`;
    case "keyValues": {
      const title = b.title ? `<h4>${esc(b.title)}</h4>` : "";
      return `${title}<table class="kv"><tbody>${b.items.map((i) => `<tr><th scope="row">${esc(i.key)}</th><td>${esc(i.value)}</td></tr>`).join("")}</tbody></table>`;
    }
    case "table":
      return table(b);
    case "list":
      return `<ul>${b.items.map((i) => `<li>${esc(i)}</li>`).join("")}</ul>`;
    case "callout":
      return `<div class="callout" role="note"><h4>${esc(b.title)}</h4><p>${esc(b.text)}</p>${b.reference ? `<p class="ref">Reference: ${esc(b.reference)}</p>` : ""}</div>`;
    case "chart":
      return `<figure>${chartToSvg(b.chart)}<figcaption>${esc(b.chart.description)}</figcaption></figure>`;
  }
}

function section(s: Section, n: number): string {
  return `<section id="${esc(s.id)}" aria-labelledby="h-${esc(s.id)}">\n<h2 id="h-${esc(s.id)}">${n}. ${esc(s.heading)}</h2>\n${s.blocks.map(block).join("\n")}\n</section>`;
}

export function renderReportHtml(model: ReportModel): string {
  const cautionsIndex = model.sections.findIndex((s) => s.id === "cautions");
  const safety =
    cautionsIndex >= 0 ? `Safety: read section ${cautionsIndex + 1}, "${model.sections[cautionsIndex]?.heading}", before any work on the bank.` : "";
  const facts = model.facts.map((f) => `<dt>${esc(f.key)}</dt><dd>${esc(f.value)}</dd>`).join("");
  const toc = model.sections.map((s) => `<li><a href="#${esc(s.id)}">${esc(s.heading)}</a></li>`).join("");
  return [
    "<!DOCTYPE html>",
    '<html lang="en">',
    "<head>",
    '<meta charset="utf-8">',
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${esc(model.title)}: ${esc(model.subtitle)}</title>`,
    `<style>${REPORT_CSS}</style>`,
    "</head>",
    "<body>",
    `<header class="title-block"><h1>${esc(model.title)}</h1><p class="subtitle">${esc(model.subtitle)}</p><dl class="facts">${facts}</dl>${safety ? `<p class="safety-line">${esc(safety)}</p>` : ""}</header>`,
    `<section id="${esc(model.verdict.id)}" class="verdict" aria-labelledby="h-${esc(model.verdict.id)}">\n<h2 id="h-${esc(model.verdict.id)}">${esc(model.verdict.heading)}</h2>\n${model.verdict.blocks.map(block).join("\n")}\n</section>`,
    `<nav class="toc" aria-label="Contents"><strong>Contents</strong><ol>${toc}</ol></nav>`,
    "<main>",
    ...model.sections.map((s, i) => section(s, i + 1)),
    "</main>",
    `<footer><p>${esc(model.title)} — ${esc(model.subtitle)}. These figures support and do not replace the design of a qualified person under the local codes.</p></footer>`,
    "</body>",
    "</html>",
  ].join("\n");
}
