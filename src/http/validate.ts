import type { z } from "zod";
import type { InputIssue } from "../core/warnings.js";
import { pathOf, ProblemError, validationProblem, zodErrors } from "./problem.js";

/** Parse with a zod schema or throw a 400 problem naming each field. */
export function parseOr400<S extends z.ZodType>(schema: S, value: unknown, prefix: (string | number)[] = []): z.infer<S> {
  const nul = pathOfNul(value, prefix);
  if (nul) throw new ProblemError(validationProblem([{ path: pathOf(nul), message: "must not contain the NUL character (U+0000)" }]));
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new ProblemError(validationProblem(zodErrors(parsed.error, prefix)));
  return parsed.data;
}

/** The engine's plausibility issues (e.g. kW above kVA) as a 400. */
export function engineIssuesTo400(issues: InputIssue[], prefix: (string | number)[] = []): ProblemError {
  return new ProblemError(validationProblem(issues.map((i) => ({ path: pathOf([...prefix, ...i.path]), message: i.message }))));
}

/**
 * The path of the first string (or object key) holding U+0000, or null. No field has a use for it, PostgreSQL's text
 * and jsonb cannot store it, and a terminal or CSV reader may cut the value there: refused everywhere, on both stores.
 */
function pathOfNul(value: unknown, prefix: (string | number)[]): (string | number)[] | null {
  const below = nulBelow(value);
  return below ? [...prefix, ...below] : null;
}

/** The walk behind pathOfNul: allocates nothing until it finds one (it runs on every request body). */
function nulBelow(value: unknown): (string | number)[] | null {
  if (typeof value === "string") return value.includes("\u0000") ? [] : null;
  if (typeof value !== "object" || value === null) return null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = nulBelow(value[i]);
      if (found) return [i, ...found];
    }
    return null;
  }
  for (const key in value) {
    if (!Object.hasOwn(value, key)) continue;
    if (key.includes("\u0000")) return [key];
    const found = nulBelow((value as Record<string, unknown>)[key]);
    if (found) return [key, ...found];
  }
  return null;
}
