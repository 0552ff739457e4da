import { describe, expect, it } from "vitest";
import type { SizingInput } from "../../src/core/inputs.js";
import { size, type SizingResult } from "../../src/core/pipeline/size.js";
import { compactList, ieee18Severity, mergeBySubject, warning } from "../../src/core/warnings.js";
import { hallInput } from "../report/fixtures.js";

function sized(input: SizingInput): SizingResult {
  const o = size(input);
  if (!o.ok) throw new Error(JSON.stringify(o.issues));
  return o.result;
}

describe("severity against the IEEE Std 18 continuous limits", () => {
  // IEEE Std 18-2012 permits 110 % rms voltage, 120 % peak, 135 % current and kvar (from memory). Above 100 %:
  // information; past half the allowance (105 % for voltage, 117.5 % for current): a warning; above the limit: an error.
  it.each([
    { value: 100, limit: 110, want: null },
    { value: 100.1, limit: 110, want: "info" },
    { value: 105, limit: 110, want: "info" },
    { value: 105.1, limit: 110, want: "warning" },
    { value: 110, limit: 110, want: "warning" },
    { value: 110.1, limit: 110, want: "error" },
    { value: 117.5, limit: 135, want: "info" },
    { value: 117.6, limit: 135, want: "warning" },
    { value: 135.1, limit: 135, want: "error" },
  ] as const)("$value % against $limit % → $want", ({ value, limit, want }) => {
    expect(ieee18Severity(value, limit)).toBe(want);
  });
});

describe("grouping helpers", () => {
  it("stage lists: runs of three or more as a range", () => {
    expect(compactList([1, 2, 3, 5])).toBe("1-3, 5");
    expect(compactList([4, 1, 2])).toBe("1, 2, 4");
    expect(compactList([7])).toBe("7");
  });

  it("per-load warnings of one code become one listing the loads; the heavier severity wins", () => {
    const ws = [
      warning("starting_method_needed", "Saw: state how the motor is started", "loads.0.starting", { subjects: ["Saw"] }),
      warning("other", "unrelated", "x"),
      warning("starting_method_needed", "Planer: state how the motor is started", "loads.2.starting", { subjects: ["Planer"], severity: "error" }),
    ];
    expect(mergeBySubject(ws, "loads")).toEqual([
      {
        code: "starting_method_needed",
        message: "Saw, Planer: state how the motor is started",
        severity: "error",
        path: "loads",
        subjects: ["Saw", "Planer"],
      },
      { code: "other", message: "unrelated", severity: "warning", path: "x" },
    ]);
  });
});

describe("one warning per concern in a sizing", () => {
  const hall = sized(hallInput());

  it("no two warnings share a code and a path", () => {
    const keys = hall.warnings.map((w) => `${w.code}|${w.path ?? ""}`);
    expect(new Set(keys).size).toBe(keys.length);
    for (const w of hall.warnings) expect(["info", "warning", "error"]).toContain(w.severity);
  });

  it("capacitor duty: one warning per bank, every stage above rating listed, information when within IEEE 18", () => {
    const duty = hall.warnings.filter((w) => w.code === "capacitor_above_rating" || w.code === "capacitor_duty_exceeds_limit");
    expect(duty.map((w) => w.path).sort()).toEqual(["proposedBank", "recommendedBank"]);
    const proposed = duty.find((w) => w.path === "proposedBank")!;
    const stages = hall.harmonics!.banks.find((b) => b.name === "proposed")!.stages;
    // every stage of the 4 × 50 kvar bank is a little above rating in at least one quantity (the figures of the study)
    const above = stages.filter((s) => s.duty.aboveRating).map((s) => `stage ${s.stageNumber}`);
    expect(above.length).toBeGreaterThan(1);
    expect(proposed.subjects).toEqual(above);
    const worst = Math.max(
      ...stages.flatMap((s) =>
        [s.duty.rmsVoltage, s.duty.peakVoltage, s.duty.rmsCurrent, s.duty.reactivePower].map((q) => q.valuePct - 100 - (q.limitPct - 100) / 2),
      ),
    );
    expect(worst).toBeLessThan(0); // all within half the allowance…
    expect(proposed.severity).toBe("info"); // …so information only
  });

  it("resonance near a harmonic: one warning per bank, not one per stage", () => {
    const res = hall.warnings.filter((w) => w.code === "resonance_near_harmonic");
    const flaggedStages = hall.proposedBank!.stages.filter((s) => s.nearHarmonic !== null).map((s) => `stage ${s.stage}`);
    expect(res.filter((w) => w.path === "proposedBank.steps").map((w) => w.subjects)).toEqual([flaggedStages]);
  });

  it("the study proposes a detuned bank, so the study is advised, and the result says why", () => {
    expect(hall.harmonics!.proposals.length).toBeGreaterThan(0);
    expect(hall.resonance!.nonlinearSharePct!).toBeLessThan(15);
    expect(hall.resonance!.harmonicStudyAdvised).toBe(true);
    expect(hall.resonance!.harmonicStudyReasons.join(" ")).toMatch(/proposes a 7 % detuned recommended bank/);
  });

  it("460 V capacitors on 480 V: the screen's fundamental-voltage warning gives way to the study's duty warning", () => {
    // hand: 480/460 = 104.3 % of rating: information (≤ 105 %)
    const withStudy = sized({ ...hallInput(), proposedBank: { ratedVoltageV: 460, steps: [{ kvar: 50 }, { kvar: 50 }] } });
    expect(withStudy.warnings.filter((w) => w.path === "proposedBank.ratedVoltageV")).toEqual([]);
    expect(withStudy.warnings.find((w) => w.path === "proposedBank")?.message).toMatch(/rms voltage 104\.\d % of rating/);
    // no drives: no study, the screen's own warning stays, as information
    const noDrives = {
      ...hallInput(),
      loads: hallInput().loads.filter((l) => l.kind !== "drive"),
      proposedBank: { ratedVoltageV: 460, steps: [{ kvar: 50 }] },
    };
    const screen = sized(noDrives).warnings.filter((w) => w.path === "proposedBank.ratedVoltageV");
    expect(screen.map((w) => [w.code, w.severity])).toEqual([["capacitor_above_rated_voltage", "info"]]);
  });

  it.each([
    // hand: a 7 % reactor on a 480 V bus puts 480/0.93 = 516.1 V on 480 V capacitors = 107.5 % → warning
    { ratedV: 480, reactorPct: 7, code: "capacitor_above_rated_voltage", severity: "warning" },
    // hand: 480/0.86 = 558.1 V = 116.3 % → error
    { ratedV: 480, reactorPct: 14, code: "capacitor_overvoltage", severity: "error" },
  ] as const)("screen: $reactorPct % reactor on $ratedV V capacitors → $code, $severity", ({ ratedV, reactorPct, code, severity }) => {
    const noDrives = {
      ...hallInput(),
      loads: hallInput().loads.filter((l) => l.kind !== "drive"),
      proposedBank: { ratedVoltageV: ratedV, reactorPct, steps: [{ kvar: 50 }] },
    };
    const w = sized(noDrives).warnings.filter((x) => x.path === "proposedBank.ratedVoltageV");
    expect(w.map((x) => [x.code, x.severity])).toEqual([[code, severity]]);
  });

  it("a site that needs no bank gets no warning about the fixed part of a bank", () => {
    // 100 kW at PF 0.99 lagging is above the 0.95 target: nothing to design
    const r = sized({
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      loads: [{ label: "Oven", kind: "other", measurement: { method: "kw_pf", kW: 100, pf: 0.99, sense: "lagging" } }],
    });
    expect(r.recommendedBank).toBeNull();
    expect(r.warnings.map((w) => w.code)).not.toContain("light_load_unknown");
  });
});
