import { describe, expect, it } from "vitest";
import type { SizingInput } from "../../src/core/inputs.js";
import { size } from "../../src/core/pipeline/size.js";
import { buildReportModel } from "../../src/report/model.js";

/** The installed-banks section shows the combined program the result carries (invented site). */
describe("report: installed and new steps together", () => {
  it("lists the steps in switching order, installed first, with the pair's share of samples held", () => {
    const kW: number[] = [];
    const kvar: number[] = [];
    for (let h = 0; h < 24 * 28; h++) {
      const day = h % 24 >= 7 && h % 24 < 19;
      kW.push(day ? 900 : 300);
      kvar.push(day ? 700 : 220);
    }
    const input = {
      system: { voltageV: 480, frequencyHz: 60, phases: 3 },
      targetPF: 0.95,
      scope: "whole_site",
      loads: [{ label: "Plant", kind: "other", measurement: { method: "kw_kvar", kW: 900, kvar: 700 } }],
      serviceEntrance: { measurement: { method: "kw_kvar", kW: 900, kvar: 700 } },
      intervalDemand: { kW, kvar, intervalMinutes: 60 },
      installedBanks: [{ label: "Old bank", location: "service", control: "automatic", ratedVoltageV: 480, steps: [50, 50, 50, 50, 50].map((k) => ({ kvar: k })) }],
      bankReadings: [{ bank: "Old bank", inServiceSteps: [] }],
    } as SizingInput;
    const out = size(input);
    if (!out.ok) throw new Error(JSON.stringify(out.issues));
    const program = out.result.recommendedBank?.combinedProgram;
    expect(program).toBeDefined();
    const section = buildReportModel({ inputs: input, result: out.result }).sections.find((s) => s.id === "installed");
    const table = section?.blocks.find((b) => b.kind === "table" && b.title === "Installed and new steps under one controller");
    if (!table || table.kind !== "table") throw new Error("no combined-program table");
    expect(table.rows.map((r) => r[1])).toEqual(program!.steps.map((s) => s.source));
    expect(table.rows[0]).toEqual(["1", "installed", "50.0"]);
    expect(table.note).toContain(`${(program!.metShare * 100).toFixed(1)} % of the samples`);
  });
});
