/**
 * The survey page's files as the service serves them (no browser): each file of files.json, without a key, typed,
 * under a self-only CSP; the service worker's cache list is that same list; every module a module imports is in it.
 */
import { readFileSync } from "node:fs";
import type { FastifyInstance } from "fastify";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";

let app: FastifyInstance;
beforeAll(async () => {
  app = (await makeStoreApp()).app;
});
afterAll(async () => {
  await app?.close();
});

const get = async (url: string) => {
  const r = await app.inject({ method: "GET", url });
  return { status: r.statusCode, header: (name: string) => String(r.headers[name] ?? ""), text: r.body };
};

describe("survey page files", () => {
  it("serves every file of files.json without a key, typed, with a self-only CSP; the worker caches exactly that list", async () => {
    const list = JSON.parse(readFileSync(new URL("../../src/form/files.json", import.meta.url), "utf8")) as {
      page: string;
      worker: string;
      files: string[];
    };
    const urls = ["/", ...list.files.map((f) => `/form/${f}`)];
    for (const url of [...urls, "/sw.js"]) {
      const res = await get(url);
      expect(res.status, url).toBe(200);
      expect(res.header("content-type"), url).toMatch(
        url === "/" ? /text\/html/ : url.endsWith(".css") ? /text\/css/ : url.endsWith(".svg") ? /image\/svg\+xml/ : /text\/javascript/,
      );
      const csp = res.header("content-security-policy");
      for (const d of ["script-src 'self'", "style-src 'self'", "connect-src 'self'"]) expect(csp, url).toContain(d);
      expect(csp, url).not.toContain("unsafe");
      expect(res.header("x-content-type-options")).toBe("nosniff");
    }
    // The worker's cache list is the served list, so a module added to files.json is cached too.
    const worker = (await get("/sw.js")).text;
    expect(JSON.parse(/const FILES = (\[.*\]);/.exec(worker)?.[1] ?? "[]")).toEqual(urls);
    expect(worker).toMatch(/const VERSION = "[0-9a-f]{16}";/);
    // Every module a module imports is in the list (one left out would be missing offline).
    for (const f of list.files.filter((x) => x.endsWith(".js"))) {
      const src = readFileSync(new URL(`../../src/form/${f}`, import.meta.url), "utf8");
      for (const m of src.matchAll(/from "\.\/([\w-]+\.js)"/g)) expect(list.files, `${f} imports ${m[1]}`).toContain(m[1]);
    }
    const refs = [...(await get("/")).text.matchAll(/(?:src|href)="([^"]*)"/g)].map((m) => m[1]);
    expect(refs).toContain("/form/favicon.svg");
    expect(refs).toContain("/form/main.js");
    for (const r of refs) expect(r).toMatch(/^\//); // nothing from elsewhere
    expect((await get("/v1/buildings")).status).toBe(401); // the API stays closed
  });
});
