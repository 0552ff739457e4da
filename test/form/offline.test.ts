/**
 * The survey page over HTTPS, set up as the README's tablet section says: a certificate (made here with openssl;
 * skipped, loudly, without it), the service serving HTTPS with it (TLS_CERT_PATH / TLS_KEY_PATH), and the browser
 * trusting that certificate. Chromium trusts it through --ignore-certificate-errors-spki-list, which pins this one
 * public key, so the page loads with no certificate error, as on a tablet that installed the certificate.
 * Checked on Chromium 156 when this was written: while a certificate error stands, a service worker cannot register
 * ("An SSL certificate error occurred when fetching the script"), and that is what Playwright's ignoreHTTPSErrors
 * leaves; --ignore-certificate-errors and --unsafely-treat-insecure-origin-as-secure=http://… both let it register,
 * but the first trusts every certificate and the second skips TLS, so the pin is the closest to a real tablet.
 * Then: one online visit, network off, reload: the page, the draft and the queue are there; back online it sends.
 */
import { execFileSync, spawnSync } from "node:child_process";
import { createHash, X509Certificate } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { request } from "node:https";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loadConfig } from "../../src/config.js";
import { freePort, spawnServer } from "../crash/server-process.js";
import { CHROMIUM, hasChromium, launchFreshChromium } from "../helpers/browser.js";
import { makeStoreApp, tempDatabasePath } from "../helpers/db.js";
import { enterKey, fillKwPfLoad, MAP_SITE_HOST, ready, serviceApi, SITE_HOST } from "./page.js";

const hasOpenssl = spawnSync("openssl", ["version"]).status === 0;
if (!hasOpenssl) console.warn("HTTPS survey page tests SKIPPED: openssl is not installed (apt-get install -y openssl)");
if (!hasChromium) console.warn(`offline reload browser test SKIPPED: ${CHROMIUM} is not installed`);

const dir = mkdtempSync(join(tmpdir(), "pfc-tls-"));
const certPath = join(dir, "cert.pem");
const keyPath = join(dir, "key.pem");
if (hasOpenssl) {
  // A self-signed certificate for the LAN name (and 127.0.0.1), valid two days: what the README tells a site to make.
  execFileSync(
    "openssl",
    [
      "req",
      "-x509",
      "-newkey",
      "ec",
      "-pkeyopt",
      "ec_paramgen_curve:prime256v1",
      "-nodes",
      "-days",
      "2",
      "-keyout",
      keyPath,
      "-out",
      certPath,
      "-subj",
      `/CN=${SITE_HOST}`,
      "-addext",
      `subjectAltName=DNS:${SITE_HOST},IP:127.0.0.1`,
    ],
    { stdio: "ignore" },
  );
}
/** base64 SHA-256 of the certificate's public key (SPKI), the form Chromium's pin list takes. */
const spkiPin = () =>
  createHash("sha256")
    .update(new X509Certificate(readFileSync(certPath)).publicKey.export({ type: "spki", format: "der" }))
    .digest("base64");

/** GET over HTTPS trusting only our certificate: status, or the error's code. */
function httpsStatus(port: number, path: string): Promise<number | string> {
  return new Promise((resolve) => {
    const req = request({ host: "127.0.0.1", port, path, ca: readFileSync(certPath), timeout: 2000 }, (res) => {
      res.resume();
      resolve(res.statusCode ?? 0);
    });
    req.on("error", (e: NodeJS.ErrnoException) => resolve(e.code ?? e.message));
    req.end();
  });
}

afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe.skipIf(!hasOpenssl)("HTTPS from TLS_CERT_PATH and TLS_KEY_PATH", () => {
  it("takes the two paths only together, naming the missing one", () => {
    expect(() => loadConfig({ TLS_CERT_PATH: certPath })).toThrow(/TLS_KEY_PATH: must be set together with TLS_CERT_PATH/);
    expect(() => loadConfig({ TLS_KEY_PATH: keyPath })).toThrow(/TLS_CERT_PATH: must be set together with TLS_KEY_PATH/);
    expect(loadConfig({ TLS_CERT_PATH: certPath, TLS_KEY_PATH: keyPath })).toMatchObject({ TLS_CERT_PATH: certPath, TLS_KEY_PATH: keyPath });
  });

  it("the server answers HTTPS with the certificate, and stops with a message when a file cannot be read", async () => {
    const port = await freePort();
    const proc = spawnServer(tempDatabasePath(), port, { TLS_CERT_PATH: certPath, TLS_KEY_PATH: keyPath });
    // Started together: each start compiles the server, which is most of the time this test takes.
    const bad = spawnServer(tempDatabasePath(), await freePort(), { TLS_CERT_PATH: join(dir, "missing.pem"), TLS_KEY_PATH: keyPath });
    try {
      let status: number | string = "";
      for (let i = 0; i < 200 && status !== 200; i++) {
        status = await httpsStatus(port, "/health");
        if (status !== 200) await new Promise((r) => setTimeout(r, 100));
      }
      expect(status, proc.stderr()).toBe(200);
      expect(await httpsStatus(port, "/")).toBe(200);
      await expect(fetch(`http://127.0.0.1:${port}/health`)).rejects.toThrow(); // no plain HTTP beside it
    } finally {
      proc.child.kill("SIGTERM");
      await proc.exited;
    }
    expect((await bad.exited).code).toBe(2);
    expect(bad.stderr()).toContain("cannot read the TLS certificate or key");
  });
});

describe.skipIf(!hasOpenssl || !hasChromium)("survey page over HTTPS: opens with no network after one online visit", () => {
  let app: FastifyInstance;
  let api: ReturnType<typeof serviceApi>;
  let key = "";
  let site = "";
  let context: BrowserContext;
  let profile = "";
  let page: Page;
  const problems: string[] = [];

  beforeAll(async () => {
    const made = await makeStoreApp({}, { https: { cert: readFileSync(certPath), key: readFileSync(keyPath) } });
    app = made.app;
    key = made.key;
    api = serviceApi(app, key);
    await app.listen({ port: 0, host: "127.0.0.1" });
    const addr = app.server.address();
    if (addr === null || typeof addr === "string") throw new Error("no port");
    site = `https://${SITE_HOST}:${addr.port}`;
    ({ context, profile } = await launchFreshChromium({ width: 800, height: 1280 }, [
      MAP_SITE_HOST,
      `--ignore-certificate-errors-spki-list=${spkiPin()}`,
    ]));
    page = context.pages()[0] ?? (await context.newPage());
    page.on("console", (m) => {
      if (m.type() === "error" || m.type() === "warning") problems.push(`${m.type()}: ${m.text()}`);
    });
    page.on("pageerror", (e) => problems.push(`pageerror: ${e.message}`));
  });

  afterAll(async () => {
    await context?.close();
    if (profile) rmSync(profile, { recursive: true, force: true });
    await app?.close();
  });

  it("registers the service worker, which caches every file the service lists", async () => {
    await page.goto(site + "/", { waitUntil: "load" });
    await ready(page);
    expect(await page.evaluate("isSecureContext")).toBe(true);
    await expect.poll(() => page.evaluate("navigator.serviceWorker.controller !== null"), { timeout: 10_000 }).toBe(true);
    expect(await page.locator("#offline-note").isHidden()).toBe(true);
    const worker = (await api.get("/sw.js")).body as string;
    const listed = JSON.parse(/const FILES = (\[.*\]);/.exec(worker)?.[1] ?? "[]");
    const cached = await page.evaluate<string[]>(
      `(async () => { const out = []; for (const name of await caches.keys()) for (const r of await (await caches.open(name)).keys()) out.push(new URL(r.url).pathname); return out.sort(); })()`,
    );
    expect(cached).toEqual([...listed].sort());
  });

  it("reloads with the network off: the page, the draft and the queue are there; back online the survey is stored once", async () => {
    const building = await api.post("/v1/buildings", { name: "Quarry pump house", system: { voltageV: 480, frequencyHz: 60, phases: 3 } });
    expect(building.status).toBe(201);
    await enterKey(page, key);
    await page.selectOption("#building", building.body.id);
    await page.fill("#surveyor", "R. Field");
    await fillKwPfLoad(page, 0, "Slurry pump", "75", "0.84");

    await context.setOffline(true);
    await page.reload({ waitUntil: "load" });
    await ready(page);
    expect(await page.inputValue("#l0-kW")).toBe("75");
    expect(await page.inputValue("#surveyor")).toBe("R. Field");
    expect(await page.inputValue("#building")).toBe(building.body.id);
    await expect.poll(() => page.locator("#net").textContent()).toBe("Service not reachable");
    await page.click("#submit");
    await page.locator("#pending-box").waitFor({ state: "visible" });

    await page.reload({ waitUntil: "load" });
    await ready(page);
    expect(await page.locator("#pending li").count()).toBe(1);
    expect(await page.locator("#pending li").textContent()).toContain("Quarry pump house");
    expect(await page.inputValue("#l0-label")).toBe("Slurry pump");
    expect(await api.surveyCount(building.body.id)).toBe(0);

    await context.setOffline(false);
    await page.locator("#pending-box").waitFor({ state: "hidden", timeout: 20_000 });
    await expect.poll(() => page.locator("#submit-msg").textContent()).toBe("Sent and stored.");
    expect(await api.surveyCount(building.body.id)).toBe(1);
    expect(problems.filter((p) => !/net::ERR_INTERNET_DISCONNECTED|Failed to load resource/.test(p))).toEqual([]);
  });
});
