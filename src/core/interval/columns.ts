/** Finding the columns of an interval file by header name, with user overrides. */

export type Delimiter = "," | ";" | "\t";
export type ReactiveMethod = "kW_kvar" | "kW_pf" | "kW_kVA";

export interface ColumnOverrides {
  timestampColumn?: string;
  dateColumn?: string;
  timeColumn?: string;
  kWColumn?: string;
  kvarColumn?: string;
  pfColumn?: string;
  kVAColumn?: string;
  senseColumn?: string;
}

/** Indexes (0-based) of the columns used; absent roles are −1. */
export interface ColumnMapping {
  timestamp: number;
  date: number;
  time: number;
  kW: number;
  kvar: number;
  pf: number;
  kVA: number;
  sense: number;
  method: ReactiveMethod;
  /** Role → header name, for the report. */
  names: Record<string, string>;
  notes: string[];
}

export interface MappingIssue {
  path: string;
  message: string;
}

/** The most frequent of comma, semicolon and tab in a header line (comma on a tie). */
export function detectDelimiter(line: string): Delimiter {
  let comma = 0,
    semi = 0,
    tab = 0;
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c === 44) comma++;
    else if (c === 59) semi++;
    else if (c === 9) tab++;
  }
  if (semi > comma && semi >= tab) return ";";
  if (tab > comma && tab > semi) return "\t";
  return ",";
}

/** Header cells, trimmed, with surrounding double quotes removed. */
export function splitHeader(line: string, delimiter: Delimiter): string[] {
  const out: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i] as string;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') ((cell += '"'), i++);
      else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"' && cell.trim() === "") ((quoted = true), (cell = ""));
    else if (ch === delimiter) (out.push(cell.trim()), (cell = ""));
    else cell += ch;
  }
  out.push(cell.trim());
  return out;
}

const tokens = (name: string): string[] =>
  name
    .toLowerCase()
    .split(/[^a-z0-9]+/)
    .filter(Boolean);
const has = (t: string[], ...words: string[]) => words.every((w) => t.includes(w));

type AutoRole = "timestamp" | "date" | "time" | "kW" | "kvar" | "pf" | "kVA" | "sense";

/** Which role a header name suggests, by its words (case and punctuation ignored). */
function roleOf(name: string): AutoRole | null {
  const t = tokens(name);
  if (t.length === 0) return null;
  if (has(t, "kvar") || has(t, "kvars")) return "kvar";
  if (has(t, "kva")) return "kVA";
  if (has(t, "kw")) return "kW";
  if (has(t, "sense") || has(t, "leadlag") || has(t, "lead", "lag")) return "sense";
  if (has(t, "pf") || has(t, "power", "factor") || has(t, "cos", "phi") || has(t, "cosphi")) return "pf";
  if (has(t, "timestamp") || has(t, "datetime") || has(t, "date", "time") || has(t, "time", "stamp")) return "timestamp";
  if (has(t, "interval") && (has(t, "end") || has(t, "start") || has(t, "beginning"))) return "timestamp";
  if (t.length === 1 && t[0] === "date") return "date";
  if (t.includes("time")) return "time";
  return null;
}

const AVERAGE_WORDS = ["demand", "avg", "average", "mean", "total", "net"];
const EXTREME_WORDS = ["max", "min", "peak", "maximum", "minimum", "limit", "setpoint"];

/** The preferred of several columns matching one role: the bare role word, then an average, never an extreme first. */
function pick(names: string[], candidates: number[], word: string): number {
  const score = (i: number) => {
    const t = tokens(names[i] as string);
    if (t.join(" ") === word) return 3;
    if (t.some((w) => EXTREME_WORDS.includes(w))) return 0;
    return t.some((w) => AVERAGE_WORDS.includes(w)) ? 2 : 1;
  };
  return candidates.reduce((best, i) => (score(i) > score(best) ? i : best), candidates[0] as number);
}

function resolveOverride(names: string[], field: keyof ColumnOverrides, value: string, issues: MappingIssue[]): number {
  const wanted = value.trim().toLowerCase();
  const byName = names.findIndex((n) => n.toLowerCase() === wanted);
  if (byName >= 0) return byName;
  if (/^\d+$/.test(wanted) && Number(wanted) >= 1 && Number(wanted) <= names.length) return Number(wanted) - 1;
  issues.push({ path: field, message: `no column named "${value}"; the header has: ${names.map((n) => `"${n}"`).join(", ")}` });
  return -1;
}

/** Map header names to roles; explicit overrides win, and an explicit kvar, PF or kVA column chooses the method. */
export function mapColumns(names: string[], overrides: ColumnOverrides): { mapping: ColumnMapping } | { issues: MappingIssue[] } {
  const issues: MappingIssue[] = [];
  const auto: Record<AutoRole, number[]> = { timestamp: [], date: [], time: [], kW: [], kvar: [], pf: [], kVA: [], sense: [] };
  names.forEach((n, i) => {
    const r = roleOf(n);
    if (r) auto[r].push(i);
  });
  const notes: string[] = [];
  const choose = (role: AutoRole, field: keyof ColumnOverrides, word: string): number => {
    const given = overrides[field];
    if (given !== undefined) return resolveOverride(names, field, given, issues);
    const c = auto[role];
    if (c.length === 0) return -1;
    const chosen = pick(names, c, word);
    if (c.length > 1) {
      const others = c.filter((i) => i !== chosen).map((i) => `"${names[i]}"`);
      notes.push(`column "${names[chosen]}" taken as ${word}; also matching: ${others.join(", ")} (set ${field} to choose)`);
    }
    return chosen;
  };
  const kW = choose("kW", "kWColumn", "kw");
  const explicit = (f: keyof ColumnOverrides) => overrides[f] !== undefined;
  const anyExplicit = explicit("kvarColumn") || explicit("pfColumn") || explicit("kVAColumn");
  const pickIf = (role: AutoRole, f: keyof ColumnOverrides, w: string) => (!anyExplicit || explicit(f) ? choose(role, f, w) : -1);
  const kvar = pickIf("kvar", "kvarColumn", "kvar");
  const pf = kvar >= 0 ? -1 : pickIf("pf", "pfColumn", "pf");
  const kVA = kvar >= 0 || pf >= 0 ? -1 : pickIf("kVA", "kVAColumn", "kva");
  const sense = choose("sense", "senseColumn", "sense");
  let timestamp = -1,
    date = -1,
    time = -1;
  if (explicit("dateColumn") || explicit("timeColumn")) {
    date = choose("date", "dateColumn", "date");
    time = choose("time", "timeColumn", "time");
  } else if (explicit("timestampColumn") || auto.timestamp.length > 0) {
    timestamp = choose("timestamp", "timestampColumn", "timestamp");
  } else if (auto.date.length > 0 && auto.time.length > 0) {
    date = choose("date", "dateColumn", "date");
    time = choose("time", "timeColumn", "time");
  } else {
    timestamp = auto.time[0] ?? auto.date[0] ?? -1;
  }
  if (issues.length > 0) return { issues };
  if (timestamp < 0 && (date < 0 || time < 0)) {
    issues.push({
      path: "timestampColumn",
      message: `no timestamp column found (looked for names like "timestamp", "time", "date" + "time") in: ${names.map((n) => `"${n}"`).join(", ")}`,
    });
  }
  if (kW < 0)
    issues.push({ path: "kWColumn", message: `no kW column found (a name containing the word "kW") in: ${names.map((n) => `"${n}"`).join(", ")}` });
  if (kvar < 0 && pf < 0 && kVA < 0) {
    issues.push({
      path: "kvarColumn",
      message: 'no kvar, PF or kVA column found (names containing "kvar", "PF"/"power factor" or "kVA"); set kvarColumn, pfColumn or kVAColumn',
    });
  }
  if (issues.length > 0) return { issues };
  const method: ReactiveMethod = kvar >= 0 ? "kW_kvar" : pf >= 0 ? "kW_pf" : "kW_kVA";
  const all = { timestamp, date, time, kW, kvar, pf, kVA, sense };
  const used = Object.entries(all).filter(([, i]) => i >= 0);
  const seen = new Map<number, string>();
  for (const [role, i] of used) {
    const prior = seen.get(i);
    if (prior) issues.push({ path: `${role}Column`, message: `column "${names[i]}" is already used as ${prior}` });
    seen.set(i, role);
  }
  if (issues.length > 0) return { issues };
  const roleNames = Object.fromEntries(used.map(([role, i]) => [role, names[i] as string]));
  return { mapping: { ...all, method, names: roleNames, notes } };
}
