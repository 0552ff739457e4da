// The recommendation after a survey is stored: the verdict in a line, then page 1 of the report — what to install,
// what to repair first, the PF and kVA after, cost, saving, payback, the risks — in the report's own words, fetched
// from the service (GET /v1/surveys/{id}/verdict, the same code as the report) and kept with the last survey for
// offline viewing; and the bank's steps, from the stored result (src/http/schemas/results.ts); reports and the trend.

import { call } from "./api.js";
import { $, el, say } from "./dom.js";
import { readJson, writeJson } from "./drafts.js";

const LAST_STORE = "pfc-form.last";
const f2 = (x) => x.toFixed(2);
const f3 = (x) => x.toFixed(3);
const plural = (n, word) => `${n} ${word}${n === 1 ? "" : "s"}`;

export let lastSurvey = readJson(LAST_STORE, null);

export function detunedText(bank) {
  if (!bank) return "–";
  if (!(bank.reactorPct > 0)) return "No: plain capacitors";
  const tuned = bank.tuningOrder ? `, tuned to ${bank.tuningOrder.toFixed(2)} × fundamental (${Math.round(bank.tuningHz)} Hz)` : "";
  return `Yes: ${bank.reactorPct} % reactor${tuned}`;
}

const lines = (id, items) =>
  $(id).replaceChildren(...(items.length > 1 ? [el("ul", { class: "result-list" }, ...items.map((t) => el("li", {}, t)))] : items));

/** Page 1's lines as the service words them; without them (no network yet), a line saying where they will be. */
function showVerdict(v, eco) {
  const missing = "– (shown once the service answers; the report has it)";
  lines("r-install", v ? (v.install.length ? v.install : [v.instead ?? "nothing"]) : [missing]);
  const repair = v?.repairFirst.join(" ") ?? "";
  $("r-repair-dt").hidden = $("r-repair").hidden = !repair;
  $("r-repair").textContent = repair;
  $("r-after").textContent = v ? v.after : missing;
  lines("r-risks", v ? (v.risks.length ? v.risks : ["none that matter"]) : [missing]);
  const m = v?.money;
  $("r-cost").textContent = m?.cost ?? (eco ? "– (give the building costs per kvar)" : "– (give the building a tariff and costs)");
  $("r-saving").textContent = m?.savingPerYear ?? "–";
  $("r-payback").textContent = m?.payback ?? "–";
}

/** Fetch the stored survey's verdict and keep it with the last survey; shown if that survey is still the one on screen. */
async function fetchVerdict(survey) {
  const r = await call("GET", `/v1/surveys/${encodeURIComponent(survey.id)}/verdict`);
  if (r.status !== 200 || lastSurvey?.id !== survey.id) return;
  lastSurvey = { ...lastSurvey, verdict: r.data };
  writeJson(LAST_STORE, lastSurvey);
  showVerdict(r.data, survey.result.economics);
}

/** Show a stored survey's result: { id, buildingId, result }, with its verdict when it was fetched already. */
export function showResult(survey) {
  lastSurvey = survey;
  writeJson(LAST_STORE, survey);
  const r = survey.result;
  const bank = r.recommendedBank;
  const eco = r.economics;
  $("result-section").hidden = false;
  $("r-pf").textContent = `${f3(r.site.displacementPF)} ${r.site.sense} (target ${r.correction.targetPF})`;
  $("r-kvar").textContent = `${f2(r.correction.kvarRequired)} kvar`;
  $("r-detuned").textContent = detunedText(bank);
  showVerdict(survey.verdict ?? null, eco);
  if (!survey.verdict) void fetchVerdict(survey);
  $("r-warnings").textContent = r.warnings.length ? `${r.warnings.length}: see the report` : "none";
  const repairs = r.correction.repairFirst ?? [];
  $("r-verdict").textContent = bank
    ? `${repairs.length ? `Repair ${plural(repairs.length, "installed step")} first, then add ` : ""}${f2(bank.nameplateKvar)} kvar, ${plural(bank.physicalSteps.length, "step")}, ${bank.reactorPct > 0 ? "detuned" : "not detuned"}${eco?.simplePaybackYears != null ? `, pays back in ${eco.simplePaybackYears.toFixed(1)} years` : ""}.`
    : repairs.length
      ? `Repair ${plural(repairs.length, "installed step")}: no new bank.`
      : "No new bank.";
  $("r-steps").replaceChildren(
    ...(bank?.physicalSteps ?? []).map((s, i) =>
      el("li", {}, `Step ${i + 1}: ${s.role}, ${s.nameplateKvar} kvar nameplate (${f2(s.effectiveKvar)} kvar effective)`),
    ),
  );
  $("trend").hidden = true;
  say("r-msg", "");
}

/** Fetch a report with the key and hand it to the browser as a download. */
export async function saveReport(pdf) {
  if (!lastSurvey) return;
  const url = `/v1/surveys/${encodeURIComponent(lastSurvey.id)}/report${pdf ? ".pdf" : ""}`;
  const r = await call("GET", url, { as: "blob" });
  if (r.status !== 200) {
    say(
      "r-msg",
      r.status === 0 ? "No network to the service: the report can be saved once it answers." : `The report could not be fetched (${r.status}).`,
      "error",
    );
    return;
  }
  const a = /** @type {HTMLAnchorElement} */ ($("r-download"));
  a.href = URL.createObjectURL(r.data);
  a.download = `survey-${lastSurvey.id}.${pdf ? "pdf" : "html"}`;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 60_000);
  say("r-msg", `Saved ${a.download}.`, "ok");
}

export async function showTrend() {
  if (!lastSurvey) return;
  const r = await call("GET", `/v1/buildings/${encodeURIComponent(lastSurvey.buildingId)}/trend`);
  if (r.status !== 200) {
    say(
      "r-msg",
      r.status === 0 ? "No network to the service: the trend can be shown once it answers." : `The trend could not be fetched (${r.status}).`,
      "error",
    );
    return;
  }
  $("trend")
    .querySelector("tbody")
    .replaceChildren(
      ...r.data.items.map((p) =>
        el("tr", {}, ...[p.surveyedAt.slice(0, 10), f2(p.kW), f2(p.kvar), f3(p.displacementPF), f2(p.kvarRequired)].map((v) => el("td", {}, v))),
      ),
    );
  $("trend").hidden = false;
}
