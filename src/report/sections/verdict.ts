/**
 * Page 1: the recommendation in the few lines a facility manager signs — what to install and where, what to repair
 * first, the PF and kVA after, the cost, the saving and the payback, and the one or two risks that matter. Every
 * figure is read from the result it summarises; nothing here is computed anew.
 */
import type { SizingResult } from "../../core/pipeline/size.js";
import { fmt } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";
import { noBankText, stepsText } from "./bank.js";
import { installedVerdict } from "./installed.js";

export interface Verdict {
  /** What to install, one line per place (central, group, motor terminals); empty when nothing is to be bought. */
  install: string[];
  /** The line when nothing is installed: no need, or the leading excess to take out of service. */
  instead: string | null;
  repairFirst: string[];
  after: string;
  money: { cost: string | null; savingPerYear: string | null; payback: string | null } | null;
  risks: string[];
}

/** The detuned proposal the harmonic study made for the recommended bank, if any. */
export function detunedProposalOf(result: SizingResult) {
  return result.harmonics?.proposals.find((p) => p.forBank === "recommended") ?? null;
}

export function verdictOf(result: SizingResult): Verdict {
  const install: string[] = [];
  const rec = result.recommendedBank;
  const detuned = detunedProposalOf(result);
  if (rec) {
    const total = rec.fixedKvar + rec.switchedKvar;
    const switched = (rec.physicalSteps ?? []).filter((s) => s.role !== "fixed");
    const parts = [
      rec.fixedKvar > 0 ? `fixed ${fmt.power(rec.fixedKvar)} kvar` : null,
      switched.length > 0 ? `switched ${stepsText(switched.map((s) => ({ kvar: s.effectiveKvar })))}` : null,
    ].filter(Boolean);
    const kind = rec.arrangement === "fixed" ? "fixed bank" : "automatic bank";
    const buy = detuned?.purchaseSteps;
    if (detuned && buy && buy.length > 0) {
      const fixed = rec.fixedKvar > 0 ? buy[0] : undefined;
      const switchedBuy = rec.fixedKvar > 0 ? buy.slice(1) : buy;
      const delivered = buy.reduce((s, x) => s + x.effectiveKvar, 0);
      const deliveredParts = [
        fixed ? `fixed ${fmt.power(fixed.effectiveKvar)} kvar` : null,
        switchedBuy.length > 0 ? `switched ${stepsText(switchedBuy.map((s) => ({ kvar: s.effectiveKvar })))}` : null,
      ].filter(Boolean);
      install.push(
        `Central ${kind} of ${fmt.power(delivered)} kvar at the service, detuned with ${fmt.num(detuned.design.reactorPct, 2)} % reactors (tuned to ${fmt.order(detuned.design.tuningOrder)}) as the harmonic study requires: ${deliveredParts.join(" + ")} delivered, from capacitors rated ${fmt.volts(detuned.design.ratedVoltageV)} V of ${stepsText(buy.map((s) => ({ kvar: s.nameplateKvar })))} nameplate.`,
      );
    }
    const tuning = detuned
      ? `, detuned with ${fmt.num(detuned.design.reactorPct, 2)} % reactors (tuned to ${fmt.order(detuned.design.tuningOrder)}, capacitors rated ${fmt.volts(detuned.design.ratedVoltageV)} V) as the harmonic study requires`
      : rec.reactorPct > 0
        ? `, detuned with ${fmt.num(rec.reactorPct, 2)} % reactors`
        : ", plain (no reactors)";
    if (install.length === 0) install.push(`Central ${kind} of ${fmt.power(total)} kvar at the service: ${parts.join(" + ")}${tuning}.`);
  }
  for (const loc of result.placement?.locations ?? []) {
    if (loc.location === "terminal") install.push(`Motor-terminal capacitors, ${fmt.power(loc.kvar)} kvar in all, on ${loc.loads.join(", ")}.`);
    else if (loc.location.startsWith("group:"))
      install.push(`Group bank of ${fmt.power(loc.kvar)} kvar at ${loc.location.slice(6)} (${loc.loads.join(", ")}).`);
  }
  const c = result.correction;
  const instead = install.length > 0 ? null : noBankText(result);
  const before = `PF ${fmt.pf(result.site.displacementPF)} ${result.site.sense}, ${fmt.power(c.kVABefore)} kVA`;
  const relief = c.action === "remove" ? c.leadingRelief : undefined;
  const reliefKVA = relief ? Math.hypot(result.site.kW, relief.kvarAfter) : 0;
  const after =
    c.action === "none"
      ? `Stays at ${before}: the target PF ${fmt.pf(c.targetPF)} is already met.`
      : relief && relief.takeOutOfService.length > 0
        ? `PF ${fmt.pf(relief.pfAfter)} ${relief.senseAfter} and ${fmt.power(reliefKVA)} kVA with those steps out, from ${before} (${fmt.power(c.kVABefore - reliefKVA)} kVA released).`
        : `PF ${fmt.pf(c.pfAfter)} ${c.pfAfterSense ?? "lagging"} and ${fmt.power(c.kVAAfter)} kVA, from ${before} (${fmt.power(c.kVAReleased)} kVA released).`;
  const e = result.economics;
  const money = e
    ? {
        cost: e.installedCost === null ? null : fmt.money(e.installedCost, e.currency),
        savingPerYear: `${fmt.money(e.savingPerYear, e.currency)} a year`,
        payback: e.simplePaybackYears === null ? null : `${fmt.num(e.simplePaybackYears, 1)} years (simple payback)`,
      }
    : null;
  const repair = installedVerdict(result);
  return { install, instead, repairFirst: repair ? [repair] : [], after, money, risks: risksOf(result) };
}

/** The one or two risks that matter, most serious first. */
function risksOf(result: SizingResult): string[] {
  const risks: string[] = [];
  const rec = result.recommendedBank;
  const near = rec?.stages.filter((s) => s.nearHarmonic !== null) ?? [];
  const detuned = detunedProposalOf(result);
  if (near.length > 0) {
    const orders = [...new Set(near.map((s) => s.nearHarmonic as number))].sort((a, b) => a - b);
    risks.push(
      `Resonance: ${near.length === rec?.stages.length ? "every stage" : `${near.length} of ${rec?.stages.length} stages`} of a plain bank would resonate near the ${orders.map(ordinal).join(" and ")} harmonic the site makes${detuned ? " — hence the detuned design" : ""}.`,
    );
  } else if (detuned) {
    risks.push(
      `Harmonics: the plain bank fails the harmonic study (${detuned.triggeredBy.join(", ").replace(/_/g, " ")}) — hence the detuned design.`,
    );
  }
  const failing = (result.correction.repairFirst ?? []).filter((r) => r.status === "failed" || r.status === "degraded");
  if (failing.length > 0) {
    risks.push(`Failing bank: ${failing.map((r) => `${r.bank} step ${r.step} (${r.status})`).join(", ")} — repair before buying new capacitors.`);
  }
  if (result.correction.action === "remove") {
    risks.push(
      `Leading operation: the site leads now (PF ${fmt.pf(result.site.displacementPF)}); leading PF raises the voltage and can upset generators and motor controls.`,
    );
  } else if (result.warnings.some((w) => w.code === "light_load_unknown") && rec && rec.fixedKvar > 0) {
    risks.push(
      "Leading at light load: no light-load reading was given, so the fixed part is held small; take a night or weekend reading before ordering.",
    );
  }
  return risks.slice(0, 2);
}

const ordinal = (n: number) =>
  `${n}${n % 10 === 1 && n % 100 !== 11 ? "st" : n % 10 === 2 && n % 100 !== 12 ? "nd" : n % 10 === 3 && n % 100 !== 13 ? "rd" : "th"}`;

/** The safety line page 1 carries under the verdict. */
export const VERDICT_CAUTION =
  "Capacitors hold a lethal charge after they are switched off: lock out, tag out and wait the discharge time before touching them. This recommendation defers to local codes and to a licensed engineer's review.";

export function verdictSection(input: ReportInput): Section {
  const v = verdictOf(input.result);
  const items: { key: string; value: string }[] = [];
  if (v.install.length > 0) v.install.forEach((line, i) => items.push({ key: i === 0 ? "Install" : "", value: line }));
  else items.push({ key: "Install", value: v.instead ?? "nothing" });
  v.repairFirst.forEach((line, i) => items.push({ key: i === 0 ? "Repair first" : "", value: line }));
  items.push({ key: "After", value: v.after });
  if (v.money) {
    if (v.money.cost) items.push({ key: "Cost", value: v.money.cost });
    if (v.money.savingPerYear) items.push({ key: "Saving", value: v.money.savingPerYear });
    if (v.money.payback) items.push({ key: "Payback", value: v.money.payback });
  } else items.push({ key: "Cost and saving", value: "no tariff or costs were given for this building" });
  const blocks: Block[] = [{ kind: "keyValues", items }];
  if (v.risks.length > 0) blocks.push({ kind: "subheading", text: "Risks that matter" }, { kind: "list", items: v.risks });
  blocks.push({ kind: "paragraph", tone: "note", text: VERDICT_CAUTION });
  return { id: "verdict", heading: "Recommendation", blocks };
}
