import { describe, expect, it } from "vitest";
import { plantWithInstalledAutomaticBank } from "../helpers/sites.js";
import { size } from "../../src/core/pipeline/size.js";
import { buildReportModel } from "../../src/report/model.js";

/** The installed-banks section shows the combined program the result carries (invented site). */
describe("report: installed and new steps together", () => {
  it("lists the steps in switching order, installed first, with the pair's share of samples held", () => {
    const input = plantWithInstalledAutomaticBank();
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
