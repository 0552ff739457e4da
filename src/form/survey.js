// The survey part of the page: its fields, the loads, the live figures and totals, the checks before sending and
// the body sent. Everything reads and writes `state.draft` (drafts.js).

import { bankReadingsBody, checkBankReadings, renderBankReadings } from "./bank-readings.js";
import { kvarToTarget, num, rules, triangle, voltsHint } from "./checks.js";
import { $, controlFor, drawFields, el, setMsg } from "./dom.js";
import { changed, newLoad, saveDraft } from "./drafts.js";
import { loadFields, SURVEY_FIELDS, surveyExtraFields } from "./fields.js";
import { bodyOf, errorsOf, fieldError, lastSegment, prefixed } from "./model.js";

/** What the page holds besides the draft; set by main.js. */
export const state = { draft: null, building: () => null, system: () => null, openFolds: new Set(), openBank: "" };

const wholeQuantity = (raw) => (num(raw) === null ? "" : rules.whole("quantity", 1, 10_000)(raw));
const f2 = (x) => x.toFixed(2);
const f3 = (x) => x.toFixed(3);
const loadView = (i) => prefixed(state.draft.loads[i], `loads.${i}`);
const loadDefs = (i) => loadFields(`loads.${i}`, loadView(i));
const extraSections = () => surveyExtraFields(state.draft.values);

/** Every field and every value, as one flat set keyed by path. */
export function allDefs() {
  return [...SURVEY_FIELDS, ...extraSections().flatMap((s) => s.fields), ...state.draft.loads.flatMap((_, i) => loadDefs(i))];
}
export const allValues = () => Object.assign({}, state.draft.values, ...state.draft.loads.map((_, i) => loadView(i)));

const idOf = (prefix) => (def) => `${prefix}${lastSegment(def.path).replace(/^_/, "")}`;
const EXTRA_PREFIX = { serviceEntrance: "se-", lightLoad: "ll-", bankDesign: "" };

// ---------- drawing ----------

export function renderSurveyFields() {
  drawFields($("survey-fields"), SURVEY_FIELDS, state.draft.values, idOf(""));
  const box = $("survey-extra");
  box.replaceChildren(
    ...extraSections().map((s) => {
      const group = s.fields[0].path.split(".")[0];
      const inner = el("div", { id: `extra-${group}` });
      drawFields(inner, s.fields, state.draft.values, idOf(EXTRA_PREFIX[group]));
      const details = el("details", { class: "fold", "data-fold": group }, el("summary", {}, s.title), inner);
      details.open = state.openFolds.has(group);
      details.addEventListener("toggle", () => (details.open ? state.openFolds.add(group) : state.openFolds.delete(group)));
      return details;
    }),
  );
}

export function renderLoads() {
  const list = $("loads");
  list.replaceChildren(
    ...state.draft.loads.map((_, i) => {
      const fields = el("div", {});
      const view = loadView(i);
      drawFields(fields, loadDefs(i), view, idOf(`l${i}-`), { foldTitle: "More about this load", foldKey: `load-${i}`, openFolds: state.openFolds });
      // drawFields fills the defaults of selects into the view: keep them in the draft.
      for (const [k, v] of Object.entries(view)) state.draft.loads[i][k.slice(`loads.${i}.`.length)] = v;
      return el(
        "li",
        { class: "load", "data-index": i },
        el("h3", { class: "load-title" }, `Load ${i + 1}`),
        fields,
        el("p", { class: "figures", "data-role": "figures" }, "–"),
        el("button", { type: "button", class: "danger", "data-role": "remove" }, `Remove load ${i + 1}`),
      );
    }),
  );
  saveDraft(state.draft);
  updateFigures();
}

export function renderSurvey() {
  renderSurveyFields();
  renderLoads();
  renderBankReadings();
}

// ---------- live figures ----------

const reading = (values, at) =>
  Object.fromEntries(
    Object.entries(values)
      .filter(([k]) => k.startsWith(`${at}.`))
      .map(([k, v]) => [k.slice(at.length + 1), v]),
  );

/** A cross-field fault (kW above kVA, unity sense) shown beside its field while the field's own check passes. */
function showCross(at, t) {
  for (const f of ["kW", "sense"]) {
    const input = controlFor(`${at}.${f}`);
    if (!input) continue;
    const mine = t?.error?.field === f ? t.error.message : "";
    if (mine) {
      setMsg(input, mine);
      input.dataset.cross = "1";
    } else if (input.dataset.cross) {
      delete input.dataset.cross;
      setMsg(input, "");
    }
  }
}

/** The volts hint beside a volts reading: far from the system, or line-to-neutral. */
function showVoltsHint(at, values) {
  const input = controlFor(`${at}.volts`);
  const hint = input?.closest(".field")?.querySelector(".field-hint");
  if (hint) hint.textContent = voltsHint(values[`${at}.volts`], state.system());
}

function figuresLine(out, t) {
  out.replaceChildren();
  if (!t || t.error) {
    out.textContent = "– enter the readings –";
    return;
  }
  for (const [k, v, unit] of [
    ["kW", f2(t.kW), "kW"],
    ["kvar", f2(t.kvar), "kvar"],
    ["kVA", f2(t.kVA), "kVA"],
    ["pf", f3(t.pf), "PF"],
  ]) {
    out.append(el("span", { "data-v": k }, v), ` ${unit}`, k === "pf" ? "" : " · ");
  }
}

export function updateFigures() {
  const sys = state.system();
  const sum = { kW: 0, kvar: 0 };
  let complete = state.draft.loads.length > 0;
  state.draft.loads.forEach((load, i) => {
    const at = `loads.${i}.measurement`;
    const view = loadView(i);
    const phases = num(load.phases) ?? sys?.phases ?? 3;
    const t = triangle(reading(view, at), phases);
    showCross(at, t);
    showVoltsHint(at, view);
    const out = $("loads").children[i]?.querySelector('[data-role="figures"]');
    if (!t || t.error) complete = false;
    else {
      const q = wholeQuantity(load.quantity) ? 1 : (num(load.quantity) ?? 1);
      t.kW *= q;
      t.kvar *= q;
      t.kVA *= q;
      sum.kW += t.kW;
      sum.kvar += t.kvar;
    }
    if (out) figuresLine(out, t);
  });
  const cells = { "t-kw": "–", "t-kvar": "–", "t-kva": "–", "t-pf": "–", "se-kw": "–", "se-kvar": "–", "se-kva": "–", "se-pf": "–", "t-need": "–" };
  const put = (prefix, kW, kvar) => {
    const kVA = Math.hypot(kW, kvar);
    cells[`${prefix}-kw`] = f2(kW);
    cells[`${prefix}-kvar`] = f2(kvar);
    cells[`${prefix}-kva`] = f2(kVA);
    cells[`${prefix}-pf`] = f3(kVA > 0 ? kW / kVA : 1);
  };
  if (complete) put("t", sum.kW, sum.kvar);
  for (const group of ["serviceEntrance", "lightLoad"]) showVoltsHint(`${group}.measurement`, state.draft.values);
  const seAt = "serviceEntrance.measurement";
  const se = state.draft.values[`${seAt}.method`] ? triangle(reading(state.draft.values, seAt), sys?.phases ?? 3) : null;
  showCross(seAt, se);
  $("se-row").hidden = !state.draft.values[`${seAt}.method`];
  if (se && !se.error) put("se", se.kW, se.kvar);
  // The service sizes from the main's reading when there is one, else from the sum of the loads (src/core/site.ts).
  const basis = state.draft.values[`${seAt}.method`] ? (se && !se.error ? se : null) : complete ? sum : null;
  const target = num(state.draft.values.targetPF);
  const targetOk = !fieldError(
    SURVEY_FIELDS.find((d) => d.path === "targetPF"),
    state.draft.values,
  );
  if (basis && targetOk) cells["t-need"] = f2(kvarToTarget(basis.kW, basis.kvar, target));
  $("t-basis").textContent = state.draft.values[`${seAt}.method`] ? "(from the main's reading)" : "(from the sum of the loads)";
  for (const [id, v] of Object.entries(cells)) $(id).textContent = v;
}

// ---------- editing ----------

/** An edit in the survey section: store it, recheck the field, redraw what depends on a choice. */
export function onSurveyEdit(ev) {
  const input = /** @type {HTMLInputElement} */ (ev.target);
  const path = input.dataset?.path;
  if (!path || input.closest("#bank-readings")) return; // bank-readings.js keeps those
  const value = input.type === "checkbox" ? input.checked : input.value;
  const m = /^loads\.(\d+)\.(.+)$/.exec(path);
  if (m) state.draft.loads[Number(m[1])][m[2]] = value;
  else state.draft.values[path] = value;
  changed(state.draft);
  const def = allDefs().find((d) => d.path === path);
  const msg = input.closest(".field")?.querySelector(".msg");
  // A shown message is rechecked as the field changes; a new one appears when the field is left.
  if (def && (ev.type === "change" || msg?.textContent) && !input.dataset.cross) setMsg(input, fieldError(def, allValues()));
  if (ev.type === "change" && (input.tagName === "SELECT" || input.type === "checkbox")) {
    const id = input.id;
    if (m) renderLoads();
    else renderSurveyFields();
    $(id)?.focus();
  }
  updateFigures();
}

export function addLoad() {
  state.draft.loads.push(newLoad());
  changed(state.draft);
  renderLoads();
  $(`l${state.draft.loads.length - 1}-label`)?.focus();
}

export function removeLoad(i) {
  state.draft.loads.splice(i, 1);
  changed(state.draft);
  renderLoads();
}

// ---------- checking and sending ----------

/** Every check the page can make, shown beside its field; true when nothing is wrong. */
export function checkSurvey() {
  const values = allValues();
  for (const input of document.querySelectorAll("#survey-section [data-path]")) setMsg(input, "");
  const errors = errorsOf(allDefs(), values);
  for (const e of errors) setMsg(controlFor(e.path), e.message);
  $("loads-msg").textContent = state.draft.loads.length ? "" : "at least one load is needed";
  updateFigures(); // the cross-field faults
  const cross = document.querySelectorAll("#survey-section [data-cross]").length;
  for (const e of errors) controlFor(e.path)?.closest("details")?.setAttribute("open", "");
  const bankFaults = checkBankReadings();
  return errors.length === 0 && cross === 0 && bankFaults === 0 && state.draft.loads.length > 0;
}

/** The request body, from the fields as they stand. */
export function surveyBody() {
  const body = bodyOf(allDefs(), allValues());
  body.loads ??= [];
  const readings = bankReadingsBody();
  if (readings.length) body.bankReadings = readings;
  return body;
}
