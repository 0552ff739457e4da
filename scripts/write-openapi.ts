/**
 * Write the OpenAPI document generated from the zod schemas to openapi/openapi.json.
 * Run with `npm run openapi`; test/api/openapi.test.ts fails when the committed file is stale.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { openapiDocument } from "../src/http/openapi.js";

export const OPENAPI_PATH = resolve(dirname(fileURLToPath(import.meta.url)), "..", "openapi", "openapi.json");

/** The file's exact text: 2-space JSON and a final newline. */
export function openapiText(): string {
  return `${JSON.stringify(openapiDocument(), null, 2)}\n`;
}

function main(): void {
  mkdirSync(dirname(OPENAPI_PATH), { recursive: true });
  writeFileSync(OPENAPI_PATH, openapiText());
  process.stdout.write(`wrote ${OPENAPI_PATH}\n`);
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) main();
