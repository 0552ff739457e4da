// The building part: the list from the service (kept on the tablet for offline use) and the new-building form.

import { call, problemText } from "./api.js";
import { $, drawFields, el, placeErrors, say, setMsg, controlFor } from "./dom.js";
import { newKey, readJson, writeJson } from "./drafts.js";
import { BUILDING_SECTIONS } from "./fields.js";
import { bankDefs, bankIssues, bankValues, renderInstalledBanks, storeBankEdit } from "./installed.js";
import { errorsOf, lastSegment } from "./model.js";
import { buildingPatch, formBody, formOfBuilding } from "./building-record.js";

const BUILDINGS_STORE = "pfc-form.buildings";
const NEW_BUILDING_STORE = "pfc-form.new-building";

export const buildings = { list: readJson(BUILDINGS_STORE, []) };
/** The new-building form's values, kept across reloads; its key is made once per building being created. */
const nb = readJson(NEW_BUILDING_STORE, null) ?? { values: {}, idem: newKey() };
nb.banks ??= [];
/** The building being changed ({ id, name }), or null while the form makes a new one; `aside` keeps that one's values. */
nb.editing ??= null;
const saveNb = () => writeJson(NEW_BUILDING_STORE, nb);
let creating = false;

const TARIFF_NAMES = Object.fromEntries(BUILDING_SECTIONS.flatMap((s) => s.fields).find((d) => d.path === "economics.tariff.form").options);

export const buildingById = (id) => buildings.list.find((b) => b.id === id) ?? null;

export function describeBuilding(b) {
  if (!b) return "";
  const s = b.system;
  const parts = [`${s.voltageV} V, ${s.frequencyHz} Hz, ${s.phases === 1 ? "single" : "three"}-phase`];
  parts.push(b.transformer ? `transformer ${b.transformer.kVA} kVA at ${b.transformer.impedancePct} %` : "no transformer data (no resonance screen)");
  if (b.economics) parts.push(`tariff: ${TARIFF_NAMES[b.economics.tariff.form] ?? b.economics.tariff.form}`);
  const banks = b.installedBanks ?? [];
  if (banks.length) parts.push(`installed banks: ${banks.map((x) => x.label).join(", ")}`);
  return parts.join(" · ");
}

export function renderBuildings(selectedId) {
  const sel = /** @type {HTMLSelectElement} */ ($("building"));
  sel.replaceChildren(new Option("— choose —", ""), ...buildings.list.map((b) => new Option(b.name, b.id)));
  sel.value = buildingById(selectedId) ? selectedId : "";
  $("building-info").textContent = describeBuilding(buildingById(selectedId));
  $("building-change").hidden = !buildingById(selectedId);
}

/** Fetch the list; offline, the saved one stays. Answers a line for the key's state, or "" when unchanged. */
export async function loadBuildings() {
  const r = await call("GET", "/v1/buildings?limit=100");
  if (r.status === 0) return "No network to the service: showing the buildings saved on this tablet.";
  if (r.status !== 200) return r.status === 401 ? "The key was not accepted." : problemText(r);
  buildings.list = r.data.items;
  writeJson(BUILDINGS_STORE, buildings.list);
  return "Key accepted.";
}

const defs = () => [...BUILDING_SECTIONS.flatMap((s) => s.fields), ...bankDefs(nb.banks)];
const values = () => ({ ...nb.values, ...bankValues(nb.banks) });
const idOf = (def) => `nb-${lastSegment(def.path).replace(/^_/, "")}`;

export function renderNewBuilding(openFolds) {
  const changing = nb.editing;
  $("nb-summary").textContent = changing ? `Change ${changing.name}` : "New building";
  $("nb-create").textContent = changing ? "Save changes" : "Create building";
  $("nb-cancel").hidden = !changing;
  const box = $("nb-fields");
  box.replaceChildren();
  BUILDING_SECTIONS.forEach((section, i) => {
    const part = document.createElement("div");
    part.id = `nb-part-${i}`;
    if (section.fold)
      drawFields(
        part,
        section.fields.map((d) => ({ ...d, fold: true })),
        nb.values,
        idOf,
        { foldTitle: section.title, foldKey: `nb-${i}`, openFolds },
      );
    else drawFields(part, section.fields, nb.values, idOf);
    box.append(part);
  });
  const banks = el("div", { id: "nb-part-banks" });
  const redraw = (focusId) => {
    nb.idem = newKey();
    saveNb();
    renderNewBuilding(openFolds);
    if (focusId) $(focusId)?.focus();
  };
  renderInstalledBanks(banks, nb.banks, openFolds, redraw);
  box.append(banks);
  saveNb();
}

export function onNewBuildingEdit(ev, openFolds) {
  const input = /** @type {HTMLInputElement} */ (ev.target);
  const path = input.dataset?.path;
  if (!path) return;
  const value = input.type === "checkbox" ? input.checked : input.value;
  if (!storeBankEdit(nb.banks, path, value)) nb.values[path] = value;
  nb.idem = newKey(); // another building now: a retry of the old one can no longer be meant
  saveNb();
  const def = defs().find((d) => d.path === path);
  const msg = input.closest(".field")?.querySelector(".msg");
  if (def && (ev.type === "change" || msg?.textContent))
    setMsg(input, errorsOf([def], values())[0]?.message ?? bankIssues(nb.banks).find((e) => e.path === path)?.message ?? "");
  if (ev.type === "change" && input.tagName === "SELECT") {
    renderNewBuilding(openFolds);
    $(input.id)?.focus();
  }
}

const buildingBody = () => formBody(nb.values, nb.banks);

/** Fill the form with a stored building to change it; the new building's values wait aside. */
export function startChange(id) {
  const b = buildingById(id);
  if (!b) return;
  const { values, banks } = formOfBuilding(b);
  if (!nb.editing) nb.aside = { values: nb.values, banks: nb.banks };
  nb.values = values;
  nb.banks = banks;
  nb.editing = { id: b.id, name: b.name };
  nb.idem = newKey();
  saveNb();
}

/** Back to the new-building form as it was before the change began. */
export function endChange() {
  nb.values = nb.aside?.values ?? {};
  nb.banks = nb.aside?.banks ?? [];
  nb.editing = null;
  nb.aside = null;
  nb.idem = newKey();
  saveNb();
}

/** The form's messages cleared, then every field's and bank's problem shown; true when there is none. */
function formChecks() {
  say("nb-msg", "");
  for (const input of $("nb-fields").querySelectorAll("[data-path]")) setMsg(input, "");
  const errors = [...errorsOf(defs(), values()), ...bankIssues(nb.banks)];
  for (const e of errors) {
    const input = controlFor(e.path, $("nb-fields"));
    setMsg(input, e.message);
    input?.closest("details")?.setAttribute("open", "");
  }
  if (errors.length) say("nb-msg", "Please correct the fields marked in red.", "error");
  return errors.length === 0;
}

/** The service's refusal placed beside the fields, or a line for what it could not place. */
function refused(r) {
  const rest = placeErrors(r.data?.errors, $("nb-fields"));
  say("nb-msg", `Not accepted: ${rest.length ? rest.join("; ") : "see the messages beside the fields"}`, "error");
}

const keepBuilding = (b) => {
  buildings.list = [...buildings.list.filter((x) => x.id !== b.id), b];
  writeJson(BUILDINGS_STORE, buildings.list);
};

/**
 * Save the change to the building being changed: only the parts that differ, as one PATCH (a new version of the
 * building; surveys already stored keep the version they were sized with). Answers its id, or null.
 */
export async function saveChange() {
  if (creating || !nb.editing) return null;
  creating = true;
  $("nb-create").toggleAttribute("disabled", true);
  try {
    if (!formChecks()) return null;
    const stored = buildingById(nb.editing.id);
    if (!stored) {
      say("nb-msg", "This building is no longer in the list: reload the buildings.", "error");
      return null;
    }
    const patch = buildingPatch(stored, buildingBody(), nb.banks);
    if (!patch) {
      say("nb-msg", "Nothing to save: the form shows the building as stored.", "info");
      return null;
    }
    const r = await call("PATCH", `/v1/buildings/${encodeURIComponent(stored.id)}`, { body: patch, headers: { "idempotency-key": nb.idem } });
    if (r.status === 0) {
      say("nb-msg", "No network to the service: a change can only be saved while it answers.", "error");
      return null;
    }
    if (r.status !== 200) {
      refused(r);
      return null;
    }
    keepBuilding(r.data);
    endChange();
    say("nb-msg", `Saved the changes to ${r.data.name}.`, "ok");
    return r.data.id;
  } finally {
    creating = false;
    $("nb-create").toggleAttribute("disabled", false);
  }
}

/** Create the building; answers its id, or null (messages are shown). One key per building, so a retry is safe. */
export async function createBuilding() {
  if (creating) return null;
  creating = true;
  $("nb-create").toggleAttribute("disabled", true);
  try {
    if (!formChecks()) return null;
    const r = await call("POST", "/v1/buildings", { body: buildingBody(), headers: { "idempotency-key": nb.idem } });
    if (r.status === 0) {
      say("nb-msg", "No network to the service: a building can only be created while it answers.", "error");
      return null;
    }
    if (r.status !== 201 && r.status !== 200) {
      refused(r);
      return null;
    }
    keepBuilding(r.data);
    nb.values = {};
    nb.banks = [];
    nb.idem = newKey();
    saveNb();
    say("nb-msg", `Created ${r.data.name}.`, "ok");
    return r.data.id;
  } finally {
    creating = false;
    $("nb-create").toggleAttribute("disabled", false);
  }
}
