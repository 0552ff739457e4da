/** Every warning of the result (and of a supplied design or placement), with its code. */
import type { Warning } from "../../core/warnings.js";
import type { ReportInput, Section } from "../types.js";

export function allWarnings(input: ReportInput): (Warning & { from: string })[] {
  const all = [
    ...input.result.warnings.map((w) => ({ ...w, from: "sizing" })),
    ...(input.placement?.warnings ?? []).map((w) => ({ ...w, from: "placement" })),
    ...(input.design?.warnings ?? []).map((w) => ({ ...w, from: "design" })),
  ];
  // A supplied plan or design may repeat what the sizing already said (the engine plans and designs too): once each.
  const seen = new Set<string>();
  return all.filter((w) => {
    const key = `${w.code}|${w.message}|${w.path ?? ""}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

export function warningsSection(input: ReportInput): Section {
  const ws = allWarnings(input);
  if (ws.length === 0)
    return { id: "warnings", heading: "Warnings", blocks: [{ kind: "paragraph", text: "No warnings: the readings and banks raised no findings." }] };
  const counts = new Map<string, number>();
  for (const w of ws) counts.set(w.severity ?? "warning", (counts.get(w.severity ?? "warning") ?? 0) + 1);
  const summary = (["error", "warning", "info"] as const)
    .filter((s) => counts.has(s))
    .map((s) => `${{ error: "errors", warning: "warnings", info: "information" }[s]} ${counts.get(s)}`)
    .join(", ");
  return {
    id: "warnings",
    heading: "Warnings",
    blocks: [
      { kind: "paragraph", text: `${ws.length} finding(s), one per concern: ${summary}.` },
      {
        kind: "table",
        header: ["Severity", "Code", "Message", "Where"],
        align: ["left", "left", "left", "left"],
        rows: ws.map((w) => [
          w.severity ?? "warning",
          w.code,
          w.message,
          `${w.path ? `${w.from}: ${w.path}` : w.from}${w.subjects && w.subjects.length > 0 ? ` (${w.subjects.join(", ")})` : ""}`,
        ]),
      },
    ],
  };
}
