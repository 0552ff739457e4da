import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { size } from "../../src/core/pipeline/size.js";
import { ENGINE_VERSION } from "../../src/core/pipeline/engine-version.js";
import type { Store } from "../../src/store/ports.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { inject, keyIdOf } from "../helpers/auth.js";

let app: FastifyInstance;
let store: Store;
let buildingId: string;
beforeAll(async () => {
  ({ app, store } = await makeStoreApp());
  buildingId = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody() })).json().id;
});
afterAll(() => app.close());

const postSurvey = (payload: unknown, b = buildingId) =>
  inject(app, { method: "POST", url: `/v1/buildings/${b}/surveys`, payload: payload as object });
const revise = (id: string, payload: unknown) => inject(app, { method: "POST", url: `/v1/surveys/${id}/revisions`, payload: payload as object });

describe("POST /v1/buildings/{id}/surveys", () => {
  it("sizes with the building's system, transformer and utility, and answers 201 {id, revision, buildingId, result}", async () => {
    const res = await postSurvey(surveyBody());
    expect(res.statusCode).toBe(201);
    const body = res.json();
    expect(Object.keys(body).sort()).toEqual(["buildingId", "id", "result", "revision"]);
    expect(body).toMatchObject({ revision: 1, buildingId });
    expect(res.headers.location).toBe(`/v1/surveys/${body.id}`);
    const { surveyedAt: _a, surveyor: _b, ...sizing } = surveyBody();
    const expected = size({ ...sizing, ...buildingBody() } as never);
    expect(expected.ok).toBe(true);
    if (expected.ok) expect(body.result).toEqual(expected.result);
    expect(body.result.resonance.shortCircuitKVA).toBeGreaterThan(0); // transformer + utility were used
  });

  it("returns the stored latest revision with its inputs, result, engine version and building snapshot", async () => {
    const created = (await postSurvey(surveyBody({ notes: "first visit" }))).json();
    const res = await inject(app, `/v1/surveys/${created.id}`);
    expect(res.statusCode).toBe(200);
    const s = res.json();
    expect(s).toMatchObject({
      id: created.id,
      buildingId,
      revision: 1,
      reason: null,
      actor: keyIdOf(app),
      engineVersion: ENGINE_VERSION,
      inputs: surveyBody({ notes: "first visit" }),
      result: created.result,
      building: { buildingVersion: 1, system: buildingBody().system, transformer: buildingBody().transformer, utility: buildingBody().utility },
    });
    expect(s.revisions).toEqual([{ n: 1, createdAt: s.createdAt, reason: null }]);
  });

  it("keeps the result as stored when the building changes later (no recomputation on read)", async () => {
    const b = (await inject(app, { method: "POST", url: "/v1/buildings", payload: buildingBody({ name: "Audit hall" }) })).json();
    const created = (await postSurvey(surveyBody(), b.id)).json();
    const patched = await inject(app, {
      method: "PATCH",
      url: `/v1/buildings/${b.id}`,
      payload: { transformer: { kVA: 2500, impedancePct: 8 }, system: { voltageV: 415, frequencyHz: 50, phases: 3 } },
    });
    expect(patched.statusCode).toBe(200);
    const s = (await inject(app, `/v1/surveys/${created.id}`)).json();
    expect(s.result).toEqual(created.result);
    expect(s.building).toMatchObject({ buildingVersion: 1, system: { voltageV: 400 }, transformer: { kVA: 630 } });

    const r2 = await revise(created.id, { ...surveyBody(), reason: "recomputed after the transformer was replaced" });
    expect(r2.statusCode).toBe(201);
    expect(r2.json()).toMatchObject({ id: created.id, revision: 2, buildingId: b.id });
    expect(r2.json().result.system.voltageV).toBe(415);
    expect(r2.json().result.resonance.shortCircuitKVA).not.toBe(created.result.resonance.shortCircuitKVA);
    const rev2 = (await inject(app, `/v1/surveys/${created.id}/revisions/2`)).json();
    expect(rev2.building).toMatchObject({ buildingVersion: 2, system: { voltageV: 415 }, transformer: { kVA: 2500 } });
  });

  it("answers engine plausibility issues with 400 at the field's path, storing nothing", async () => {
    const before = await rowCounts(store);
    const body = surveyBody();
    body.loads[1] = { label: "Bad meter", kind: "motor", quantity: 1, measurement: { method: "kw_kva", kW: 50, kVA: 25 } };
    const res = await postSurvey(body);
    expect(res.statusCode).toBe(400);
    expect(res.json().errors).toEqual([{ path: "loads.1.measurement.kW", message: expect.stringMatching(/kW exceeds kVA/) }]);
    expect(await rowCounts(store)).toEqual(before);
  });

  it("answers schema errors with 400 naming each path", async () => {
    const res = await postSurvey({
      surveyedAt: "last tuesday",
      targetPF: 0.5,
      loads: [{ label: "x", measurement: { method: "kw_pf", kW: 1, pf: 2 } }],
    });
    expect(res.statusCode).toBe(400);
    const paths = res.json().errors.map((e: { path: string }) => e.path);
    expect(paths).toEqual(expect.arrayContaining(["surveyedAt", "surveyor", "targetPF", "loads.0.measurement.pf", "loads.0.measurement.sense"]));
  });

  it("accepts a plain date or a date-time with an offset for surveyedAt, not a zoneless one", async () => {
    expect((await postSurvey(surveyBody({ surveyedAt: "2024-02-29" }))).statusCode).toBe(201);
    expect((await postSurvey(surveyBody({ surveyedAt: "2024-02-29T10:00:00+01:00" }))).statusCode).toBe(201);
    for (const bad of ["2024-02-30", "2024-02-29T10:00:00", "2024-13-01", 20240229]) {
      const res = await postSurvey(surveyBody({ surveyedAt: bad }));
      expect(res.statusCode, String(bad)).toBe(400);
      expect(res.json().errors[0].path).toBe("surveyedAt");
    }
  });

  it("404s an unknown building", async () => {
    const res = await postSurvey(surveyBody(), "bld_missing");
    expect(res.statusCode).toBe(404);
    expect(res.json().detail).toBe("building bld_missing was not found");
  });
});

describe("revisions", () => {
  it("stores numbered revisions with reasons; every one stays readable", async () => {
    const created = (await postSurvey(surveyBody())).json();
    const r2 = await revise(created.id, { ...surveyBody({ targetPF: 0.98 }), reason: "customer asked for 0.98" });
    expect(r2.statusCode).toBe(201);
    expect(r2.headers.location).toBe(`/v1/surveys/${created.id}/revisions/2`);
    const r3 = await revise(created.id, { ...surveyBody({ surveyor: "Second surveyor" }), reason: "wrong surveyor name" });
    expect(r3.json().revision).toBe(3);

    const s = (await inject(app, `/v1/surveys/${created.id}`)).json();
    expect(s.revision).toBe(3);
    expect(s.inputs.surveyor).toBe("Second surveyor");
    expect(s.inputs).not.toHaveProperty("reason");
    expect(s.reason).toBe("wrong surveyor name");
    expect(s.revisions.map((r: { n: number; reason: string | null }) => [r.n, r.reason])).toEqual([
      [1, null],
      [2, "customer asked for 0.98"],
      [3, "wrong surveyor name"],
    ]);
    const first = (await inject(app, `/v1/surveys/${created.id}/revisions/1`)).json();
    expect(first).toMatchObject({ surveyId: created.id, revision: 1, inputs: surveyBody(), result: created.result });
    const second = (await inject(app, `/v1/surveys/${created.id}/revisions/2`)).json();
    expect(second.result.correction.targetPF).toBe(0.98);
    expect(second.result.correction.kvarRequired).toBeGreaterThan(first.result.correction.kvarRequired);
  });

  it("requires a reason", async () => {
    const created = (await postSurvey(surveyBody())).json();
    const before = await rowCounts(store);
    for (const reason of [undefined, "", "   "]) {
      const res = await revise(created.id, { ...surveyBody(), ...(reason === undefined ? {} : { reason }) });
      expect(res.statusCode).toBe(400);
      expect(res.json().errors[0]).toMatchObject({ path: "reason", message: expect.stringMatching(/reason/) });
    }
    expect(await rowCounts(store)).toEqual(before);
  });

  it("404s unknown surveys and revisions, 400s a revision number that is not one", async () => {
    const created = (await postSurvey(surveyBody())).json();
    expect((await inject(app, "/v1/surveys/srv_missing")).statusCode).toBe(404);
    expect((await inject(app, "/v1/surveys/srv_missing/loads.csv")).statusCode).toBe(404);
    expect((await inject(app, "/v1/surveys/srv_missing/revisions/1")).json().detail).toBe("survey srv_missing was not found");
    expect((await inject(app, `/v1/surveys/${created.id}/revisions/2`)).json().detail).toBe(`revision 2 of survey ${created.id} was not found`);
    expect((await revise("srv_missing", { ...surveyBody(), reason: "x" })).statusCode).toBe(404);
    for (const n of ["0", "-1", "1.5", "two"]) {
      const res = await inject(app, `/v1/surveys/${created.id}/revisions/${n}`);
      expect(res.statusCode, n).toBe(400);
      expect(res.json().errors[0].path).toBe("n");
    }
  });

  it("has no route that deletes", async () => {
    const created = (await postSurvey(surveyBody())).json();
    for (const url of [`/v1/surveys/${created.id}`, `/v1/buildings/${buildingId}`]) {
      const r = await inject(app, { method: "DELETE", url });
      expect(r.statusCode).toBe(405); // the resource exists; DELETE is not one of its methods
      expect(String(r.headers.allow).split(", ")).not.toContain("DELETE");
    }
    expect((await inject(app, `/v1/surveys/${created.id}`)).statusCode).toBe(200);
  });
});
