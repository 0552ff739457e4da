/**
 * Safety cautions: the result's own, plus any of the mandatory topics they lack (a stored result made by an
 * older engine may carry fewer). The report never goes out without every topic below.
 */
import type { Caution } from "../../core/cautions/safety-cautions.js";
import type { ReportInput, Section } from "../types.js";

/** The topics every report carries, keyed as the engine's cautions are; wording used only when a topic is missing. */
export const REQUIRED_CAUTIONS: readonly Caution[] = [
  {
    code: "stored_charge",
    title: "Stored charge and discharge time",
    text: "A disconnected capacitor can still hold a lethal charge. Wait at least the discharge time on the nameplate, measure zero volts terminal to terminal and to ground, then short and ground the terminals before touching.",
    reference: "NFPA 70 460.6; IEC 60831-1",
  },
  {
    code: "lockout_tagout",
    title: "Lockout/tagout and verification",
    text: "Isolate the bank from every source that can feed it, lock and tag it, and prove absence of voltage with a tester checked on a known live source before and after.",
    reference: "NFPA 70E 120",
  },
  {
    code: "no_capacitors_on_drive_output",
    title: "Never on a drive's output",
    text: "Never connect capacitors between a variable-frequency drive or soft starter and its motor. Correct on the supply side, with a detuned bank where drives are present.",
  },
  {
    code: "motor_self_excitation",
    title: "Motor-terminal capacitors and self-excitation",
    text: "A capacitor switched with a motor must stay below the kvar that would correct the motor's no-load PF to unity, or the coasting motor can self-excite to a dangerous voltage. Reset the overload relay for the lower line current.",
    reference: "IEEE Std 141 and motor makers' tables for the self-excitation limit (from memory); NFPA 70 460.8(A) conductors, 460.9 overload",
  },
  {
    code: "switching_transients",
    title: "Switching transients",
    text: "Switching a bank in causes a voltage transient and inrush current; stages switched back to back need inrush limiting. Use capacitor-duty contactors and check sensitive loads nearby.",
  },
  {
    code: "generator_operation",
    title: "Generator operation",
    text: "On generator supply at light load, capacitors can push the generator into leading PF and loss of voltage control. Switch the bank off on transfer unless the generator's capability allows it.",
  },
  {
    code: "ventilation_ambient",
    title: "Ventilation and ambient temperature",
    text: "Heat shortens capacitor life. Keep the enclosure within the units' temperature class, ventilate it, and keep reactor heat away from the capacitors.",
  },
  {
    code: "qualified_design",
    title: "Local codes and licensed practice",
    text: "This report supports and does not replace the design of a qualified person. The installation must follow the local electrical code, the utility's rules and the makers' instructions.",
  },
];

export function reportCautions(given: readonly Caution[]): Caution[] {
  const out = given.map((c) => ({ ...c }));
  for (const req of REQUIRED_CAUTIONS) if (!out.some((c) => c.code === req.code)) out.push({ ...req });
  return out;
}

export function cautionsSection(input: ReportInput): Section {
  return {
    id: "cautions",
    heading: "Safety cautions",
    blocks: [
      { kind: "paragraph", tone: "alert", text: "Read these before any work on or near the bank. They apply whatever the figures above say." },
      ...reportCautions(input.result.cautions).map((c) => ({
        kind: "callout" as const,
        title: c.title,
        text: c.text,
        ...(c.reference ? { reference: c.reference } : {}),
      })),
    ],
  };
}
