import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";
import { expectClose, TOL } from "../helpers/tolerance.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";

let app: FastifyInstance;
let store: Store;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
});
afterAll(() => app.close());

/** An invented automatic bank: 4 × 25 kvar, plain, 400 V / 50 Hz, at the main switchboard. */
export const wallBank = {
  label: "MSB-1 bank",
  location: "service",
  control: "automatic",
  ratedVoltageV: 400,
  steps: [{ kvar: 25 }, { kvar: 25 }, { kvar: 25 }, { kvar: 25 }],
  installedOn: "2019-04-01",
};
// hand: a healthy 25 kvar step at 400 V draws 25 000/(√3·400) = 25 000/692.820 = 36.084 A
const I25 = 36.0844;

const post = (url: string, payload: unknown) => inject(app, { method: "POST", url, payload: payload as object });
const patch = (url: string, payload: unknown) => inject(app, { method: "PATCH", url, payload: payload as object });

describe("installed banks through the API", () => {
  it("are stored on a building, versioned on PATCH, and read by its surveys", async () => {
    const created = await post("/v1/buildings", buildingBody({ name: "Bank hall", installedBanks: [wallBank] }));
    expect(created.statusCode).toBe(201);
    const b = created.json();
    expect(b.installedBanks).toEqual([wallBank]);
    const changed = await patch(`/v1/buildings/${b.id}`, { installedBanks: [{ ...wallBank, reactorPct: 0 }] });
    expect(changed.json()).toMatchObject({ version: 2 });
    const history = (await inject(app, `/v1/buildings/${b.id}/history`)).json();
    expect(history.items.map((v: { installedBanks: unknown[] }) => v.installedBanks.length)).toEqual([1, 1]);
    expect(history.items[1].installedBanks[0].reactorPct).toBe(0);

    const res = await post(
      `/v1/buildings/${b.id}/surveys`,
      surveyBody({
        bankReadings: [
          {
            bank: "MSB-1 bank",
            inServiceSteps: [1, 2],
            stepCurrents: [
              { step: 1, amps: [36, 36.2, 35.9] },
              { step: 2, amps: [30, 0, 30] },
            ],
          },
        ],
      }),
    );
    expect(res.statusCode).toBe(201);
    const r = res.json().result;
    expect(r.installedBanks[0].steps.map((s: { status: string }) => s.status)).toEqual(["healthy", "failed", "not_measured", "not_measured"]);
    expectClose(r.installedBanks[0].steps[0].expectedCurrentA, I25, TOL.quoted4dp, "expected current");
    // step 2: mean (30 + 0 + 30)/3 = 20 A → 25·20/36.0844 = 13.856 kvar; repair restores 25 − 13.856 = 11.144 kvar
    expect(r.correction.repairFirst[0]).toMatchObject({ step: 2, status: "failed" });
    expectClose(r.correction.repairFirst[0].restoresKvar, 11.1435, TOL.powerQuoted, "restores");
    const stored = (await inject(app, `/v1/surveys/${res.json().id}`)).json();
    expect(stored.building.installedBanks).toHaveLength(1);
    expect(stored.result).toEqual(r);
    const trend = (await inject(app, `/v1/buildings/${b.id}/trend`)).json();
    expectClose(trend.items[0].installedKvarInService, 50, TOL.power, "in service (two rated steps)");
    // delivered: 25·(108.1/3)/36.0844 = 25·36.0333/36.0844 = 24.9646, + 13.8564 = 38.8210 kvar
    expectClose(trend.items[0].kvarDelivered, 38.821, TOL.powerQuoted, "delivered");
  });

  it("rejects bad readings with 400s naming the field, and stores nothing", async () => {
    const b = (await post("/v1/buildings", buildingBody({ name: "Reject hall", installedBanks: [wallBank] }))).json();
    const before = await rowCounts(store);
    const cases: [unknown, string][] = [
      [[{ bank: "Nope", inServiceSteps: [] }], "bankReadings.0.bank"],
      [[{ bank: "MSB-1 bank", inServiceSteps: [1, 7] }], "bankReadings.0.inServiceSteps.1"],
      [[{ bank: "MSB-1 bank", inServiceSteps: [], stepCurrents: [{ step: 5, amps: 3 }] }], "bankReadings.0.stepCurrents.0.step"],
      [
        [
          {
            bank: "MSB-1 bank",
            inServiceSteps: [],
            stepCurrents: [
              { step: 1, amps: 1 },
              { step: 2, amps: 2 },
              { step: 3, amps: [36, -1, 36] },
            ],
          },
        ],
        "bankReadings.0.stepCurrents.2.amps.1",
      ],
      // 3 × 36.084 = 108.25 A
      [[{ bank: "MSB-1 bank", inServiceSteps: [], stepCurrents: [{ step: 1, amps: [36, 110, 36] }] }], "bankReadings.0.stepCurrents.0.amps.1"],
    ];
    for (const [bankReadings, path] of cases) {
      const res = await post(`/v1/buildings/${b.id}/surveys`, surveyBody({ bankReadings }));
      expect(res.statusCode, path).toBe(400);
      expect(res.headers["content-type"]).toContain("application/problem+json");
      expect(res.json().errors.map((e: { path: string }) => e.path)).toContain(path);
    }
    const dup = await post("/v1/buildings", buildingBody({ installedBanks: [wallBank, wallBank] }));
    expect(dup.statusCode).toBe(400);
    expect(dup.json().errors.map((e: { path: string }) => e.path)).toEqual(["installedBanks.1.label"]);
    expect(await rowCounts(store)).toEqual(before);
  });

  it("takes banks inline on /v1/sizing; phases on a single-phase system are a 400", async () => {
    const body = {
      system: { voltageV: 240, frequencyHz: 60, phases: 1 },
      loads: [{ label: "Shop", measurement: { method: "kw_pf", kW: 20, pf: 0.8, sense: "lagging" } }],
      installedBanks: [{ label: "Wall unit", location: "service", control: "fixed", ratedVoltageV: 240, steps: [{ kvar: 5 }] }],
      bankReadings: [{ bank: "Wall unit", inServiceSteps: [1], stepCurrents: [{ step: 1, amps: 20.5 }] }],
    };
    const ok = await post("/v1/sizing", body);
    expect(ok.statusCode).toBe(200);
    // hand: 5 kvar at 240 V single-phase: I = 5000/240 = 20.833 A; 20.5/20.833 = 98.4 % → healthy
    expectClose(ok.json().installedBanks[0].steps[0].expectedCurrentA, 20.8333, TOL.quoted4dp, "1φ current");
    expect(ok.json().installedBanks[0].steps[0].status).toBe("healthy");
    const bad = await post("/v1/sizing", {
      ...body,
      bankReadings: [{ bank: "Wall unit", inServiceSteps: [1], stepCurrents: [{ step: 1, amps: [20, 20, 20] }] }],
    });
    expect(bad.statusCode).toBe(400);
    expect(bad.json().errors.map((e: { path: string }) => e.path)).toEqual(["bankReadings.0.stepCurrents.0.amps"]);
  });
});
