export interface Caution {
  code: string;
  title: string;
  text: string;
  reference?: string;
}

/** Safety and code cautions carried by every recommendation. Wording is the project's own. */
const ALWAYS: Caution[] = [
  {
    code: "stored_charge",
    title: "Stored charge and discharge time",
    text: "Capacitors hold a lethal charge after they are disconnected. Wait at least the discharge time marked on the unit (at most 1 minute to 50 V for units up to 1000 V; IEC units 3 minutes to 75 V), then verify zero voltage between all terminals and to ground, and short and ground the terminals before touching them.",
    reference: "NFPA 70 460.6; IEC 60831-1",
  },
  {
    code: "lockout_tagout",
    title: "Lockout/tagout and verification",
    text: "Isolate the bank and every source that can feed it, apply your lock and tag, and test for absence of voltage with a meter proved on a known live source before and after the test.",
    reference: "NFPA 70E 120",
  },
  {
    code: "no_capacitors_on_drive_output",
    title: "Never on a drive's output",
    text: "Do not connect capacitors between a variable-frequency drive and its motor, nor on a soft starter's output: the switching frequency destroys them and can damage the drive. Correct drives on their supply side, detuned, or rely on the drive's own near-unity displacement PF.",
  },
  {
    code: "motor_self_excitation",
    title: "Motor-terminal capacitors and self-excitation",
    text: "A capacitor switched with a motor must not exceed the kvar that brings the motor's no-load PF to unity, or the coasting motor can self-excite to a dangerous voltage. Not on motors that are jogged, plugged, reversed, or on reduced-voltage or multi-speed starters. Reset the overload relay to the reduced line current.",
    reference: "IEEE Std 141 and motor makers' tables for the self-excitation limit (from memory); NFPA 70 460.8(A) conductors, 460.9 overload",
  },
  {
    code: "generator_operation",
    title: "Generator operation",
    text: "On standby or island generation at light load, fixed capacitors can drive a generator into leading PF and loss of excitation control. Switch banks off or block them on generator transfer unless the generator's capability curve allows the leading kvar.",
  },
  {
    code: "switching_transients",
    title: "Switching transients",
    text: "Energising a bank causes a voltage transient and inrush current that can trip drives and sensitive electronics; back-to-back stages need inrush limiting. Use capacitor-duty contactors.",
  },
  {
    code: "ventilation_ambient",
    title: "Ventilation and ambient temperature",
    text: "Capacitor life falls sharply with temperature. Keep the enclosure within the units' temperature class, ventilate it, and keep reactors' heat away from the capacitors.",
  },
  {
    code: "qualified_design",
    title: "Local codes and licensed practice",
    text: "These figures support and do not replace the design of a qualified person. Installation must follow the local electrical code, the utility's rules and the makers' instructions, and be checked by a licensed engineer or electrician where the jurisdiction requires it.",
  },
];

export function cautionsFor(): Caution[] {
  return ALWAYS.map((c) => ({ ...c }));
}
