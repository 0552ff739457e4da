/** Readings checked against the system they were taken on: the reading's volts, and loads against the transformer. */
import { SQRT3, type Phases } from "../conventions.js";
import type { SystemInput } from "../inputs.js";
import { warning, type InputIssue, type Warning } from "../warnings.js";

/**
 * A reading within ±10 % of a nominal voltage is taken as read at that voltage: the usual band of utilisation
 * voltage around nominal (NEMA MG 1 12.44 lets motors run at ±10 % of rated; from memory).
 */
export const READING_VOLTAGE_BAND = 0.1;
/** Volts above 2× or below 0.4× the line voltage belong to another system or are a typing error (the project's rule). */
export const READING_VOLTS_MAX_RATIO = 2;
export const READING_VOLTS_MIN_RATIO = 0.4;

export interface VoltageCheck {
  issues: InputIssue[];
  warnings: Warning[];
}

const near = (volts: number, nominalV: number) => Math.abs(volts - nominalV) <= READING_VOLTAGE_BAND * nominalV;

/**
 * The reading's volts against the system: line-to-line (3φ) or the line voltage (1φ) is plausible; so is the
 * line-to-neutral voltage for a single-phase load on a three-phase system (277 V on 480Y/277) and half the voltage
 * of a single-phase system (120 V on a 120/240 V three-wire service). A three-phase load read line-to-neutral
 * understates its kVA by √3: `reading_line_to_neutral`. Any other figure more than 10 % off warns; far off is a 400.
 */
export function checkReadingVolts(volts: number, loadPhases: Phases, system: SystemInput, at: (string | number)[]): VoltageCheck {
  const lineV = system.voltageV;
  const path = [...at, "volts"];
  const ratio = volts / lineV;
  if (ratio > READING_VOLTS_MAX_RATIO || ratio < READING_VOLTS_MIN_RATIO) {
    const message = `${volts} V is ${ratio > 1 ? "more than twice" : "less than 0.4 times"} the system's ${lineV} V line voltage: a reading from another system or a typing error`;
    return { issues: [{ path, message }], warnings: [] };
  }
  if (near(volts, lineV)) return { issues: [], warnings: [] };
  const neutralV = system.phases === 3 ? lineV / SQRT3 : lineV / 2;
  if (near(volts, neutralV)) {
    if (loadPhases === 1) return { issues: [], warnings: [] };
    const msg = `${volts} V is within 10 % of the ${neutralV.toFixed(0)} V line-to-neutral voltage of the ${lineV} V system: three-phase kVA (sqrt(3)·V·I) needs line-to-line volts; read between two lines, or set the load's phases: 1 if it is a single-phase load`;
    return { issues: [], warnings: [warning("reading_line_to_neutral", msg, path.join("."))] };
  }
  const pct = (ratio - 1) * 100;
  const msg = `${volts} V read against the system's ${lineV} V line voltage (${pct > 0 ? "+" : ""}${pct.toFixed(1)} %, beyond ±10 %): check the system voltage or the meter's range; the current is worked at the ${volts} V read`;
  return { issues: [], warnings: [warning("reading_voltage_mismatch", msg, path.join("."))] };
}

export interface ApparentPowerItem {
  label: string;
  /** The meter's kVA when read, else the fundamental kVA. */
  kVA: number;
}

/** A load or the site drawing more kVA than the transformer's rating: a reading error, or an overloaded transformer. */
export function checkAgainstTransformer(site: ApparentPowerItem, loads: ApparentPowerItem[], transformerKVA: number): Warning[] {
  const warnings: Warning[] = [];
  const over = loads.filter((l) => l.kVA > transformerKVA);
  if (over.length > 0) {
    const list = over.map((l) => `${l.label} ${l.kVA.toFixed(1)} kVA`).join(", ");
    warnings.push(
      warning(
        "load_above_transformer",
        `${over.length === 1 ? "a load draws" : `${over.length} loads draw`} more than the ${transformerKVA} kVA transformer (${list}): check the readings (units, quantity) or the transformer rating`,
        "transformer.kVA",
      ),
    );
  }
  if (site.kVA > transformerKVA) {
    warnings.push(
      warning(
        "site_above_transformer",
        `${site.label} ${site.kVA.toFixed(1)} kVA is above the ${transformerKVA} kVA transformer rating: check the readings or the transformer rating; the transformer would be overloaded`,
        "transformer.kVA",
      ),
    );
  }
  return warnings;
}
