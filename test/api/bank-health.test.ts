import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { organisationNamed } from "../../src/auth/bootstrap.js";
import { inject, keyFor } from "../helpers/auth.js";
import { makeStoreApp } from "../helpers/db.js";
import { expectClose, TOL } from "../helpers/tolerance.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

let app: FastifyInstance;
beforeAll(async () => {
  ({ app } = await makeStoreApp());
});
afterAll(() => app.close());

const post = (url: string, payload: unknown) => inject(app, { method: "POST", url, payload: payload as object });
const bank = { label: "Wall bank", location: "service", control: "automatic", ratedVoltageV: 400, steps: [{ kvar: 25 }, { kvar: 25 }, { kvar: 50 }] };
// hand: 25 kvar at 400 V → 36.0844 A; 50 kvar → 72.1688 A
const reading = (step2A: number, step3: number[]) => ({
  bank: "Wall bank",
  inServiceSteps: [1, 2, 3],
  stepCurrents: [
    { step: 1, amps: 36 },
    { step: 2, amps: step2A },
    { step: 3, amps: step3 },
  ],
});

describe("GET /v1/buildings/{id}/bank-health", () => {
  it("shows the capacitance per step drifting across three surveys, oldest first; a replaced bank starts a new series", async () => {
    const b = (await post("/v1/buildings", buildingBody({ name: "Health hall", installedBanks: [bank] }))).json();
    const dates = ["2024-01-10", "2024-04-10", "2024-07-10"];
    const step2 = [35.7, 33.9, 31.0];
    const ids: string[] = [];
    // posted out of order: the answer is ordered by survey date
    for (const i of [2, 0, 1]) {
      const res = await post(`/v1/buildings/${b.id}/surveys`, surveyBody({ surveyedAt: dates[i], bankReadings: [reading(step2[i]!, [72, 72, 72])] }));
      expect(res.statusCode).toBe(201);
      ids[i] = res.json().id;
    }
    const h = (await inject(app, `/v1/buildings/${b.id}/bank-health`)).json();
    expect(h).toMatchObject({ buildingId: b.id, order: "oldest_first", truncated: false });
    expect(h.series).toHaveLength(1);
    const s2 = h.series[0].steps[1];
    expect(s2.points.map((p: { surveyId: string }) => p.surveyId)).toEqual(ids);
    // hand: 35.7/36.0844 = 98.93 %, 33.9/36.0844 = 93.95 %, 31.0/36.0844 = 85.91 %
    [98.9347, 93.9464, 85.9097].forEach((pct, i) => expectClose(s2.points[i].capacitancePct, pct, TOL.pct, `point ${i}`));
    expect(s2.points.map((p: { status: string }) => p.status)).toEqual(["healthy", "degraded", "degraded"]);
    expectClose(s2.points[2].measuredKvar, 25 * 0.859097, TOL.powerRounded, "kvar");

    // the trend carries the kvar in service (100 rated) and delivered per survey
    const trend = (await inject(app, `/v1/buildings/${b.id}/trend`)).json();
    expect(trend.items.map((p: { installedKvarInService: number }) => p.installedKvarInService)).toEqual([100, 100, 100]);
    expect(trend.items[2].kvarDelivered).toBeLessThan(trend.items[0].kvarDelivered);

    // the bank is replaced by a larger one under the same label: a new series, and the answer says so
    await inject(app, {
      method: "PATCH",
      url: `/v1/buildings/${b.id}`,
      payload: { installedBanks: [{ ...bank, steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }] }] },
    });
    await post(
      `/v1/buildings/${b.id}/surveys`,
      surveyBody({ surveyedAt: "2024-10-10", bankReadings: [{ bank: "Wall bank", inServiceSteps: [1], stepCurrents: [{ step: 1, amps: 72 }] }] }),
    );
    // and then renamed, same definition
    await inject(app, {
      method: "PATCH",
      url: `/v1/buildings/${b.id}`,
      payload: { installedBanks: [{ ...bank, label: "MSB bank", steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }] }] },
    });
    await post(`/v1/buildings/${b.id}/surveys`, surveyBody({ surveyedAt: "2025-01-10", bankReadings: [{ bank: "MSB bank", inServiceSteps: [1] }] }));
    const after = (await inject(app, `/v1/buildings/${b.id}/bank-health`)).json();
    expect(after.series.map((s: { bank: string; startedBecause: string }) => `${s.bank}:${s.startedBecause}`)).toEqual([
      "Wall bank:first_seen",
      "Wall bank:replaced",
      "MSB bank:renamed",
    ]);
    expect(after.series[2].note).toContain('"Wall bank"');
  });

  it("answers 404 for another organisation's building", async () => {
    const b = (await post("/v1/buildings", buildingBody({ name: "Private hall", installedBanks: [bank] }))).json();
    const other = await keyFor(app, "auditor", (await organisationNamed(app.store, "Other org")).id);
    const res = await app.inject({ method: "GET", url: `/v1/buildings/${b.id}/bank-health`, headers: { authorization: `Bearer ${other}` } });
    expect(res.statusCode).toBe(404);
  });
});
