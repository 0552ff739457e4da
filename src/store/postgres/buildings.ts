import type { BuildingsRepository } from "../ports.js";
import { buildingFromRow } from "../sqlite/buildings-repo.js";
import type { BuildingData, BuildingListQuery, BuildingRecord, BuildingVersion } from "../types.js";
import { all, jsonb, one, type Sql } from "./sql.js";

// JSON columns read back as text so the SQLite store's row mapper serves both stores.
const COLUMNS = `id, name, address, notes, voltage_v, frequency_hz, phases, transformer_kva, transformer_impedance_pct,
  transformer_x_over_r, utility_fault_mva, economics_json::text AS economics_json,
  installed_banks_json::text AS installed_banks_json, version, created_at, updated_at`;

type Row = Parameters<typeof buildingFromRow>[0];

function columnsOf(d: BuildingData): unknown[] {
  return [
    d.name,
    d.address,
    d.notes,
    d.system.voltageV,
    d.system.frequencyHz,
    d.system.phases,
    d.transformer?.kVA ?? null,
    d.transformer?.impedancePct ?? null,
    d.transformer?.xOverR ?? null,
    d.utility?.faultMVA ?? null,
    d.economics ? jsonb(d.economics) : null,
    d.installedBanks && d.installedBanks.length > 0 ? jsonb(d.installedBanks) : null,
  ];
}

/** Buildings and their version history. Every statement filters by organisation. */
export function postgresBuildings(sql: Sql): BuildingsRepository {
  const get = async (orgId: string, id: string): Promise<BuildingRecord | undefined> => {
    const row = await one<Row>(sql, `SELECT ${COLUMNS} FROM buildings WHERE org_id = $1 AND id = $2`, [orgId, id]);
    return row && buildingFromRow(row);
  };
  const insertVersion = (orgId: string, id: string, version: number, data: BuildingData, at: string, actor: string) =>
    sql.query(`INSERT INTO building_versions (org_id, building_id, version, data_json, recorded_at, actor) VALUES ($1, $2, $3, $4, $5, $6)`, [
      orgId,
      id,
      version,
      jsonb(data),
      at,
      actor,
    ]);
  return {
    get,
    async create(orgId, id, data, actor, at) {
      const row = await one<Row>(
        sql,
        `INSERT INTO buildings (org_id, id, name, address, notes, voltage_v, frequency_hz, phases, transformer_kva,
           transformer_impedance_pct, transformer_x_over_r, utility_fault_mva, economics_json, installed_banks_json,
           version, created_at, updated_at)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14, 1, $15, $15)
         RETURNING ${COLUMNS}`,
        [orgId, id, ...columnsOf(data), at],
      );
      await insertVersion(orgId, id, 1, data, at, actor);
      if (!row) throw new Error(`building ${id} was not stored`);
      return buildingFromRow(row);
    },
    async update(orgId, id, expectedVersion, data, actor, at) {
      // Under READ COMMITTED a concurrent update re-evaluates the version test after the other commits: one wins.
      const row = await one<Row>(
        sql,
        `UPDATE buildings SET name = $4, address = $5, notes = $6, voltage_v = $7, frequency_hz = $8, phases = $9,
           transformer_kva = $10, transformer_impedance_pct = $11, transformer_x_over_r = $12, utility_fault_mva = $13,
           economics_json = $14, installed_banks_json = $15, version = version + 1, updated_at = $16
         WHERE org_id = $1 AND id = $2 AND version = $3
         RETURNING ${COLUMNS}`,
        [orgId, id, expectedVersion, ...columnsOf(data), at],
      );
      if (!row) return undefined;
      await insertVersion(orgId, id, expectedVersion + 1, data, at, actor);
      return buildingFromRow(row);
    },
    async list(orgId: string, query: BuildingListQuery) {
      const q = query.q ? query.q.replace(/[\\%_]/g, (c) => `\\${c}`) : null;
      // lower() under "C" folds ASCII letters only: the order and the search of SQLite's NOCASE.
      const rows = await all<Row>(
        sql,
        `SELECT ${COLUMNS} FROM buildings
         WHERE org_id = $1
           AND ($2::text IS NULL OR lower(name) LIKE '%' || lower($2::text) || '%' ESCAPE '\\')
           AND ($3::text IS NULL OR lower(name) > lower($3::text) OR (lower(name) = lower($3::text) AND id > $4::text))
         ORDER BY lower(name), id LIMIT $5`,
        [orgId, q, query.after?.name ?? null, query.after?.id ?? null, query.limit],
      );
      return rows.map(buildingFromRow);
    },
    async history(orgId, id): Promise<BuildingVersion[]> {
      return all<BuildingVersion>(
        sql,
        `SELECT version, data_json AS data, recorded_at AS "recordedAt", actor FROM building_versions
         WHERE org_id = $1 AND building_id = $2 ORDER BY version`,
        [orgId, id],
      );
    },
  };
}
