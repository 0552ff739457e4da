import { describe, expect, it } from "vitest";
import type { Caution } from "../../src/core/cautions/safety-cautions.js";
import {
  buildReportModel,
  fmt,
  reportCautions,
  reportForSizing,
  REQUIRED_CAUTIONS,
  SECTION_ORDER,
  type Block,
  type ReportModel,
} from "../../src/report/index.js";
import type { Chart } from "../../src/report/charts/index.js";
import { fullReportInput, hallInput, plainInput, sized } from "./fixtures.js";

const charts = (m: ReportModel): Chart[] => m.sections.flatMap((s) => s.blocks).flatMap((b: Block) => (b.kind === "chart" ? [b.chart] : []));

describe("report model", () => {
  it("has every section in the fixed order, with or without data", () => {
    const full = buildReportModel(fullReportInput());
    const pi = plainInput();
    const plain = buildReportModel({ inputs: pi, result: sized(pi) });
    expect(full.sections.map((s) => s.id)).toEqual([...SECTION_ORDER]);
    expect(plain.sections.map((s) => s.id)).toEqual([...SECTION_ORDER]);
    for (const s of plain.sections) expect(s.blocks.length, s.id).toBeGreaterThan(0);
    expect(charts(plain).map((c) => c.id)).toEqual(["power-triangle"]);
  });

  it("reportForSizing gives the model and its HTML", () => {
    const pi = plainInput();
    const { model, html } = reportForSizing(sized(pi), pi, { title: "Pump room check" });
    expect(model.title).toBe("Pump room check");
    expect(html).toContain("<h1>Pump room check</h1>");
  });

  it("keeps the result's own cautions and adds only the missing mandatory topics", () => {
    const own: Caution[] = [
      { code: "stored_charge", title: "Own wording on stored charge", text: "x" },
      { code: "site_specific", title: "Crane overhead", text: "y" },
    ];
    const merged = reportCautions(own);
    expect(merged.slice(0, 2)).toEqual(own);
    expect(merged.map((c) => c.code).sort()).toEqual([...new Set([...REQUIRED_CAUTIONS.map((c) => c.code), "site_specific"])].sort());
    expect(merged.filter((c) => c.code === "stored_charge")).toHaveLength(1);
  });
});

describe("scan charts without a harmonic study", () => {
  // Transformer known, no drives or spectra: the screen runs, the study does not; the report still scans.
  const input = { ...hallInput(), loads: hallInput().loads.filter((l) => l.kind !== "drive") };
  const result = sized(input);

  it("computes the scan from the network figures: peaks near h = sqrt(S_sc/Q) of each stage", () => {
    expect(result.harmonics).toBeUndefined();
    expect(result.resonance).toBeDefined();
    const m = buildReportModel({ inputs: input, result });
    const chart = charts(m).find((c) => c.id === "scan-recommended") as Chart;
    const lines = chart.shapes.filter((s) => s.role === "scan-stage");
    const stages = result.recommendedBank?.stages ?? [];
    expect(lines).toHaveLength(stages.length);
    const area = chart.shapes.find((s) => s.role === "plot-area") as { data: Record<string, string> };
    const d = (k: string) => Number(area.data[k]);
    lines.forEach((l, i) => {
      if (l.kind !== "polyline") throw new Error("scan line is a polyline");
      const top = l.points.reduce((a, p) => (p[1] < a[1] ? p : a));
      const h = d("h0") + ((top[0] - d("x0")) / (d("x1") - d("x0"))) * (d("h1") - d("h0"));
      const estimate = stages[i]?.resonanceOrder as number;
      // The scan includes source R and load damping, the estimate does not: a few percent apart at most.
      expect(Math.abs(h - estimate) / estimate, `stage ${i + 1}`).toBeLessThan(0.05);
    });
  });

  it("uses supplied series instead of computing them", () => {
    const orders = [1, 2, 3, 4, 5];
    const m = buildReportModel({
      inputs: input,
      result,
      scanSeries: [{ bank: "recommended", stages: [{ stageNumber: 1, orders, impedanceOhm: [0.01, 0.02, 0.5, 0.02, 0.01] }] }],
    });
    const chart = charts(m).find((c) => c.id === "scan-recommended") as Chart;
    const lines = chart.shapes.filter((s) => s.role === "scan-stage");
    expect(lines).toHaveLength(1);
    expect(lines[0]?.data?.points).toBe("5");
  });
});

describe("number formatting", () => {
  it("prints kW 1 decimal, PF 3, orders 2, money 2 with the code, and no signed zero", () => {
    expect(fmt.power(1234.56)).toBe("1,234.6");
    expect(fmt.power(-0.04)).toBe("0.0");
    expect(fmt.power(-12.34)).toBe("-12.3");
    expect(fmt.pf(0.81166)).toBe("0.812");
    expect(fmt.order(14.0303)).toBe("14.03");
    expect(fmt.money(7843.554, "EUR")).toBe("7,843.55 EUR");
    expect(fmt.power(null)).toBe("n/a");
    expect(fmt.ohmOrNone(Number.POSITIVE_INFINITY)).toBe("no limit");
  });
});
