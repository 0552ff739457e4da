/** Installed banks: each step's expected and measured current and status, the credit, repairs first, and the capacitance chart. */
import { DEGRADED_BELOW_PCT, FAILED_BELOW_PCT } from "../../core/bank/installed.js";
import type { SizingResult } from "../../core/pipeline/size.js";
import { capacitanceChart, type CapacitanceLine } from "../charts/index.js";
import { dateTime, fmt } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";

type Correction = SizingResult["correction"];

/** Page 1's verdict on the installed banks: what to repair and what it restores before anything new is bought. */
export function installedVerdict(result: SizingResult): string | null {
  const c: Correction = result.correction;
  if (!result.installedBanks || c.kvarAdditional === undefined) return null;
  const repairs = c.repairFirst ?? [];
  const then = c.kvarAdditional > 0 ? `then ${fmt.power(c.kvarAdditional)} kvar of new capacitors` : "then nothing new is needed";
  if (repairs.length === 0) {
    const measured = result.installedBanks.some((b) => b.steps.some((s) => s.status !== "not_measured"));
    return `${measured ? "no measured step is failed or degraded" : "no step currents were measured"}; installed ${fmt.power(c.kvarInstalledRated)} kvar credited, ${then}`;
  }
  const list = repairs.map((r) => `${r.bank} step ${r.step} (${r.status}, ${fmt.power(r.restoresKvar)} kvar)`).join(", ");
  return `${list} — ${fmt.power(c.kvarRestoredByRepair)} kvar restored before anything new is bought; ${then}`;
}

function chartOf(input: ReportInput): Block | null {
  const history = input.bankHistory;
  const result = input.result;
  let surveys: { id: string; at: string }[];
  let lines: CapacitanceLine[];
  if (history && history.length > 0) {
    const seen = new Map<string, string>();
    for (const s of history) for (const st of s.steps) for (const p of st.points) seen.set(p.surveyId, p.surveyedAt);
    surveys = [...seen.entries()].map(([id, at]) => ({ id, at })).sort((a, b) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0));
    lines = history.flatMap((s) =>
      s.steps.map((st) => ({
        label: `${s.bank}${s.startedBecause === "first_seen" ? "" : ` (${s.startedBecause})`} step ${st.step}`,
        pct: surveys.map((sv) => st.points.find((p) => p.surveyId === sv.id)?.capacitancePct ?? null),
      })),
    );
  } else {
    surveys = [{ id: input.survey?.id ?? "this", at: input.survey?.surveyedAt ?? "this reading" }];
    lines = (result.installedBanks ?? []).flatMap((b) =>
      b.steps.map((st) => ({ label: `${b.label} step ${st.step}`, pct: [st.capacitancePct ?? null] })),
    );
  }
  if (!lines.some((l) => l.pct.some((v) => v !== null))) return null;
  return {
    kind: "chart",
    chart: capacitanceChart({
      surveys: surveys.map((s) => dateTime(s.at).slice(0, 10)),
      lines,
      degradedBelowPct: DEGRADED_BELOW_PCT,
      failedBelowPct: FAILED_BELOW_PCT,
    }),
  };
}

export function installedSection(input: ReportInput): Section {
  const { result } = input;
  const banks = result.installedBanks;
  const c = result.correction;
  if (!banks || banks.length === 0) {
    return {
      id: "installed",
      heading: "Installed banks",
      blocks: [{ kind: "paragraph", text: "No installed capacitor banks were entered for this site." }],
    };
  }
  const blocks: Block[] = [];
  for (const b of banks) {
    blocks.push({
      kind: "subheading",
      text: `${b.label} (${b.control}, at the ${b.location}${b.group ? ` ${b.group}` : ""}${b.loadLabel ? ` ${b.loadLabel}` : ""})`,
    });
    blocks.push({
      kind: "keyValues",
      items: [
        {
          key: "Nameplate / rated at system voltage",
          value: `${fmt.power(b.nameplateKvar)} / ${fmt.power(b.ratedKvarAtSystem)} kvar${b.reactorPct > 0 ? ` (${fmt.num(b.reactorPct, 1)} % reactors)` : " (plain)"}`,
        },
        {
          key: "In service during the readings / delivered",
          value: b.read ? `${fmt.power(b.inServiceKvar)} / ${fmt.power(b.deliveredKvar)} kvar` : "not read: taken as out of service",
        },
        { key: "Currents worked at", value: `${fmt.volts(b.voltageV)} V (${b.voltageMeasured ? "measured at the bank" : "the system voltage"})` },
      ],
    });
    blocks.push({
      kind: "table",
      title: `${b.label}: steps`,
      header: ["Step", "Nameplate (kvar)", "On during the readings", "Expected (A)", "Measured (A)", "Capacitance (%)", "Unbalance (%)", "Status"],
      align: ["right", "right", "left", "right", "left", "right", "right", "left"],
      rows: b.steps.map((s) => [
        String(s.step),
        fmt.power(s.nameplateKvar),
        fmt.yesNo(s.inService),
        fmt.amps(s.expectedCurrentA),
        s.phaseCurrentsA ? s.phaseCurrentsA.map((a) => fmt.amps(a)).join(" / ") : "-",
        s.capacitancePct === undefined ? "-" : fmt.pct(s.capacitancePct),
        s.unbalancePct === undefined ? "-" : fmt.pct(s.unbalancePct),
        s.status.replace("_", " "),
      ]),
      note: `Expected current: Q_r·(V/V_r)²·(f/f_r)/(1 − p) ÷ (√3·V) (IEEE Std 18 rating basis). Degraded below ${DEGRADED_BELOW_PCT} % of rated capacitance (IEC 60831-1 lower tolerance, from memory); failed below ${FAILED_BELOW_PCT} % or with a phase under 10 % of expected; unbalanced above 10 % phase deviation (common practice).`,
    });
  }
  if (c.kvarAdditional !== undefined) {
    blocks.push({
      kind: "keyValues",
      title: "Credit for the installed banks",
      items: [
        {
          key: "Delivered during the readings",
          value: `${fmt.power(c.kvarInstalledInService)} kvar (${fmt.power(c.kvarIncludedInReadings)} kvar of it inside the readings, added back)`,
        },
        { key: "Required by the uncorrected site", value: `${fmt.power(c.kvarRequiredTotal)} kvar to PF ${fmt.pf(c.targetPF)}` },
        { key: "Installed, restored and fully used", value: `${fmt.power(c.kvarInstalledRated)} kvar` },
        { key: "Restored by repair", value: `${fmt.power(c.kvarRestoredByRepair)} kvar` },
        { key: "New kvar still to add", value: `${fmt.power(c.kvarAdditional)} kvar` },
      ],
    });
    if (c.basisNote) blocks.push({ kind: "paragraph", tone: "note", text: c.basisNote });
  }
  if (c.repairFirst && c.repairFirst.length > 0) {
    blocks.push({ kind: "paragraph", tone: "alert", text: "Repair these before buying new capacitors:" });
    blocks.push({
      kind: "list",
      items: c.repairFirst.map((r) => `${r.bank} step ${r.step}: ${r.status}, restores ${fmt.power(r.restoresKvar)} kvar — ${r.finding}`),
    });
  }
  if (c.leadingRelief) {
    const r = c.leadingRelief;
    blocks.push({
      kind: "paragraph",
      tone: "alert",
      text: `The site leads: take out ${r.takeOutOfService.map((s) => (s.control === "fixed" ? `fixed bank ${s.bank}` : `${s.bank} step ${s.step}`)).join(", ")} (${fmt.power(r.kvarRemoved)} kvar); PF after ${fmt.pf(r.pfAfter)} ${r.senseAfter}.`,
    });
  }
  for (const sc of result.combinedStages ?? []) {
    const text =
      sc.hazards.length === 0
        ? `Combined resonance screen${sc.withNewBank === "none" ? "" : ` with the ${sc.withNewBank} bank`}: ${sc.stagesScreened} switchable combinations, none within 10 % of a present harmonic.`
        : `Combined resonance screen${sc.withNewBank === "none" ? "" : ` with the ${sc.withNewBank} bank`}: ${sc.hazards.length} of ${sc.stagesScreened} combinations resonate near a present harmonic, e.g. ${sc.hazards
            .slice(0, 3)
            .map(
              (h) =>
                `${h.installed.join(" + ")}${h.newStage > 0 ? ` + new stage ${h.newStage}` : ""} at ${h.resonanceOrders.map((o) => fmt.order(o)).join(", ")}`,
            )
            .join("; ")}.`;
    blocks.push({ kind: "paragraph", tone: sc.hazards.length > 0 ? "alert" : "normal", text });
    const h = sc.harmonics;
    if (h && h.worstThdV) {
      const w = h.worstThdV;
      const name = (x: { installed: string[]; newStage: number }) =>
        `${x.installed.join(" + ")}${x.newStage > 0 ? ` + new stage ${x.newStage}` : ""}`;
      blocks.push({
        kind: "paragraph",
        tone: h.flagged.length > 0 ? "alert" : "normal",
        text:
          `Combined harmonic study${sc.withNewBank === "none" ? "" : ` with the ${sc.withNewBank} bank`}: ${h.stagesStudied} combinations studied${h.truncated ? " (truncated)" : ""}; ` +
          `the worst THD_v is ${fmt.pct2(w.thdVPct)} % (${name(w)}, limit ${fmt.num(w.ieee519.thdLimitPct, 1)} %)` +
          (h.flagged.length > 0
            ? `; ${h.flagged.length} combination(s) break an IEEE 519 limit or load a capacitor above its rating, e.g. ${h.flagged.slice(0, 3).map(name).join("; ")}.`
            : "; every combination within IEEE 519 and the capacitors' ratings."),
      });
    }
  }
  const program = result.recommendedBank?.combinedProgram;
  if (program) {
    blocks.push({
      kind: "table",
      title: "Installed and new steps under one controller",
      header: ["Switching order", "Bank", "Delivered (kvar)"],
      align: ["right", "left", "right"],
      rows: program.steps.map((s, i) => [String(i + 1), s.source === "installed" ? "installed" : "new", fmt.power(s.kvar)]),
      note: `Fixed ${fmt.power(program.fixedKvar)} kvar always in. Together the banks hold the target in ${fmt.num(program.metShare * 100, 1)} % of the samples (the new bank alone, with the installed credited as always in: ${fmt.num(program.newAloneMetShare * 100, 1)} %).`,
    });
  }
  const chart = chartOf(input);
  if (chart) blocks.push(chart);
  return { id: "installed", heading: "Installed banks", blocks };
}
