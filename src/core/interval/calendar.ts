/** Calendar arithmetic on day counts and wall-clock milliseconds (proleptic Gregorian, no allocation). */

export const MS_PER_MINUTE = 60_000;
export const MS_PER_HOUR = 3_600_000;
export const MS_PER_DAY = 86_400_000;

/** Days since 1970-01-01 of a proleptic Gregorian date (H. Hinnant, "chrono-compatible low-level date algorithms"). */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month + (month > 2 ? -3 : 9)) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/** Month index year·12 + (month − 1) of a day count (inverse of daysFromCivil, same source). */
export function monthIndexOfDays(days: number): number {
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const month = mp < 10 ? mp + 3 : mp - 9;
  const year = yoe + era * 400 + (month <= 2 ? 1 : 0);
  return year * 12 + month - 1;
}

export function monthLabel(monthIndex: number): string {
  const year = Math.floor(monthIndex / 12);
  const month = monthIndex - year * 12 + 1;
  return `${year}-${month < 10 ? "0" : ""}${month}`;
}

export function daysInMonth(year: number, month: number): number {
  if (month === 2) return year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0) ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

/** ISO 8601 text of an instant shown in a fixed offset, e.g. "2026-03-01T14:15:00-06:00". */
export function isoWithOffset(utcMs: number, offsetMs: number): string {
  const local = new Date(utcMs + offsetMs).toISOString().slice(0, 19);
  if (offsetMs === 0) return `${local}Z`;
  const m = Math.round(Math.abs(offsetMs) / MS_PER_MINUTE);
  const hh = String(Math.floor(m / 60)).padStart(2, "0");
  const mm = String(m % 60).padStart(2, "0");
  return `${local}${offsetMs < 0 ? "-" : "+"}${hh}:${mm}`;
}

const C0 = 48;

/**
 * The common shape "YYYY-MM-DD[T ]HH:MM[:SS][Z]" read by position from bytes, without loops: its wall-clock ms
 * (as if UTC), or NaN when the text is anything else (the general parser then reads or rejects it).
 */
export function fastIsoWallMs(b: Uint8Array, p: number, end: number): number {
  const len = end - p;
  if (len !== 16 && len !== 17 && len !== 19 && len !== 20) return Number.NaN;
  if (b[p + 4] !== 45 || b[p + 7] !== 45 || b[p + 13] !== 58) return Number.NaN;
  const sep = b[p + 10];
  if (sep !== 84 && sep !== 32) return Number.NaN;
  let second = 0;
  if (len >= 19) {
    if (b[p + 16] !== 58) return Number.NaN;
    second = twoDigits(b, p + 17);
  }
  if (len === 17 || len === 20) {
    const z = b[end - 1];
    if (z !== 90 && z !== 122) return Number.NaN;
  }
  const year = twoDigits(b, p) * 100 + twoDigits(b, p + 2);
  const month = twoDigits(b, p + 5);
  const day = twoDigits(b, p + 8);
  const hour = twoDigits(b, p + 11);
  const minute = twoDigits(b, p + 14);
  // NaN from a non-digit fails every comparison below
  if (!(month >= 1 && month <= 12 && day >= 1 && day <= daysInMonth(year, month) && hour <= 23 && minute <= 59 && second <= 59)) return Number.NaN;
  const key = (year * 16 + month) * 32 + day;
  if (key !== lastDateKey) {
    lastDateKey = key;
    lastDateDays = daysFromCivil(year, month, day); // consecutive rows mostly share their date
  }
  return lastDateDays * MS_PER_DAY + ((hour * 60 + minute) * 60 + second) * 1000;
}

let lastDateKey = -1;
let lastDateDays = 0;

/** Two decimal digits at p as a number, NaN if either is not a digit. */
function twoDigits(b: Uint8Array, p: number): number {
  const x = (b[p] as number) - C0;
  const y = (b[p + 1] as number) - C0;
  return x >>> 0 > 9 || y >>> 0 > 9 ? Number.NaN : x * 10 + y;
}
