// The survey page's entry point: plain ES modules, no build step. Wires the parts together; each module says
// what it owns (files.json lists them all).

import { onBankClick, onBankEdit, renderBankReadings } from "./bank-readings.js";
import { apiKey, onReachability, probe, problemText, setApiKey } from "./api.js";
import {
  buildingById,
  createBuilding,
  describeBuilding,
  endChange,
  loadBuildings,
  onNewBuildingEdit,
  renderBuildings,
  renderNewBuilding,
  saveChange,
  startChange,
} from "./building.js";
import { $, placeErrors, say, setMsg } from "./dom.js";
import { changed, freshDraft, loadDraft, newKey, saveDraft } from "./drafts.js";
import { enqueue, flush, readQueue, sending } from "./queue.js";
import { lastSurvey, saveReport, showResult, showTrend } from "./result.js";
import { renderOfflineNote, renderQueue, renderReach } from "./status.js";
import { addLoad, checkSurvey, onSurveyEdit, removeLoad, renderSurvey, state, surveyBody, updateFigures } from "./survey.js";

const RETRY_MS = 10_000;
const PROBE_MS = 15_000;

state.draft = loadDraft();
state.building = () => buildingById(state.draft.buildingId);
state.system = () => state.building()?.system ?? null;
let submitting = false;

/** Submit is off while a survey is on its way: a second tap cannot send it twice. */
function refreshSubmit() {
  $("submit").toggleAttribute("disabled", submitting || sending());
  $("send-now").toggleAttribute("disabled", sending());
}

// ---------- sending ----------

const isCurrent = (entry) => entry.idem === state.draft.idem;

const outcomes = {
  stored(entry, body) {
    if (isCurrent(entry)) {
      // Stored under the draft's key. Changed since it was queued? Then what is on screen is a new survey.
      if (JSON.stringify(surveyBody()) === entry.body) state.draft.storedAs = body.id;
      else state.draft.idem = newKey();
      saveDraft(state.draft);
      say("submit-msg", "Sent and stored.", "ok");
    } else say("submit-msg", `A waiting survey of ${entry.buildingName} was sent and stored.`, "ok");
    showResult(body);
  },
  rejected(entry, answer) {
    if (!isCurrent(entry)) {
      say("submit-msg", `Not accepted: ${entry.buildingName}: ${problemText(answer)}`, "error");
      return;
    }
    if (String(answer.data?.type ?? "").endsWith("idempotency-key-reused")) {
      state.draft.idem = newKey();
      saveDraft(state.draft);
      say(
        "submit-msg",
        "An earlier version of this survey was stored before your last change (its answer was lost). Submit again to store this version as another survey.",
        "error",
      );
      return;
    }
    const rest = placeErrors(answer.data?.errors, $("survey-section"));
    say("submit-msg", `Not accepted: ${rest.length ? rest.join("; ") : "see the messages beside the fields"}`, "error");
  },
  waiting(entry, text) {
    if (isCurrent(entry)) say("submit-msg", `Not sent yet: ${text}. The survey is kept on this tablet and sent when the service answers.`, "warn");
  },
  settled() {
    renderQueue(readQueue());
    refreshSubmit();
  },
};

function sendQueue() {
  const round = flush(outcomes);
  refreshSubmit();
  return round;
}

async function submit() {
  if (submitting || sending()) return;
  submitting = true;
  refreshSubmit();
  try {
    say("submit-msg", "");
    if (!apiKey()) return say("submit-msg", "Enter the API key first.", "error");
    if (!state.draft.buildingId) {
      $("building-msg").textContent = "choose or create the building first";
      return say("submit-msg", "Choose the building first.", "error");
    }
    $("building-msg").textContent = "";
    if (state.draft.storedAs)
      return say(
        "submit-msg",
        "This survey is already stored. Change a reading to send a new version, or clear the form for the next survey.",
        "info",
      );
    if (!checkSurvey()) return say("submit-msg", "Please correct the fields marked in red.", "error");
    const body = surveyBody();
    const waiting = readQueue().find((e) => e.idem === state.draft.idem);
    enqueue({
      idem: state.draft.idem,
      buildingId: state.draft.buildingId,
      buildingName: buildingById(state.draft.buildingId)?.name ?? state.draft.buildingId,
      loadCount: body.loads.length,
      body: JSON.stringify(body),
      queuedAt: waiting?.queuedAt ?? new Date().toISOString(),
    });
    renderQueue(readQueue());
    say("submit-msg", "Sending…", "info");
    await sendQueue();
  } finally {
    submitting = false;
    refreshSubmit();
  }
}

// ---------- wiring ----------

function selectBuilding(id) {
  const other = id !== state.draft.buildingId;
  state.draft.buildingId = id;
  if (other) {
    state.draft.bankReadings = {}; // another building's banks: readings of the last one's mean nothing here
    changed(state.draft); // another building: a stored draft becomes a new survey
  } else saveDraft(state.draft);
  renderBuildings(id);
  renderBankReadings();
  updateFigures();
}

async function refreshBuildings() {
  if (!apiKey()) return;
  const line = await loadBuildings();
  $("key-state").textContent = line;
  renderBuildings(state.draft.buildingId);
  renderBankReadings();
  updateFigures();
}

function wire() {
  $("key-save").addEventListener("click", () => {
    const k = /** @type {HTMLInputElement} */ ($("api-key")).value.trim();
    setMsg($("api-key"), k ? "" : "enter the API key");
    if (!k) return;
    setApiKey(k);
    void refreshBuildings().then(() => readQueue().length && sendQueue());
  });
  $("key-forget").addEventListener("click", () => {
    setApiKey("");
    /** @type {HTMLInputElement} */ ($("api-key")).value = "";
    $("key-state").textContent = "No key saved.";
  });
  $("building").addEventListener("change", (ev) => {
    $("building-msg").textContent = "";
    selectBuilding(/** @type {HTMLSelectElement} */ (ev.target).value);
  });
  for (const type of ["input", "change"]) {
    $("nb-fields").addEventListener(type, (ev) => onNewBuildingEdit(ev, state.openFolds));
    $("survey-section").addEventListener(type, onSurveyEdit);
    $("bank-readings").addEventListener(type, onBankEdit);
  }
  $("bank-readings").addEventListener("click", onBankClick);
  $("nb-create").addEventListener("click", async () => {
    const id = $("nb-cancel").hidden ? await createBuilding() : await saveChange();
    if (!id) return;
    /** @type {HTMLDetailsElement} */ ($("new-building")).open = false;
    renderNewBuilding(state.openFolds);
    selectBuilding(id);
  });
  $("building-change").addEventListener("click", () => {
    startChange(state.draft.buildingId);
    renderNewBuilding(state.openFolds);
    const fold = /** @type {HTMLDetailsElement} */ ($("new-building"));
    fold.open = true;
    fold.scrollIntoView({ block: "start" });
    $("nb-name")?.focus();
  });
  $("nb-cancel").addEventListener("click", () => {
    endChange();
    say("nb-msg", "");
    /** @type {HTMLDetailsElement} */ ($("new-building")).open = false;
    renderNewBuilding(state.openFolds);
  });
  $("loads").addEventListener("click", (ev) => {
    const btn = /** @type {HTMLElement} */ (ev.target).closest('[data-role="remove"]');
    if (btn) removeLoad(Number(btn.closest("li.load").dataset.index));
  });
  $("add-load").addEventListener("click", addLoad);
  $("submit").addEventListener("click", () => void submit());
  $("send-now").addEventListener("click", () => void sendQueue());
  // Clearing asks first, and a cleared draft is a new survey with a new key; what waits in the queue stays.
  $("clear").addEventListener("click", () => {
    $("clear-confirm").hidden = false;
    $("clear-no").focus();
  });
  $("clear-no").addEventListener("click", () => ($("clear-confirm").hidden = true));
  $("clear-yes").addEventListener("click", () => {
    state.draft = freshDraft(state.draft);
    saveDraft(state.draft);
    $("clear-confirm").hidden = true;
    say("submit-msg", "");
    renderSurvey();
  });
  $("r-report").addEventListener("click", () => void saveReport(false));
  $("r-pdf").addEventListener("click", () => void saveReport(true));
  $("r-trend").addEventListener("click", () => void showTrend());
}

/** Reachability: every request reports it; a probe fills the quiet times; coming back sends what waits. */
function watchService() {
  let last = "unknown";
  onReachability((reach) => {
    renderReach(reach);
    if (reach.state === "up" && last !== "up" && readQueue().length && !sending()) void sendQueue();
    last = reach.state;
  });
  const check = () => void probe();
  setInterval(check, PROBE_MS);
  setInterval(() => readQueue().length && !sending() && void sendQueue(), RETRY_MS);
  window.addEventListener("online", check);
  window.addEventListener("offline", check);
  check();
}

function offlineReady() {
  if (!("serviceWorker" in navigator)) return renderOfflineNote("insecure");
  navigator.serviceWorker.register("/sw.js").then(
    () => renderOfflineNote(""),
    () => renderOfflineNote("failed"),
  );
}

function start() {
  /** @type {HTMLInputElement} */ ($("api-key")).value = apiKey();
  $("key-state").textContent = apiKey() ? "A key is saved on this tablet." : "No key saved yet.";
  wire();
  renderNewBuilding(state.openFolds);
  renderBuildings(state.draft.buildingId);
  $("building-info").textContent = describeBuilding(buildingById(state.draft.buildingId));
  renderSurvey();
  renderQueue(readQueue());
  if (lastSurvey) showResult(lastSurvey);
  refreshSubmit();
  watchService();
  offlineReady();
  document.body.dataset.ready = "1";
  void refreshBuildings().then(() => readQueue().length && sendQueue());
}

start();
