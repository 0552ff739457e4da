// A stored building ⇄ the building form, for changing a building from the tablet. The form shows some of a
// building's fields; a change must not lose the others (the notes, anything a later version of the service adds),
// so the PATCH body is the stored record with the form's own fields taken out and the form's values put in. The
// service replaces `economics` and `installedBanks` whole (src/http/schemas/buildings.ts, buildingPatchSchema).

import { BUILDING_SECTIONS, COMMON_SYSTEMS, installedBankFields } from "./fields.js";
import { bankDefs, bankValues } from "./installed.js";
import { bodyOf } from "./model.js";

/** The top-level parts of a building the form changes; the rest (notes) is left as stored. */
const FORM_PARTS = ["name", "address", "system", "transformer", "utility", "economics"];
/** A part that is cleared (null) when the form leaves the field it cannot be without empty. */
const NEEDS = { transformer: "transformer.kVA", utility: "utility.faultMVA", economics: "economics.tariff.form" };

const buildingDefs = () => BUILDING_SECTIONS.flatMap((s) => s.fields).filter((d) => !d.path.startsWith("_"));
/** An installed bank's field names as the form keeps them ("steps", "ratedVoltageV"). */
const bankKeys = () => installedBankFields("b").map((d) => d.path.slice(2));

export const getPath = (obj, path) => path.split(".").reduce((at, p) => (at == null ? undefined : at[p]), obj);

function deletePath(obj, path) {
  const parts = path.split(".");
  const parent = getPath(obj, parts.slice(0, -1).join("."));
  if (parts.length === 1) delete obj[path];
  else if (parent && typeof parent === "object") delete parent[parts[parts.length - 1]];
}

/** Objects left empty once the form's fields are taken out are dropped. */
function pruneEmpty(obj) {
  for (const [k, v] of Object.entries(obj)) {
    if (v && typeof v === "object" && !Array.isArray(v)) {
      pruneEmpty(v);
      if (Object.keys(v).length === 0) delete obj[k];
    }
  }
  return obj;
}

/** Copy `from` into `to`, object by object: the form's values over what is left of the stored record. */
function deepAssign(to, from) {
  for (const [k, v] of Object.entries(from)) {
    if (v && typeof v === "object" && !Array.isArray(v) && to[k] && typeof to[k] === "object" && !Array.isArray(to[k])) deepAssign(to[k], v);
    else to[k] = v;
  }
  return to;
}

/** The body the building form makes: a common system expands to its three figures; "other" sends what was typed. */
export function formBody(values, banks) {
  const body = bodyOf([...BUILDING_SECTIONS.flatMap((s) => s.fields), ...bankDefs(banks)], { ...values, ...bankValues(banks) });
  const common = COMMON_SYSTEMS.find((s) => s.id === values._system);
  if (common) body.system = { voltageV: common.voltageV, frequencyHz: common.frequencyHz, phases: common.phases };
  return body;
}

/** A bank's steps as a nameplate reads them, the way the form's steps field parses them back: "5 × 50", "50 + 25". */
export function stepsText(steps) {
  const kvars = (steps ?? []).map((s) => s.kvar);
  if (kvars.length === 0) return "";
  return kvars.length > 1 && kvars.every((k) => k === kvars[0]) ? `${kvars.length} × ${kvars[0]}` : kvars.join(" + ");
}

/** Equal as JSON values, whatever the order of the keys (the merge re-adds the form's keys last). */
export function sameJson(a, b) {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null || Array.isArray(a) !== Array.isArray(b)) return false;
  const ka = Object.keys(a);
  return ka.length === Object.keys(b).length && ka.every((k) => Object.hasOwn(b, k) && sameJson(a[k], b[k]));
}

const asValue = (def, v) => (def.kind === "check" ? v === true : String(v));

/** The form's values for a stored building, and its banks as the form keeps them (each with its stored record). */
export function formOfBuilding(b) {
  const values = {};
  for (const def of buildingDefs()) {
    const v = getPath(b, def.path);
    if (v !== undefined && v !== null) values[def.path] = asValue(def, v);
  }
  const s = b.system;
  const common = COMMON_SYSTEMS.find((c) => c.voltageV === s.voltageV && c.frequencyHz === s.frequencyHz && c.phases === s.phases);
  values._system = common ? common.id : "other";
  const defsByKey = Object.fromEntries(installedBankFields("b").map((d) => [d.path.slice(2), d]));
  const banks = (b.installedBanks ?? []).map((bank) => {
    const kept = { stored: bank };
    for (const key of bankKeys()) {
      const v = key === "steps" ? stepsText(bank.steps) : bank[key];
      if (v !== undefined && v !== null && v !== "") kept[key] = asValue(defsByKey[key], v);
    }
    return kept;
  });
  return { values, banks };
}

/** One bank for the PATCH: its stored record without the form's fields, then the form's; steps kept if unchanged. */
function mergedBank(kept, fromForm) {
  const stored = kept.stored ? structuredClone(kept.stored) : {};
  for (const key of bankKeys()) delete stored[key];
  const bank = { ...stored, ...fromForm };
  if (kept.stored && stepsText(kept.stored.steps) === kept.steps) bank.steps = structuredClone(kept.stored.steps);
  return bank;
}

/**
 * The PATCH body that makes `stored` what the form shows: only the parts that differ from the stored record, each
 * whole as the service replaces it. `formBody` is what the form would POST for a new building (bodyOf of its
 * visible, non-empty fields), `banks` the form's banks (formOfBuilding's, edited). Null when nothing differs.
 */
export function buildingPatch(stored, formBody, banks) {
  const merged = {};
  for (const part of FORM_PARTS) if (stored[part] !== undefined) merged[part] = structuredClone(stored[part]);
  for (const def of buildingDefs()) deletePath(merged, def.path);
  const fromForm = { ...formBody };
  delete fromForm.installedBanks;
  deepAssign(merged, fromForm);
  pruneEmpty(merged);
  const patch = {};
  for (const part of FORM_PARTS) {
    let next = merged[part];
    if (part in NEEDS && getPath(formBody, NEEDS[part]) === undefined) next = null;
    if (next === undefined) next = part === "name" || part === "system" ? stored[part] : null;
    if (!sameJson(next, stored[part] ?? null)) patch[part] = next;
  }
  const nextBanks = banks.map((kept, i) => mergedBank(kept, formBody.installedBanks?.[i] ?? {}));
  if (!sameJson(nextBanks, stored.installedBanks ?? [])) patch.installedBanks = nextBanks;
  return Object.keys(patch).length ? patch : null;
}
