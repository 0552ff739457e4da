import type { EconomicsSettings } from "../../core/economics/of-sizing.js";
import type { InstalledBankInput } from "../../core/inputs.js";
import type { Db } from "./database.js";
import type { BuildingData, BuildingListQuery, BuildingRecord, BuildingVersion } from "../types.js";

interface BuildingRow {
  id: string;
  name: string;
  address: string | null;
  notes: string | null;
  voltage_v: number;
  frequency_hz: number;
  phases: number;
  transformer_kva: number | null;
  transformer_impedance_pct: number | null;
  transformer_x_over_r: number | null;
  utility_fault_mva: number | null;
  economics_json: string | null;
  installed_banks_json: string | null;
  version: number;
  created_at: string;
  updated_at: string;
}

const COLUMNS =
  "id, name, address, notes, voltage_v, frequency_hz, phases, transformer_kva, transformer_impedance_pct, transformer_x_over_r, utility_fault_mva, economics_json, installed_banks_json, version, created_at, updated_at";

export function buildingFromRow(r: BuildingRow): BuildingRecord {
  return {
    id: r.id,
    version: r.version,
    name: r.name,
    address: r.address,
    notes: r.notes,
    system: { voltageV: r.voltage_v, frequencyHz: r.frequency_hz as 50 | 60, phases: r.phases as 1 | 3 },
    transformer:
      r.transformer_kva === null || r.transformer_impedance_pct === null
        ? null
        : {
            kVA: r.transformer_kva,
            impedancePct: r.transformer_impedance_pct,
            ...(r.transformer_x_over_r === null ? {} : { xOverR: r.transformer_x_over_r }),
          },
    utility: r.utility_fault_mva === null ? null : { faultMVA: r.utility_fault_mva },
    economics: r.economics_json === null ? null : (JSON.parse(r.economics_json) as EconomicsSettings),
    ...(r.installed_banks_json === null ? {} : { installedBanks: JSON.parse(r.installed_banks_json) as InstalledBankInput[] }),
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

function columnsOf(d: BuildingData) {
  return {
    name: d.name,
    address: d.address,
    notes: d.notes,
    voltage_v: d.system.voltageV,
    frequency_hz: d.system.frequencyHz,
    phases: d.system.phases,
    transformer_kva: d.transformer?.kVA ?? null,
    transformer_impedance_pct: d.transformer?.impedancePct ?? null,
    transformer_x_over_r: d.transformer?.xOverR ?? null,
    utility_fault_mva: d.utility?.faultMVA ?? null,
    economics_json: d.economics ? JSON.stringify(d.economics) : null,
    installed_banks_json: d.installedBanks && d.installedBanks.length > 0 ? JSON.stringify(d.installedBanks) : null,
  };
}

export type BuildingsRepo = ReturnType<typeof buildingsRepo>;

/** Buildings and their version history. Every statement filters by organisation. */
export function buildingsRepo(db: Db) {
  const insert = db.prepare(
    `INSERT INTO buildings (org_id, ${COLUMNS})
     VALUES (@org_id, @id, @name, @address, @notes, @voltage_v, @frequency_hz, @phases, @transformer_kva,
             @transformer_impedance_pct, @transformer_x_over_r, @utility_fault_mva, @economics_json, @installed_banks_json, 1, @at, @at)`,
  );
  const update = db.prepare(
    `UPDATE buildings SET name = @name, address = @address, notes = @notes, voltage_v = @voltage_v,
       frequency_hz = @frequency_hz, phases = @phases, transformer_kva = @transformer_kva,
       transformer_impedance_pct = @transformer_impedance_pct, transformer_x_over_r = @transformer_x_over_r,
       utility_fault_mva = @utility_fault_mva, economics_json = @economics_json, installed_banks_json = @installed_banks_json, version = version + 1, updated_at = @at
     WHERE org_id = @org_id AND id = @id AND version = @version`,
  );
  const insertVersion = db.prepare(
    `INSERT INTO building_versions (org_id, building_id, version, data_json, recorded_at, actor)
     VALUES (?, ?, ?, ?, ?, ?)`,
  );
  const byId = db.prepare(`SELECT ${COLUMNS} FROM buildings WHERE org_id = ? AND id = ?`);
  const page = db.prepare(
    `SELECT ${COLUMNS} FROM buildings
     WHERE org_id = @org_id
       AND (@q IS NULL OR name LIKE '%' || @q || '%' ESCAPE '\\')
       AND (@after_name IS NULL OR name > @after_name OR (name = @after_name AND id > @after_id))
     ORDER BY name, id LIMIT @limit`,
  );
  const versions = db.prepare(
    `SELECT version, data_json, recorded_at, actor FROM building_versions
     WHERE org_id = ? AND building_id = ? ORDER BY version`,
  );

  const get = (orgId: string, id: string): BuildingRecord | undefined => {
    const row = byId.get(orgId, id) as BuildingRow | undefined;
    return row && buildingFromRow(row);
  };
  const mustGet = (orgId: string, id: string): BuildingRecord => {
    const b = get(orgId, id);
    if (!b) throw new Error(`building ${id} vanished inside its own transaction`);
    return b;
  };

  return {
    get,
    create(orgId: string, id: string, data: BuildingData, actor: string, at: string): BuildingRecord {
      insert.run({ org_id: orgId, id, ...columnsOf(data), at });
      insertVersion.run(orgId, id, 1, JSON.stringify(data), at, actor);
      return mustGet(orgId, id);
    },
    /** Write `data` as the next version; undefined when `expectedVersion` is no longer current. */
    update(orgId: string, id: string, expectedVersion: number, data: BuildingData, actor: string, at: string): BuildingRecord | undefined {
      const changed = update.run({ org_id: orgId, id, version: expectedVersion, ...columnsOf(data), at }).changes;
      if (changed !== 1) return undefined;
      insertVersion.run(orgId, id, expectedVersion + 1, JSON.stringify(data), at, actor);
      return mustGet(orgId, id);
    },
    list(orgId: string, query: BuildingListQuery): BuildingRecord[] {
      const q = query.q ? query.q.replace(/[\\%_]/g, (c) => `\\${c}`) : null;
      const rows = page.all({
        org_id: orgId,
        q,
        after_name: query.after?.name ?? null,
        after_id: query.after?.id ?? null,
        limit: query.limit,
      }) as BuildingRow[];
      return rows.map(buildingFromRow);
    },
    /** Every version, oldest first; the last is the current one. */
    history(orgId: string, id: string): BuildingVersion[] {
      const rows = versions.all(orgId, id) as { version: number; data_json: string; recorded_at: string; actor: string }[];
      return rows.map((r) => ({ version: r.version, data: JSON.parse(r.data_json) as BuildingData, recordedAt: r.recorded_at, actor: r.actor }));
    },
  };
}
