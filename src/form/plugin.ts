import { createHash } from "node:crypto";
import { existsSync, readFileSync } from "node:fs";
import { dirname, extname, join } from "node:path";
import { fileURLToPath } from "node:url";
import type { FastifyInstance } from "fastify";

/**
 * The tablet survey page: hand-written files listed in files.json, read once at start-up. The page is `/`, the
 * service worker `/sw.js` (its scope must cover `/`), everything else under `/form/`. The page is open (no key);
 * the key it asks for is sent only on its /v1 calls.
 */
export const FORM_CSP =
  "default-src 'none'; script-src 'self'; style-src 'self'; connect-src 'self'; img-src 'self'; worker-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".svg": "image/svg+xml",
};

export interface FormFileList {
  page: string;
  worker: string;
  files: string[];
}

export interface FormAsset {
  url: string;
  file: string;
  type: string;
  body: Buffer;
}

/** The assets sit next to this module: in src/form, and in dist/form where the build copies them. */
function assetDir(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  if (existsSync(join(here, "files.json"))) return here;
  throw new Error(`the survey page's files (files.json and what it lists) were not found next to ${here}`);
}

export const urlOf = (list: FormFileList, file: string): string => (file === list.page ? "/" : file === list.worker ? `/${file}` : `/form/${file}`);

/**
 * Every file with its URL and body. The worker is generated: the cached URLs and a version (a digest of every
 * other file) go above its source, so the cache list is the served list and any change installs a new cache.
 */
export function formAssets(dir = assetDir()): FormAsset[] {
  const list = JSON.parse(readFileSync(join(dir, "files.json"), "utf8")) as FormFileList;
  const typeOf = (file: string) => {
    const t = TYPES[extname(file)];
    if (!t) throw new Error(`files.json lists ${file}, whose type the service does not know`);
    return t;
  };
  const cached = [list.page, ...list.files].map((file) => ({
    url: urlOf(list, file),
    file,
    type: typeOf(file),
    body: readFileSync(join(dir, file)),
  }));
  const digest = createHash("sha256");
  for (const a of cached) digest.update(a.url).update(a.body);
  const worker = readFileSync(join(dir, list.worker));
  digest.update(worker);
  const header = `const FILES = ${JSON.stringify(cached.map((a) => a.url))};\nconst VERSION = "${digest.digest("hex").slice(0, 16)}";\n`;
  return [
    ...cached,
    { url: urlOf(list, list.worker), file: list.worker, type: typeOf(list.worker), body: Buffer.concat([Buffer.from(header), worker]) },
  ];
}

export async function formRoutes(app: FastifyInstance): Promise<void> {
  for (const asset of formAssets()) {
    app.get(asset.url, async (_request, reply) =>
      reply
        .type(asset.type)
        .header("content-security-policy", FORM_CSP)
        .header("cache-control", "no-cache")
        .header("x-content-type-options", "nosniff")
        .send(asset.body),
    );
  }
}
