import { createIntervalParser, type ParseOptions, type ParseOutcome } from "../../../src/core/interval/parser.js";

/** Parse a whole text, or in chunks of `chunk` characters. */
export function parse(text: string, opts: ParseOptions = {}, chunk = 0): ParseOutcome {
  const p = createIntervalParser(opts);
  if (chunk <= 0) p.push(text);
  else for (let i = 0; i < text.length; i += chunk) p.push(text.slice(i, i + chunk));
  return p.end();
}

/** Parse, failing the test with the refusal when the upload is refused. */
export function ok(text: string, opts: ParseOptions = {}) {
  const out = parse(text, opts);
  if (!out.ok) throw new Error(`refused: ${out.fatal.message} ${JSON.stringify(out.fatal.issues)}`);
  return out;
}

export const Z = (s: string) => Date.parse(s);

/** n rows of 15-minute data from 2026-03-01 00:00Z, kW 100 + i, kvar 50 + i. */
export function rows15(
  n = 20,
  header = "timestamp,kW,kvar",
  f = (i: number) => `${new Date(Z("2026-03-01T00:00:00Z") + i * 900_000).toISOString()},${100 + i},${50 + i}`,
) {
  return [header, ...Array.from({ length: n }, (_, i) => f(i))].join("\n") + "\n";
}
