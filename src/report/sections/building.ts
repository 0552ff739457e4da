/** Building and survey: who, when, which revision, the electrical data used (name and engine version are in the title block). */
import { dateTime, fmt, phasesText } from "../format.js";
import type { Block, ReportInput, Section } from "../types.js";

export function buildingSection(input: ReportInput): Section {
  const { building, survey, result } = input;
  const blocks: Block[] = [];
  if (building) {
    const items: { key: string; value: string }[] = [];
    if (building.buildingVersion !== undefined) items.push({ key: "Building data version", value: String(building.buildingVersion) });
    if (building.notes) items.push({ key: "Building notes", value: building.notes });
    if (items.length > 0) blocks.push({ kind: "keyValues", title: "Building", items });
  } else {
    blocks.push({ kind: "paragraph", text: "No building record was given: this report was made from a sizing request alone." });
  }
  if (survey) {
    const items = [
      { key: "Survey", value: survey.id },
      { key: "Revision", value: String(survey.revision) },
      { key: "Surveyed at", value: dateTime(survey.surveyedAt) },
      { key: "Surveyor", value: survey.surveyor },
      { key: "Revision recorded at", value: dateTime(survey.createdAt) },
    ];
    if (survey.reason) items.push({ key: "Reason for this revision", value: survey.reason });
    if (survey.notes) items.push({ key: "Survey notes", value: survey.notes });
    blocks.push({ kind: "keyValues", title: "Survey", items });
  } else {
    blocks.push({ kind: "paragraph", text: "No stored survey: the figures were computed on request." });
  }
  const sys = result.system;
  const tx = input.inputs.transformer ?? building?.transformer ?? null;
  const ut = input.inputs.utility ?? building?.utility ?? null;
  blocks.push({
    kind: "keyValues",
    title: "Electrical data used",
    items: [
      { key: "System", value: `${fmt.volts(sys.voltageV)} V, ${sys.frequencyHz} Hz, ${phasesText(sys.phases)}` },
      { key: "Target displacement PF", value: fmt.pf(result.correction.targetPF) },
      {
        key: "Supply transformer",
        value: tx
          ? `${fmt.kva0(tx.kVA)} kVA, impedance ${fmt.pct2(tx.impedancePct)} %${tx.xOverR !== undefined ? `, X/R ${fmt.num(tx.xOverR, 1)}` : ""}`
          : "not given",
      },
      {
        key: "Utility fault level",
        value: ut ? `${fmt.num(ut.faultMVA, 0)} MVA` : "not given (infinite source assumed when a transformer is given)",
      },
    ],
  });
  return { id: "building", heading: "Building and survey", blocks };
}
