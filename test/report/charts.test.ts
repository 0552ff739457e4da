import { describe, expect, it } from "vitest";
import {
  chartToSvg,
  durationCurveChart,
  impedanceScanChart,
  powerTriangleChart,
  simplify,
  type Chart,
  type Shape,
} from "../../src/report/charts/index.js";
import { logBounds } from "../../src/report/charts/scan.js";
import { descendants, parseXml, type XmlElement } from "./xml.js";

type LineShape = Extract<Shape, { kind: "line" }>;
const byRole = (c: Chart, role: string, state?: string) =>
  c.shapes.filter((s) => s.role === role && (state === undefined || s.data?.state === state));
const lineOf = (c: Chart, role: string, state?: string): LineShape => {
  const found = byRole(c, role, state);
  expect(found, `${role} ${state ?? ""}`).toHaveLength(1);
  return found[0] as LineShape;
};
const len = (l: { x1: number; y1: number; x2: number; y2: number }) => Math.hypot(l.x2 - l.x1, l.y2 - l.y1);
const num = (e: XmlElement, k: string) => Number(e.attrs[k]);

/** A triangle from kW and PF, by hand: Q = P·tan(acos PF), S = P/PF. */
const tri = (kW: number, pf: number, sign = 1) => ({ kW, kvar: sign * kW * Math.tan(Math.acos(pf)), kVA: kW / pf, pf });

describe("XML strictness check (the test tool itself)", () => {
  it.each([
    ["<svg><line></svg>", "unbalanced"],
    ["<svg a=1/>", "unquoted attribute"],
    ["<svg>a & b</svg>", "bare ampersand"],
    ['<svg a="1" a="2"/>', "duplicate attribute"],
    ["<svg/><svg/>", "two roots"],
    ['<svg t="<"/>', "< in attribute"],
  ])("rejects %s (%s)", (xml) => {
    expect(parseXml(xml).problems.length).toBeGreaterThan(0);
  });

  it("accepts a well-formed fragment and decodes entities", () => {
    const { root, problems } = parseXml('<svg a="x &amp; y"><title>1 &lt; 2</title><g/></svg>');
    expect(problems).toEqual([]);
    expect(root?.attrs.a).toBe("x & y");
    expect(root?.children[0]?.text).toBe("1 < 2");
  });
});

describe("power triangle chart", () => {
  const before = tri(400, 0.8);
  const after = tri(400, 0.95);
  const chart = powerTriangleChart({ before, after, bankKvar: before.kvar - after.kvar });

  it("draws kvar/kW to scale in both triangles, at one scale", () => {
    for (const [state, t] of [
      ["before", before],
      ["after", after],
    ] as const) {
      const ratio = len(lineOf(chart, "kvar-leg", state)) / len(lineOf(chart, "kw-leg", state));
      expect(ratio).toBeCloseTo(t.kvar / t.kW, 9);
    }
    // Same kW, same scale: equal kW legs; kvar legs in the ratio of the kvar.
    expect(len(lineOf(chart, "kw-leg", "before"))).toBeCloseTo(len(lineOf(chart, "kw-leg", "after")), 9);
    expect(len(lineOf(chart, "kvar-leg", "after")) / len(lineOf(chart, "kvar-leg", "before"))).toBeCloseTo(after.kvar / before.kvar, 9);
    // The bank's dashed segment is the kvar removed, at the same scale.
    expect(len(lineOf(chart, "bank-kvar")) / len(lineOf(chart, "kw-leg", "after"))).toBeCloseTo((before.kvar - after.kvar) / 400, 9);
  });

  it("closes each triangle: the hypotenuse runs from the kW leg's start to the kvar leg's end, S/P = 1/PF", () => {
    for (const [state, t] of [
      ["before", before],
      ["after", after],
    ] as const) {
      const p = lineOf(chart, "kw-leg", state);
      const q = lineOf(chart, "kvar-leg", state);
      const s = lineOf(chart, "kva-leg", state);
      expect([s.x1, s.y1]).toEqual([p.x1, p.y1]);
      expect([s.x2, s.y2]).toEqual([q.x2, q.y2]);
      expect([q.x1, q.y1]).toEqual([p.x2, p.y2]);
      expect(len(s) / len(p)).toBeCloseTo(1 / t.pf, 9);
      expect(q.y2).toBeLessThan(q.y1); // lagging kvar drawn up
    }
  });

  it("labels the angle φ in degrees: acos(0.8) = 36.87°", () => {
    const labels = byRole(chart, "phi-label").map((s) => (s.kind === "text" ? s.text : ""));
    expect(labels).toEqual(["φ 36.9°", "φ 18.2°"]);
    expect(byRole(chart, "phi-arc")).toHaveLength(2);
  });

  it("draws a leading site's kvar downwards", () => {
    const lead = tri(100, 0.9, -1);
    const c = powerTriangleChart({ before: lead, after: lead, bankKvar: 0 });
    const q = lineOf(c, "kvar-leg", "before");
    expect(q.y2).toBeGreaterThan(q.y1);
    expect(len(q) / len(lineOf(c, "kw-leg", "before"))).toBeCloseTo(Math.tan(Math.acos(0.9)), 9);
    expect(byRole(c, "bank-kvar")).toHaveLength(0);
  });

  it("writes well-formed SVG whose legs keep the ratio to 1e-6", () => {
    const { root, problems } = parseXml(chartToSvg(chart));
    expect(problems).toEqual([]);
    expect(root?.attrs.role).toBe("img");
    expect(root?.attrs.viewBox).toMatch(/^0 0 760 \d+(\.\d+)?$/);
    expect(root?.children[0]?.name).toBe("title");
    const legs = (role: string) =>
      descendants(root as XmlElement, (e) => e.attrs["data-role"] === role && e.attrs["data-state"] === "before")[0] as XmlElement;
    const l = (e: XmlElement) => Math.hypot(num(e, "x2") - num(e, "x1"), num(e, "y2") - num(e, "y1"));
    expect(Math.abs(l(legs("kvar-leg")) / l(legs("kw-leg")) - 0.75)).toBeLessThan(1e-6);
  });
});

describe("impedance scan chart", () => {
  const orders = Array.from({ length: 491 }, (_, i) => 1 + i * 0.1);
  const flat = orders.map(() => 0.1);
  const spike = orders.map((h) => (Math.abs(h - 13) < 0.05 ? 0.8 : 0.02));
  const chart = impedanceScanChart({
    id: "t",
    title: "test",
    markerOrders: [5, 7, 11, 13, 60],
    lines: [
      { label: "bus", kind: "bus", orders, impedanceOhm: flat },
      { label: "stage 1", kind: "stage", stageNumber: 1, orders, impedanceOhm: flat },
      { label: "stage 2", kind: "stage", stageNumber: 2, orders, impedanceOhm: spike },
    ],
  });
  const area = chart.shapes.find((s) => s.role === "plot-area") as Shape & { data: Record<string, string> };
  const d = (k: string) => Number(area.data[k]);
  const xOf = (h: number) => d("x0") + ((h - d("h0")) / (d("h1") - d("h0"))) * (d("x1") - d("x0"));
  const yOf = (z: number) => d("y0") - ((Math.log10(z) - Math.log10(d("z0"))) / (Math.log10(d("z1")) - Math.log10(d("z0")))) * (d("y0") - d("y1"));

  it("has one line per stage plus the bus line, each with its own dash pattern", () => {
    const stages = byRole(chart, "scan-stage");
    expect(stages.map((s) => s.data?.stage)).toEqual(["1", "2"]);
    expect(byRole(chart, "scan-bus")).toHaveLength(1);
    const dashes = stages.map((s) => (s.kind === "polyline" ? JSON.stringify(s.stroke.dash ?? []) : ""));
    expect(new Set(dashes).size).toBe(2);
  });

  it("marks the source orders inside the range as vertical lines at their order", () => {
    const markers = byRole(chart, "harmonic-marker") as LineShape[];
    expect(markers.map((m) => m.data?.order)).toEqual(["5", "7", "11", "13"]);
    for (const m of markers) {
      expect(m.x1).toBeCloseTo(xOf(Number(m.data?.order)), 9);
      expect(m.x2).toBe(m.x1);
    }
  });

  it("plots |Z| on a log axis: a flat 0.1 ohm line sits at log position of 0.1; the spike's top is kept", () => {
    const flatLine = byRole(chart, "scan-stage")[0] as Extract<Shape, { kind: "polyline" }>;
    for (const [, y] of flatLine.points) expect(y).toBeCloseTo(yOf(0.1), 9);
    const spiky = byRole(chart, "scan-stage")[1] as Extract<Shape, { kind: "polyline" }>;
    const top = spiky.points.reduce((a, p) => (p[1] < a[1] ? p : a));
    expect(top[1]).toBeCloseTo(yOf(0.8), 9);
    expect(top[0]).toBeCloseTo(xOf(13), 6);
    expect(d("z0")).toBeLessThanOrEqual(0.02);
    expect(d("z1")).toBeGreaterThanOrEqual(0.8);
  });

  it("bounds the log axis at 1-2-5 steps around the data", () => {
    expect(logBounds(0.0098, 0.62)).toEqual([0.005, 1]);
    expect(logBounds(0.012, 0.45)).toEqual([0.01, 0.5]);
    expect(logBounds(0.02, 0.2)).toEqual([0.02, 0.2]);
  });

  it("writes well-formed SVG", () => {
    expect(parseXml(chartToSvg(chart)).problems).toEqual([]);
  });
});

describe("simplify", () => {
  it("drops collinear points and keeps corners", () => {
    const pts = [
      [0, 0],
      [1, 1],
      [2, 2],
      [3, 3],
      [4, 0],
    ] as const;
    expect(simplify(pts, 0.1)).toEqual([
      [0, 0],
      [3, 3],
      [4, 0],
    ]);
  });
});

describe("duration curve chart", () => {
  const exceedancePct = [0, 25, 50, 75, 100];
  const kvar = [160, 120, 90, 40, 0];
  const demand = [360, 300, 250, 140, 110];
  const chart = durationCurveChart({
    need: { exceedancePct, kvar },
    demand: { exceedancePct, kvar: demand },
    levels: [
      { label: "fixed", kvar: 100 },
      { label: "fixed + step 1", kvar: 150 },
    ],
    targetPF: 0.95,
    coveredPct: 99.9,
  });
  const area = chart.shapes.find((s) => s.role === "plot-area") as Shape & { data: Record<string, string> };
  const d = (k: string) => Number(area.data[k]);
  const yOf = (q: number) => d("y0") - ((q - d("k0")) / (d("k1") - d("k0"))) * (d("y0") - d("y1"));
  const xOf = (p: number) => d("x0") + (p / 100) * (d("x1") - d("x0"));

  it("draws the need to reach the target through each (share, kvar) point, and the demand lighter", () => {
    const curve = byRole(chart, "need-curve")[0] as Extract<Shape, { kind: "polyline" }>;
    curve.points.forEach(([x, y], i) => {
      expect(x).toBeCloseTo(xOf(exceedancePct[i] as number), 9);
      expect(y).toBeCloseTo(yOf(kvar[i] as number), 9);
    });
    const light = byRole(chart, "demand-curve")[0] as Extract<Shape, { kind: "polyline" }>;
    light.points.forEach(([, y], i) => expect(y).toBeCloseTo(yOf(demand[i] as number), 9));
    expect(light.stroke.width).toBeLessThan(curve.stroke.width);
  });

  it("marks the coverage where the need passes the full bank: at 100 − 99.9 = 0.1 % exceedance", () => {
    const mark = byRole(chart, "coverage")[0] as LineShape;
    expect(mark.x1).toBeCloseTo(xOf(0.1), 9);
    expect(chart.description).toMatch(/covers the need in 99\.9 % of the intervals/);
  });

  it("draws each cumulative level as a horizontal line at its kvar", () => {
    const levels = byRole(chart, "step-level") as LineShape[];
    expect(levels.map((l) => Number(l.data?.kvar)).sort((a, b) => a - b)).toEqual([100, 150]);
    for (const l of levels) {
      expect(l.y1).toBe(l.y2);
      expect(l.y1).toBeCloseTo(yOf(Number(l.data?.kvar)), 9);
    }
    expect(parseXml(chartToSvg(chart)).problems).toEqual([]);
  });
});

describe("SVG text escaping", () => {
  it("escapes markup in titles and labels", () => {
    const c: Chart = {
      id: "x",
      title: 'a <b> & "c"',
      description: "<script>",
      width: 10,
      height: 10,
      shapes: [{ kind: "text", x: 1, y: 1, text: "<tag> & more", size: 5, anchor: "start" }],
    };
    const svg = chartToSvg(c);
    expect(svg).not.toContain("<script>");
    expect(svg).not.toContain("<tag>");
    const { root, problems } = parseXml(svg);
    expect(problems).toEqual([]);
    expect(descendants(root as XmlElement, (e) => e.name === "text")[0]?.text).toBe("<tag> & more");
  });
});
