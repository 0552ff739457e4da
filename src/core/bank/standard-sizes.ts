/** Standard low-voltage capacitor unit sizes, kvar (common practice list, no single source). */
export const STANDARD_UNIT_KVAR = [2.5, 5, 7.5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100] as const;

/** Common capacitor nameplate voltages, line-to-line; a maker's catalogue list, no standard. */
export const STANDARD_CAPACITOR_VOLTAGES_V: readonly number[] = [
  240, 400, 415, 440, 480, 525, 550, 600, 690, 800, 1000, 2400, 4160, 4800, 6600, 7200, 8320, 11000, 12470, 13200, 13800, 14400, 24940, 34500,
];

/** Common LV capacitor step sizes, kvar at rated voltage; catalogue practice, no standard. */
export const STANDARD_STEP_KVAR: readonly number[] = [2.5, 5, 7.5, 10, 12.5, 15, 20, 25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 400, 500];

/** Smallest standard voltage at or above the need; beyond the list, the next whole kV. */
export function standardCapacitorVoltageV(requiredV: number): number {
  const v = STANDARD_CAPACITOR_VOLTAGES_V.find((s) => s >= requiredV);
  return v ?? Math.ceil(requiredV / 1000) * 1000;
}

/** Nearest standard size (ties go up); beyond the list, the nearest 50 kvar. */
export function nearestStandardKvar(kvar: number): number {
  const last = STANDARD_STEP_KVAR[STANDARD_STEP_KVAR.length - 1]!;
  if (kvar > last) return Math.max(last, Math.round(kvar / 50) * 50);
  let best = STANDARD_STEP_KVAR[0]!;
  for (const s of STANDARD_STEP_KVAR) if (Math.abs(s - kvar) <= Math.abs(best - kvar)) best = s;
  return best;
}
