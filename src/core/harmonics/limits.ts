/** IEEE Std 519-2014 Table 1 voltage distortion limits and the pass/fail check against them. */
import type { BusDistortion } from "./distortion.js";
import { limitCheck, type LimitCheck } from "./study-types.js";

export interface VoltageDistortionLimits {
  /** Bus voltage class as written in Table 1. */
  busVoltageClass: string;
  individualPct: number;
  thdPct: number;
}

/** IEEE Std 519-2014 Table 1 (bus voltage V at the PCC, line-to-line). */
export function ieee519VoltageLimits(voltageV: number): VoltageDistortionLimits {
  if (voltageV <= 1_000) return { busVoltageClass: "V <= 1.0 kV", individualPct: 5.0, thdPct: 8.0 };
  if (voltageV <= 69_000) return { busVoltageClass: "1 kV < V <= 69 kV", individualPct: 3.0, thdPct: 5.0 };
  if (voltageV <= 161_000) return { busVoltageClass: "69 kV < V <= 161 kV", individualPct: 1.5, thdPct: 2.5 };
  return { busVoltageClass: "161 kV < V", individualPct: 1.0, thdPct: 1.5 };
}

export interface Ieee519Check {
  limits: VoltageDistortionLimits;
  thd: LimitCheck;
  /** The worst individual order against the individual limit. */
  individual: LimitCheck & { order: number | null };
  pass: boolean;
}

export function checkIeee519(distortion: BusDistortion, voltageV: number): Ieee519Check {
  const limits = ieee519VoltageLimits(voltageV);
  const thd = limitCheck(distortion.thdVPct, limits.thdPct);
  const worst = distortion.worstIndividual;
  const check = limitCheck(worst?.pct ?? 0, limits.individualPct);
  const individual = {
    valuePct: check.valuePct,
    limitPct: check.limitPct,
    marginPct: check.marginPct,
    pass: check.pass,
    order: worst?.order ?? null,
  };
  return { limits, thd, individual, pass: thd.pass && individual.pass };
}
