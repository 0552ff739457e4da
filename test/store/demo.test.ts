import { afterEach, describe, expect, it } from "vitest";
import type { FastifyInstance } from "fastify";
import { size } from "../../src/core/pipeline/size.js";
import { DEMO_BUILDING, DEMO_SURVEYS } from "../../src/demo/scenario.js";
import { seedDemo } from "../../src/demo/seed.js";
import { engineInputOf } from "../../src/application/survey-sizing.js";
import { makeStoreApp, rowCounts } from "../helpers/db.js";
import { inject } from "../helpers/auth.js";

let app: FastifyInstance | undefined;
afterEach(async () => {
  await app?.close();
  app = undefined;
});

describe("demo data", () => {
  it("seeds one building with two surveys a year apart, sized by the engine, on a new database", async () => {
    const made = await makeStoreApp({ DEMO_DATA: "on" });
    app = made.app;
    const list = (await inject(app, "/v1/buildings")).json();
    expect(list.items).toHaveLength(1);
    const building = list.items[0];
    expect(building).toMatchObject({ name: DEMO_BUILDING.name, system: { voltageV: 480, frequencyHz: 60, phases: 3 } });

    const trend = (await inject(app, `/v1/buildings/${building.id}/trend`)).json();
    expect(trend.items).toHaveLength(2);
    const [before, after] = trend.items;
    const days = (Date.parse(after.surveyedAt) - Date.parse(before.surveyedAt)) / 86_400_000;
    expect(days).toBeGreaterThan(360);
    expect(days).toBeLessThan(380);
    // the story the demo tells: poor PF, a bank fitted, PF better but drifting below the target again
    expect(before.displacementPF).toBeLessThan(0.85);
    expect(after.displacementPF).toBeGreaterThan(before.displacementPF);
    expect(after.displacementPF).toBeLessThan(0.95);
    expect(after.kvarRequired).toBeGreaterThan(0);

    // the installed bank: step 3 loses capacitance between the surveys, step 5 fails (0 A in every phase)
    const health = (await inject(app, `/v1/buildings/${building.id}/bank-health`)).json();
    expect(health.series).toHaveLength(1);
    const step3 = health.series[0].steps[2].points;
    expect(step3.map((p: { status: string }) => p.status)).toEqual(["healthy", "degraded"]);
    expect(step3[1].capacitancePct).toBeLessThan(step3[0].capacitancePct - 5);
    expect(health.series[0].steps[4].points.map((p: { status: string }) => p.status)).toEqual(["healthy", "failed"]);
    expect(after.kvarDelivered).toBeGreaterThan(0);

    for (const [i, point] of trend.items.entries()) {
      const stored = (await inject(app, `/v1/surveys/${point.surveyId}`)).json();
      const fresh = size(engineInputOf(stored.building, DEMO_SURVEYS[i]!));
      expect(fresh.ok).toBe(true);
      if (fresh.ok) expect(stored.result).toEqual(fresh.result);
      expect(stored.actor).toBe("demo");
    }
  });

  it("does not seed a database that already holds something, nor twice", async () => {
    const made = await makeStoreApp({ DEMO_DATA: "on" });
    app = made.app;
    const counts = await rowCounts(made.store);
    expect(await seedDemo(made.store)).toBeNull();
    expect(await rowCounts(made.store)).toEqual(counts);
  });

  it("stays off with DEMO_DATA=off", async () => {
    const made = await makeStoreApp();
    app = made.app;
    expect((await inject(app, "/v1/buildings")).json().items).toEqual([]);
    expect(await rowCounts(made.store)).toMatchObject({ buildings: 0, surveys: 0, audit_log: 0 });
  });
});
