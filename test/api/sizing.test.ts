import type request from "supertest";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as sizingContracts from "../../src/http/contracts/sizing.js";
import { sizingResultSchema } from "../../src/http/schemas/results.js";
import { makeTestApp } from "../helpers/app.js";
import { exampleSizingBody } from "../helpers/bodies.js";
import { expectClose, TOL } from "../helpers/tolerance.js";
import { api } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

/** The 200 schema POST /v1/sizing declares (the OpenAPI document is generated from it). */
const declared = sizingContracts.size.response["200"]?.content?.["application/json"]?.schema;

/** Every 200 from /v1/sizing must match sizingResultSchema and the schema the API documents. */
function expectValidResult(body: unknown): void {
  for (const [name, schema] of [
    ["sizingResultSchema", sizingResultSchema],
    ["declared 200 schema", declared],
  ] as const) {
    expect(schema, name).toBeDefined();
    const parsed = schema!.safeParse(body);
    expect(parsed.success, `${name}: ${parsed.success ? "" : JSON.stringify(parsed.error.issues.slice(0, 5))}`).toBe(true);
  }
}

describe("POST /v1/sizing — the contract example", () => {
  // Hand calculation of the example:
  //   S = √3·480·120/1000 = 99.766 kVA; P = 0.78·S = 77.818 kW; Q = √(1 − 0.78²)·S = 0.625780·99.766 = 62.432 kvar
  //   S_sc = 1/(1/500 000 + 0.06/1500) = 1/(2e-6 + 4e-5) = 1/4.2e-5 = 23 809.5 kVA
  //   stages 100 and 200 kvar rated 480 V on 480 V behind 7 %: Q_eff = 100/0.93 = 107.5, 200/0.93 = 215.1 kvar
  //   h = √(1/(100/23 809.5 + 0.07)) = √(1/0.074200) = 3.671; √(1/(200/23 809.5 + 0.07)) = √(1/0.078400) = 3.571
  //   tuning 1/√0.07 = 3.780; capacitor voltage 480/0.93 = 516.1 V = 107.5 % of 480 V (between 100 and 110 %)
  //   kvar to 0.95: 62.432 − 77.818·0.328684 = 62.432 − 25.577 = 36.854 kvar → one fixed 40 kvar unit
  const S = (Math.sqrt(3) * 480 * 120) / 1000;
  let res: request.Response;
  beforeAll(async () => {
    res = await api(app).post("/v1/sizing").send(exampleSizingBody());
  });

  it("answers 200 application/json that validates against sizingResultSchema", () => {
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^application\/json/);
    expectValidResult(res.body);
  });

  it("the load and the site: 99.77 kVA, 77.82 kW, 62.43 kvar lagging, 120 A", () => {
    const load = res.body.loads[0];
    expectClose(load.kVA, S, TOL.power, "load kVA");
    expectClose(load.kW, 0.78 * S, TOL.power, "load kW");
    expectClose(load.kvar, Math.sqrt(1 - 0.78 ** 2) * S, TOL.power, "load kvar");
    expectClose(load.kVA, 99.77, TOL.powerRounded, "load kVA (quoted)");
    expectClose(load.kW, 77.82, TOL.powerRounded, "load kW (quoted)");
    expectClose(load.kvar, 62.43, TOL.powerRounded, "load kvar (quoted)");
    expect(load.sense).toBe("lagging");
    expectClose(load.lineCurrentA, 120, TOL.currentA, "load line current");
    expectClose(res.body.site.kW, 0.78 * S, TOL.power, "site kW");
    expectClose(res.body.site.displacementPF, 0.78, TOL.pf, "site PF");
    expect(res.body.site.basis).toBe("sum_of_loads");
  });

  it("correction and recommended bank", () => {
    expectClose(res.body.correction.kvarRequired, 36.854, TOL.powerQuoted, "kvar required");
    expectClose(res.body.correction.kvarPerKW, 0.474, TOL.kvarPerKW, "kvar per kW 0.78 → 0.95 (hand: 0.80228 − 0.32868)");
    expectClose(res.body.correction.pfAfter, 0.95, TOL.pf, "pf after");
    // Bank design rule (the project's own, README "Bank design"): without a light-load reading the fixed part is held
    // under min(need 36.85 kvar, 5 % of the 1500 kVA transformer = 75 kvar) → the largest standard unit ≤ 36.85 is
    // 30 kvar; the 6.85 kvar left is switched in the fewest (3) equal steps of a standard size: 3 × 2.5 kvar.
    expect(res.body.recommendedBank.arrangement).toBe("fixed_and_automatic");
    expect(res.body.recommendedBank.steps).toEqual([{ kvar: 30 }, { kvar: 2.5 }, { kvar: 2.5 }, { kvar: 2.5 }]);
    expect(res.body.recommendedBank.fixedKvar).toBe(30);
    const codes = res.body.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain("light_load_unknown");
  });

  it("short circuit and the proposed bank's stages", () => {
    expectClose(res.body.resonance.shortCircuitKVA, 1 / 4.2e-5, TOL.shortCircuitKVA, "S_sc");
    expectClose(res.body.resonance.shortCircuitKVA, 23_809.5, TOL.shortCircuitKVAQuoted, "S_sc (quoted)");
    const pb = res.body.proposedBank;
    expectClose(pb.stages[0].cumulativeKvar, 107.5, TOL.powerRounded, "stage 1 effective kvar");
    expectClose(pb.stages[1].cumulativeKvar, 215.1, TOL.powerRounded, "stage 2 effective kvar");
    expectClose(pb.stages[0].resonanceOrder, 3.671, TOL.order, "stage 1 h");
    expectClose(pb.stages[1].resonanceOrder, 3.571, TOL.order, "stage 2 h");
    expectClose(pb.tuningOrder, 3.78, TOL.order, "tuning order");
    expectClose(pb.capacitorVoltageV, 516.1, TOL.voltageRoundedV, "capacitor voltage");
    expectClose(pb.effectiveKvar, 215.1, TOL.powerRounded, "bank effective kvar");
  });

  it("warns capacitor_above_rated_voltage (516 V on 480 V) and that the bank would make the site lead", () => {
    const codes = res.body.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain("capacitor_above_rated_voltage");
    expect(codes).not.toContain("capacitor_overvoltage");
    expect(res.body.warnings).toContainEqual(expect.objectContaining({ code: "capacitor_above_rated_voltage", path: "proposedBank.ratedVoltageV" }));
    // 215.1 kvar supplied > 62.4 kvar consumed
    expect(codes).toContain("proposed_bank_leads");
  });

  it("carries the safety cautions", () => {
    const codes = res.body.cautions.map((c: { code: string }) => c.code);
    expect(codes).toEqual(expect.arrayContaining(["stored_charge", "lockout_tagout", "no_capacitors_on_drive_output"]));
  });

  it("echoes a valid x-request-id", async () => {
    const r = await api(app).post("/v1/sizing").set("x-request-id", "survey-42").send(exampleSizingBody());
    expect(r.headers["x-request-id"]).toBe("survey-42");
  });
});

describe("POST /v1/sizing — other valid requests", () => {
  const VALID: { name: string; body: () => Record<string, any>; check?: (b: any) => void }[] = [
    {
      name: "single-phase system, two methods, quantity",
      body: () => ({
        system: { voltageV: 240, frequencyHz: 60, phases: 1 },
        loads: [
          { label: "compressor", quantity: 2, measurement: { method: "v_i_kw", volts: 240, amps: 50, kW: 9.6 } },
          { label: "lights", kind: "lighting", measurement: { method: "kw_pf", kW: 3, pf: 0.9, sense: "lagging" } },
        ],
      }),
      // hand calculation: 2 × (9.6 kW, 7.2 kvar) + (3 kW, 3·√0.19/0.9 = 1.4530 kvar) = 22.2 kW, 15.853 kvar
      check: (b) => {
        expectClose(b.site.kW, 22.2, TOL.power, "site kW");
        expectClose(b.site.kvar, 14.4 + (3 * Math.sqrt(0.19)) / 0.9, TOL.power, "site kvar");
        // I = S/V: √(22.2² + 15.853²)·1000/240 = 27.279·1000/240 = 113.66 A
        expectClose(b.site.lineCurrentA, (Math.hypot(22.2, 14.4 + (3 * Math.sqrt(0.19)) / 0.9) * 1000) / 240, TOL.currentA, "1φ current");
      },
    },
    {
      name: "service entrance basis with the unmetered remainder",
      body: () => ({
        system: { voltageV: 400, frequencyHz: 50, phases: 3 },
        loads: [{ label: "line 1", measurement: { method: "kw_kvar", kW: 150, kvar: 100 } }],
        serviceEntrance: { label: "main", measurement: { method: "kw_kva", kW: 200, kVA: 250 } },
      }),
      // hand: main 200 kW, √(250² − 200²) = 150 kvar; unmetered 50 kW, 50 kvar
      check: (b) => {
        expect(b.site.basis).toBe("service_entrance");
        expectClose(b.site.unmetered.kW, 50, TOL.power, "unmetered kW");
        expectClose(b.site.unmetered.kvar, 50, TOL.power, "unmetered kvar");
      },
    },
    {
      name: "leading site: no recommended bank",
      body: () => ({
        system: { voltageV: 480, frequencyHz: 60, phases: 3 },
        loads: [{ label: "over-corrected", measurement: { method: "kw_kvar", kW: 100, kvar: -60 } }],
      }),
      check: (b) => {
        expect(b.recommendedBank).toBeNull();
        expect(b.correction.kvarRequired).toBe(0);
        // hand: 60 − 32.868 = 27.132 kvar
        expectClose(b.correction.leadingExcessKvar, 27.1316, TOL.powerQuoted, "leading excess");
        expect(b.warnings.map((w: any) => w.code)).toContain("site_leading");
      },
    },
    {
      name: "drives with a measured spectrum, declared sources, utility only",
      body: () => ({
        system: { voltageV: 480, frequencyHz: 60, phases: 3 },
        targetPF: 0.97,
        loads: [
          {
            label: "VFD bank",
            kind: "drive",
            measurement: { method: "kw_pf", kW: 200, pf: 0.9, sense: "lagging", pfType: "true", currentTHDPct: 35 },
            harmonics: [
              { order: 5, pct: 30 },
              { order: 7, pct: 12 },
            ],
          },
          { label: "motors", kind: "motor", measurement: { method: "kw_pf", kW: 400, pf: 0.78, sense: "lagging" } },
        ],
        utility: { faultMVA: 30 },
        harmonicSources: ["twelve_pulse"],
      }),
      check: (b) => {
        expect(b.resonance.harmonicOrdersPresent).toEqual([5, 7, 11, 13]);
        expectClose(b.resonance.shortCircuitKVA, 30_000, TOL.shortCircuitKVA, "utility alone");
        expect(b.resonance.nonlinearSharePct).toBeNull();
      },
    },
    {
      name: "exactly 2000 loads (the limit)",
      body: () => ({
        system: { voltageV: 480, frequencyHz: 60, phases: 3 },
        loads: Array.from({ length: 2000 }, (_, i) => ({ label: `L${i}`, measurement: { method: "kw_pf", kW: 1, pf: 0.8, sense: "lagging" } })),
      }),
      // hand: 2000 × (1 kW, 0.75 kvar)
      check: (b) => {
        expect(b.loads).toHaveLength(2000);
        expectClose(b.site.kvar, 1500, TOL.power, "site kvar");
      },
    },
  ];

  it.each(VALID)("$name → 200 and schema-valid", async ({ body, check }) => {
    const r = await api(app).post("/v1/sizing").send(body());
    expect(r.status, JSON.stringify(r.body).slice(0, 500)).toBe(200);
    expectValidResult(r.body);
    check?.(r.body);
  });
});

describe("service routes", () => {
  it("GET /health → {status: ok}", async () => {
    const r = await api(app).get("/health");
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ status: "ok" });
  });

  it("an unknown route → 404 problem", async () => {
    const r = await api(app).get("/v1/nothing-here?x=1");
    expect(r.status).toBe(404);
    expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
    expect(r.body).toMatchObject({ status: 404, title: "Not found", instance: "/v1/nothing-here?x=1" });
    expect(r.body.type).toMatch(/not-found$/);
    expect(r.body.detail).toBe("no route GET /v1/nothing-here");
  });

  it("GET /v1/sizing (wrong method) → 405 problem with Allow: POST", async () => {
    const r = await api(app).get("/v1/sizing");
    expect(r.status).toBe(405);
    expect(r.headers.allow).toBe("POST");
    expect(r.headers["content-type"]).toMatch(/^application\/problem\+json/);
  });
});
