// Field values ⇄ request bodies. Values are kept as typed (text), keyed by the field's path; a body is built from
// the visible, non-empty fields by their paths, so the page sends exactly what the service's schemas name.

import { num } from "./checks.js";

export const lastSegment = (path) => path.split(".").pop();
export const isEmpty = (raw) => raw === undefined || raw === null || raw === false || String(raw).trim() === "";
export const visible = (def, values) => !def.when || def.when(values);
const required = (def, values) => (typeof def.required === "function" ? def.required(values) : def.required === true);

/** The message for one field as it stands, "" when fine or hidden. */
export function fieldError(def, values) {
  if (!visible(def, values) || def.kind === "check") return "";
  const raw = values[def.path];
  if (isEmpty(raw)) {
    if (!required(def, values)) return "";
    return def.requiredMessage ?? (def.check?.("") || `${lastSegment(def.path)} is needed`);
  }
  return def.check ? def.check(raw) : "";
}

/** Every field's message: [{ path, message }]. */
export const errorsOf = (defs, values) => defs.map((d) => ({ path: d.path, message: fieldError(d, values) })).filter((e) => e.message);

function parsed(def, raw) {
  if (def.kind === "check") return raw === true;
  if (typeof def.parse === "function") return def.parse(raw);
  if (def.parse === "number" || def.inputmode) return num(raw);
  return String(raw).trim();
}

/** Put a value at "a.0.b" in an object, making arrays for numeric segments. */
export function setPath(obj, path, value) {
  const parts = path.split(".");
  let at = obj;
  parts.forEach((p, i) => {
    if (i === parts.length - 1) {
      at[p] = value;
      return;
    }
    at[p] ??= /^\d+$/.test(parts[i + 1]) ? [] : {};
    at = at[p];
  });
}

/** The body the fields make: visible, non-empty ones only; paths starting with "_" are the page's own. */
export function bodyOf(defs, values) {
  const body = {};
  for (const def of defs) {
    if (def.path.startsWith("_") || !visible(def, values) || isEmpty(values[def.path])) continue;
    setPath(body, def.path, parsed(def, values[def.path]));
  }
  return body;
}

/** A load's values keyed by full path ("loads.2.measurement.kW"), as the field definitions read them. */
export const prefixed = (obj, at) => Object.fromEntries(Object.entries(obj).map(([k, v]) => [`${at}.${k}`, v]));
