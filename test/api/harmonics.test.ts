import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { harmonicScanResultSchema, sizingWithHarmonicsSchema } from "../../src/http/schemas/results.js";
import { makeStoreApp } from "../helpers/db.js";
import { api } from "../helpers/auth.js";

let app: FastifyInstance;
beforeAll(async () => {
  ({ app } = await makeStoreApp());
});
afterAll(async () => {
  await app.close();
});

// Invented plant: 480 V, 1500 kVA 5.75 % transformer on an infinite source, a 250 kW drive line and a 300 kW compressor.
const site = {
  system: { voltageV: 480, frequencyHz: 60, phases: 3 },
  targetPF: 0.95,
  loads: [
    { label: "Conveyor drives", kind: "drive", measurement: { method: "kw_pf", kW: 250, pf: 0.95, sense: "lagging" } },
    { label: "Compressor", kind: "motor", measurement: { method: "kw_pf", kW: 300, pf: 0.72, sense: "lagging" } },
  ],
  transformer: { kVA: 1500, impedancePct: 5.75 },
  proposedBank: { ratedVoltageV: 480, steps: [{ kvar: 100 }, { kvar: 100 }] },
};

// hand calculation: S_sc = 1500 / 0.0575 = 26 087 kVA (infinite utility)
const S_SC_KVA = 1500 / 0.0575;

describe("POST /v1/harmonics/scan", () => {
  it("returns the |Z(h)| series for the bus and every stage, with peaks near the closed form", async () => {
    const res = await api(app)
      .post("/v1/harmonics/scan")
      .send({ ...site, scan: { stepOrder: 0.01 } });
    expect(res.status).toBe(200);
    expect(() => harmonicScanResultSchema.parse(res.body)).not.toThrow();
    const study = res.body.study;
    // h from 1 to 50 in 0.01 steps: (50 − 1)/0.01 + 1 = 4901 points
    expect(study.withoutCapacitors.series.orders).toHaveLength(4901);
    const proposed = study.banks.find((b: { name: string }) => b.name === "proposed");
    expect(proposed.stages).toHaveLength(2);
    for (const [i, stage] of proposed.stages.entries()) {
      expect(stage.series.impedanceOhm).toHaveLength(4901);
      // closed form h = √(S_sc/Q_c) (IEEE Std 519 practice); 100 kvar → 16.15, 200 kvar → 11.42; damping shifts it < 2 %
      const closed = Math.sqrt(S_SC_KVA / (100 * (i + 1)));
      expect(Math.abs(stage.peaks[0].order - closed) / closed).toBeLessThan(0.02);
    }
  });

  it("honours the scan options", async () => {
    const res = await api(app)
      .post("/v1/harmonics/scan")
      .send({ ...site, scan: { fromOrder: 2, toOrder: 20, stepOrder: 0.1 } });
    expect(res.status).toBe(200);
    // (20 − 2)/0.1 + 1 = 181 points
    expect(res.body.study.withoutCapacitors.series.orders).toHaveLength(181);
    expect(res.body.study.withoutCapacitors.series.orders[0]).toBeCloseTo(2, 9);
  });

  it("needs the source strength", async () => {
    const { transformer: _t, ...noSource } = site;
    const res = await api(app).post("/v1/harmonics/scan").send(noSource);
    expect(res.status).toBe(400);
    expect(res.headers["content-type"]).toMatch(/application\/problem\+json/);
    expect(res.body.errors[0].path).toBe("transformer");
  });

  it.each([
    [{ stepOrder: 0 }, "scan.stepOrder"],
    [{ fromOrder: 30, toOrder: 10 }, "scan.fromOrder"],
    [{ toOrder: 60 }, "scan.toOrder"],
    [{ points: 3 }, "scan.points"],
  ])("rejects scan options %j at %s", async (scan, path) => {
    const res = await api(app)
      .post("/v1/harmonics/scan")
      .send({ ...site, scan });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
  });
});

describe("harmonics in /v1/sizing", () => {
  it("adds the study's figures, not the series, when the site has drives", async () => {
    const res = await api(app).post("/v1/sizing").send(site);
    expect(res.status).toBe(200);
    expect(() => sizingWithHarmonicsSchema.parse(res.body)).not.toThrow();
    const h = res.body.harmonics;
    expect(h).toBeDefined();
    expect(h.withoutCapacitors.series).toBeUndefined();
    // a drive without a measured spectrum gets the six-pulse orders 6k ± 1 (textbook)
    expect(h.presentOrders.slice(0, 4)).toEqual([5, 7, 11, 13]);
    // the plain recommended bank fails the study, so a detuned alternative is proposed and warned
    const codes = res.body.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain("detuned_bank_proposed");
    expect(h.proposals.length).toBeGreaterThan(0);
    // the detuned proposal's stages resonate below their tuning order (series LC practice)
    for (const p of h.proposals) {
      for (const s of p.study.stages) expect(s.peaks[0].order).toBeLessThan(1 / Math.sqrt(p.design.reactorPct / 100));
    }
  });

  it("has no harmonics section for a site with no harmonic source", async () => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({ ...site, loads: [site.loads[1]] });
    expect(res.status).toBe(200);
    expect(res.body.harmonics).toBeUndefined();
  });

  it("adds background distortion arithmetically to the bus's own", async () => {
    const withBg = await api(app)
      .post("/v1/sizing")
      .send({ ...site, backgroundVoltageDistortion: [{ order: 5, pct: 2 }] });
    const without = await api(app).post("/v1/sizing").send(site);
    const line = (b: typeof withBg.body) => b.harmonics.withoutCapacitors.distortion.lines.find((l: { order: number }) => l.order === 5).voltagePct;
    // the stated model: background + injected, arithmetic (worst case)
    expect(line(withBg.body) - line(without.body)).toBeCloseTo(2, 9);
  });

  it.each([
    [[{ order: 1, pct: 10 }], "loads.0.harmonics.0.order"],
    [[{ order: 51, pct: 10 }], "loads.0.harmonics.0.order"],
    [[{ order: 5, pct: -1 }], "loads.0.harmonics.0.pct"],
    [
      [
        { order: 5, pct: 200 },
        { order: 7, pct: 150 },
      ],
      "loads.0.harmonics",
    ],
    [
      [
        { order: 5, pct: 20 },
        { order: 5, pct: 10 },
      ],
      "loads.0.harmonics",
    ],
  ])("rejects the spectrum %j at %s", async (harmonics, path) => {
    const res = await api(app)
      .post("/v1/sizing")
      .send({ ...site, loads: [{ ...site.loads[0], harmonics }, site.loads[1]] });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path)).toContain(path);
  });
});

describe("harmonics in stored surveys", () => {
  it("stores the harmonics section with the survey and returns it unchanged", async () => {
    const b = await api(app).post("/v1/buildings").send({ name: "Drive hall", system: site.system, transformer: site.transformer });
    expect(b.status).toBe(201);
    const s = await api(app)
      .post(`/v1/buildings/${b.body.id}/surveys`)
      .send({
        surveyedAt: "2026-02-03T09:00:00Z",
        surveyor: "Test surveyor",
        targetPF: 0.95,
        loads: site.loads,
        backgroundVoltageDistortion: [{ order: 5, pct: 1 }],
      });
    expect(s.status).toBe(201);
    expect(s.body.result.harmonics.withoutCapacitors.distortion.thdVPct).toBeGreaterThan(0);
    const got = await api(app).get(`/v1/surveys/${s.body.id}`);
    expect(got.status).toBe(200);
    expect(got.body.result.harmonics).toEqual(s.body.result.harmonics);
    expect(got.body.inputs.backgroundVoltageDistortion).toEqual([{ order: 5, pct: 1 }]);
    const codes = got.body.result.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain("detuned_bank_proposed");
  });
});
