/** Frequency scan of the driving-point impedance |Z(h)| with located resonance peaks and series dips. */
import { drivingPointImpedanceOhm, fillImpedanceOhm, sourceImpedanceOhmAt, type BusModel } from "./network.js";
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

/** A parallel resonance: a local maximum of |Z(h)|. */
export interface ResonancePeak {
  order: number;
  impedanceOhm: number;
  /** |Z(h)| / |Z_s(h)|: how much the bank amplifies the source impedance at that order. */
  timesSourceImpedance: number;
  /** |Z(h)| / Z_base. */
  timesBaseImpedance: number;
}

/** A series-tuned dip: a local minimum of |Z(h)| (a detuned stage near h = 1/√p). */
export interface ImpedanceDip {
  order: number;
  impedanceOhm: number;
}

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
  if (!Number.isFinite(o.toOrder) || o.toOrder <= o.fromOrder) issues.push({ path: `${path}.toOrder`, message: "must be a number greater than fromOrder" });
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

const GOLDEN = (Math.sqrt(5) - 1) / 2;

/** Golden-section search on the exact |Z(h)| inside the grid bracket: refines a grid extremum to ~1e-12 in h. */
function refineExtremum(model: BusModel, lo: number, hi: number, sign: 1 | -1): number {
  let a = lo;
  let b = hi;
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let fc = sign * drivingPointImpedanceOhm(model, c);
  let fd = sign * drivingPointImpedanceOhm(model, d);
  for (let i = 0; i < 60 && b - a > 1e-12 * b; i++) {
    if (fc > fd) {
      b = d; d = c; fd = fc;
      c = b - GOLDEN * (b - a);
      fc = sign * drivingPointImpedanceOhm(model, c);
    } else {
      a = c; c = d; fc = fd;
      d = a + GOLDEN * (b - a);
      fd = sign * drivingPointImpedanceOhm(model, d);
    }
  }
  return (a + b) / 2;
}

/** Scans |Z(h)| on a uniform grid; h_i = from + i·step (not accumulated, so no drift). */
export function scanImpedance(model: BusModel, options?: ScanOptions): ImpedanceScan {
  const grid = resolveScanGrid(options);
  const n = grid.points;
  const ordersH = new Float64Array(n);
  const impedanceOhm = new Float64Array(n);
  fillImpedanceOhm(model, grid.fromOrder, grid.stepOrder, ordersH, impedanceOhm);
  const peaks: ResonancePeak[] = [];
  const dips: ImpedanceDip[] = [];
  for (let i = 1; i < n - 1; i++) {
    const prev = impedanceOhm[i - 1]!;
    const here = impedanceOhm[i]!;
    const next = impedanceOhm[i + 1]!;
    const lo = ordersH[i - 1]!;
    const hi = ordersH[i + 1]!;
    if (here > prev && here >= next) {
      const order = refineExtremum(model, lo, hi, 1);
      const z = drivingPointImpedanceOhm(model, order);
      peaks.push({
        order,
        impedanceOhm: z,
        timesSourceImpedance: z / sourceImpedanceOhmAt(model.source, order),
        timesBaseImpedance: z / model.source.baseImpedanceOhm,
      });
    } else if (here < prev && here <= next) {
      const order = refineExtremum(model, lo, hi, -1);
      dips.push({ order, impedanceOhm: drivingPointImpedanceOhm(model, order) });
    }
  }
  return { grid, ordersH, impedanceOhm, peaks, dips };
}
