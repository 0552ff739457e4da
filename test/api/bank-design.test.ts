import type request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { sizingWithHarmonicsSchema } from "../../src/http/schemas/results.js";
import { makeStoreApp } from "../helpers/db.js";
import { expectClose } from "../helpers/tolerance.js";
import { api } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  ({ app } = await makeStoreApp());
});
afterAll(async () => {
  await app.close();
});

const SQRT3 = Math.sqrt(3);
// Invented workshop on 480 V / 60 Hz with a 1000 kVA transformer.
const body = {
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  targetPF: 0.95,
  transformer: { kVA: 1000, impedancePct: 5.75 },
  loads: [
    {
      label: "Chiller compressor",
      kind: "motor",
      starting: "across_the_line",
      noLoadAmps: 30,
      measurement: { method: "kw_pf", kW: 75, pf: 0.8, sense: "lagging" },
    },
    { label: "Hoist", kind: "motor", starting: "jogging", noLoadAmps: 20, measurement: { method: "kw_pf", kW: 30, pf: 0.75, sense: "lagging" } },
    { label: "Line A motors", kind: "motor", group: "MCC-1", measurement: { method: "kw_pf", kW: 250, pf: 0.72, sense: "lagging" } },
    { label: "Offices", kind: "lighting", measurement: { method: "kw_pf", kW: 60, pf: 0.9, sense: "lagging" } },
  ],
  lightLoad: { measurement: { method: "kw_kvar", kW: 90, kvar: 60 } },
  bankDesign: { ctRatio: 300, protectionDevice: "fuse" },
};

describe("bank design through /v1/sizing", () => {
  let res: request.Response;
  beforeAll(async () => {
    res = await api(app).post("/v1/sizing").send(body);
  });

  it("answers 200 with placement and a designed bank", () => {
    expect(res.status).toBe(200);
    expect(() => sizingWithHarmonicsSchema.parse(res.body)).not.toThrow();
    expect(res.body.placement.loads).toHaveLength(4);
  });

  it("puts a capacitor at the chiller's terminals within its self-excitation limit", () => {
    const chiller = res.body.placement.loads.find((l: { label: string }) => l.label === "Chiller compressor");
    expect(chiller.location).toBe("terminal");
    // Q_max = √3·V·I₀/1000 = 1.732 × 480 × 30 / 1000 = 24.94 kvar (motor application guidance); 90 % → 22.45 kvar
    expectClose(chiller.terminal.selfExcitationLimitKvar, (SQRT3 * 480 * 30) / 1000, { rel: 1e-9 }, "Q_max");
    expect(chiller.terminal.perMotorKvar).toBeLessThanOrEqual(0.9 * ((SQRT3 * 480 * 30) / 1000));
    // the overload relay must be reset on the new, lower line current (NFPA 70 460.9)
    expect(chiller.terminal.lineCurrentAfterA).toBeLessThan(chiller.terminal.lineCurrentBeforeA);
    expect(chiller.terminal.overloadNote).toMatch(/460\.9/);
  });

  it("never puts one on a jogged motor, and says why with a code", () => {
    const hoist = res.body.placement.loads.find((l: { label: string }) => l.label === "Hoist");
    expect(hoist.location).not.toBe("terminal");
    const codes = res.body.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain("no_terminal_capacitor_starting");
  });

  it("holds the fixed part under the light-load reactive demand", () => {
    const bank = res.body.recommendedBank;
    // light load reads 60 kvar: the fixed part must not exceed it, or the site leads at light load
    expect(bank.fixedKvar).toBeLessThanOrEqual(60);
    expect(bank.stepPlan.source).toBe("survey_and_light_load");
  });

  it("gives C/k, protection at 135 % and a standard fuse, and discharge resistors", () => {
    const bank = res.body.recommendedBank;
    const smallest = bank.controller.smallestStepKvar;
    // C/k = Q_step·1000/(√3·V·CT ratio) (trade formula)
    expectClose(bank.controller.responseA, (smallest * 1000) / (SQRT3 * 480 * 300), { rel: 1e-9 }, "C/k");
    const whole = bank.protection.bank;
    // rated current I = Q·1000/(√3·V); conductors and disconnect ≥ 135 % (NFPA 70 460.8(A), (C))
    expectClose(whole.ratedCurrentA, (whole.kvar * 1000) / (SQRT3 * 480), { rel: 1e-9 }, "rated current");
    expectClose(whole.conductorMinAmpacityA, 1.35 * whole.ratedCurrentA, { rel: 1e-9 }, "conductor");
    // fuse at 165 % (common practice) rounded up to a standard rating of NFPA 70 240.6(A)
    const standard = [
      15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000,
    ];
    expect(standard).toContain(whole.ocpdRatingA);
    expect(whole.ocpdRatingA).toBeGreaterThanOrEqual(1.65 * whole.ratedCurrentA);
    // NFPA 70 460.6(A): ≤ 50 V within 1 min for ≤ 1000 V
    expect(bank.discharge[0].governingCitation).toMatch(/460\.6/);
  });

  it("screens every switchable total for resonance", () => {
    const bank = res.body.recommendedBank;
    const last = bank.stages[bank.stages.length - 1];
    expectClose(last.cumulativeNameplateKvar, bank.fixedKvar + bank.switchedKvar, { abs: 1e-9 }, "last stage = whole bank");
    for (const st of bank.stages) expect(st.resonanceOrder).toBeGreaterThan(1);
  });

  it("rejects bad design options with their paths", async () => {
    const bad = await api(app)
      .post("/v1/sizing")
      .send({ ...body, bankDesign: { ctRatio: -5, coverage: 2 }, loads: [{ ...body.loads[0], noLoadAmps: 0 }] });
    expect(bad.status).toBe(400);
    const paths = bad.body.errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["bankDesign.ctRatio", "bankDesign.coverage", "loads.0.noLoadAmps"]));
  });
});
