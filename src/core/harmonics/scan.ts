/** Frequency scan of the driving-point impedance |Z(h)|, with its resonance peaks and series dips. */
import { impedanceExtrema, type ImpedanceDip, type ResonancePeak } from "./extrema.js";
import { fillImpedanceOhm, type BusModel } from "./network.js";
import { fillPlannedImpedanceOhm, planScan } from "./scan-fill.js";
import type { Issue } from "./study-types.js";

export interface ScanOptions {
  fromOrder?: number;
  toOrder?: number;
  stepOrder?: number;
}

export interface ScanGrid {
  fromOrder: number;
  toOrder: number;
  stepOrder: number;
  points: number;
}

export type { ResonancePeak, ImpedanceDip };

export interface ImpedanceScan {
  grid: ScanGrid;
  ordersH: Float64Array;
  impedanceOhm: Float64Array;
  peaks: ResonancePeak[];
  dips: ImpedanceDip[];
}

export const DEFAULT_SCAN: Readonly<Required<ScanOptions>> = { fromOrder: 1, toOrder: 50, stepOrder: 0.01 };
export const MAX_SCAN_POINTS = 100_000;

function pointCount(from: number, to: number, step: number): number {
  // The small allowance keeps the end point when (to − from)/step is an integer spoiled by rounding.
  return Math.floor((to - from) / step + 1e-9) + 1;
}

export function validateScanOptions(options: ScanOptions | undefined, path = "scan"): Issue[] {
  const o = { ...DEFAULT_SCAN, ...stripUndefined(options) };
  const issues: Issue[] = [];
  if (!Number.isFinite(o.fromOrder) || o.fromOrder <= 0) issues.push({ path: `${path}.fromOrder`, message: "must be a number > 0" });
  if (!Number.isFinite(o.toOrder) || o.toOrder <= o.fromOrder)
    issues.push({ path: `${path}.toOrder`, message: "must be a number greater than fromOrder" });
  if (!Number.isFinite(o.stepOrder) || o.stepOrder <= 0) issues.push({ path: `${path}.stepOrder`, message: "must be a number > 0" });
  if (issues.length === 0 && pointCount(o.fromOrder, o.toOrder, o.stepOrder) > MAX_SCAN_POINTS)
    issues.push({ path: `${path}.stepOrder`, message: `scan would exceed ${MAX_SCAN_POINTS} points` });
  return issues;
}

function stripUndefined(options: ScanOptions | undefined): ScanOptions {
  const out: ScanOptions = {};
  if (options?.fromOrder !== undefined) out.fromOrder = options.fromOrder;
  if (options?.toOrder !== undefined) out.toOrder = options.toOrder;
  if (options?.stepOrder !== undefined) out.stepOrder = options.stepOrder;
  return out;
}

/** Throws RangeError on invalid options (see validateScanOptions for a non-throwing check). */
export function resolveScanGrid(options?: ScanOptions): ScanGrid {
  const issues = validateScanOptions(options);
  if (issues.length > 0) throw new RangeError(issues.map((i) => `${i.path}: ${i.message}`).join("; "));
  const o = { ...DEFAULT_SCAN, ...stripUndefined(options) };
  return { ...o, points: pointCount(o.fromOrder, o.toOrder, o.stepOrder) };
}

/**
 * |Z(h)| on a uniform grid (h_i = from + i·step, not accumulated, so no drift) for plots; the peaks and dips are
 * located on the exact |Z(h)| without the grid (extrema.ts), so they do not depend on the step.
 * The grid is filled by the one-division loop of scan-fill.ts when its range bound holds for this model and range,
 * else by the reciprocal-per-term loop; both compute the same |Z(h)|.
 */
export function scanImpedance(model: BusModel, options?: ScanOptions): ImpedanceScan {
  const grid = resolveScanGrid(options);
  // One allocation for both series (two views of one buffer): half the allocator and GC work per scan.
  const both = new Float64Array(2 * grid.points);
  const ordersH = both.subarray(0, grid.points);
  const impedanceOhm = both.subarray(grid.points);
  const last = grid.fromOrder + (grid.points - 1) * grid.stepOrder;
  const plan = planScan(model, grid.fromOrder, last);
  if (plan) fillPlannedImpedanceOhm(plan, grid.fromOrder, grid.stepOrder, ordersH, impedanceOhm);
  else fillImpedanceOhm(model, grid.fromOrder, grid.stepOrder, ordersH, impedanceOhm);
  return { grid, ordersH, impedanceOhm, ...impedanceExtrema(model, grid.fromOrder, last) };
}

/** The peaks and dips scanImpedance would report for these options, without computing the grid. */
export function extremaInScanRange(model: BusModel, options?: ScanOptions): Pick<ImpedanceScan, "peaks" | "dips"> {
  const grid = resolveScanGrid(options);
  return impedanceExtrema(model, grid.fromOrder, grid.fromOrder + (grid.points - 1) * grid.stepOrder);
}
