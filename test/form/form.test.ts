/**
 * The tablet survey page in a real browser (Debian's headless Chromium) against the real app on a temp database:
 * key, building, three loads of three methods with live totals checked against hand-worked figures and the
 * service's own sizing, submit, offline queue, a lost response resent without a duplicate, a draft that survives a
 * reload, and messages beside their fields. Skipped, loudly, where /usr/bin/chromium is not installed.
 */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";
import { CHROMIUM, hasChromium, launchFreshChromium } from "../helpers/browser.js";

if (!hasChromium) console.warn(`survey page browser tests SKIPPED: ${CHROMIUM} is not installed (apt-get install -y chromium)`);

let app: FastifyInstance;
let key = "";
let base = "";
let context: BrowserContext | undefined;
let profile = "";
let shots = "";
let page: Page;
const problems: string[] = [];

const auth = () => ({ authorization: `Bearer ${key}` });
async function get(path: string): Promise<{ status: number; headers: Headers; body: any }> {
  const res = await fetch(base + path, { headers: auth() });
  const text = await res.text();
  return { status: res.status, headers: res.headers, body: (res.headers.get("content-type") ?? "").includes("json") ? JSON.parse(text) : text };
}
async function post(path: string, body: unknown): Promise<{ status: number; body: any }> {
  const res = await fetch(base + path, { method: "POST", headers: { ...auth(), "content-type": "application/json" }, body: JSON.stringify(body) });
  return { status: res.status, body: await res.json() };
}
const num = async (selector: string) => Number(await page.locator(selector).textContent());

beforeAll(async () => {
  const made = await makeStoreApp();
  app = made.app;
  key = made.key;
  await app.listen({ port: 0, host: "127.0.0.1" });
  const addr = app.server.address();
  if (addr === null || typeof addr === "string") throw new Error("no port");
  base = `http://127.0.0.1:${addr.port}`;
  if (!hasChromium) return;
  shots = mkdtempSync(join(tmpdir(), "pfc-form-shots-"));
  ({ context, profile } = await launchFreshChromium({ width: 800, height: 1280 }));
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
  if (shots) console.log(`survey page screenshots in ${shots}`);
});

describe("survey page assets", () => {
  it("serves /, the CSS and the JS without a key, with their content types and a self-only CSP", async () => {
    for (const [path, type] of [["/", "text/html"], ["/form/form.css", "text/css"], ["/form/form.js", "text/javascript"]] as const) {
      const res = await fetch(base + path);
      expect(res.status, path).toBe(200);
      expect(res.headers.get("content-type"), path).toContain(type);
      const csp = res.headers.get("content-security-policy") ?? "";
      expect(csp, path).toContain("script-src 'self'");
      expect(csp, path).toContain("style-src 'self'");
      expect(csp, path).toContain("connect-src 'self'");
      expect(csp, path).not.toContain("unsafe-inline");
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    }
    const html = await (await fetch(base + "/")).text();
    // Nothing from elsewhere: every src/href is a path on this service.
    const refs = [...html.matchAll(/(?:src|href)="([^"]*)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const r of refs) expect(r).toMatch(/^\//);
    // The API stays closed.
    expect((await fetch(base + "/v1/buildings")).status).toBe(401);
  });
});

// Readings typed into the page, and the figures worked out here by hand from them.
const SQRT3 = Math.sqrt(3);
const tanOf = (pf: number) => Math.tan(Math.acos(pf));
const hand = (() => {
  const l0 = { kW: 2 * 22, kvar: 2 * 22 * tanOf(0.81) }; // 2 × (22 kW at PF 0.81 lagging)
  const kVA1 = (SQRT3 * 400 * 35) / 1000; // 400 V, 35 A, three-phase
  const l1 = { kW: kVA1 * 0.86, kvar: kVA1 * 0.86 * tanOf(0.86) };
  const l2 = { kW: 8, kvar: Math.sqrt(9.2 * 9.2 - 8 * 8) }; // 8 kW of 9.2 kVA
  const kW = l0.kW + l1.kW + l2.kW;
  const kvar = l0.kvar + l1.kvar + l2.kvar;
  const kVA = Math.hypot(kW, kvar);
  return { loads: [l0, l1, l2], kW, kvar, kVA, pf: kW / kVA, need: Math.max(0, kvar - kW * tanOf(0.95)) };
})();
const apiLoads = [
  { label: "Dough mixer", kind: "motor", quantity: 2, measurement: { method: "kw_pf", kW: 22, pf: 0.81, sense: "lagging" } },
  { label: "Oven fans", kind: "hvac", quantity: 1, measurement: { method: "v_i_pf", volts: 400, amps: 35, pf: 0.86, sense: "lagging" } },
  { label: "Hall lighting", kind: "lighting", quantity: 1, measurement: { method: "kw_kva", kW: 8, kVA: 9.2 } },
];

async function surveyCount(buildingId: string): Promise<number> {
  const r = await get(`/v1/buildings/${buildingId}/surveys?limit=100`);
  expect(r.status).toBe(200);
  return r.body.items.length;
}

describe.skipIf(!hasChromium)("survey page in headless Chromium", () => {
  let buildingId = "";

  it("takes the key, creates the building, and shows live figures that match the hand-worked ones and the service's sizing", async () => {
    await page.goto(base + "/", { waitUntil: "load" });
    await page.locator("body[data-ready='1']").waitFor();
    await page.fill("#api-key", key);
    await page.click("#key-save");
    await expect.poll(() => page.locator("#key-state").textContent()).toBe("Key accepted.");
    expect(await page.evaluate<string | null>(`localStorage.getItem("pfc-form.key")`)).toBe(key);

    await page.click("#new-building summary");
    await page.fill("#nb-name", "Riverside bakery hall");
    await page.fill("#nb-volts", "400");
    await page.selectOption("#nb-hz", "50");
    await page.selectOption("#nb-phases", "3");
    await page.click("#nb-create");
    await expect.poll(() => page.inputValue("#building")).not.toBe("");
    buildingId = await page.inputValue("#building");
    const stored = await get(`/v1/buildings/${buildingId}`);
    expect(stored.status).toBe(200);
    expect(stored.body.name).toBe("Riverside bakery hall");
    expect(stored.body.system).toEqual({ voltageV: 400, frequencyHz: 50, phases: 3 });

    await page.fill("#surveyor", "T. Example");
    await page.fill("#targetPF", "0.95");
    await page.fill("#l0-label", "Dough mixer");
    await page.fill("#l0-quantity", "2");
    await page.fill("#l0-kW", "22");
    await page.fill("#l0-pf", "0.81");
    await page.click("#add-load");
    await page.fill("#l1-label", "Oven fans");
    await page.selectOption("#l1-kind", "hvac");
    await page.selectOption("#l1-method", "v_i_pf");
    // The fields follow the method.
    expect(await page.locator("#l1-kW").count()).toBe(0);
    await page.fill("#l1-volts", "400");
    await page.fill("#l1-amps", "35");
    await page.fill("#l1-pf", "0.86");
    await page.click("#add-load");
    await page.fill("#l2-label", "Hall lighting");
    await page.selectOption("#l2-kind", "lighting");
    await page.selectOption("#l2-method", "kw_kva");
    expect(await page.locator("#l2-pf").count()).toBe(0);
    await page.fill("#l2-kW", "8");
    await page.fill("#l2-kVA", "9.2");

    for (const [i, l] of hand.loads.entries()) {
      const row = `#loads > li:nth-child(${i + 1}) [data-role=figures]`;
      expect(await num(`${row} [data-v=kW]`), `load ${i} kW`).toBeCloseTo(l.kW, 1);
      expect(await num(`${row} [data-v=kvar]`), `load ${i} kvar`).toBeCloseTo(l.kvar, 1);
      expect(await num(`${row} [data-v=kVA]`), `load ${i} kVA`).toBeCloseTo(Math.hypot(l.kW, l.kvar), 1);
      expect(await num(`${row} [data-v=pf]`), `load ${i} PF`).toBeCloseTo(l.kW / Math.hypot(l.kW, l.kvar), 2);
    }
    expect(await num("#t-kw")).toBeCloseTo(hand.kW, 1);
    expect(await num("#t-kvar")).toBeCloseTo(hand.kvar, 1);
    expect(await num("#t-kva")).toBeCloseTo(hand.kVA, 1);
    expect(await num("#t-pf")).toBeCloseTo(hand.pf, 2);
    expect(await num("#t-need")).toBeCloseTo(hand.need, 1);

    // The service agrees with the page on the same readings.
    const sizing = await post("/v1/sizing", { system: { voltageV: 400, frequencyHz: 50, phases: 3 }, targetPF: 0.95, loads: apiLoads });
    expect(sizing.status).toBe(200);
    expect(await num("#t-kw")).toBeCloseTo(sizing.body.site.kW, 1);
    expect(await num("#t-kvar")).toBeCloseTo(sizing.body.site.kvar, 1);
    expect(await num("#t-pf")).toBeCloseTo(sizing.body.site.displacementPF, 2);
    expect(await num("#t-need")).toBeCloseTo(sizing.body.correction.kvarRequired, 1);

    // Touch targets of at least 48 px on every visible control.
    const small = await page.evaluate<string[]>(
      `[...document.querySelectorAll("button, input, select, summary")].filter((e) => e.offsetParent !== null).map((e) => [e.id || e.textContent.trim(), e.getBoundingClientRect()]).filter(([, r]) => r.height < 48 || r.width < 48).map(([n, r]) => n + " " + r.width + "x" + r.height)`,
    );
    expect(small).toEqual([]);
    expect(await page.locator("input[inputmode=decimal]").count()).toBeGreaterThanOrEqual(9);

    await page.evaluate("window.scrollTo(0, 0)");
    await page.screenshot({ path: join(shots, "portrait-800x1280.png"), fullPage: true });
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.screenshot({ path: join(shots, "landscape-1280x800.png"), fullPage: true });
    await page.setViewportSize({ width: 800, height: 1280 });
  });

  it("keeps the draft across a reload", async () => {
    await page.reload({ waitUntil: "load" });
    await page.locator("body[data-ready='1']").waitFor();
    expect(await page.inputValue("#l1-label")).toBe("Oven fans");
    expect(await page.inputValue("#l1-method")).toBe("v_i_pf");
    expect(await page.inputValue("#l2-kVA")).toBe("9.2");
    expect(await page.inputValue("#surveyor")).toBe("T. Example");
    expect(await page.inputValue("#building")).toBe(buildingId);
    expect(await num("#t-kw")).toBeCloseTo(hand.kW, 1);
  });

  it("submits, shows the recommendation, saves the report and shows the trend", async () => {
    await page.click("#submit");
    await expect.poll(() => page.locator("#submit-msg").textContent()).toBe("Sent and stored.");
    const list = await get(`/v1/buildings/${buildingId}/surveys`);
    expect(list.body.items).toHaveLength(1);
    const summary = list.body.items[0];
    expect(summary.surveyor).toBe("T. Example");
    expect(summary.kW).toBeCloseTo(hand.kW, 6);
    expect(summary.kvar).toBeCloseTo(hand.kvar, 6);
    const survey = (await get(`/v1/surveys/${summary.id}`)).body;
    expect(survey.inputs.loads.map((l: { measurement: { method: string } }) => l.measurement.method)).toEqual(["kw_pf", "v_i_pf", "kw_kva"]);

    expect(await page.locator("#result-section").isVisible()).toBe(true);
    expect(Number((await page.locator("#r-kvar").textContent())?.split(" ")[0])).toBeCloseTo(summary.kvarRequired, 1);
    expect(Number((await page.locator("#r-pf").textContent())?.split(" ")[0])).toBeCloseTo(summary.displacementPF, 2);
    const bank = survey.result.recommendedBank;
    expect(await page.locator("#r-steps li").count()).toBe(bank ? bank.physicalSteps.length : 0);

    const [download] = await Promise.all([page.waitForEvent("download"), page.click("#r-report")]);
    const file = await download.path();
    expect(readFileSync(file, "utf8")).toContain("<html");

    await page.click("#r-trend");
    await page.locator("#trend tbody tr").first().waitFor();
    expect(await page.locator("#trend tbody tr").count()).toBe(1);
  });

  it("queues a survey made offline, shows it pending, and stores it exactly once when the network returns", async () => {
    await (context as BrowserContext).setOffline(true);
    await expect.poll(() => page.locator("#net").textContent()).toBe("Offline");
    await page.fill("#l0-kW", "24");
    await page.click("#submit");
    await page.locator("#pending-box").waitFor({ state: "visible" });
    expect(await page.locator("#pending li").textContent()).toContain("Riverside bakery hall");
    expect(await page.locator("#submit-msg").textContent()).toContain("No network");
    expect(await page.evaluate<number>(`JSON.parse(localStorage.getItem("pfc-form.queue")).length`)).toBe(1);
    await page.screenshot({ path: join(shots, "offline-pending-portrait.png"), fullPage: true });
    expect(await surveyCount(buildingId)).toBe(1);

    await (context as BrowserContext).setOffline(false);
    await page.locator("#pending-box").waitFor({ state: "hidden", timeout: 15_000 });
    expect(await surveyCount(buildingId)).toBe(2);
    // Further retries (the button, the timer) find nothing to send.
    await page.click("#r-trend");
    expect(await surveyCount(buildingId)).toBe(2);
    // The queued one carries the offline edit (2 × 24 kW on the first load instead of 2 × 22).
    const kWs = (await get(`/v1/buildings/${buildingId}/surveys`)).body.items.map((i: { kW: number }) => i.kW).sort((a: number, b: number) => a - b);
    expect(kWs[0]).toBeCloseTo(hand.kW, 6);
    expect(kWs[1]).toBeCloseTo(hand.kW + 4, 6);
  });

  it("resends with the same Idempotency-Key when the answer was lost, and the service stores it once", async () => {
    let lost = false;
    const keys: string[] = [];
    await page.route("**/v1/buildings/*/surveys", async (route) => {
      if (route.request().method() !== "POST") return route.continue();
      keys.push(route.request().headers()["idempotency-key"] ?? "");
      if (!lost) {
        lost = true;
        await route.fetch(); // the service stores it…
        return route.abort("internetdisconnected"); // …but the page never hears back
      }
      return route.continue();
    });
    await page.fill("#l0-kW", "26");
    await page.click("#submit");
    await page.locator("#pending-box").waitFor({ state: "visible" });
    expect(await surveyCount(buildingId)).toBe(3);
    const replayed = page.waitForResponse((r) => r.request().method() === "POST" && r.url().includes("/surveys"));
    await page.click("#send-now");
    const res = await replayed;
    expect(res.headers()["idempotent-replayed"]).toBe("true");
    await page.locator("#pending-box").waitFor({ state: "hidden" });
    await page.unroute("**/v1/buildings/*/surveys");
    expect(keys).toHaveLength(2);
    expect(keys[0]).toMatch(/^[0-9a-f-]{36}$/);
    expect(keys[1]).toBe(keys[0]);
    expect(await surveyCount(buildingId)).toBe(3);
  });

  it("shows a wrong value's message beside its field, in the service's words, client-side and from a 400", async () => {
    const before = await surveyCount(buildingId);
    await page.fill("#l1-pf", "1.5");
    await page.click("#submit");
    const apiAnswer = await post("/v1/sizing", {
      system: { voltageV: 400, frequencyHz: 50, phases: 3 },
      loads: [apiLoads[0], { ...apiLoads[1], measurement: { ...apiLoads[1]!.measurement, pf: 1.5 } }],
    });
    expect(apiAnswer.status).toBe(400);
    const apiError = apiAnswer.body.errors.find((e: { path: string }) => e.path === "loads.1.measurement.pf");
    expect(apiError).toBeDefined();
    const beside = page.locator("#loads > li:nth-child(2) [data-m=pf]");
    expect(await beside.textContent()).toBe(apiError.message);
    expect(await page.getAttribute("#l1-pf", "aria-invalid")).toBe("true");
    // The message sits next to its field: just below the input, in the same column.
    const boxes = await page.evaluate<number[]>(
      `(() => { const i = document.getElementById("l1-pf").getBoundingClientRect(); const m = document.querySelector("#loads > li:nth-child(2) [data-m=pf]").getBoundingClientRect(); return [m.top - i.bottom, Math.abs(m.left - i.left)]; })()`,
    );
    expect(boxes[0]).toBeGreaterThanOrEqual(0);
    expect(boxes[0]).toBeLessThan(20);
    expect(boxes[1]).toBeLessThan(5);
    await page.screenshot({ path: join(shots, "field-message-portrait.png"), fullPage: true });
    expect(await surveyCount(buildingId)).toBe(before);

    // Corrected, the message goes; a reading only the service rejects comes back as a 400 placed at its field.
    await page.fill("#l1-pf", "0.86");
    expect(await beside.textContent()).toBe("");
    await page.fill("#l2-kW", "30");
    await page.click("#submit");
    const kwMsg = page.locator("#loads > li:nth-child(3) [data-m=kW]");
    await expect.poll(() => kwMsg.textContent()).toContain("kW exceeds kVA");
    expect(await page.locator("#submit-msg").textContent()).toContain("Not accepted");
    expect(await page.locator("#pending-box").isHidden()).toBe(true);
    expect(await surveyCount(buildingId)).toBe(before);
  });

  it("raised no console errors (no CSP violations) on the way", () => {
    expect(problems.filter((p) => !p.includes("net::ERR_INTERNET_DISCONNECTED") && !p.includes("Failed to load resource"))).toEqual([]);
  });
});
