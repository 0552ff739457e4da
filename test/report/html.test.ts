import { parse, valid, type HTMLElement } from "node-html-parser";
import { describe, expect, it } from "vitest";
import { buildReportModel, renderReportHtml, escapeHtml } from "../../src/report/index.js";
import { fullReportInput, plainInput, sized } from "./fixtures.js";
import { descendants, parseXml, svgStrings, type XmlElement } from "./xml.js";

const HEADINGS = [
  "Building and survey",
  "Readings and power triangle per load",
  "Site before and after correction",
  "Reactive demand over time",
  "Installed banks",
  "Capacitor bank",
  "Resonance and harmonics",
  "Economics",
  "Warnings",
  "Safety cautions",
  "Methods and standards",
];
const CAUTION_TOPICS = [
  "Stored charge and discharge time",
  "Lockout/tagout and verification",
  "Never on a drive's output",
  "Motor-terminal capacitors and self-excitation",
  "Switching transients",
  "Generator operation",
  "Ventilation and ambient temperature",
  "Local codes and licensed practice",
];

const input = fullReportInput();
const { result } = input;
const html = renderReportHtml(buildReportModel(input));
const doc = parse(html);
const text = doc.text.replace(/\s+/g, " ");
const f1 = (x: number) => x.toFixed(1);

function rowsOf(table: HTMLElement): string[][] {
  return table.querySelectorAll("tbody tr").map((tr) => tr.querySelectorAll("td").map((td) => td.text));
}
function tableTitled(start: string): HTMLElement {
  const t = doc.querySelectorAll("table.data").find((x) => x.querySelector("caption")?.text.startsWith(start));
  expect(t, `table "${start}"`).toBeDefined();
  return t as HTMLElement;
}
function svgOf(chartId: string): XmlElement {
  const s = svgStrings(html).find((x) => x.includes(`data-chart="${chartId}"`));
  expect(s, chartId).toBeDefined();
  const { root, problems } = parseXml(s as string);
  expect(problems).toEqual([]);
  return root as XmlElement;
}
const roleIn = (root: XmlElement, role: string, state?: string) =>
  descendants(root, (e) => e.attrs["data-role"] === role && (state === undefined || e.attrs["data-state"] === state));
const n = (e: XmlElement | undefined, k: string) => Number(e?.attrs[k]);
const lengthOf = (e: XmlElement | undefined) => Math.hypot(n(e, "x2") - n(e, "x1"), n(e, "y2") - n(e, "y1"));

describe("report HTML: document", () => {
  it("is a complete, valid document with a title block", () => {
    expect(html.startsWith("<!DOCTYPE html>")).toBe(true);
    expect(valid(html)).toBe(true);
    expect(doc.querySelector("title")?.text).toContain("srv_TEST123");
    expect(doc.querySelector("header.title-block h1")?.text).toBe("Power-factor correction report");
    expect(doc.querySelector("style")?.text).toMatch(/@page\s*\{\s*size:\s*auto;\s*margin:\s*15mm;?\s*\}/);
  });

  it("has every section heading, in order", () => {
    expect(doc.querySelectorAll("h2").map((h) => h.text.replace(/^\d+\.\s*/, ""))).toEqual(["Recommendation", ...HEADINGS]);
  });

  it("references nothing outside itself: no http(s) src/href, no scripts, links, images or frames", () => {
    for (const el of doc.querySelectorAll("*")) {
      for (const [k, v] of Object.entries(el.attributes)) {
        if (/^(src|href|xlink:href|srcset|action|poster|data)$/i.test(k)) expect(v, `${el.tagName} ${k}`).not.toMatch(/^(https?:)?\/\//i);
      }
    }
    expect(html).not.toMatch(/\b(src|href)\s*=\s*["']?\s*(https?:)?\/\//i);
    expect(html).not.toMatch(/url\(\s*["']?(https?:)?\/\//i);
    expect(html).not.toMatch(/@import/i);
    for (const tag of ["script", "link", "img", "iframe", "object", "embed"]) expect(doc.querySelectorAll(tag), tag).toHaveLength(0);
    for (const a of doc.querySelectorAll("a")) expect(a.getAttribute("href")).toMatch(/^#/);
  });

  it("escapes text: a load label with markup characters shows as text, not as a tag", () => {
    expect(html).toContain("Conveyor motors &lt;hall 2&gt; &amp; &quot;east&quot;");
    expect(html).not.toContain("<hall 2>");
    expect(doc.querySelectorAll("hall")).toHaveLength(0);
    expect(escapeHtml(`<a href="x">&'</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;&amp;&#39;&lt;/a&gt;");
  });
});

describe("report HTML: figures from the result", () => {
  it("shows the site's kW, kvar, PF, the kvar required and line currents", () => {
    const site = rowsOf(doc.querySelectorAll("#site table.data")[0] as HTMLElement);
    expect(site[0]).toEqual(["Real power", f1(result.site.kW), f1(result.site.kW), "kW"]);
    expect(site[1]).toEqual(["Reactive power", f1(result.site.kvar), f1(result.correction.kvarAfter), "kvar"]);
    expect(site[3]).toEqual([
      "Displacement PF",
      `${result.site.displacementPF.toFixed(3)} ${result.site.sense}`,
      `${result.correction.pfAfter.toFixed(3)} ${result.correction.pfAfterSense}`,
      "-",
    ]);
    expect(site[4]?.[1]).toBe(f1(result.correction.lineCurrentBeforeA));
    expect(text).toContain(`${f1(result.correction.kvarRequired)} kvar`);
    expect(text).toContain(`${f1(result.correction.kVAReleased)} kVA`);
  });

  it("lists each load with its measured fields and computed triangle", () => {
    const rows = rowsOf(doc.querySelector("#readings table.data") as HTMLElement);
    expect(rows).toHaveLength(result.loads.length);
    result.loads.forEach((l, i) => {
      const r = rows[i] as string[];
      expect(r[0]).toBe(l.label);
      expect(r.slice(5, 10)).toEqual([f1(l.kW), f1(l.kvar), f1(l.kVA), l.displacementPF.toFixed(3), l.sense]);
      expect(r[10]).toBe(f1(l.lineCurrentA));
    });
    expect(rows[1]?.[4]).toBe("480 V, 118.0 A, PF 0.820 lagging"); // the reading as entered
  });

  it("shows S_sc and each stage's resonance order with its near-harmonic flag", () => {
    expect(text).toContain(`${Math.round(result.resonance?.shortCircuitKVA ?? 0).toLocaleString("en-US")} kVA`);
    const rows = rowsOf(tableTitled("Recommended bank: parallel resonance"));
    const stages = result.recommendedBank?.stages ?? [];
    expect(rows).toHaveLength(stages.length);
    expect(stages.some((s) => s.nearHarmonic !== null)).toBe(true); // the fixture has flagged stages
    stages.forEach((s, i) => {
      expect(rows[i]?.[0]).toBe(String(s.stage));
      expect(rows[i]?.[2]).toBe((s.resonanceOrder as number).toFixed(2));
      if (s.nearHarmonic === null) expect(rows[i]?.[4]).toBe("-");
      else expect(rows[i]?.[4]).toMatch(new RegExp(`^${s.nearHarmonic}(st|nd|rd|th) `));
    });
    const prop = rowsOf(tableTitled("Proposed bank: parallel resonance"));
    expect(prop.map((r) => r[2])).toEqual(result.proposedBank?.stages.map((s) => (s.resonanceOrder as number).toFixed(2)));
  });

  it("shows THD_v per stage against IEEE 519 and the detuned proposal beside the bank", () => {
    const study = result.harmonics?.banks.find((b) => b.name === "recommended");
    const rows = rowsOf(tableTitled("Recommended bank: distortion"));
    expect(rows.map((r) => r[2])).toEqual(study?.stages.map((s) => s.ieee519.thd.valuePct.toFixed(2)));
    expect(rows.map((r) => r[4])).toEqual(study?.stages.map((s) => (s.ieee519.pass ? "PASS" : "FAIL")));
    expect(result.harmonics?.proposals.length).toBeGreaterThan(0);
    const side = rowsOf(tableTitled("Recommended bank as given and detuned"));
    const prop = result.harmonics?.proposals.find((p) => p.forBank === "recommended");
    expect(side.map((r) => r[5])).toEqual(prop?.study.stages.map((s) => f1(s.effectiveKvar)));
  });

  it("lists every warning code, the cautions' titles, economics and the design", () => {
    const codes = rowsOf(doc.querySelector("#warnings table.data") as HTMLElement).map((r) => r[1]);
    for (const w of result.warnings) expect(codes).toContain(w.code);
    expect(
      doc
        .querySelectorAll("#cautions .callout h4")
        .map((h) => h.text)
        .sort(),
    ).toEqual([...CAUTION_TOPICS].sort());
    expect(text).toContain(
      `${(input.economics?.savingPerYear ?? 0).toLocaleString("en-US", { minimumFractionDigits: 2, maximumFractionDigits: 2 })} EUR`,
    );
    expect(text).toContain(`${input.design?.controller?.responseA.toFixed(3)} A`);
  });
});

describe("report HTML: charts drawn to the data", () => {
  it("every SVG is well formed, an image with a title, viewBox-based", () => {
    const svgs = svgStrings(html);
    expect(svgs.length).toBe(2 + (result.harmonics?.banks.length ?? 0) + (result.harmonics?.proposals.length ?? 0));
    for (const s of svgs) {
      const { root, problems } = parseXml(s);
      expect(problems).toEqual([]);
      expect(root?.attrs.role).toBe("img");
      expect(root?.attrs.viewBox).toMatch(/^0 0 \d+/);
      expect(root?.children[0]?.name).toBe("title");
    }
  });

  it("draws the site's triangles with kvar/kW legs in the result's ratio", () => {
    const svg = svgOf("power-triangle");
    const ratio = (state: string) => lengthOf(roleIn(svg, "kvar-leg", state)[0]) / lengthOf(roleIn(svg, "kw-leg", state)[0]);
    expect(Math.abs(ratio("before") - result.site.kvar / result.site.kW)).toBeLessThan(1e-6);
    expect(Math.abs(ratio("after") - result.correction.kvarAfter / result.site.kW)).toBeLessThan(1e-6);
  });

  it("draws one scan line per stage, markers at the source orders, peaks where the stored study found them", () => {
    const svg = svgOf("scan-recommended");
    const stages = roleIn(svg, "scan-stage");
    const study = result.harmonics?.banks.find((b) => b.name === "recommended");
    expect(stages).toHaveLength(result.recommendedBank?.stages.length ?? -1);
    const area = roleIn(svg, "plot-area")[0];
    const hOf = (x: number) =>
      n(area, "data-h0") + ((x - n(area, "data-x0")) / (n(area, "data-x1") - n(area, "data-x0"))) * (n(area, "data-h1") - n(area, "data-h0"));
    const markers = roleIn(svg, "harmonic-marker");
    expect(markers.map((m) => Number(m.attrs["data-order"]))).toEqual(result.harmonics?.presentOrders.filter((h) => h <= 50));
    for (const m of markers) expect(hOf(n(m, "x1"))).toBeCloseTo(Number(m.attrs["data-order"]), 3);
    const xOf = (h: number) =>
      n(area, "data-x0") + ((h - n(area, "data-h0")) / (n(area, "data-h1") - n(area, "data-h0"))) * (n(area, "data-x1") - n(area, "data-x0"));
    stages.forEach((p, i) => {
      const pts = (p.attrs.points ?? "").split(" ").map((xy) => xy.split(",").map(Number) as [number, number]);
      const top = pts.reduce((a, b) => (b[1] < a[1] ? b : a));
      const stored = study?.stages[i]?.peaks[0]?.order as number;
      // The drawn line's highest point is at the stored study's peak: same order within 2 %, and the line
      // at the stored peak's x is within half a unit of its top (flat-topped peaks tie over several points).
      expect(Math.abs(hOf(top[0]) - stored) / stored, `stage ${i + 1}`).toBeLessThan(0.02);
      const x = xOf(stored);
      const k = pts.findIndex((q) => q[0] >= x);
      const [a, b] = [pts[k - 1] as [number, number], pts[k] as [number, number]];
      const yAt = a[1] + ((x - a[0]) / (b[0] - a[0])) * (b[1] - a[1]);
      expect(yAt - top[1], `stage ${i + 1}`).toBeLessThan(0.5);
    });
  });

  it("draws the duration curve with the design's cumulative levels", () => {
    const svg = svgOf("duration-curve");
    let sum = 0;
    const expected = (input.design?.steps ?? []).map((s) => (sum += s.effectiveKvar));
    expect(
      roleIn(svg, "step-level")
        .map((l) => Number(l.attrs["data-kvar"]))
        .sort((a, b) => a - b),
    ).toEqual(expected.sort((a, b) => a - b));
  });
});

/** A result as stored before the engine designed the recommended bank: no design fields on it, no placement. */
function withoutEngineDesign(r: ReturnType<typeof sized>): ReturnType<typeof sized> {
  const rec = r.recommendedBank as unknown as Record<string, unknown> | null;
  if (!rec) return r;
  const {
    physicalSteps: _a,
    fixedKvar: _b,
    switchedKvar: _c,
    stepPlan: _d,
    controller: _e,
    protection: _f,
    discharge: _g,
    notes: _h,
    ...plain
  } = rec;
  const { placement: _p, ...rest } = r as unknown as Record<string, unknown>;
  return { ...rest, recommendedBank: plain } as unknown as ReturnType<typeof sized>;
}

describe("report HTML: missing data is said, not dropped", () => {
  const pi = plainInput();
  const r = withoutEngineDesign(sized(pi));
  const plain = parse(renderReportHtml(buildReportModel({ inputs: pi, result: { ...r, cautions: [] } })));
  const t = plain.text.replace(/\s+/g, " ");

  it("keeps every heading and says what is missing", () => {
    expect(plain.querySelectorAll("h2").map((h) => h.text.replace(/^\d+\.\s*/, ""))).toEqual(["Recommendation", ...HEADINGS]);
    for (const s of [
      "No building record was given",
      "No interval data was analysed",
      "Resonance was not screened",
      "Economics not evaluated",
      "No bank design (placement, controller setting, per-step protection and discharge resistors) was supplied",
      "No bank was proposed with the survey.",
    ])
      expect(t).toContain(s);
    expect(plain.querySelectorAll("svg")).toHaveLength(1); // the triangle only: no scan, no interval chart
  });

  it("adds every mandatory caution when the result carries none", () => {
    expect(
      plain
        .querySelectorAll("#cautions .callout h4")
        .map((h) => h.text)
        .sort(),
    ).toEqual([...CAUTION_TOPICS].sort());
    expect(t).toContain("supports and does not replace the design of a qualified person");
  });

  it("gives the minimum circuit figures of the recommended bank from its rated current", () => {
    const rec = r.recommendedBank;
    expect(rec).not.toBeNull();
    // NFPA 70 460.8: 135 % of rated current, computed here from the bank's rated current.
    expect(t).toContain(((rec?.ratedCurrentA ?? 0) * 1.35).toFixed(1));
  });
});

describe("report HTML: a bank the engine designed", () => {
  const pi = plainInput();
  const r = sized(pi);
  const rec = r.recommendedBank as unknown as { protection?: { steps: { label: string; ocpdRatingA: number | null }[] } } | null;

  it.skipIf(!rec?.protection)("shows the result's own design: protection per step from the recommended bank", () => {
    const d = parse(renderReportHtml(buildReportModel({ inputs: pi, result: r })));
    const table = d.querySelectorAll("#bank table.data").find((x) => x.querySelector("caption")?.text === "Conductors and protection") as HTMLElement;
    expect(table).toBeDefined();
    const rows = rowsOf(table);
    const steps = rec?.protection?.steps ?? [];
    expect(rows.slice(0, steps.length).map((x) => [x[0], x[6]])).toEqual(steps.map((p) => [p.label, String(p.ocpdRatingA)]));
    expect(d.text).not.toContain("No bank design");
  });
});
