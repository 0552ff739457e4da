// The "Installed banks" part of the new-building form: banks already on site, each with its nameplate, so surveys
// of the building can read them (src/http/schemas/sizing.ts, installedBankSchema). Values are kept per bank as
// typed, keyed by the field's path under the bank ("steps", "location"), like the survey's loads.

import { drawFields, el } from "./dom.js";
import { fixedBankIssue, installedBankFields } from "./fields.js";
import { lastSegment, prefixed } from "./model.js";

export const newBank = () => ({ location: "service", control: "automatic" });

const at = (i) => `installedBanks.${i}`;
const view = (banks, i) => prefixed(banks[i], at(i));

/** Every bank's field definitions, with full paths ("installedBanks.1.steps"). */
export const bankDefs = (banks) => banks.flatMap((_, i) => installedBankFields(at(i)));
/** Every bank's values keyed by full path, as the definitions read them. */
export const bankValues = (banks) => Object.assign({}, ...banks.map((_, i) => view(banks, i)));

/** Store an edit of a bank's field; false when the path is not a bank's. */
export function storeBankEdit(banks, path, value) {
  const m = /^installedBanks\.(\d+)\.(.+)$/.exec(path);
  if (!m || !banks[Number(m[1])]) return false;
  banks[Number(m[1])][m[2]] = value;
  return true;
}

/** What the service checks across fields and banks, in its words: a fixed bank is one step, labels are unique. */
export function bankIssues(banks) {
  const values = bankValues(banks);
  const issues = [];
  const seen = new Set();
  banks.forEach((b, i) => {
    const fixed = fixedBankIssue(values, at(i));
    if (fixed) issues.push({ path: `${at(i)}.steps`, message: fixed });
    const label = String(b.label ?? "").trim();
    if (label && seen.has(label))
      issues.push({ path: `${at(i)}.label`, message: `bank label "${label}" is used twice: labels are how readings refer to a bank` });
    seen.add(label);
  });
  return issues;
}

/**
 * Draw the banks into `box`, folded under "Installed banks" (kept open across redraws through `openFolds`), each
 * with its fields and a remove button, then "+ Add installed bank". `onChange` redraws after an add or a remove.
 */
export function renderInstalledBanks(box, banks, openFolds, onChange) {
  const list = el("ol", { class: "loads", id: "nb-banks" });
  banks.forEach((_, i) => {
    const fields = el("div", {});
    const v = view(banks, i);
    drawFields(fields, installedBankFields(at(i)), v, (d) => `nb-b${i}-${lastSegment(d.path)}`);
    for (const [k, value] of Object.entries(v)) banks[i][k.slice(at(i).length + 1)] = value; // the selects' defaults
    const remove = el("button", { type: "button", class: "danger" }, `Remove bank ${i + 1}`);
    remove.addEventListener("click", () => {
      banks.splice(i, 1);
      onChange();
    });
    list.append(el("li", { class: "load", "data-bank": i }, el("h3", { class: "load-title" }, `Installed bank ${i + 1}`), fields, remove));
  });
  const add = el("button", { type: "button", class: "secondary", id: "nb-add-bank" }, "+ Add installed bank");
  add.addEventListener("click", () => {
    banks.push(newBank());
    onChange(`nb-b${banks.length - 1}-label`);
  });
  const summary = el("summary", {}, banks.length ? `Installed banks (${banks.length})` : "Installed banks (none)");
  const note = el(
    "p",
    { class: "hint" },
    "Capacitor banks already on site. Steps as the nameplates read: 5 × 50 for five 50 kvar steps, or 50 + 50 + 25 (a comma between steps needs a space after it: 12,5 is a decimal). Surveys of the building then read each bank's steps.",
  );
  const details = el("details", { class: "fold", "data-fold": "nb-banks", id: "nb-banks-part" }, summary, el("div", {}, note, list, add));
  details.open = openFolds?.has("nb-banks") ?? false;
  details.addEventListener("toggle", () => (details.open ? openFolds?.add("nb-banks") : openFolds?.delete("nb-banks")));
  box.replaceChildren(details);
}
