// The survey page: plain ES module, no build step. Live figures are computed here with the power-triangle
// formulas (a small copy of the service's: the submitted survey's sizing is the record); surveys that cannot
// be sent are queued in localStorage with their Idempotency-Key and resent until the service answers.

const KEY_STORE = "pfc-form.key";
const DRAFT_STORE = "pfc-form.draft";
const QUEUE_STORE = "pfc-form.queue";
const BUILDINGS_STORE = "pfc-form.buildings";
const RETRY_MS = 10_000;

const MAX_FIGURE = 1e6;
const VOLTS_MIN = 50;
const VOLTS_MAX = 35_000;
const TARGET_MIN = 0.8;
const TARGET_MAX = 1;

/** The readings each method takes, in the service's field names. */
const METHODS = {
  kw_pf: ["kW", "pf", "sense"],
  kw_kva: ["kW", "kVA"],
  kw_kvar: ["kW", "kvar"],
  v_i_kw: ["volts", "amps", "kW"],
  v_i_pf: ["volts", "amps", "pf", "sense"],
};
const LABELS = { kW: "kW", kVA: "kVA", kvar: "kvar (+ lagging, − leading)", pf: "PF", sense: "Sense", volts: "Volts (line-to-line)", amps: "Amps" };

const $ = (id) => /** @type {HTMLElement} */ (document.getElementById(id));
const read = (k, fallback) => {
  try {
    const v = localStorage.getItem(k);
    return v === null ? fallback : JSON.parse(v);
  } catch {
    return fallback;
  }
};
const write = (k, v) => localStorage.setItem(k, JSON.stringify(v));

// ---------- numbers and checks (messages as the service words them) ----------

/** "" → null (missing); "1,5" reads as 1.5; anything else not a number → NaN. */
function num(raw) {
  const s = String(raw ?? "").trim().replace(",", ".");
  if (s === "") return null;
  return /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(s) ? Number(s) : NaN;
}

function check(field, raw) {
  const v = num(raw);
  const isNum = v !== null && Number.isFinite(v);
  switch (field) {
    case "kW":
    case "kVA":
    case "amps":
      if (!isNum) return `${field} must be a number`;
      if (v <= 0) return `${field} must be greater than 0`;
      if (v > MAX_FIGURE) return `${field} must be at most ${MAX_FIGURE}`;
      return "";
    case "kvar":
      if (!isNum) return "kvar must be a number";
      return Math.abs(v) > MAX_FIGURE ? `kvar must be within ±${MAX_FIGURE}` : "";
    case "volts":
      if (!isNum) return "volts must be a number";
      return v < VOLTS_MIN || v > VOLTS_MAX ? `volts must be between ${VOLTS_MIN} and ${VOLTS_MAX} V` : "";
    case "pf":
      if (!isNum) return "pf must be a number";
      return v <= 0 || v > 1 ? "pf must be greater than 0 and at most 1" : "";
    case "targetPF":
      if (!isNum) return "targetPF must be a number";
      return v < TARGET_MIN || v > TARGET_MAX ? `targetPF must be between ${TARGET_MIN} and ${TARGET_MAX}` : "";
    case "quantity":
      if (v === null) return "";
      if (!isNum || !Number.isInteger(v)) return "quantity must be a whole number";
      return v < 1 || v > 10_000 ? "quantity must be 1 to 10000" : "";
    case "label":
      return String(raw ?? "").trim() === "" ? "label must not be empty" : "";
    case "surveyor":
      return String(raw ?? "").trim() === "" ? "surveyor must not be empty" : "";
    case "surveyedAt":
      return /^\d{4}-\d{2}-\d{2}$/.test(String(raw ?? "")) ? "" : "surveyedAt must be a date";
    default:
      return "";
  }
}

// ---------- power triangle ----------

/** One reading's kW, signed kvar (> 0 lagging), kVA and PF, times quantity; null while a reading is missing or wrong. */
export function triangle(load, phases) {
  const fields = METHODS[load.method];
  if (!fields) return null;
  const v = {};
  for (const f of fields) {
    if (f === "sense") continue;
    if (check(f, load.values[f])) return null;
    v[f] = num(load.values[f]);
  }
  const sign = load.values.sense === "leading" ? -1 : load.values.sense === "unity" ? 0 : 1;
  const viKVA = () => ((phases === 1 ? 1 : Math.sqrt(3)) * v.volts * v.amps) / 1000;
  let kW;
  let kvar;
  switch (load.method) {
    case "kw_kvar":
      kW = v.kW;
      kvar = v.kvar;
      break;
    case "kw_pf":
    case "v_i_pf":
      kW = load.method === "kw_pf" ? v.kW : viKVA() * v.pf;
      kvar = v.pf >= 1 ? 0 : sign * kW * Math.tan(Math.acos(v.pf));
      break;
    default: {
      const kVA = load.method === "kw_kva" ? v.kVA : viKVA();
      kW = v.kW;
      if (kW > kVA * 1.01) return null;
      const pf = Math.min(1, kW / kVA);
      kvar = pf >= 1 ? 0 : kW * Math.tan(Math.acos(pf));
    }
  }
  const q = check("quantity", load.quantity) ? 1 : (num(load.quantity) ?? 1);
  kW *= q;
  kvar *= q;
  const kVA = Math.hypot(kW, kvar);
  return { kW, kvar, kVA, pf: kVA > 0 ? kW / kVA : 1 };
}

const f2 = (x) => x.toFixed(2);
const f3 = (x) => x.toFixed(3);

// ---------- state ----------

const today = () => new Date().toISOString().slice(0, 10);
const newLoad = () => ({ label: "", kind: "motor", quantity: "1", method: "kw_pf", values: { sense: "lagging" } });
let state = read(DRAFT_STORE, null) ?? { buildingId: "", surveyor: "", surveyedAt: today(), targetPF: "0.95", loads: [newLoad()] };
let buildings = read(BUILDINGS_STORE, []);
let lastSurvey = read("pfc-form.last", null);
const saveDraft = () => write(DRAFT_STORE, state);
const key = () => localStorage.getItem(KEY_STORE) ?? "";
const phases = () => buildings.find((b) => b.id === state.buildingId)?.system?.phases ?? 3;

// ---------- API ----------

async function api(method, url, body, extra = {}) {
  const headers = { authorization: `Bearer ${key()}`, ...extra };
  if (body !== undefined) headers["content-type"] = "application/json";
  const res = await fetch(url, { method, headers, ...(body !== undefined ? { body: typeof body === "string" ? body : JSON.stringify(body) } : {}) });
  const type = res.headers.get("content-type") ?? "";
  const data = type.includes("json") ? await res.json() : null;
  return { status: res.status, data };
}
const problemText = (r) => r.data?.detail ?? r.data?.title ?? `the service answered ${r.status}`;

// ---------- messages beside fields ----------

function setMsg(input, msgEl, text) {
  if (msgEl) msgEl.textContent = text;
  if (input) {
    if (text) input.setAttribute("aria-invalid", "true");
    else input.removeAttribute("aria-invalid");
  }
}
const topMsg = (id, text) => setMsg($(id), $(`${id}-msg`), text);
const loadMsg = (i, field, text) => {
  const li = $("loads").children[i];
  if (!li) return false;
  const input = li.querySelector(`[data-f="${field}"]`);
  const msg = li.querySelector(`[data-m="${field}"]`);
  if (!msg) return false;
  setMsg(input, msg, text);
  return true;
};

/** Show a 400's errors[] beside their fields: loads.2.measurement.pf → load 3's pf. Unplaced ones go under Submit. */
function showApiErrors(errors) {
  const rest = [];
  for (const e of errors ?? []) {
    const p = String(e.path ?? "").split(".");
    let placed = false;
    if (p[0] === "loads" && p.length >= 3) {
      const field = p[2] === "measurement" ? (p[3] ?? "method") : p[2];
      placed = loadMsg(Number(p[1]), field, e.message);
    } else if (p[0] === "loads" && p.length === 1) {
      $("loads-msg").textContent = e.message;
      placed = true;
    } else if (["targetPF", "surveyor", "surveyedAt"].includes(p[0])) {
      topMsg(p[0], e.message);
      placed = true;
    }
    if (!placed) rest.push(`${e.path ? `${e.path}: ` : ""}${e.message}`);
  }
  return rest;
}

// ---------- rendering ----------

function renderBuildings() {
  const sel = /** @type {HTMLSelectElement} */ ($("building"));
  sel.replaceChildren(new Option("— choose —", ""));
  for (const b of buildings) sel.append(new Option(b.name, b.id));
  sel.value = buildings.some((b) => b.id === state.buildingId) ? state.buildingId : "";
  const b = buildings.find((x) => x.id === state.buildingId);
  $("building-info").textContent = b ? `${b.system.voltageV} V, ${b.system.frequencyHz} Hz, ${b.system.phases}-phase` : "";
}

function readingField(i, load, f) {
  const wrap = document.createElement("div");
  wrap.className = "field";
  const label = document.createElement("label");
  label.textContent = LABELS[f];
  const id = `l${i}-${f}`;
  label.htmlFor = id;
  let input;
  if (f === "sense") {
    input = document.createElement("select");
    for (const s of ["lagging", "leading", "unity"]) input.append(new Option(s, s));
    input.value = load.values.sense ?? "lagging";
    load.values.sense = input.value;
  } else {
    input = document.createElement("input");
    input.type = "text";
    input.inputMode = "decimal";
    input.autocomplete = "off";
    input.value = load.values[f] ?? "";
  }
  input.id = id;
  input.dataset.f = f;
  input.dataset.reading = "1";
  const msg = document.createElement("p");
  msg.className = "msg";
  msg.dataset.m = f;
  wrap.append(label, input, msg);
  return wrap;
}

function renderLoads() {
  const list = $("loads");
  const tpl = /** @type {HTMLTemplateElement} */ ($("load-template"));
  list.replaceChildren();
  state.loads.forEach((load, i) => {
    const li = /** @type {HTMLElement} */ (tpl.content.firstElementChild.cloneNode(true));
    li.dataset.index = String(i);
    for (const el of li.querySelectorAll("[data-f]")) {
      const f = el.dataset.f;
      el.id = `l${i}-${f}`;
      el.previousElementSibling.htmlFor = el.id;
      el.value = load[f] ?? "";
    }
    li.querySelector('[data-role="readings"]').append(...METHODS[load.method].map((f) => readingField(i, load, f)));
    list.append(li);
  });
  updateFigures();
}

function updateFigures() {
  const ph = phases();
  const sum = { kW: 0, kvar: 0 };
  let complete = state.loads.length > 0;
  state.loads.forEach((load, i) => {
    const t = triangle(load, ph);
    const out = $("loads").children[i]?.querySelector('[data-role="figures"]');
    if (!t) complete = false;
    else {
      sum.kW += t.kW;
      sum.kvar += t.kvar;
    }
    if (out) {
      out.replaceChildren();
      if (!t) out.textContent = "– enter the readings –";
      else
        for (const [k, v, unit] of [["kW", f2(t.kW), "kW"], ["kvar", f2(t.kvar), "kvar"], ["kVA", f2(t.kVA), "kVA"], ["pf", f3(t.pf), "PF"]]) {
          const s = document.createElement("span");
          s.dataset.v = k;
          s.textContent = v;
          out.append(s, ` ${unit}`, k === "pf" ? "" : " · ");
        }
    }
  });
  const cells = { "t-kw": "–", "t-kvar": "–", "t-kva": "–", "t-pf": "–", "t-need": "–" };
  if (complete) {
    const kVA = Math.hypot(sum.kW, sum.kvar);
    const pf = kVA > 0 ? sum.kW / kVA : 1;
    cells["t-kw"] = f2(sum.kW);
    cells["t-kvar"] = f2(sum.kvar);
    cells["t-kva"] = f2(kVA);
    cells["t-pf"] = f3(pf);
    const target = num(state.targetPF);
    if (!check("targetPF", state.targetPF)) cells["t-need"] = f2(Math.max(0, sum.kvar - sum.kW * Math.tan(Math.acos(target))));
  }
  for (const [id, v] of Object.entries(cells)) $(id).textContent = v;
}

function renderPending() {
  const queue = read(QUEUE_STORE, []);
  $("pending-box").hidden = queue.length === 0;
  $("pending").replaceChildren(
    ...queue.map((e) => {
      const li = document.createElement("li");
      li.textContent = `${e.buildingName}: ${e.loadCount} load(s), queued ${new Date(e.queuedAt).toLocaleTimeString()}${e.note ? ` — ${e.note}` : ""}`;
      return li;
    }),
  );
}

function renderNet() {
  const el = $("net");
  el.textContent = navigator.onLine ? "Online" : "Offline";
  el.classList.toggle("offline", !navigator.onLine);
}

function showResult(survey) {
  lastSurvey = survey;
  write("pfc-form.last", survey);
  const r = survey.result;
  $("result-section").hidden = false;
  $("r-pf").textContent = `${f3(r.site.displacementPF)} (target ${r.correction.targetPF})`;
  $("r-kvar").textContent = `${f2(r.correction.kvarRequired)} kvar`;
  const bank = r.recommendedBank;
  $("r-bank").textContent = bank ? `${bank.arrangement.replaceAll("_", " ")}: ${f2(bank.nameplateKvar)} kvar nameplate` : "none needed";
  $("r-steps").replaceChildren(
    ...(bank?.physicalSteps ?? []).map((s, i) => {
      const li = document.createElement("li");
      li.textContent = `Step ${i + 1}: ${s.role}, ${s.nameplateKvar} kvar nameplate (${f2(s.effectiveKvar)} kvar effective)`;
      return li;
    }),
  );
  $("trend").hidden = true;
}

// ---------- the send queue ----------

let flushing = false;

/** Send every queued survey in order; network errors and 5xx/429 keep an entry, any other answer removes it. */
async function flush() {
  if (flushing) return;
  flushing = true;
  try {
    for (const entry of read(QUEUE_STORE, [])) {
      let r;
      try {
        const res = await fetch(`/v1/buildings/${encodeURIComponent(entry.buildingId)}/surveys`, {
          method: "POST",
          headers: { authorization: `Bearer ${key()}`, "content-type": "application/json", "idempotency-key": entry.idem },
          body: entry.body,
        });
        r = { status: res.status, data: (res.headers.get("content-type") ?? "").includes("json") ? await res.json() : null };
      } catch {
        setNote(entry.idem, "no network: it will be sent when the network returns");
        if (read(QUEUE_STORE, []).some((e) => e.current)) $("submit-msg").textContent = "No network: the survey is saved on this tablet and will be sent when the network returns.";
        break; // still offline: try the rest later
      }
      if (r.status === 201 || r.status === 200) {
        dropEntry(entry.idem);
        if (entry.current) $("submit-msg").textContent = "Sent and stored.";
        else $("submit-msg").textContent = `A queued survey of ${entry.buildingName} was sent.`;
        showResult(r.data);
      } else if (r.status >= 500 || r.status === 429 || r.status === 401) {
        setNote(entry.idem, `not sent yet: ${problemText(r)}`);
        break;
      } else {
        dropEntry(entry.idem);
        const rest = entry.current ? showApiErrors(r.data?.errors) : [];
        $("submit-msg").textContent = `Not accepted: ${entry.current ? (rest.length ? rest.join("; ") : "see the messages beside the fields") : `${entry.buildingName}: ${problemText(r)}`}`;
      }
    }
  } finally {
    flushing = false;
    renderPending();
  }
}
function setNote(idem, note) {
  write(QUEUE_STORE, read(QUEUE_STORE, []).map((e) => (e.idem === idem ? { ...e, note } : e)));
}
function dropEntry(idem) {
  write(QUEUE_STORE, read(QUEUE_STORE, []).filter((e) => e.idem !== idem));
}

// ---------- submit ----------

function surveyBody() {
  return {
    surveyedAt: state.surveyedAt,
    surveyor: state.surveyor.trim(),
    targetPF: num(state.targetPF),
    loads: state.loads.map((l) => {
      const measurement = { method: l.method };
      for (const f of METHODS[l.method]) measurement[f] = f === "sense" ? l.values.sense : num(l.values[f]);
      const q = num(l.quantity);
      return { label: l.label.trim(), kind: l.kind, ...(q !== null ? { quantity: q } : {}), measurement };
    }),
  };
}

/** Client-side checks; true when nothing is wrong. */
function validate() {
  let ok = true;
  for (const f of ["surveyor", "surveyedAt", "targetPF"]) {
    const m = check(f, state[f]);
    topMsg(f, m);
    if (m) ok = false;
  }
  if (!state.buildingId) {
    $("building-msg").textContent = "choose or create the building first";
    ok = false;
  } else $("building-msg").textContent = "";
  $("loads-msg").textContent = state.loads.length ? "" : "at least one load is needed";
  if (!state.loads.length) ok = false;
  state.loads.forEach((l, i) => {
    for (const f of ["label", "quantity", ...METHODS[l.method]]) {
      const m = f === "sense" ? "" : check(f, f === "label" || f === "quantity" ? l[f] : l.values[f]);
      loadMsg(i, f, m);
      if (m) ok = false;
    }
  });
  return ok;
}

async function submit() {
  $("submit-msg").textContent = "";
  if (!key()) {
    $("submit-msg").textContent = "enter the API key first";
    return;
  }
  if (!validate()) {
    $("submit-msg").textContent = "Please correct the fields marked in red.";
    return;
  }
  const body = surveyBody();
  const queue = read(QUEUE_STORE, []).map((e) => ({ ...e, current: false }));
  queue.push({
    idem: crypto.randomUUID(),
    buildingId: state.buildingId,
    buildingName: buildings.find((b) => b.id === state.buildingId)?.name ?? state.buildingId,
    loadCount: body.loads.length,
    body: JSON.stringify(body),
    queuedAt: new Date().toISOString(),
    current: true,
  });
  write(QUEUE_STORE, queue);
  renderPending();
  await flush();
}

// ---------- buildings ----------

async function loadBuildings() {
  if (!key()) return;
  try {
    const r = await api("GET", "/v1/buildings?limit=100");
    if (r.status !== 200) {
      $("key-state").textContent = r.status === 401 ? "The key was not accepted." : problemText(r);
      return;
    }
    buildings = r.data.items;
    write(BUILDINGS_STORE, buildings);
    $("key-state").textContent = "Key accepted.";
  } catch {
    $("key-state").textContent = "No network: showing the buildings saved on this tablet.";
  }
  renderBuildings();
  updateFigures();
}

async function createBuilding() {
  const name = /** @type {HTMLInputElement} */ ($("nb-name")).value.trim();
  const volts = /** @type {HTMLInputElement} */ ($("nb-volts")).value;
  const nameMsg = name ? "" : "name must not be empty";
  const voltsMsg = check("volts", volts).replace(/^volts/, "voltageV");
  setMsg($("nb-name"), $("nb-name-msg"), nameMsg);
  setMsg($("nb-volts"), $("nb-volts-msg"), voltsMsg);
  if (nameMsg || voltsMsg) return;
  const body = {
    name,
    system: { voltageV: num(volts), frequencyHz: Number(/** @type {HTMLSelectElement} */ ($("nb-hz")).value), phases: Number(/** @type {HTMLSelectElement} */ ($("nb-phases")).value) },
  };
  try {
    const r = await api("POST", "/v1/buildings", body, { "idempotency-key": crypto.randomUUID() });
    if (r.status !== 201) {
      $("building-msg").textContent = (r.data?.errors ?? []).map((e) => e.message).join("; ") || problemText(r);
      return;
    }
    buildings = [...buildings.filter((b) => b.id !== r.data.id), r.data];
    write(BUILDINGS_STORE, buildings);
    state.buildingId = r.data.id;
    saveDraft();
    $("building-msg").textContent = "";
    /** @type {HTMLDetailsElement} */ ($("new-building")).open = false;
    renderBuildings();
    updateFigures();
  } catch {
    $("building-msg").textContent = "No network: a building can only be created online.";
  }
}

// ---------- report and trend ----------

async function saveFile(url, name) {
  try {
    const res = await fetch(url, { headers: { authorization: `Bearer ${key()}` } });
    if (!res.ok) {
      $("submit-msg").textContent = `The report could not be fetched (${res.status}).`;
      return;
    }
    const a = /** @type {HTMLAnchorElement} */ ($("r-download"));
    a.href = URL.createObjectURL(await res.blob());
    a.download = name;
    a.click();
    setTimeout(() => URL.revokeObjectURL(a.href), 60_000);
  } catch {
    $("submit-msg").textContent = "No network: the report can be saved once the network returns.";
  }
}

async function showTrend() {
  if (!lastSurvey) return;
  try {
    const r = await api("GET", `/v1/buildings/${encodeURIComponent(lastSurvey.buildingId)}/trend`);
    if (r.status !== 200) return;
    const body = $("trend").querySelector("tbody");
    body.replaceChildren(
      ...r.data.items.map((p) => {
        const tr = document.createElement("tr");
        for (const v of [p.surveyedAt.slice(0, 10), f2(p.kW), f2(p.kvar), f3(p.displacementPF), f2(p.kvarRequired)]) {
          const td = document.createElement("td");
          td.textContent = v;
          tr.append(td);
        }
        return tr;
      }),
    );
    $("trend").hidden = false;
  } catch {
    $("submit-msg").textContent = "No network: the trend can be shown once the network returns.";
  }
}

// ---------- wiring ----------

function onLoadsInput(ev) {
  const el = /** @type {HTMLInputElement} */ (ev.target);
  const li = el.closest("li.load");
  if (!li || !el.dataset.f) return;
  const load = state.loads[Number(li.dataset.index)];
  const f = el.dataset.f;
  if (el.dataset.reading) load.values[f] = el.value;
  else load[f] = el.value;
  // A message already shown is rechecked as the field changes.
  const msg = li.querySelector(`[data-m="${f}"]`);
  if (msg?.textContent) setMsg(el, msg, check(f, el.value));
  saveDraft();
  if (f === "method") renderLoads();
  else updateFigures();
}

function start() {
  /** @type {HTMLInputElement} */ ($("api-key")).value = key();
  $("key-state").textContent = key() ? "A key is saved on this tablet." : "No key saved yet.";
  for (const f of ["surveyor", "surveyedAt", "targetPF"]) {
    const el = /** @type {HTMLInputElement} */ ($(f));
    el.value = state[f] ?? "";
    el.addEventListener("input", () => {
      state[f] = el.value;
      if ($(`${f}-msg`).textContent) topMsg(f, check(f, el.value));
      saveDraft();
      updateFigures();
    });
  }
  $("key-save").addEventListener("click", () => {
    const k = /** @type {HTMLInputElement} */ ($("api-key")).value.trim();
    setMsg($("api-key"), $("api-key-msg"), k ? "" : "enter the API key");
    if (!k) return;
    localStorage.setItem(KEY_STORE, k);
    void loadBuildings();
  });
  $("key-forget").addEventListener("click", () => {
    localStorage.removeItem(KEY_STORE);
    /** @type {HTMLInputElement} */ ($("api-key")).value = "";
    $("key-state").textContent = "No key saved.";
  });
  $("building").addEventListener("change", (ev) => {
    state.buildingId = /** @type {HTMLSelectElement} */ (ev.target).value;
    $("building-msg").textContent = "";
    saveDraft();
    renderBuildings();
    updateFigures();
  });
  $("nb-create").addEventListener("click", () => void createBuilding());
  $("loads").addEventListener("input", onLoadsInput);
  $("loads").addEventListener("change", onLoadsInput);
  $("loads").addEventListener("click", (ev) => {
    const btn = /** @type {HTMLElement} */ (ev.target).closest('[data-role="remove"]');
    if (!btn) return;
    state.loads.splice(Number(btn.closest("li.load").dataset.index), 1);
    saveDraft();
    renderLoads();
  });
  $("add-load").addEventListener("click", () => {
    state.loads.push(newLoad());
    saveDraft();
    renderLoads();
    /** @type {HTMLInputElement} */ ($("loads").lastElementChild?.querySelector('[data-f="label"]'))?.focus();
  });
  $("submit").addEventListener("click", () => void submit());
  $("clear").addEventListener("click", () => {
    state = { buildingId: state.buildingId, surveyor: state.surveyor, surveyedAt: today(), targetPF: "0.95", loads: [newLoad()] };
    saveDraft();
    $("surveyedAt").value = state.surveyedAt;
    $("targetPF").value = state.targetPF;
    renderLoads();
  });
  $("send-now").addEventListener("click", () => void flush());
  $("r-report").addEventListener("click", () => lastSurvey && void saveFile(`/v1/surveys/${lastSurvey.id}/report`, `survey-${lastSurvey.id}.html`));
  $("r-pdf").addEventListener("click", () => lastSurvey && void saveFile(`/v1/surveys/${lastSurvey.id}/report.pdf`, `survey-${lastSurvey.id}.pdf`));
  $("r-trend").addEventListener("click", () => void showTrend());
  window.addEventListener("online", () => {
    renderNet();
    void flush();
  });
  window.addEventListener("offline", renderNet);
  setInterval(() => {
    if (read(QUEUE_STORE, []).length) void flush();
  }, RETRY_MS);

  renderNet();
  renderBuildings();
  renderLoads();
  renderPending();
  if (lastSurvey) showResult(lastSurvey);
  document.body.dataset.ready = "1";
  void loadBuildings().then(() => flush());
}

start();
