import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import ts from "typescript";
import { describe, expect, it } from "vitest";

/**
 * The engine's texts (notes, warnings, methods, messages) stay within Latin-1 (U+0000-U+00FF): "²", "·", "×", "±"
 * are fine, "≥", "—", "√", "→", "Ω" are not. Why: one character beyond Latin-1 anywhere in a result makes V8 build
 * JSON.stringify's whole text as a two-byte string, and the 25-80 KB answers then cost about twice as much to
 * serialise and to encode as UTF-8 (measured on the bench's sizing: size() plus serialisation 415 -> 142 µs, and
 * POST /v1/sizing 958 -> 1313 req/s). Comments are free to use any character; only string and template literals
 * are checked, found with the TypeScript parser so a comment or a regex is never taken for a text.
 */
const CORE = new URL("../../src/core/", import.meta.url);

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sourceFiles(join(dir, e.name)) : e.name.endsWith(".ts") ? [join(dir, e.name)] : [],
  );
}

/** Every string and template literal piece in a file, with its line. */
function literals(file: string): { line: number; text: string }[] {
  const source = ts.createSourceFile(file, readFileSync(file, "utf8"), ts.ScriptTarget.Latest, true);
  const out: { line: number; text: string }[] = [];
  const visit = (node: ts.Node): void => {
    if (ts.isStringLiteral(node) || ts.isNoSubstitutionTemplateLiteral(node) || ts.isTemplateLiteralToken(node)) {
      out.push({ line: source.getLineAndCharacterOfPosition(node.getStart()).line + 1, text: node.text });
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return out;
}

const beyondLatin1 = /[\u0100-\uffff]/;

describe("src/core's texts are Latin-1", () => {
  const files = sourceFiles(CORE.pathname);

  it("finds the engine's texts (not vacuous)", () => {
    expect(files.length).toBeGreaterThan(50);
    const all = files.flatMap(literals);
    expect(all.length).toBeGreaterThan(500);
    // the check does see a character beyond Latin-1 in a literal, and ignores one in a comment
    const probe = ts.createSourceFile("p.ts", 'const a = "x ≥ y"; // ≥\nconst b = `${a} — z`;', ts.ScriptTarget.Latest, true);
    const seen: string[] = [];
    const visit = (n: ts.Node): void => {
      if (ts.isStringLiteral(n) || ts.isTemplateLiteralToken(n)) seen.push(n.text);
      ts.forEachChild(n, visit);
    };
    visit(probe);
    expect(seen.filter((t) => beyondLatin1.test(t))).toEqual(["x ≥ y", " — z"]);
  });

  it("no string or template literal holds a character beyond U+00FF", () => {
    const offenders = files.flatMap((f) =>
      literals(f)
        .filter((l) => beyondLatin1.test(l.text))
        .map((l) => `${f.slice(CORE.pathname.length)}:${l.line}: ${l.text.slice(0, 80)}`),
    );
    expect(offenders).toEqual([]);
  });
});
