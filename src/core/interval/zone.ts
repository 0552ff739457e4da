import { daysFromCivil, MS_PER_DAY, MS_PER_HOUR, MS_PER_MINUTE } from "./datetime.js";

/**
 * A time zone: the UTC offset at an instant, and local wall-clock time → UTC. IANA zones use the platform's
 * time-zone database through Intl; offsets are cached per UTC day (per hour on a transition day) so a year of
 * 1-minute rows costs a few hundred Intl calls.
 */
export interface Zone {
  /** Canonical text: "UTC", "+02:00" or the IANA name. */
  readonly name: string;
  /** Offset of local time from UTC at an instant, ms (local = UTC + offset). */
  offsetMsAt(utcMs: number): number;
  /**
   * UTC instant of a local wall-clock time (wall ms counted as if UTC). A time that occurs twice (DST fall-back)
   * maps to the earlier instant unless that is not after `afterUtcMs` (the previous row); a time that does not
   * exist (DST spring-forward gap) gives NaN.
   */
  wallToUtc(wallMs: number, afterUtcMs: number): number;
}

/** "+02:00", "-0530", "+05" → ms, or NaN. */
export function parseFixedOffsetMs(text: string): number {
  const m = /^([+-])(\d{2}):?(\d{2})?$/.exec(text.trim());
  if (!m) return Number.NaN;
  const hours = Number(m[2]);
  const minutes = Number(m[3] ?? "0");
  if (hours > 18 || minutes > 59) return Number.NaN;
  return (m[1] === "-" ? -1 : 1) * (hours * 60 + minutes) * MS_PER_MINUTE;
}

export function offsetText(offsetMs: number): string {
  if (offsetMs === 0) return "UTC";
  const m = Math.round(Math.abs(offsetMs) / MS_PER_MINUTE);
  return `${offsetMs < 0 ? "-" : "+"}${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
}

export function fixedZone(offsetMs: number): Zone {
  return { name: offsetText(offsetMs), offsetMsAt: () => offsetMs, wallToUtc: (wallMs) => wallMs - offsetMs };
}

export const UTC_ZONE = fixedZone(0);

const zones = new Map<string, Zone | null>();

/** The zone named by an IANA name or a fixed offset ("UTC", "Z", "+02:00"); null when it is not one. Cached by name. */
export function zoneFor(text: string): Zone | null {
  let zone = zones.get(text);
  if (zone === undefined) {
    zone = makeZone(text);
    if (zones.size < 1000) zones.set(text, zone);
  }
  return zone;
}

function makeZone(text: string): Zone | null {
  const t = text.trim();
  if (t === "") return null;
  if (/^(utc|gmt|z)$/i.test(t)) return UTC_ZONE;
  const fixed = parseFixedOffsetMs(t);
  if (!Number.isNaN(fixed)) return fixedZone(fixed);
  if (/^[+-]/.test(t)) return null;
  let format: Intl.DateTimeFormat;
  try {
    format = new Intl.DateTimeFormat("en-US", {
      timeZone: t,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
      era: "short",
    });
  } catch {
    return null;
  }
  return ianaZone(format.resolvedOptions().timeZone, format);
}

function ianaZone(name: string, format: Intl.DateTimeFormat): Zone {
  const exact = (utcMs: number): number => {
    const whole = Math.floor(utcMs / 1000) * 1000;
    let y = 0,
      mo = 0,
      d = 0,
      h = 0,
      mi = 0,
      s = 0,
      bc = false;
    for (const part of format.formatToParts(whole)) {
      switch (part.type) {
        case "year":
          y = Number(part.value);
          break;
        case "month":
          mo = Number(part.value);
          break;
        case "day":
          d = Number(part.value);
          break;
        case "hour":
          h = Number(part.value);
          break;
        case "minute":
          mi = Number(part.value);
          break;
        case "second":
          s = Number(part.value);
          break;
        case "era":
          bc = part.value.startsWith("B");
          break;
      }
    }
    const wall = daysFromCivil(bc ? 1 - y : y, mo, d) * MS_PER_DAY + ((h * 60 + mi) * 60 + s) * 1000;
    return wall - whole;
  };
  const dayCache = new Map<number, number>();
  const hourCache = new Map<number, number>();
  let memoStart = Number.NaN;
  let memoOffset = 0;
  // Constant over a span when equal at both ends: no zone changes its offset and back within three days (tz database).
  const cached = (cache: Map<number, number>, key: number, spanMs: number): number => {
    let v = cache.get(key);
    if (v === undefined) {
      const a = exact(key * spanMs);
      v = a === exact(key * spanMs + spanMs - 1000) ? a : Number.NaN;
      cache.set(key, v);
    }
    return v;
  };
  const offsetMsAt = (utcMs: number): number => {
    if (utcMs >= memoStart && utcMs < memoStart + MS_PER_DAY) return memoOffset;
    const day = Math.floor(utcMs / MS_PER_DAY);
    const dayOffset = cached(dayCache, day, MS_PER_DAY);
    if (!Number.isNaN(dayOffset)) {
      memoStart = day * MS_PER_DAY;
      memoOffset = dayOffset;
      return dayOffset;
    }
    const hourOffset = cached(hourCache, Math.floor(utcMs / MS_PER_HOUR), MS_PER_HOUR);
    return Number.isNaN(hourOffset) ? exact(utcMs) : hourOffset;
  };
  let wallMemoDay = Number.NaN;
  let wallMemoOffset = Number.NaN;
  const wallToUtc = (wallMs: number, afterUtcMs: number): number => {
    const wallDay = Math.floor(wallMs / MS_PER_DAY);
    if (wallDay !== wallMemoDay) {
      wallMemoDay = wallDay;
      // Offsets lie within ±18 h, so the wall day's instants lie in [day − 1, day + 2) UTC.
      const a = offsetMsAt((wallDay - 1) * MS_PER_DAY);
      wallMemoOffset = a === offsetMsAt((wallDay + 2) * MS_PER_DAY - 1000) ? a : Number.NaN;
    }
    if (!Number.isNaN(wallMemoOffset)) return wallMs - wallMemoOffset;
    const before = offsetMsAt(wallMs - MS_PER_DAY);
    const after = offsetMsAt(wallMs + MS_PER_DAY);
    const c1 = wallMs - before;
    const c2 = wallMs - after;
    const ok1 = offsetMsAt(c1) === before;
    const ok2 = c2 !== c1 && offsetMsAt(c2) === after;
    if (ok1 && ok2) {
      const early = Math.min(c1, c2);
      const late = Math.max(c1, c2);
      return Number.isNaN(afterUtcMs) || early > afterUtcMs ? early : late;
    }
    if (ok1) return c1;
    if (ok2) return c2;
    return Number.NaN;
  };
  return { name, offsetMsAt, wallToUtc };
}
