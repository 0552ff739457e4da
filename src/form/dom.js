// Building fields on the page from their definitions, and placing messages beside them.

import { lastSegment, visible } from "./model.js";

export const $ = (id) => /** @type {HTMLElement} */ (document.getElementById(id));

export function el(tag, attrs = {}, ...children) {
  const e = document.createElement(tag);
  for (const [k, v] of Object.entries(attrs)) {
    if (v === undefined || v === null || v === false) continue;
    if (k === "class") e.className = v;
    else if (k.startsWith("data-")) e.dataset[k.slice(5).replace(/-(\w)/g, (_, c) => c.toUpperCase())] = String(v);
    else e.setAttribute(k, v === true ? "" : String(v));
  }
  e.append(...children.filter((c) => c !== null && c !== undefined));
  return e;
}

/** One field: label, control, message line and hint line. A select's first option becomes the value if none is set. */
export function fieldEl(def, values, id) {
  const f = lastSegment(def.path);
  let input;
  if (def.kind === "select") {
    input = el("select");
    for (const [v, t] of def.options) input.append(new Option(t, v));
    input.value = values[def.path] ?? def.options[0][0];
    values[def.path] = input.value;
  } else if (def.kind === "check") {
    input = el("input", { type: "checkbox" });
    input.checked = values[def.path] === true;
  } else {
    input = el("input", {
      type: def.kind === "date" ? "date" : "text",
      autocomplete: def.autocomplete ?? "off",
      spellcheck: "false",
      placeholder: def.placeholder,
    });
    if (def.inputmode) input.inputMode = def.inputmode;
    input.value = values[def.path] ?? "";
  }
  input.id = id;
  input.dataset.path = def.path;
  input.dataset.f = f;
  const label = el("label", { for: id }, def.label);
  const msg = el("p", { class: "msg", id: `${id}-msg`, "data-m": f, role: "alert" });
  const hint = el("p", { class: "field-hint", "data-h": f });
  const note = def.note ? el("p", { class: "note" }, def.note) : null;
  // A select whose longest choice would not fit a grid column takes the whole row: no option text is cut.
  const long = def.kind === "select" && Math.max(...def.options.map(([, t]) => t.length)) > 12;
  const cls = `field${def.wide || long ? " wide" : ""}${def.kind === "check" ? " check" : ""}`;
  return def.kind === "check"
    ? el("div", { class: cls }, el("label", { class: "tick", for: id }, input, ` ${def.label}`), msg)
    : el("div", { class: cls }, label, input, note, msg, hint);
}

/**
 * Draw `defs` into `box`: visible unfolded fields in a grid, folded ones in a <details> (kept open across redraws
 * through `openFolds`). `idOf(def)` names each control.
 */
export function drawFields(box, defs, values, idOf, { foldTitle = "More", foldKey = box.id, openFolds } = {}) {
  const shown = defs.filter((d) => visible(d, values));
  const main = el("div", { class: "grid" }, ...shown.filter((d) => !d.fold).map((d) => fieldEl(d, values, idOf(d))));
  const folded = shown.filter((d) => d.fold);
  box.replaceChildren(main);
  if (folded.length) {
    const details = el(
      "details",
      { class: "fold", "data-fold": foldKey },
      el("summary", {}, foldTitle),
      el("div", { class: "grid" }, ...folded.map((d) => fieldEl(d, values, idOf(d)))),
    );
    details.open = openFolds?.has(foldKey) ?? false;
    details.addEventListener("toggle", () => (details.open ? openFolds?.add(foldKey) : openFolds?.delete(foldKey)));
    box.append(details);
  }
}

/** Show or clear a message beside the control. */
export function setMsg(input, text) {
  const msg = input?.closest(".field")?.querySelector(".msg");
  if (msg) msg.textContent = text;
  if (!input) return;
  if (text) input.setAttribute("aria-invalid", "true");
  else input.removeAttribute("aria-invalid");
}

/** The control a path names, or the first one under it ("loads.2.measurement" → its method). */
export function controlFor(path, root = document) {
  const all = [...root.querySelectorAll("[data-path]")];
  return all.find((e) => e.dataset.path === path) ?? all.find((e) => e.dataset.path.startsWith(`${path}.`)) ?? null;
}

/** Place the service's errors[] beside their fields; returns those with no field on the page. */
export function placeErrors(errors, root = document) {
  const rest = [];
  for (const e of errors ?? []) {
    const input = controlFor(String(e.path ?? ""), root);
    if (input && e.path) {
      setMsg(input, e.message);
      input.closest("details")?.setAttribute("open", "");
    } else rest.push(`${e.path ? `${e.path}: ` : ""}${e.message}`);
  }
  return rest;
}

/** A status line: tone "ok", "error", "info" or "" (cleared). */
export function say(id, text, tone = "info") {
  const box = $(id);
  box.textContent = text;
  box.dataset.tone = text ? tone : "";
}
