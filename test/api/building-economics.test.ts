import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { size } from "../../src/core/pipeline/size.js";
import { engineInputOf } from "../../src/application/survey-sizing.js";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { expectClose } from "../helpers/tolerance.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance;
let store: Store;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
});
afterAll(() => app.close());

/** Invented tariff: 8.00 a kVA of monthly billing demand; the bank costs 40 a kvar plus 2 000. */
const kvaTariff = { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 8 }, cost: { perKvar: 40, fixed: 2000 } };

const postBuilding = (payload: unknown) => inject(app, { method: "POST", url: "/v1/buildings", payload: payload as object });
const patch = (id: string, payload: unknown) => inject(app, { method: "PATCH", url: `/v1/buildings/${id}`, payload: payload as object });
const postSurvey = (id: string, payload: unknown = surveyBody()) =>
  inject(app, { method: "POST", url: `/v1/buildings/${id}/surveys`, payload: payload as object });

describe("a building's economics", () => {
  it("is stored on POST, returned on GET, and used by its surveys (basis survey_demand)", async () => {
    const created = await postBuilding(buildingBody({ name: "Tariff hall", economics: kvaTariff }));
    expect(created.statusCode).toBe(201);
    const b = created.json();
    expect(b.economics).toEqual(kvaTariff);
    expect((await inject(app, `/v1/buildings/${b.id}`)).json().economics).toEqual(kvaTariff);

    const res = await postSurvey(b.id);
    expect(res.statusCode).toBe(201);
    const r = res.json().result;
    expect(r.economics.basis).toBe("survey_demand");
    expect(r.economics.currency).toBe("EUR");
    // hand: a kVA demand tariff bills the site's kVA before correction at 8 a kVA
    expect(r.economics.periods).toHaveLength(1);
    expectClose(r.economics.periods[0].before.billedQuantity, r.site.kVA, { abs: 1e-9 }, "billed kVA");
    expectClose(r.economics.periods[0].before.charge, 8 * r.site.kVA, { abs: 1e-6 }, "charge before");
    expectClose(r.economics.installedCost, 40 * r.recommendedBank.effectiveKvar + 2000, { abs: 1e-6 }, "cost");
    // the engine, given the same tariff directly, answers the same
    const { surveyedAt: _a, surveyor: _s, ...sizing } = surveyBody();
    const direct = size({ ...sizing, ...buildingBody(), economics: kvaTariff } as never);
    expect(direct.ok && direct.result.economics).toEqual(r.economics);

    const stored = (await inject(app, `/v1/surveys/${res.json().id}`)).json();
    expect(stored.building.economics).toEqual(kvaTariff);
    expect(stored.building.intervalAnalysisId).toBeNull();
  });

  it("PATCH replaces it, null clears it; history keeps each version; old revisions keep the tariff they had", async () => {
    const b = (await postBuilding(buildingBody({ name: "Clearing hall", economics: kvaTariff }))).json();
    const first = (await postSurvey(b.id)).json();

    const other = { currency: "USD", tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 12, basePF: 0.9 } };
    const changed = await patch(b.id, { economics: other });
    expect(changed.statusCode).toBe(200);
    expect(changed.json()).toMatchObject({ version: 2, economics: other });

    const cleared = await patch(b.id, { economics: null });
    expect(cleared.statusCode).toBe(200);
    expect(cleared.json()).toMatchObject({ version: 3, economics: null });
    expect((await inject(app, `/v1/buildings/${b.id}`)).json().economics).toBeNull();

    const history = (await inject(app, `/v1/buildings/${b.id}/history`)).json();
    expect(history.items.map((v: { economics: unknown }) => v.economics)).toEqual([kvaTariff, other, null]);

    const later = (await postSurvey(b.id)).json();
    expect(later.result).not.toHaveProperty("economics");

    // the first survey was computed with, and still shows, the kVA tariff
    const firstStored = (await inject(app, `/v1/surveys/${first.id}`)).json();
    expect(firstStored.building).toMatchObject({ buildingVersion: 1, economics: kvaTariff });
    expect(firstStored.result.economics.basis).toBe("survey_demand");
    // a revision made now is sized with the building's current data: no economics
    const rev = await inject(app, {
      method: "POST",
      url: `/v1/surveys/${first.id}/revisions`,
      payload: { ...surveyBody(), reason: "tariff removed" },
    });
    expect(rev.statusCode).toBe(201);
    expect(rev.json().result).not.toHaveProperty("economics");
    const revStored = (await inject(app, `/v1/surveys/${first.id}/revisions/2`)).json();
    expect(revStored.building).toMatchObject({ buildingVersion: 3, economics: null });
    // recomputing revision 1 from its snapshot gives the stored result
    const again = size(engineInputOf(firstStored.building, firstStored.inputs));
    expect(again.ok && again.result).toEqual(firstStored.result);
  });

  it("an unchanged economics PATCH writes no version (key order does not matter)", async () => {
    const b = (await postBuilding(buildingBody({ name: "Same tariff hall", economics: kvaTariff }))).json();
    const reordered = { cost: { fixed: 2000, perKvar: 40 }, tariff: { chargePerKVA: 8, form: "kva_demand" }, currency: "EUR" };
    const before = await rowCounts(store);
    const res = await patch(b.id, { economics: reordered });
    expect(res.statusCode).toBe(200);
    expect(res.json().version).toBe(1);
    expect(await rowCounts(store)).toEqual(before);
  });

  it("bad economics: 400 naming the fields, on POST and PATCH, and nothing written", async () => {
    const b = (await postBuilding(buildingBody({ name: "Bad tariff hall" }))).json();
    const before = await rowCounts(store);
    const bad = { currency: "euro", tariff: { form: "kva_demand", chargePerKVA: -1 }, operatingHoursPerMonth: 800 };
    for (const res of [await postBuilding(buildingBody({ name: "Never stored", economics: bad })), await patch(b.id, { economics: bad })]) {
      expect(res.statusCode).toBe(400);
      expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
      const paths = res.json().errors.map((e: { path: string }) => e.path);
      expect(paths).toEqual(expect.arrayContaining(["economics.currency", "economics.tariff.chargePerKVA", "economics.operatingHoursPerMonth"]));
    }
    const unknownForm = await patch(b.id, { economics: { currency: "EUR", tariff: { form: "flat" } } });
    expect(unknownForm.statusCode).toBe(400);
    expect(unknownForm.json().errors[0].path).toBe("economics.tariff.form");
    expect(await rowCounts(store)).toEqual(before);
    expect((await inject(app, `/v1/buildings/${b.id}`)).json()).toMatchObject({ version: 1, economics: null });
  });
});
