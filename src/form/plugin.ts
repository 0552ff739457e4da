import { existsSync, readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { FastifyInstance } from "fastify";

/**
 * The tablet survey page: `/` (HTML), `/form/form.css` and `/form/form.js`, hand-written files read once at start-up.
 * The page is open (no key); the key it asks for is sent only on its /v1 calls.
 */
export const FORM_CSP =
  "default-src 'none'; script-src 'self'; style-src 'self'; connect-src 'self'; img-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

const ASSETS: readonly { url: string; file: string; type: string }[] = [
  { url: "/", file: "index.html", type: "text/html; charset=utf-8" },
  { url: "/form/form.css", file: "form.css", type: "text/css; charset=utf-8" },
  { url: "/form/form.js", file: "form.js", type: "text/javascript; charset=utf-8" },
];

/** The assets sit next to this module: in src/form, and in dist/form where the build copies them. */
function assetDir(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  if (existsSync(join(here, "index.html"))) return here;
  throw new Error(`the survey page's files (index.html, form.css, form.js) were not found next to ${here}`);
}

export async function formRoutes(app: FastifyInstance): Promise<void> {
  const dir = assetDir();
  for (const asset of ASSETS) {
    const body = readFileSync(join(dir, asset.file));
    app.get(asset.url, async (_request, reply) =>
      reply
        .type(asset.type)
        .header("content-security-policy", FORM_CSP)
        .header("cache-control", "no-cache")
        .header("x-content-type-options", "nosniff")
        .send(body),
    );
  }
}
