import { z } from "zod";
import { MAX_STEPS } from "../../core/interval/controller.js";
import type { ParseOptions } from "../../core/interval/parser.js";
import type { CapacitorBank } from "../../core/interval/series-types.js";
import { zoneFor } from "../../core/interval/zone.js";
import { ProblemError, validationProblem, zodErrors } from "../problem.js";

/** Every option of POST /v1/interval-analyses, as query parameters or multipart form fields (all strings). */
export const INTERVAL_OPTION_DOCS = {
  targetPF: { type: "number", description: "target displacement PF, 0.80–1.00 (default 0.95)" },
  timestampColumn: { type: "string", description: "header name (or 1-based index) of the timestamp column" },
  dateColumn: { type: "string", description: "date column when date and time are split (with timeColumn)" },
  timeColumn: { type: "string", description: "time-of-day column when date and time are split" },
  kWColumn: { type: "string", description: "kW column (default: a header containing the word kW)" },
  kvarColumn: { type: "string", description: "kvar column (signed: > 0 lagging)" },
  pfColumn: { type: "string", description: "PF column (fraction; signed negative = leading unless a sense is given)" },
  kVAColumn: { type: "string", description: "kVA column" },
  senseColumn: { type: "string", description: "column with lagging/leading (lag/lead, L/C, ind/cap)" },
  sense: { type: "string", description: "lagging | leading: sense of PF or kVA rows without a sense column" },
  dateOrder: { type: "string", description: "mdy | dmy for dates like 03/01/2026 (default mdy; a first part above 12 is an error)" },
  timeZone: {
    type: "string",
    description: "IANA zone (America/Chicago) or offset (+02:00) of timestamps without one, and of calendar months; default UTC",
  },
  delimiter: { type: "string", description: "comma | semicolon | tab (default: detected from the header)" },
  intervalMinutes: { type: "number", description: "interval length override, minutes (default: the median step)" },
  fixedKvar: { type: "number", description: "bank to simulate: fixed kvar always connected" },
  bankSteps: { type: "string", description: `bank to simulate: switched steps, comma-separated kvar (e.g. 50,50,100; at most ${MAX_STEPS})` },
  leadingLimitPF: { type: "number", description: "leading PF the simulated controller may cause, 0.80–1.00 (default 0.98)" },
  ctRatio: { type: "number", description: "controller CT ratio (e.g. 1000/5 → 200), for the C/k setting" },
  voltageV: { type: "number", description: "line-to-line voltage, V, for the C/k setting" },
} as const satisfies Record<string, { type: "string" | "number"; description: string }>;

export type OptionName = keyof typeof INTERVAL_OPTION_DOCS;
export const OPTION_NAMES = Object.keys(INTERVAL_OPTION_DOCS) as OptionName[];

const num = (min: number, max: number, what: string) =>
  z.coerce
    .number({ error: `${what} must be a number` })
    .refine(Number.isFinite, `${what} must be a finite number`)
    .pipe(z.number().min(min, `${what} must be at least ${min}`).max(max, `${what} must be at most ${max}`));
const column = z.string().trim().min(1, "give a header name or a 1-based column number").max(200);

const schema = z.object({
  targetPF: num(0.8, 1, "targetPF").default(0.95),
  timestampColumn: column.optional(),
  dateColumn: column.optional(),
  timeColumn: column.optional(),
  kWColumn: column.optional(),
  kvarColumn: column.optional(),
  pfColumn: column.optional(),
  kVAColumn: column.optional(),
  senseColumn: column.optional(),
  sense: z.enum(["lagging", "leading"], { error: "sense must be lagging or leading" }).optional(),
  dateOrder: z.enum(["mdy", "dmy"], { error: "dateOrder must be mdy or dmy" }).optional(),
  timeZone: z
    .string()
    .trim()
    .max(64)
    .refine((v) => zoneFor(v) !== null, "not an IANA time-zone name (e.g. America/Chicago) or an offset like +02:00")
    .optional(),
  delimiter: z.enum(["comma", "semicolon", "tab"], { error: "delimiter must be comma, semicolon or tab" }).optional(),
  intervalMinutes: num(1 / 60, 1440, "intervalMinutes").optional(),
  fixedKvar: num(0, 1e6, "fixedKvar").optional(),
  bankSteps: z
    .string()
    .trim()
    .refine(
      (v) => v.split(",").every((s) => /^\s*\d+(\.\d+)?\s*$/.test(s) && Number(s) > 0),
      "bankSteps must be comma-separated kvar values > 0, e.g. 50,50,100",
    )
    .refine((v) => v.split(",").length <= MAX_STEPS, `at most ${MAX_STEPS} steps`)
    .optional(),
  leadingLimitPF: num(0.8, 1, "leadingLimitPF").optional(),
  ctRatio: num(1e-3, 1e6, "ctRatio").optional(),
  voltageV: num(1, 1e6, "voltageV").optional(),
});

export interface IntervalRequestOptions {
  targetPF: number;
  parse: ParseOptions;
  bank: CapacitorBank | null;
  leadingLimitPF: number | undefined;
  ctRatio: number | undefined;
  voltageV: number | undefined;
}

const DELIMITERS = { comma: ",", semicolon: ";", tab: "\t" } as const;

/** Validate the options (query and form fields merged; the same option in both is an error) or throw a 400. */
export function parseIntervalOptions(query: Record<string, unknown>, form: Record<string, string> = {}): IntervalRequestOptions {
  const errors: { path: string; message: string }[] = [];
  const merged: Record<string, unknown> = { ...query };
  for (const [k, v] of Object.entries(form)) {
    if (k in query) errors.push({ path: k, message: "given both in the query and as a form field; give it once" });
    merged[k] = v;
  }
  for (const k of Object.keys(merged)) {
    if (!(OPTION_NAMES as string[]).includes(k)) errors.push({ path: k, message: `unknown option; the options are: ${OPTION_NAMES.join(", ")}` });
  }
  const parsed = schema.safeParse(merged);
  if (!parsed.success) errors.push(...zodErrors(parsed.error));
  if (errors.length > 0 || !parsed.success) throw new ProblemError(validationProblem(errors));
  const o = parsed.data;
  if ((o.ctRatio === undefined) !== (o.voltageV === undefined)) {
    throw new ProblemError(
      validationProblem([
        { path: o.ctRatio === undefined ? "ctRatio" : "voltageV", message: "ctRatio and voltageV go together (both are needed for the C/k setting)" },
      ]),
    );
  }
  const steps = o.bankSteps === undefined || o.bankSteps === "" ? [] : o.bankSteps.split(",").map(Number);
  const parse: ParseOptions = {
    timestampColumn: o.timestampColumn,
    dateColumn: o.dateColumn,
    timeColumn: o.timeColumn,
    kWColumn: o.kWColumn,
    kvarColumn: o.kvarColumn,
    pfColumn: o.pfColumn,
    kVAColumn: o.kVAColumn,
    senseColumn: o.senseColumn,
    sense: o.sense,
    dateOrder: o.dateOrder,
    timeZone: o.timeZone,
    intervalMinutes: o.intervalMinutes,
    delimiter: o.delimiter ? DELIMITERS[o.delimiter] : undefined,
  };
  for (const k of Object.keys(parse) as (keyof ParseOptions)[]) if (parse[k] === undefined) delete parse[k];
  return {
    targetPF: o.targetPF,
    parse,
    bank: o.fixedKvar !== undefined || steps.length > 0 ? { fixedKvar: o.fixedKvar ?? 0, stepsKvar: steps } : null,
    leadingLimitPF: o.leadingLimitPF,
    ctRatio: o.ctRatio,
    voltageV: o.voltageV,
  };
}
