/** Rules for capacitors at a motor's terminals: which starters forbid them, the self-excitation limit, new current. */
import { SQRT3, type Phases } from "../conventions.js";
import type { LoadKind, StartingMethod } from "../inputs.js";

export type { StartingMethod };

export const STARTING_METHODS: readonly StartingMethod[] = [
  "across_the_line",
  "star_delta",
  "soft_starter",
  "reduced_voltage",
  "jogging",
  "plugging",
  "reversing",
  "multi_speed",
];

/**
 * Duties on which a capacitor must never sit at the motor terminals, whatever its contactor
 * (motor application guidance — IEEE Std 141 and motor makers' application notes, from memory: the self-excitation
 * limit caps the kvar, these duties defeat the limit).
 */
const NEVER_AT_TERMINALS: Partial<Record<StartingMethod, string>> = {
  jogging:
    "jogging reconnects a still-turning motor many times; the capacitor keeps it excited, so each reclosure is out of phase: high transient torque and current",
  plugging:
    "plugging reverses a turning motor; the capacitor keeps it excited, so the reversal closes onto the motor's own voltage out of phase: transient torque and overvoltage",
  reversing: "reversing reconnects a motor that the capacitor still excites, out of phase with the supply: transient torque and overvoltage",
  multi_speed:
    "a multi-speed motor's windings have different no-load currents and are switched under the capacitor: no single capacitor suits them and the switching can self-excite",
};

/**
 * Starters with which a terminal capacitor is unsafe unless it has its own contactor on the starter's line side,
 * closed only once the motor runs at full voltage and opened with the motor (makers' application practice).
 */
const ONLY_WITH_OWN_CONTACTOR: Partial<Record<StartingMethod, string>> = {
  star_delta: "the open transition of a star-delta starter leaves the motor with the capacitor: self-excitation, then reclosure out of phase",
  soft_starter: "a soft starter's thyristors and a capacitor at its output damage each other (inrush on every firing, resonance with the ramp)",
  reduced_voltage:
    "on the motor side of an autotransformer or reactor starter the capacitor resonates with the starter's inductance and sees overvoltage at transition",
};

export interface TerminalSafety {
  safe: boolean;
  /** Warning code when a load's duty forbids a terminal capacitor. */
  code?: "no_terminal_capacitor_drive" | "no_terminal_capacitor_starting";
  reason: string;
}

export interface TerminalSafetyInput {
  kind: LoadKind;
  starting?: StartingMethod;
  /** The capacitor has its own contactor on the starter's line side, closed after the run/bypass contactor. */
  separateCapacitorContactor?: boolean;
}

/** May a capacitor be connected at this load's terminals (switched with it)? */
export function terminalSafety(load: TerminalSafetyInput): TerminalSafety {
  if (load.kind === "drive") {
    return {
      safe: false,
      code: "no_terminal_capacitor_drive",
      reason:
        "never a capacitor on a drive's output (its switching destroys the capacitor and can damage the drive); a drive's input displacement PF is near unity, so its share is corrected upstream, preferably detuned",
    };
  }
  if (load.kind !== "motor") {
    return { safe: false, reason: `terminal capacitors are for induction motors; a ${load.kind} load is corrected at a group or central bank` };
  }
  const s = load.starting;
  if (s === undefined) {
    return {
      safe: false,
      reason:
        "starting method not stated: a terminal capacitor only goes on an across-the-line motor (or one with its own capacitor contactor); give `starting`",
    };
  }
  const never = NEVER_AT_TERMINALS[s];
  if (never !== undefined) {
    return { safe: false, code: "no_terminal_capacitor_starting", reason: `no terminal capacitor (${s}): ${never}` };
  }
  const contactor = ONLY_WITH_OWN_CONTACTOR[s];
  if (contactor !== undefined) {
    if (load.separateCapacitorContactor) {
      return {
        safe: true,
        reason: `${s} with its own capacitor contactor on the starter's line side, closed after the motor runs at full voltage`,
      };
    }
    return {
      safe: false,
      code: "no_terminal_capacitor_starting",
      reason: `no terminal capacitor (${s}) without its own contactor on the starter's line side: ${contactor}`,
    };
  }
  return { safe: true, reason: "across-the-line start: the capacitor can switch with the motor" };
}

/** Where the self-excitation limit comes from: motor-application guidance, not a clause of NFPA 70 (from memory). */
export const SELF_EXCITATION_SOURCE = "motor-application guidance: IEEE Std 141 ch. 8 and motor makers' capacitor tables, from memory";

/**
 * Most kvar a motor can carry without self-excitation: the kvar that raises its no-load PF to unity
 * (SELF_EXCITATION_SOURCE), taken as √3·V·I₀/1000 (3φ) or V·I₀/1000 (1φ) at the voltage the motor runs at — the
 * no-load current treated as all magnetising, which slightly overstates it (no-load kW is friction and core loss);
 * the share kept below it covers that.
 */
export function selfExcitationLimitKvar(noLoadAmps: number, voltageV: number, phases: Phases): number {
  return ((phases === 3 ? SQRT3 : 1) * voltageV * noLoadAmps) / 1000;
}

/** Line current of one motor at P kW and Q kvar with Q_c kvar at its terminals: I = √(P² + (Q − Q_c)²)·1000/(√3·V). */
export function motorLineCurrentA(kW: number, kvar: number, capacitorKvar: number, voltageV: number, phases: Phases): number {
  return (Math.hypot(kW, kvar - capacitorKvar) * 1000) / (phases === 3 ? SQRT3 * voltageV : voltageV);
}

/**
 * Largest nameplate size of the list whose delivered kvar (nameplate × `deliveredPerNameplate`, e.g. (V/V_r)² for a
 * unit rated above the bus) is at or below a limit, or null (a terminal unit is never rounded up: self-excitation).
 */
export function largestSizeAtMost(limitKvar: number, sizesKvar: readonly number[], deliveredPerNameplate = 1): number | null {
  let best: number | null = null;
  for (const s of sizesKvar) if (s * deliveredPerNameplate <= limitKvar + 1e-9 && (best === null || s > best)) best = s;
  return best;
}
