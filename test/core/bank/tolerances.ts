import type { Tolerance } from "../../helpers/tolerance.js";

/** Tolerances of the bank-design tests not in the shared table, one per quantity. */
export const DTOL = {
  /** A current quoted to three decimals in a hand calculation (e.g. C/k 0.180 A). */
  currentRoundedA: { abs: 0.0005 },
  /** Resistance in ohm against exact arithmetic. */
  resistanceOhm: { rel: 1e-9 },
  /** Power in W against exact arithmetic. */
  powerW: { rel: 1e-9 },
  /** Time in s against exact arithmetic. */
  timeS: { rel: 1e-9 },
  /** Time in s from the RK4 oracle (step t/20000, linear interpolation of the crossing): 0.2 %. */
  oracleTimeS: { rel: 2e-3 },
  /** kvar against exact arithmetic. */
  kvar: { rel: 1e-9, abs: 1e-9 },
  /** Capacitance in F against exact arithmetic. */
  farad: { rel: 1e-9 },
} as const satisfies Record<string, Tolerance>;
