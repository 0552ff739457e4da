/**
 * How much a finding weighs: "info" is worth knowing and needs no action, "warning" calls for a look before the
 * order is placed, "error" is a limit of a standard broken by the design as it stands.
 */
export type Severity = "info" | "warning" | "error";

/**
 * A finding the electrician should read, one per concern; `path` points into the request when one field caused it,
 * and `subjects` lists the stages or loads the concern covers when it covers more than one thing.
 */
export interface Warning {
  code: string;
  message: string;
  severity: Severity;
  path?: string;
  subjects?: string[];
}

/** A plausibility failure that makes a reading unusable: reported as a 400 with its path. */
export interface InputIssue {
  path: (string | number)[];
  message: string;
}

export interface WarningDetail {
  /** Default "warning". */
  severity?: Severity;
  subjects?: string[];
}

export function warning(code: string, message: string, path?: string, detail: WarningDetail = {}): Warning {
  const w: Warning = { code, message, severity: detail.severity ?? "warning" };
  if (path !== undefined) w.path = path;
  if (detail.subjects && detail.subjects.length > 0) w.subjects = [...detail.subjects];
  return w;
}

const RANK: Record<Severity, number> = { info: 0, warning: 1, error: 2 };

/** The heavier of severities, for a concern that gathers several findings. */
export function worstSeverity(severities: readonly Severity[]): Severity {
  return severities.reduce<Severity>((a, b) => (RANK[b] > RANK[a] ? b : a), "info");
}

/**
 * Against an IEEE Std 18 continuous limit (percent of rating): above the limit an error; above halfway from 100 %
 * to the limit a warning (105 % for rms voltage, whose limit is 110 %; own rule: half the contingency allowance
 * used up is no longer a design margin); above 100 % information, the standard permitting it; else null.
 */
export function ieee18Severity(valuePct: number, limitPct: number): Severity | null {
  if (valuePct > limitPct) return "error";
  if (valuePct > 100 + (limitPct - 100) / 2) return "warning";
  if (valuePct > 100) return "info";
  return null;
}

/** "1, 2, 3, 5" → "1–3, 5": stage lists stay short. */
export function compactList(ns: readonly number[]): string {
  const sorted = [...new Set(ns)].sort((a, b) => a - b);
  const parts: string[] = [];
  for (let i = 0; i < sorted.length;) {
    let j = i;
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j]! + 1) j++;
    parts.push(j - i >= 2 ? `${sorted[i]}-${sorted[j]}` : sorted.slice(i, j + 1).join(", "));
    i = j + 1;
  }
  return parts.join(", ");
}

/**
 * One warning per concern: warnings of one code that each name one subject (a load) become one listing them all.
 * When every message is "subject: same text" the text is said once; otherwise each subject keeps its own words.
 * The merged warning points at `commonPath`; a code raised once is kept as it was.
 */
export function mergeBySubject(ws: readonly Warning[], commonPath: string): Warning[] {
  const groups = new Map<string, Warning[]>();
  const out: (Warning | string)[] = [];
  for (const w of ws) {
    if (!w.subjects || w.subjects.length !== 1) {
      out.push(w);
      continue;
    }
    const g = groups.get(w.code);
    if (g) g.push(w);
    else {
      groups.set(w.code, [w]);
      out.push(w.code);
    }
  }
  return out.map((x) => {
    if (typeof x !== "string") return x;
    const g = groups.get(x)!;
    if (g.length === 1) return g[0]!;
    const subjects = g.map((w) => w.subjects![0]!);
    const texts = g.map((w, i) => (w.message.startsWith(`${subjects[i]}: `) ? w.message.slice(subjects[i]!.length + 2) : w.message));
    const same = texts.every((t) => t === texts[0]);
    const message = same ? `${subjects.join(", ")}: ${texts[0]}` : g.map((w) => w.message).join("; ");
    return warning(x, message, commonPath, { severity: worstSeverity(g.map((w) => w.severity)), subjects });
  });
}
