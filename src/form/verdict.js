// Page 1's verdict, in the report's words, from a stored result (src/http/schemas/results.ts): what to install and
// where, what to repair first, the PF and kVA after, the money and the one or two risks that matter. The report
// (src/report/sections/verdict.ts) is the record; this reproduces its lines simply, reading every figure from the
// result and computing nothing anew (the kVA after a leading relief is √(kW² + kvar²), as there).

const f1 = (x) => (x == null ? "n/a" : x.toFixed(1));
const f3 = (x) => (x == null ? "n/a" : x.toFixed(3));
const plural = (n, word) => `${n} ${word}${n === 1 ? "" : "s"}`;

/** "3 × 50.0 kvar", or "50.0 + 25.0 kvar" when the steps differ. */
export function stepsText(kvars) {
  if (kvars.length === 0) return "none";
  return kvars.every((k) => k === kvars[0]) ? `${kvars.length} × ${f1(kvars[0])} kvar` : `${kvars.map(f1).join(" + ")} kvar`;
}

const ordinal = (n) =>
  `${n}${n % 10 === 1 && n % 100 !== 11 ? "st" : n % 10 === 2 && n % 100 !== 12 ? "nd" : n % 10 === 3 && n % 100 !== 13 ? "rd" : "th"}`;

export const detunedProposalOf = (r) => r.harmonics?.proposals?.find((p) => p.forBank === "recommended") ?? null;

function installLines(r) {
  const lines = [];
  const rec = r.recommendedBank;
  const detuned = detunedProposalOf(r);
  if (rec) {
    const kind = rec.arrangement === "fixed" ? "fixed bank" : "automatic bank";
    const buy = detuned?.purchaseSteps ?? [];
    if (detuned && buy.length) {
      const delivered = buy.reduce((s, x) => s + x.effectiveKvar, 0);
      lines.push(
        `Central ${kind} of ${f1(delivered)} kvar at the service, detuned with ${detuned.design.reactorPct.toFixed(2)} % reactors (tuned to ${detuned.design.tuningOrder.toFixed(2)}) as the harmonic study requires: capacitors rated ${detuned.design.ratedVoltageV} V of ${stepsText(buy.map((s) => s.nameplateKvar))} nameplate.`,
      );
    } else {
      const switched = (rec.physicalSteps ?? []).filter((s) => s.role !== "fixed");
      const parts = [
        rec.fixedKvar > 0 ? `fixed ${f1(rec.fixedKvar)} kvar` : null,
        switched.length ? `switched ${stepsText(switched.map((s) => s.effectiveKvar))}` : null,
      ].filter(Boolean);
      const tuning = rec.reactorPct > 0 ? `, detuned with ${rec.reactorPct.toFixed(2)} % reactors` : ", plain (no reactors)";
      lines.push(`Central ${kind} of ${f1(rec.fixedKvar + rec.switchedKvar)} kvar at the service: ${parts.join(" + ")}${tuning}.`);
    }
  }
  for (const loc of r.placement?.locations ?? []) {
    if (loc.location === "terminal") lines.push(`Motor-terminal capacitors, ${f1(loc.kvar)} kvar in all, on ${loc.loads.join(", ")}.`);
    else if (loc.location.startsWith("group:"))
      lines.push(`Group bank of ${f1(loc.kvar)} kvar at ${loc.location.slice(6)} (${loc.loads.join(", ")}).`);
  }
  return lines;
}

/** The line when nothing is to be bought. */
function insteadText(r) {
  const c = r.correction;
  const relief = c.leadingRelief;
  if (c.leadingExcessKvar > 0 && relief?.takeOutOfService.length) {
    const steps = relief.takeOutOfService
      .map((s) => `${s.bank} step ${s.step} (${f1(s.kvar)} kvar${s.control === "fixed" ? ", a fixed unit: disconnect it" : ""})`)
      .join(", ");
    return `No bank is recommended: the site leads; take ${steps} out of service (${f1(relief.kvarRemoved)} kvar), giving PF ${f3(relief.pfAfter)} ${relief.senseAfter}.`;
  }
  if (c.leadingExcessKvar > 0)
    return `No bank is recommended: the site leads, and about ${f1(c.leadingExcessKvar)} kvar of capacitors should be taken out of service instead.`;
  if (c.kvarAdditional !== undefined && c.kvarAdditional <= 0 && c.kvarRequired > 0)
    return "No new bank is needed: the installed banks, once repaired and fully used, cover the need.";
  if (c.kvarRequired <= 0) return "No bank is recommended: the site needs no capacitors to reach the target at the surveyed load.";
  return `No central bank is recommended: the ${f1(c.kvarRequired)} kvar needed is below the smallest standard unit or the design could not be made from the readings.`;
}

/** What to repair before anything new is bought, with what it restores; null without installed banks. */
function repairText(r) {
  const c = r.correction;
  if (!r.installedBanks || c.kvarAdditional === undefined) return null;
  const repairs = c.repairFirst ?? [];
  const then = c.kvarAdditional > 0 ? `then ${f1(c.kvarAdditional)} kvar of new capacitors` : "then nothing new is needed";
  if (repairs.length === 0) {
    const measured = r.installedBanks.some((b) => b.steps.some((s) => s.status !== "not_measured"));
    return `${measured ? "No measured step is failed or degraded" : "No step currents were measured"}; installed ${f1(c.kvarInstalledRated)} kvar credited, ${then}.`;
  }
  const list = repairs.map((x) => `${x.bank} step ${x.step} (${x.status}, ${f1(x.restoresKvar)} kvar)`).join(", ");
  return `${list} — ${f1(c.kvarRestoredByRepair)} kvar restored before anything new is bought; ${then}.`;
}

function afterText(r) {
  const c = r.correction;
  const before = `PF ${f3(r.site.displacementPF)} ${r.site.sense}, ${f1(c.kVABefore)} kVA`;
  const relief = c.action === "remove" ? c.leadingRelief : undefined;
  if (c.action === "none") return `Stays at ${before}: the target PF ${f3(c.targetPF)} is already met.`;
  if (relief?.takeOutOfService.length) {
    const kVA = Math.hypot(r.site.kW, relief.kvarAfter);
    return `PF ${f3(relief.pfAfter)} ${relief.senseAfter} and ${f1(kVA)} kVA with those steps out, from ${before} (${f1(c.kVABefore - kVA)} kVA released).`;
  }
  return `PF ${f3(c.pfAfter)} ${c.pfAfterSense ?? "lagging"} and ${f1(c.kVAAfter)} kVA, from ${before} (${f1(c.kVAReleased)} kVA released).`;
}

function risksOf(r) {
  const risks = [];
  const rec = r.recommendedBank;
  const near = rec?.stages?.filter((s) => s.nearHarmonic !== null) ?? [];
  const detuned = detunedProposalOf(r);
  if (near.length) {
    const orders = [...new Set(near.map((s) => s.nearHarmonic))].sort((a, b) => a - b);
    const which = near.length === rec.stages.length ? "every stage" : `${near.length} of ${rec.stages.length} stages`;
    risks.push(
      `Resonance: ${which} of a plain bank would resonate near the ${orders.map(ordinal).join(" and ")} harmonic the site makes${detuned ? " — hence the detuned design" : ""}.`,
    );
  } else if (detuned)
    risks.push(
      `Harmonics: the plain bank fails the harmonic study (${detuned.triggeredBy.join(", ").replace(/_/g, " ")}) — hence the detuned design.`,
    );
  const failing = (r.correction.repairFirst ?? []).filter((x) => x.status === "failed" || x.status === "degraded");
  if (failing.length)
    risks.push(`Failing bank: ${failing.map((x) => `${x.bank} step ${x.step} (${x.status})`).join(", ")} — repair before buying new capacitors.`);
  if (r.correction.action === "remove")
    risks.push(
      `Leading operation: the site leads now (PF ${f3(r.site.displacementPF)}); leading PF raises the voltage and can upset generators and motor controls.`,
    );
  else if (r.warnings.some((w) => w.code === "light_load_unknown") && rec && rec.fixedKvar > 0)
    risks.push(
      "Leading at light load: no light-load reading was given, so the fixed part is held small; take a night or weekend reading before ordering.",
    );
  return risks.slice(0, 2);
}

/** The verdict's parts: install lines (or the line instead), repair, after, risks; money is the page's to format. */
export function verdictOf(r) {
  const install = installLines(r);
  return { install: install.length ? install : [insteadText(r)], repair: repairText(r), after: afterText(r), risks: risksOf(r) };
}

export const stepCount = (bank) => plural(bank.physicalSteps.length, "step");
