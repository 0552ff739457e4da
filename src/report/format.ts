/**
 * Every number the report prints is formatted here, so HTML, PDF and tests agree on the digits.
 * Plain ASCII: "-" for minus, "," for thousands (en-US grouping), no locale lookups at run time.
 */

const cache = new Map<number, Intl.NumberFormat>();

function fixed(value: number, digits: number): string {
  if (!Number.isFinite(value)) return value > 0 ? "inf" : value < 0 ? "-inf" : "n/a";
  let f = cache.get(digits);
  if (!f) {
    f = new Intl.NumberFormat("en-US", { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: true });
    cache.set(digits, f);
  }
  // Intl may print "-0.0" for tiny negatives: a signed zero means nothing on a report.
  const s = f.format(value);
  return /^-0(\.0+)?$/.test(s) ? s.slice(1) : s;
}

const orNA =
  (f: (x: number) => string) =>
  (x: number | null | undefined): string =>
    x === null || x === undefined ? "n/a" : f(x);

export const fmt = {
  /** kW, kvar, kVA: 1 decimal. */
  power: orNA((x) => fixed(x, 1)),
  /** Power factor: 3 decimals. */
  pf: orNA((x) => fixed(x, 3)),
  /** Harmonic or resonance order: 2 decimals. */
  order: orNA((x) => fixed(x, 2)),
  /** Currents, A: 1 decimal. */
  amps: orNA((x) => fixed(x, 1)),
  /** Voltages, V: whole volts. */
  volts: orNA((x) => fixed(x, 0)),
  /** Percentages: 1 decimal. */
  pct: orNA((x) => fixed(x, 1)),
  /** Percentages that are usually small (voltage rise, THD): 2 decimals. */
  pct2: orNA((x) => fixed(x, 2)),
  /** Short-circuit strength, kVA: whole kVA. */
  kva0: orNA((x) => fixed(x, 0)),
  /** Capacitance, microfarad: 1 decimal. */
  uF: orNA((x) => fixed(x, 1)),
  /** Ohms: 4 significant figures. */
  ohm: orNA((x) => (x === 0 ? "0" : x.toPrecision(4))),
  /** Hertz: 1 decimal. */
  hz: orNA((x) => fixed(x, 1)),
  /** Seconds: whole seconds. */
  seconds: orNA((x) => fixed(x, 0)),
  /** Watts: 1 decimal. */
  watts: orNA((x) => fixed(x, 1)),
  /** Years of payback: 1 decimal. */
  years: orNA((x) => fixed(x, 1)),
  /** Angle in degrees: 1 decimal. */
  degrees: orNA((x) => fixed(x, 1)),
  /** Plain number with the given digits. */
  num: (x: number | null | undefined, digits = 2): string => (x === null || x === undefined ? "n/a" : fixed(x, digits)),
  /** Money: 2 decimals and the ISO 4217 code, e.g. "1,234.56 USD". */
  money: (x: number | null | undefined, currency: string): string => (x === null || x === undefined ? "n/a" : `${fixed(x, 2)} ${currency}`),
  /** Ohms that may be infinite (no discharge limit). */
  ohmOrNone: (x: number): string => (Number.isFinite(x) ? (x >= 1000 ? `${fixed(x / 1000, 1)} k` : fixed(x, 0)) : "no limit"),
  yesNo: (b: boolean): string => (b ? "yes" : "no"),
  passFail: (b: boolean): string => (b ? "PASS" : "FAIL"),
};

/** A date-time as given (ISO 8601) shown with a space instead of "T"; anything else is shown as it is. */
export function dateTime(iso: string): string {
  return /^\d{4}-\d{2}-\d{2}T/.test(iso) ? iso.replace("T", " ") : iso;
}

export function phasesText(phases: number): string {
  return phases === 3 ? "three-phase" : "single-phase";
}

export function ordinal(n: number): string {
  const s = n % 100 >= 11 && n % 100 <= 13 ? "th" : (({ 1: "st", 2: "nd", 3: "rd" } as Record<number, string>)[n % 10] ?? "th");
  return `${n}${s}`;
}
