import type { z } from "zod";
import type { InputIssue } from "../core/warnings.js";
import { pathOf, ProblemError, validationProblem, zodErrors } from "./problem.js";

/** Parse with a zod schema or throw a 400 problem naming each field. */
export function parseOr400<S extends z.ZodType>(schema: S, value: unknown, prefix: (string | number)[] = []): z.infer<S> {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new ProblemError(validationProblem(zodErrors(parsed.error, prefix)));
  return parsed.data;
}

/** The engine's plausibility issues (e.g. kW above kVA) as a 400. */
export function engineIssuesTo400(issues: InputIssue[], prefix: (string | number)[] = []): ProblemError {
  return new ProblemError(validationProblem(issues.map((i) => ({ path: pathOf([...prefix, ...i.path]), message: i.message }))));
}
