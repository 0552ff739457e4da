/** Resonance screen and harmonic study per stage, with the detuned proposal beside the bank it replaces. */
import { compactList } from "../../core/warnings.js";
import type { BankAnalysis } from "../../core/bank/stages.js";
import type { SizingResult } from "../../core/pipeline/size.js";
import { impedanceScanChart } from "../charts/index.js";
import { slug } from "../escape.js";
import { fmt, ordinal } from "../format.js";
import { scanSeriesFor } from "../scan-series.js";
import type { Block, ReportInput, Section } from "../types.js";
import { stepsText } from "./bank.js";

/** The study as the sizing result keeps it (derived, so it follows the engine's stored form). */
type Study = NonNullable<SizingResult["harmonics"]>;
type BankStudy = Study["banks"][number];
type StageStudy = BankStudy["stages"][number];
type DetunedProposal = Study["proposals"][number];

const cap = (t: string) => t.charAt(0).toUpperCase() + t.slice(1);
/** "recommended" → "recommended bank"; "recommended (detuned proposal)" → "detuned proposal for the recommended bank". */
export function bankLabel(name: string): string {
  const m = /^(.*) \(detuned proposal\)$/.exec(name);
  return m ? `detuned proposal for the ${m[1]} bank` : `${name} bank`;
}
const near = (n: number | null) => (n === null ? "-" : `${ordinal(n)} (within 10 %)`);
const peakOf = (s: StageStudy | undefined) => (s && s.peaks.length > 0 ? s.peaks.map((p) => fmt.order(p.order)).join(", ") : "-");
const worst = (s: StageStudy) =>
  `${fmt.pct2(s.ieee519.individual.valuePct)}${s.ieee519.individual.order !== null ? ` (h ${s.ieee519.individual.order})` : ""}`;
const duty = (s: StageStudy) =>
  `${fmt.pct(s.duty.rmsVoltage.valuePct)} / ${fmt.pct(s.duty.peakVoltage.valuePct)} / ${fmt.pct(s.duty.rmsCurrent.valuePct)} / ${fmt.pct(s.duty.reactivePower.valuePct)}`;

function resonanceTable(name: string, b: BankAnalysis, study: BankStudy | undefined, hz: number): Block {
  return {
    kind: "table",
    title: `${name}: parallel resonance per stage`,
    header: ["Stage", "Delivered (kvar)", "h = √(S_sc/Q)", "Resonance (Hz)", "Near a source order", "Scan peak h", "Peak within 10 % of"],
    align: ["right", "right", "right", "right", "left", "right", "left"],
    rows: b.stages.map((s) => {
      const st = study?.stages.find((x) => x.stageNumber === s.stage);
      return [
        String(s.stage),
        fmt.power(s.cumulativeKvar),
        fmt.order(s.resonanceOrder),
        s.resonanceOrder === null ? "n/a" : fmt.num(s.resonanceOrder * hz, 0),
        near(s.nearHarmonic),
        peakOf(st),
        st && st.resonanceWithin10PctOf.length > 0 ? st.resonanceWithin10PctOf.join(", ") : "-",
      ];
    }),
  };
}

function studyTable(title: string, study: BankStudy): Block {
  const lim = study.stages[0]?.ieee519.limits;
  return {
    kind: "table",
    title,
    header: [
      "Stage",
      "Delivered (kvar)",
      "THD_v (%)",
      "Worst individual (%)",
      "IEEE 519",
      "Capacitor rms V / peak V / I / kvar (% of rating)",
      "IEEE 18 duty",
    ],
    align: ["right", "right", "right", "right", "left", "right", "left"],
    rows: study.stages.map((s) => [
      String(s.stageNumber),
      fmt.power(s.effectiveKvar),
      fmt.pct2(s.ieee519.thd.valuePct),
      worst(s),
      fmt.passFail(s.ieee519.pass),
      duty(s),
      fmt.passFail(s.duty.pass),
    ]),
    ...(lim
      ? {
          note: `IEEE 519-2014 Table 1 at ${lim.busVoltageClass}: THD_v at most ${fmt.pct(lim.thdPct)} %, individual at most ${fmt.pct(lim.individualPct)} %. IEEE 18 limits: rms voltage 110 %, peak voltage 120 %, current 135 %, kvar 135 %.`,
        }
      : {}),
  };
}

function proposalBlocks(p: DetunedProposal, original: BankStudy | undefined): Block[] {
  const d = p.design;
  const rows = p.study.stages.map((s) => {
    const o = original?.stages.find((x) => x.stageNumber === s.stageNumber);
    return [
      String(s.stageNumber),
      o ? fmt.power(o.effectiveKvar) : "-",
      o ? peakOf(o) : "-",
      o ? fmt.pct2(o.ieee519.thd.valuePct) : "-",
      o ? fmt.passFail(o.duty.pass) : "-",
      fmt.power(s.effectiveKvar),
      peakOf(s),
      fmt.pct2(s.ieee519.thd.valuePct),
      fmt.passFail(s.duty.pass),
    ];
  });
  return [
    { kind: "subheading", text: `Detuned proposal for the ${p.forBank} bank` },
    {
      kind: "keyValues",
      items: [
        { key: "Triggered by", value: p.triggeredBy.join(", ") },
        { key: "Reactor", value: `${fmt.num(d.reactorPct, 2)} % (tuned to h = ${fmt.order(d.tuningOrder)})` },
        {
          key: "Capacitor rating",
          value: `${fmt.volts(d.ratedVoltageV)} V (fundamental on the capacitor ${fmt.volts(d.capacitorFundamentalVoltageV)} V)`,
        },
        { key: "Steps (nameplate)", value: stepsText(d.steps.map((s) => ({ kvar: s.nameplateKvar }))) },
        { key: "Findings after detuning", value: p.findings.length === 0 ? "none" : groupedFindings(p.findings) },
      ],
    },
    { kind: "list", items: d.rationale },
    {
      kind: "table",
      title: `${cap(bankLabel(p.forBank))} as given and detuned, side by side`,
      header: [
        "Stage",
        "As given: kvar",
        "As given: peak h",
        "As given: THD_v (%)",
        "As given: duty",
        "Detuned: kvar",
        "Detuned: peak h",
        "Detuned: THD_v (%)",
        "Detuned: duty",
      ],
      align: ["right", "right", "right", "right", "left", "right", "right", "right", "left"],
      rows,
    },
  ];
}

export function harmonicsSection(input: ReportInput): Section {
  const { result } = input;
  const r = result.resonance;
  const h = result.harmonics;
  const hz = result.system.frequencyHz;
  const blocks: Block[] = [];
  if (!r) {
    const orders = h?.presentOrders.length ? ` The site's harmonic orders are ${h.presentOrders.join(", ")}.` : "";
    blocks.push({
      kind: "paragraph",
      tone: "alert",
      text: `Resonance was not screened: the transformer (kVA and impedance) and the utility fault level were not given, so the source strength S_sc at the bus is unknown.${orders}`,
    });
    return { id: "harmonics", heading: "Resonance and harmonics", blocks };
  }
  blocks.push({
    kind: "keyValues",
    items: [
      { key: "Short-circuit strength at the bus S_sc", value: `${fmt.kva0(r.shortCircuitKVA)} kVA` },
      {
        key: "Transformer alone / utility",
        value: `${r.transformerShortCircuitKVA === null ? "n/a" : fmt.kva0(r.transformerShortCircuitKVA)} kVA / ${r.utilityShortCircuitKVA === null ? "infinite" : `${fmt.kva0(r.utilityShortCircuitKVA)} kVA`}`,
      },
      {
        key: "Harmonic orders of the site's sources",
        value: r.harmonicOrdersPresent.length > 0 ? r.harmonicOrdersPresent.join(", ") : "none declared",
      },
      {
        key: "Nonlinear (drive) load",
        value: `${fmt.power(r.nonlinearKVA)} kVA${r.nonlinearSharePct === null ? "" : ` (${fmt.pct(r.nonlinearSharePct)} % of the transformer)`}`,
      },
      {
        key: "Harmonic study advised",
        // Revisions stored before the reasons were kept have none: the flag alone is shown.
        value:
          r.harmonicStudyAdvised && (r.harmonicStudyReasons ?? []).length > 0
            ? `yes: ${r.harmonicStudyReasons.join("; ")}`
            : fmt.yesNo(r.harmonicStudyAdvised),
      },
      {
        key: "Voltage rise, whole bank (recommended / proposed)",
        value: `${fmt.pct2(r.recommendedBankVoltageRisePct)} / ${fmt.pct2(r.proposedBankVoltageRisePct)} %`,
      },
    ],
  });
  const studyOf = (name: string) => h?.banks.find((b) => b.name === name);
  if (result.recommendedBank) blocks.push(resonanceTable("Recommended bank", result.recommendedBank, studyOf("recommended"), hz));
  if (result.proposedBank) blocks.push(resonanceTable("Proposed bank", result.proposedBank, studyOf("proposed"), hz));
  if (!result.recommendedBank && !result.proposedBank) blocks.push({ kind: "paragraph", text: "No bank to screen." });
  if (h) {
    const w = h.withoutCapacitors.ieee519;
    blocks.push({
      kind: "paragraph",
      text: `Bus without capacitors: THD_v ${fmt.pct2(w.thd.valuePct)} % (limit ${fmt.pct(w.thd.limitPct)} %), worst individual ${fmt.pct2(w.individual.valuePct)} %${w.individual.order !== null ? ` at h ${w.individual.order}` : ""} (limit ${fmt.pct(w.limits.individualPct)} %): ${fmt.passFail(w.pass)}.`,
    });
    for (const b of h.banks) blocks.push(studyTable(`${cap(bankLabel(b.name))}: distortion and capacitor duty per stage`, b));
    for (const p of h.proposals) blocks.push(...proposalBlocks(p, studyOf(p.forBank)));
  } else {
    blocks.push({
      kind: "paragraph",
      text: "No harmonic study was run: the site has no declared harmonic sources, drives or measured spectra. The screen above uses the estimate h = √(S_sc/Q).",
    });
  }
  const scans = scanSeriesFor(input);
  if (scans) {
    for (const b of scans.banks) {
      const chart = impedanceScanChart({
        id: `scan-${slug(b.bank)}`,
        title: `Impedance scan: ${bankLabel(b.bank)}, one line per stage`,
        lines: b.lines,
        markerOrders: scans.markerOrders,
      });
      blocks.push({ kind: "chart", chart });
    }
    blocks.push({
      kind: "paragraph",
      tone: "note",
      text:
        scans.basis === "computed"
          ? "Scan series recomputed for this report from the stored network figures (source S_sc and X/R, linear load as damping, reactor X/R 50)."
          : "Scan series as supplied with the study.",
    });
  }
  if (h && h.assumptions.length > 0) blocks.push({ kind: "subheading", text: "Study assumptions" }, { kind: "list", items: h.assumptions });
  return { id: "harmonics", heading: "Resonance and harmonics", blocks };
}

/** Findings said once per concern: the first message of each code and subject, and the other stages it holds at. */
export function groupedFindings(findings: readonly { code: string; subject: string; message: string; stageNumber?: number }[]): string {
  const groups = new Map<string, { message: string; stages: number[] }>();
  for (const f of findings) {
    const key = `${f.code}|${f.subject}`;
    const g = groups.get(key);
    if (g) {
      if (f.stageNumber !== undefined) g.stages.push(f.stageNumber);
    } else groups.set(key, { message: f.message, stages: f.stageNumber !== undefined ? [f.stageNumber] : [] });
  }
  return [...groups.values()]
    .map((g) => (g.stages.length > 1 ? `${g.message} (and likewise at stages ${compactList(g.stages.slice(1))})` : g.message))
    .join("; ");
}
