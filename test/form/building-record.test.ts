/**
 * Changing a building from the tablet (src/form/building-record.js), run in Node against the real service: a
 * stored building read into the form and sent back unchanged is no change at all; each kind of edit becomes a
 * PATCH the service accepts, changes what was edited and keeps what the form does not show (the notes, a bank's
 * installation date, per-step records when the steps text is unchanged).
 */
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeTestApp } from "../helpers/app.js";
import { api } from "../helpers/auth.js";

type Values = Record<string, unknown>;
type Kept = Record<string, unknown> & { stored?: Record<string, unknown> };
type Building = Record<string, unknown> & { id: string };

// Plain ES modules with no type declarations: imported by a computed name so the type checker leaves them be.
const formDir = "../../src/form/";
const record = (await import(`${formDir}building-record.js`)) as {
  formOfBuilding: (b: Building) => { values: Values; banks: Kept[] };
  formBody: (values: Values, banks: Kept[]) => Record<string, unknown>;
  buildingPatch: (stored: Building, body: Record<string, unknown>, banks: Kept[]) => Record<string, unknown> | null;
  stepsText: (steps: { kvar: number }[]) => string;
  sameJson: (a: unknown, b: unknown) => boolean;
};

const BUILDING = {
  name: "Riverside cold store",
  address: "4 Quay Lane",
  notes: "Key from the gatehouse; the MCC room is locked after 18:00.",
  system: { voltageV: 400, frequencyHz: 50, phases: 3 },
  transformer: { kVA: 1000, impedancePct: 6, xOverR: 8 },
  utility: { faultMVA: 250 },
  economics: { currency: "EUR", tariff: { form: "kva_demand", chargePerKVA: 9.5 }, cost: { perKvar: 28, fixed: 1500 } },
  installedBanks: [
    {
      label: "Main bank",
      location: "service",
      control: "automatic",
      ratedVoltageV: 440,
      reactorPct: 7,
      steps: [{ kvar: 50 }, { kvar: 50 }, { kvar: 25 }],
      installedOn: "2019-06-01",
    },
    { label: "Compressor 2 unit", location: "motor", loadLabel: "Compressor 2", control: "fixed", ratedVoltageV: 400, steps: [{ kvar: 15 }] },
  ],
};

let app: FastifyInstance;
beforeAll(async () => {
  app = await makeTestApp();
});
afterAll(async () => {
  await app.close();
});

async function created(body: Record<string, unknown> = BUILDING): Promise<Building> {
  const r = await api(app).post("/v1/buildings").send(body);
  expect(r.status).toBe(201);
  return (await api(app).get(`/v1/buildings/${(r.body as Building).id}`)).body as Building;
}

async function patched(stored: Building, patch: Record<string, unknown>): Promise<Building> {
  const r = await api(app).patch(`/v1/buildings/${stored.id}`).send(patch);
  expect(r.status, JSON.stringify(r.body)).toBe(200);
  return (await api(app).get(`/v1/buildings/${stored.id}`)).body as Building;
}

describe("a stored building in the form", () => {
  it("reads every field the form shows, the system as a common one, the steps as the nameplate reads", async () => {
    const b = await created();
    const { values, banks } = record.formOfBuilding(b);
    expect(values).toMatchObject({
      name: "Riverside cold store",
      _system: "400-3-50",
      "transformer.kVA": "1000",
      "transformer.xOverR": "8",
      "economics.tariff.form": "kva_demand",
      "economics.tariff.chargePerKVA": "9.5",
    });
    expect(banks.map((k) => k.steps)).toEqual(["50 + 50 + 25", "15"]);
    expect(record.stepsText([{ kvar: 50 }, { kvar: 50 }, { kvar: 50 }])).toBe("3 × 50");
  });

  it("sent back untouched is no change (null), so saving never writes a version for nothing", async () => {
    const b = await created();
    const { values, banks } = record.formOfBuilding(b);
    expect(record.buildingPatch(b, record.formBody(values, banks), banks)).toBeNull();
  });

  it("a system no common choice matches is 'other' with its three figures, and unchanged is no change", async () => {
    const b = await created({ ...BUILDING, system: { voltageV: 380, frequencyHz: 50, phases: 3 } });
    const { values, banks } = record.formOfBuilding(b);
    expect(values).toMatchObject({ _system: "other", "system.voltageV": "380", "system.frequencyHz": "50", "system.phases": "3" });
    expect(record.buildingPatch(b, record.formBody(values, banks), banks)).toBeNull();
  });
});

describe("edits become a PATCH the service accepts", () => {
  it("a new bank, a changed step and a cleared transformer X/R: only those parts sent; notes and installedOn kept", async () => {
    const b = await created();
    const { values, banks } = record.formOfBuilding(b);
    delete values["transformer.xOverR"];
    banks[1]!.steps = "20";
    banks.push({ label: "Packing hall", location: "group", group: "MCC-2", control: "automatic", ratedVoltageV: "400", steps: "4 × 25" });
    const patch = record.buildingPatch(b, record.formBody(values, banks), banks);
    expect(Object.keys(patch ?? {}).sort()).toEqual(["installedBanks", "transformer"]);
    const after = await patched(b, patch!);
    expect(after.notes).toBe(BUILDING.notes);
    expect(after.transformer).toEqual({ kVA: 1000, impedancePct: 6 });
    const afterBanks = after.installedBanks as Record<string, unknown>[];
    expect(afterBanks[0]).toMatchObject({ label: "Main bank", installedOn: "2019-06-01", steps: BUILDING.installedBanks[0]!.steps });
    expect(afterBanks[1]).toMatchObject({ label: "Compressor 2 unit", steps: [{ kvar: 20 }] });
    expect(afterBanks[2]).toMatchObject({ label: "Packing hall", group: "MCC-2", steps: [{ kvar: 25 }, { kvar: 25 }, { kvar: 25 }, { kvar: 25 }] });
    // read back into the form, it is the form as edited: nothing more to save
    const again = record.formOfBuilding(after);
    expect(record.buildingPatch(after, record.formBody(again.values, again.banks), again.banks)).toBeNull();
  });

  it("another tariff replaces the old one's fields; emptying the tariff clears the economics; removing a bank removes it", async () => {
    const b = await created();
    const first = record.formOfBuilding(b);
    first.values["economics.tariff.form"] = "kw_demand_pf_adjusted";
    first.values["economics.tariff.chargePerKW"] = "14";
    first.values["economics.tariff.basePF"] = "0.9";
    const switched = await patched(b, record.buildingPatch(b, record.formBody(first.values, first.banks), first.banks)!);
    expect(switched.economics).toEqual({
      currency: "EUR",
      tariff: { form: "kw_demand_pf_adjusted", chargePerKW: 14, basePF: 0.9 },
      cost: { perKvar: 28, fixed: 1500 },
    });
    const second = record.formOfBuilding(switched);
    second.values["economics.tariff.form"] = "";
    second.banks.splice(0, 1);
    const patch = record.buildingPatch(switched, record.formBody(second.values, second.banks), second.banks);
    expect(patch).toMatchObject({ economics: null });
    const cleared = await patched(switched, patch!);
    expect(cleared.economics ?? null).toBeNull();
    expect((cleared.installedBanks as { label: string }[]).map((x) => x.label)).toEqual(["Compressor 2 unit"]);
    expect(cleared.notes).toBe(BUILDING.notes);
  });

  it("a renamed building and a cleared address", async () => {
    const b = await created();
    const { values, banks } = record.formOfBuilding(b);
    values.name = "Riverside cold store (east)";
    values.address = "";
    const patch = record.buildingPatch(b, record.formBody(values, banks), banks);
    expect(patch).toEqual({ name: "Riverside cold store (east)", address: null });
    const after = await patched(b, patch!);
    expect(after).toMatchObject({ name: "Riverside cold store (east)", notes: BUILDING.notes });
    expect(after.address ?? null).toBeNull();
  });

  it("sameJson ignores key order and nothing else", () => {
    expect(record.sameJson({ a: 1, b: [1, { c: 2, d: 3 }] }, { b: [1, { d: 3, c: 2 }], a: 1 })).toBe(true);
    expect(record.sameJson({ a: 1 }, { a: 1, b: undefined })).toBe(false);
    expect(record.sameJson([1, 2], { 0: 1, 1: 2 })).toBe(false);
    expect(record.sameJson({ a: "1" }, { a: 1 })).toBe(false);
  });
});
