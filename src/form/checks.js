// Numbers, checks and the power triangle of one reading. The messages are the service's own (src/http/schemas/
// sizing.ts and src/core/measurement.ts), so a field reads the same whether the page or the service caught it.

export const MAX_FIGURE = 1e6;
export const VOLTS_MIN = 50;
export const VOLTS_MAX = 35_000;
/** Meter tolerance: kW up to 1 % above kVA reads as unity PF (the service's KW_OVER_KVA_TOLERANCE). */
const KW_OVER_KVA_TOLERANCE = 0.01;
/** A reading more than 10 % off the system voltage is doubtful: IEC 60038 supply tolerance is ±10 % (from memory). */
const VOLTS_TOLERANCE = 0.1;

/** "" → null (missing); "1,5" reads as 1.5; anything else not a number → NaN. */
export function num(raw) {
  const s = String(raw ?? "")
    .trim()
    .replace(",", ".");
  if (s === "") return null;
  return /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(s) ? Number(s) : NaN;
}

const isNum = (v) => v !== null && Number.isFinite(v);

/** Rules: each takes the raw text and returns "" or the service's message. Empty text is "" (the caller decides). */
export const rules = {
  positive:
    (what, max = MAX_FIGURE) =>
    (raw) => {
      const v = num(raw);
      if (!isNum(v)) return `${what} must be a number`;
      if (v <= 0) return `${what} must be greater than 0`;
      return v > max ? `${what} must be at most ${max}` : "";
    },
  range:
    (what, min, max, message, { minExclusive = false } = {}) =>
    (raw) => {
      const v = num(raw);
      if (!isNum(v)) return `${what} must be a number`;
      return (minExclusive ? v <= min : v < min) || v > max ? message : "";
    },
  money: (what) => (raw) => {
    const v = num(raw);
    if (!isNum(v)) return `${what} must be a number`;
    if (v < 0) return `${what} must not be negative`;
    return v > 1e9 ? `${what} must be at most 1000000000` : "";
  },
  whole: (what, min, max) => (raw) => {
    const v = num(raw);
    if (!isNum(v) || !Number.isInteger(v)) return `${what} must be a whole number`;
    return v < min || v > max ? `${what} must be ${min} to ${max}` : "";
  },
  text: (what, max) => (raw) => {
    const s = String(raw ?? "").trim();
    if (s === "") return `${what} must not be empty`;
    return s.length > max ? `${what} must be at most ${max} characters` : "";
  },
  pattern: (re, message) => (raw) => (re.test(String(raw ?? "").trim()) ? "" : message),
};

export const volts = rules.range("volts", VOLTS_MIN, VOLTS_MAX, `volts must be between ${VOLTS_MIN} and ${VOLTS_MAX} V`);
export const pf = rules.range("pf", 0, 1, "pf must be greater than 0 and at most 1", { minExclusive: true });
export const kvar = (raw) => {
  const v = num(raw);
  if (!isNum(v)) return "kvar must be a number";
  return Math.abs(v) > MAX_FIGURE ? `kvar must be within ±${MAX_FIGURE}` : "";
};

export function impedancePct(raw) {
  const v = num(raw);
  if (!isNum(v)) return "impedancePct must be a number";
  if (v <= 0.5) return "impedancePct must be above 0.5 %";
  return v > 25 ? "impedancePct must be at most 25 %" : "";
}

/** "1000/5" → 200, "200" → 200: a CT is labelled primary/secondary; the service takes the ratio. */
export function ctRatioOf(raw) {
  const s = String(raw ?? "").trim();
  if (s === "") return null;
  const m = /^(\S+)\s*[/:]\s*(\S+)$/.exec(s);
  if (!m) return num(s);
  const [a, b] = [num(m[1]), num(m[2])];
  return isNum(a) && isNum(b) && b > 0 ? a / b : NaN;
}
export const ctRatio = (raw) => {
  const v = ctRatioOf(raw);
  const msg = "ctRatio must be greater than 0 (primary/secondary, e.g. 200 for 1000/5)";
  return !isNum(v) || v <= 0 || v > 100_000 ? msg : "";
};

/** "5:30, 7:12" → [{order: 5, pct: 30}, …]; null when empty; a string message when it does not parse. */
export function spectrumOf(raw) {
  const s = String(raw ?? "").trim();
  if (s === "") return null;
  const out = [];
  for (const part of s.split(/[,;\s]+/).filter(Boolean)) {
    const m = /^(\d+)[:=](.+)$/.exec(part);
    const pct = m ? num(m[2]) : NaN;
    if (!m || !isNum(pct)) return `write each harmonic as order:percent, e.g. 5:30, 7:12 (got "${part}")`;
    out.push({ order: Number(m[1]), pct });
  }
  return out;
}
export const spectrum = (raw) => {
  const s = spectrumOf(raw);
  if (typeof s === "string") return s;
  for (const c of s ?? []) {
    if (c.order < 2 || c.order > 50) return "order must be 2 to 50";
    if (c.pct < 0 || c.pct > 300) return "pct must be 0 to 300";
  }
  if (s && new Set(s.map((c) => c.order)).size !== s.length) return "each harmonic order may appear only once";
  if (s && s.reduce((a, c) => a + c.pct, 0) > 300) return "the spectrum sums to more than 300 %, which no real load produces";
  return "";
};

/**
 * A hint, not an error (the service accepts any voltage in range): a reading far from the system voltage, and
 * whether it looks line-to-neutral (V_LL = √3·V_LN on three-phase).
 */
export function voltsHint(rawVolts, system) {
  const v = num(rawVolts);
  if (!system || !isNum(v) || volts(rawVolts)) return "";
  const near = (x, ref) => Math.abs(x - ref) <= ref * VOLTS_TOLERANCE;
  if (near(v, system.voltageV)) return "";
  if (system.phases === 3 && near(v, system.voltageV / Math.sqrt(3)))
    return `${v} V looks line-to-neutral; this system is ${system.voltageV} V line-to-line: enter the line-to-line voltage`;
  return `${v} V is more than 10 % off the building's ${system.voltageV} V system: check the reading or the building`;
}

/** The reading fields each method takes, in the service's names ("sense" where the method has it). */
export const METHODS = {
  kw_pf: ["kW", "pf", "sense"],
  kw_kva: ["kW", "kVA", "sense"],
  kw_kvar: ["kW", "kvar"],
  v_i_kw: ["volts", "amps", "kW", "sense"],
  v_i_pf: ["volts", "amps", "pf", "sense"],
};

/** The check of one reading field; "" when fine. */
export const readingCheck = { kW: rules.positive("kW"), kVA: rules.positive("kVA"), amps: rules.positive("amps"), kvar, volts, pf };
export const thd = rules.range("currentTHDPct", 0, 300, "currentTHDPct must be 0 to 300 %");

/**
 * One reading → { kW, kvar (signed, > 0 lagging), kVA, pf } before quantity, or { error: {field, message} } for a
 * cross-field fault, or null while a reading is missing or wrong. The same steps as triangleOf in
 * src/core/measurement.ts, including the true-PF to displacement-PF step (IEEE Std 1459-2010 decomposition).
 */
export function triangle(m, phases) {
  const fields = METHODS[m.method];
  if (!fields) return null;
  const v = {};
  for (const f of fields) {
    if (f === "sense") continue;
    if (readingCheck[f](m[f])) return null;
    v[f] = num(m[f]);
  }
  const viKVA = () => ((phases === 1 ? 1 : Math.sqrt(3)) * v.volts * v.amps) / 1000;
  let kW;
  let meterPF;
  let sense = m.sense ?? "lagging";
  if (m.method === "kw_kvar") {
    kW = v.kW;
    meterPF = kW / Math.hypot(kW, v.kvar);
    sense = v.kvar > 0 ? "lagging" : v.kvar < 0 ? "leading" : "unity";
  } else if (m.method === "kw_pf" || m.method === "v_i_pf") {
    kW = m.method === "kw_pf" ? v.kW : viKVA() * v.pf;
    meterPF = v.pf;
    if (v.pf === 1) sense = "unity";
  } else {
    const kVA = m.method === "kw_kva" ? v.kVA : viKVA();
    kW = v.kW;
    if (kW > kVA * (1 + KW_OVER_KVA_TOLERANCE))
      return { error: { field: "kW", message: `kW exceeds kVA (${kW} kW against ${Math.round(kVA * 1000) / 1000} kVA): check the readings` } };
    meterPF = Math.min(1, kW / kVA);
    if (meterPF === 1) sense = "unity";
  }
  if (sense === "unity" && meterPF < 0.995 && m.method !== "kw_kvar")
    return {
      error: { field: "sense", message: `sense is "unity" but the reading gives PF ${Math.round(meterPF * 1000) / 1000}: choose lagging or leading` },
    };
  let dpf = meterPF;
  if (m.pfType === "true" && !thd(m.currentTHDPct) && num(m.currentTHDPct) !== null) {
    const t = num(m.currentTHDPct) / 100;
    dpf = Math.min(1, meterPF * Math.sqrt(1 + t * t));
  }
  const sign = sense === "leading" ? -1 : sense === "unity" ? 0 : 1;
  const kvarOut = m.method === "kw_kvar" && m.pfType !== "true" ? v.kvar : dpf >= 1 ? 0 : sign * kW * Math.tan(Math.acos(dpf));
  const kVA = Math.hypot(kW, kvarOut);
  return { kW, kvar: kvarOut, kVA, pf: kVA > 0 ? kW / kVA : 1 };
}

/** kvar to bring kW/kvar to the target PF: Q − P·tan(acos(PF_target)), never below 0. */
export const kvarToTarget = (kW, kvarNow, targetPF) => Math.max(0, kvarNow - kW * Math.tan(Math.acos(targetPF)));

/**
 * A bank's steps as an electrician reads the nameplates: "5 × 50" (or 5x50, 5*50), "50, 50, 25" or "50+50+25", and
 * mixes ("2x50 + 25"). A comma separates steps only with a space after it, so "12,5" stays a decimal comma.
 * Answers [{ kvar }], null when empty, or a message when it does not parse.
 */
export function stepsOf(raw) {
  const s = String(raw ?? "").trim();
  if (s === "") return null;
  const out = [];
  for (const part of s
    .split(/[;+]|,\s+/)
    .map((p) => p.trim())
    .filter(Boolean)) {
    const m = /^(\d+)\s*[x×*]\s*(.+)$/i.exec(part);
    const count = m ? Number(m[1]) : 1;
    const kvar = num(m ? m[2].replace(/\s*kvar$/i, "") : part.replace(/\s*kvar$/i, ""));
    if (!isNum(kvar)) return `write the steps as count × kvar (5 × 50) or one kvar each (50, 50, 25); "${part}" is not`;
    for (let i = 0; i < count && out.length <= 64; i++) out.push({ kvar });
  }
  return out;
}
/** The service's limits on a bank's steps (installedBankSchema in src/http/schemas/sizing.ts). */
export const steps = (raw) => {
  const s = stepsOf(raw);
  if (typeof s === "string") return s;
  if (!s || s.length === 0) return "a bank needs at least one step";
  if (s.length > 32) return "a bank has at most 32 steps";
  for (const x of s) {
    if (x.kvar <= 0) return "kvar must be greater than 0";
    if (x.kvar > 100_000) return "kvar must be at most 100000";
  }
  return "";
};

/** Above this many times a healthy step's current a reading is rejected as a misreading (MAX_CURRENT_RATIO in src/core/bank/installed.ts). */
export const MAX_STEP_CURRENT_RATIO = 3;

/**
 * A healthy installed step's current at voltageV: Q = Q_r·(V/V_r)²·(f/f_r), divided by (1 − p) behind a reactor of
 * p, then I = Q/(√3·V) on three phases, Q/V on one: the service's expectedStep (IEEE Std 18 rating basis).
 */
export function expectedStepA(nameplateKvar, bank, voltageV, system) {
  const ratedHz = bank.ratedFrequencyHz ?? system.frequencyHz;
  const q = (nameplateKvar * (voltageV / bank.ratedVoltageV) ** 2 * (system.frequencyHz / ratedHz)) / (1 - (bank.reactorPct ?? 0) / 100);
  return (q * 1000) / ((system.phases === 1 ? 1 : Math.sqrt(3)) * voltageV);
}

/** A step current's message, "" when fine: the service's own words for a figure above 3 × the expected. */
export function stepAmps(raw, expectedA, nameplateKvar, voltageV) {
  const a = num(raw);
  if (a === null) return "";
  if (!isNum(a)) return "amps must be a number";
  if (a < 0) return "amps must not be negative";
  if (a > MAX_FIGURE) return `amps must be at most ${MAX_FIGURE}`;
  if (a > MAX_STEP_CURRENT_RATIO * expectedA)
    return `${a} A is more than ${MAX_STEP_CURRENT_RATIO} × the ${expectedA.toFixed(1)} A a healthy ${nameplateKvar} kvar step draws at ${voltageV} V: check the clamp's range and the step number`;
  return "";
}
