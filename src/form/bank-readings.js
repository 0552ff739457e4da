// The survey's readings of the building's installed banks ("bankReadings", src/http/schemas/sizing.ts), arranged
// for a walk-around: one bank open at a time, its steps as rows (in service, current per phase or one figure), the
// healthy current beside each step and a live check against it. Kept in the draft per bank label, as typed.

import { expectedStepA, num, stepAmps, volts } from "./checks.js";
import { $, el, setMsg } from "./dom.js";
import { changed } from "./drafts.js";
import { state } from "./survey.js";

const PHASES = ["a", "b", "c"];
const f1 = (x) => x.toFixed(1);

/** The chosen building's installed banks (from the building list kept on the tablet). */
const banksOf = () => state.building()?.installedBanks ?? [];
const readingOf = (label) => {
  state.draft.bankReadings ??= {};
  state.draft.bankReadings[label] ??= { perPhase: true, voltageV: "", steps: {} };
  return state.draft.bankReadings[label];
};
const stepOf = (r, n) => (r.steps[n] ??= { on: false, a: "", b: "", c: "", one: "" });
const perPhase = (r) => r.perPhase && state.system()?.phases !== 1;
const phasesOf = (r) => (perPhase(r) ? PHASES : ["one"]);
const filled = (x) => String(x ?? "").trim() !== "";

/** The voltage the expected currents are worked at: the one read at the bank when valid, else the system's. */
function voltageOf(r) {
  const sys = state.system();
  return filled(r.voltageV) && !volts(r.voltageV) ? num(r.voltageV) : sys.voltageV;
}

/** Whether anything was entered for the bank: a bank with nothing is sent as not read (taken as out of service). */
const isRead = (r, bank) =>
  filled(r.voltageV) ||
  bank.steps.some((_, i) => {
    const s = stepOf(r, i + 1);
    return s.on || phasesOf(r).some((p) => filled(s[p]));
  });

/**
 * The readings as the service takes them, and the body path of each control (by its data-key), so a message from
 * the service finds its box. Steps with no current typed are not sent as measured.
 */
function layout() {
  const readings = [];
  const paths = new Map();
  for (const bank of banksOf()) {
    const r = readingOf(bank.label);
    if (!isRead(r, bank)) continue;
    const at = `bankReadings.${readings.length}`;
    const out = { bank: bank.label, inServiceSteps: [] };
    if (filled(r.voltageV)) {
      out.voltageV = num(r.voltageV);
      paths.set(`${bank.label}|voltageV`, `${at}.voltageV`);
    }
    const currents = [];
    bank.steps.forEach((_, i) => {
      const n = i + 1;
      const s = stepOf(r, n);
      if (s.on) {
        paths.set(`${bank.label}|on|${n}`, `${at}.inServiceSteps.${out.inServiceSteps.length}`);
        out.inServiceSteps.push(n);
      }
      const ph = phasesOf(r);
      if (!ph.some((p) => filled(s[p]))) return;
      const j = currents.length;
      if (ph.length === 1) paths.set(`${bank.label}|amps|${n}|one`, `${at}.stepCurrents.${j}.amps`);
      else ph.forEach((p, k) => paths.set(`${bank.label}|amps|${n}|${p}`, `${at}.stepCurrents.${j}.amps.${k}`));
      currents.push({ step: n, amps: ph.length === 1 ? num(s.one) : ph.map((p) => num(s[p])) });
    });
    if (currents.length) out.stepCurrents = currents;
    readings.push(out);
  }
  return { readings, paths };
}

export const bankReadingsBody = () => layout().readings;

/** Give every control the body path it is sent under (the page's own "_" path when it is not sent). */
function assignPaths() {
  const { paths } = layout();
  for (const c of $("bank-readings").querySelectorAll("[data-key]")) c.dataset.path = paths.get(c.dataset.key) ?? `_br.${c.dataset.key}`;
}

/** One control's message as it stands, "" when fine. */
function messageOf(control) {
  const [label, what, n, phase] = control.dataset.key.split("|");
  const bank = banksOf().find((b) => b.label === label);
  if (!bank) return "";
  const r = readingOf(label);
  if (what === "voltageV") return filled(r.voltageV) ? volts(r.voltageV) : "";
  if (what !== "amps") return "";
  const s = stepOf(r, Number(n));
  const kvar = bank.steps[Number(n) - 1].kvar;
  const v = voltageOf(r);
  const own = stepAmps(s[phase], expectedStepA(kvar, bank, v, state.system()), kvar, v);
  if (own) return own;
  // Three boxes: all or none (one figure is the other choice).
  const ph = phasesOf(r);
  return ph.length === 3 && !filled(s[phase]) && ph.some((p) => filled(s[p])) ? "amps must be one figure, or three (one per phase)" : "";
}

/** What the step's currents say, live: percent of the healthy current, and a dead phase (a blown fuse) named. */
function foundText(bank, r, n) {
  const s = stepOf(r, n);
  const ph = phasesOf(r);
  const amps = ph.map((p) => num(s[p]));
  if (amps.some((a) => a === null || !Number.isFinite(a))) return "–";
  const expected = expectedStepA(bank.steps[n - 1].kvar, bank, voltageOf(r), state.system());
  const dead = amps.findIndex((a) => a === 0);
  if (dead >= 0) return ph.length > 1 ? `phase ${"ABC"[dead]} 0 A` : "0 A";
  return `${Math.round((amps.reduce((x, y) => x + y, 0) / amps.length / expected) * 100)} %`;
}

function summaryText(bank, r) {
  const on = bank.steps.filter((_, i) => stepOf(r, i + 1).on).length;
  const measured = bank.steps.filter((_, i) => phasesOf(r).some((p) => filled(stepOf(r, i + 1)[p]))).length;
  const found = isRead(r, bank) ? `${on} of ${bank.steps.length} in service, ${measured} measured` : "not read yet";
  return `${bank.label} · ${bank.control}, ${bank.steps.length} step${bank.steps.length > 1 ? "s" : ""} — ${found}`;
}

const cell = (control, msgId) => el("td", {}, el("div", { class: "field" }, control, el("p", { class: "msg", id: msgId, role: "alert" })));

function bankPanel(bank, bi, count) {
  const r = readingOf(bank.label);
  const sys = state.system();
  const id = (...p) => `br${bi}-${p.join("-")}`;
  const ph = phasesOf(r);
  const v = voltageOf(r);
  const voltage = el("input", {
    type: "text",
    inputmode: "decimal",
    id: id("voltageV"),
    "data-key": `${bank.label}|voltageV`,
    placeholder: String(sys.voltageV),
    autocomplete: "off",
  });
  voltage.value = r.voltageV;
  const top = el(
    "div",
    { class: "grid" },
    el(
      "div",
      { class: "field" },
      el("label", { for: voltage.id }, "Voltage at the bank (V)"),
      voltage,
      el("p", { class: "msg", id: `${voltage.id}-msg`, role: "alert" }),
    ),
  );
  if (sys.phases !== 1) {
    const mode = el("select", { id: id("mode"), "data-mode": bank.label }, new Option("Per phase", "phase"), new Option("One figure", "one"));
    mode.value = r.perPhase ? "phase" : "one";
    top.append(el("div", { class: "field" }, el("label", { for: mode.id }, "Step currents"), mode));
  }
  const head = el(
    "tr",
    {},
    el("th", { scope: "col" }, "Step"),
    el("th", { scope: "col" }, "On during the readings"),
    ...ph.map((p) => el("th", { scope: "col" }, p === "one" ? "Amps" : `${p.toUpperCase()} (A)`)),
    el("th", { scope: "col" }, "Found"),
  );
  const rows = bank.steps.map((step, i) => {
    const n = i + 1;
    const s = stepOf(r, n);
    const on = el("input", { type: "checkbox", id: id("on", n), "data-key": `${bank.label}|on|${n}` });
    on.checked = s.on;
    const amps = ph.map((p) => {
      const input = el("input", {
        type: "text",
        inputmode: "decimal",
        id: id("amps", n, p),
        "data-key": `${bank.label}|amps|${n}|${p}`,
        autocomplete: "off",
        "aria-label": `step ${n} ${p === "one" ? "amps" : `phase ${p.toUpperCase()} amps`}`,
      });
      input.value = s[p];
      return cell(input, `${input.id}-msg`);
    });
    const expected = expectedStepA(step.kvar, bank, v, sys);
    return el(
      "tr",
      { "data-step": n },
      el(
        "th",
        { scope: "row" },
        `${n}`,
        el("span", { class: "sub" }, `${step.kvar} kvar`),
        el("span", { class: "expect" }, `expect ${f1(expected)} A`),
      ),
      el("td", {}, el("label", { class: "tick", for: on.id }, on, " on")),
      ...amps,
      el("td", { class: "found", "data-found": n }, foundText(bank, r, n)),
    );
  });
  const all = el("button", { type: "button", class: "secondary", "data-all": bank.label }, "All steps in service");
  const next = bi + 1 < count ? el("button", { type: "button", class: "secondary", "data-next": bi + 1 }, "Next bank ›") : null;
  const details = el(
    "details",
    { class: "fold bank-read", "data-bank": bank.label, id: `br${bi}` },
    el("summary", {}, summaryText(bank, r)),
    el("div", {}, top, el("table", { class: "steps" }, el("thead", {}, head), el("tbody", {}, ...rows)), el("div", { class: "row" }, all, next)),
  );
  details.open = state.openBank === bank.label;
  // One bank open at a time: the walk-around reads one panel, then the next.
  details.addEventListener("toggle", () => {
    if (!details.open) return;
    state.openBank = bank.label;
    for (const d of $("bank-readings").querySelectorAll("details.bank-read")) if (d !== details) d.open = false;
  });
  return details;
}

export function renderBankReadings() {
  const box = $("bank-readings");
  const banks = banksOf();
  const sys = state.system();
  $("bank-readings-part").hidden = !sys || banks.length === 0;
  if (!sys || banks.length === 0) return box.replaceChildren();
  box.replaceChildren(...banks.map((b, i) => bankPanel(b, i, banks.length)));
  assignPaths();
  for (const c of box.querySelectorAll("[data-key]")) if (filled(c.value) && c.type !== "checkbox") setMsg(c, messageOf(c));
}

/** Refresh the live parts of one bank's panel: messages, expected currents, what was found, the summary. */
function refreshBank(label) {
  const bank = banksOf().find((b) => b.label === label);
  const panel = [...$("bank-readings").querySelectorAll("details.bank-read")].find((d) => d.dataset.bank === label);
  if (!bank || !panel) return;
  const r = readingOf(label);
  const v = voltageOf(r);
  panel.querySelector("summary").textContent = summaryText(bank, r);
  for (const c of panel.querySelectorAll("[data-key]"))
    if (c.type !== "checkbox" && (filled(c.value) || c.getAttribute("aria-invalid"))) setMsg(c, messageOf(c));
  bank.steps.forEach((step, i) => {
    const row = panel.querySelector(`tr[data-step="${i + 1}"]`);
    row.querySelector(".expect").textContent = `expect ${f1(expectedStepA(step.kvar, bank, v, state.system()))} A`;
    row.querySelector(".found").textContent = foundText(bank, r, i + 1);
  });
  assignPaths();
}

/** An edit in the bank readings: store it in the draft, recheck live. */
export function onBankEdit(ev) {
  const t = /** @type {HTMLInputElement} */ (ev.target);
  if (t.dataset.mode) {
    if (ev.type !== "change") return;
    readingOf(t.dataset.mode).perPhase = t.value === "phase";
    changed(state.draft);
    renderBankReadings();
    $(t.id)?.focus();
    return;
  }
  if (!t.dataset.key) return;
  const [label, what, n, phase] = t.dataset.key.split("|");
  const r = readingOf(label);
  if (what === "voltageV") r.voltageV = t.value;
  else if (what === "on") stepOf(r, Number(n)).on = t.checked;
  else stepOf(r, Number(n))[phase] = t.value;
  changed(state.draft);
  refreshBank(label);
}

export function onBankClick(ev) {
  const t = /** @type {HTMLElement} */ (ev.target);
  if (t.dataset.all) {
    const bank = banksOf().find((b) => b.label === t.dataset.all);
    bank.steps.forEach((_, i) => (stepOf(readingOf(bank.label), i + 1).on = true));
    changed(state.draft);
    renderBankReadings();
  } else if (t.dataset.next) {
    const next = /** @type {HTMLDetailsElement} */ ($(`br${t.dataset.next}`));
    next.open = true;
    next.scrollIntoView({ block: "start" });
  }
}

/** Every check of the bank readings, shown beside its box; answers the number of faults. */
export function checkBankReadings() {
  let faults = 0;
  for (const c of $("bank-readings").querySelectorAll("[data-key]")) {
    if (c.type === "checkbox") continue;
    const m = messageOf(c);
    setMsg(c, m);
    if (m) {
      faults++;
      c.closest("details")?.setAttribute("open", "");
    }
  }
  return faults;
}
