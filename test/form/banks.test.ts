/**
 * The survey page's installed-bank parts in real Chromium (Debian's headless build), on the plain-HTTP LAN origin:
 * a building with an automatic bank entered on the tablet ("5 × 50"), a survey with its scope and the bank read
 * step by step (one step degraded, one with a dead phase), the live check of a current above 3 × the expected, the
 * stored survey carrying every new field, and the recommendation showing what to repair first. Screenshots of the
 * new parts at 800 × 1280 and 1280 × 800. Skipped, loudly, without Chromium.
 */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { FastifyInstance } from "fastify";
import type { BrowserContext, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";
import { CHROMIUM, hasChromium, launchFreshChromium } from "../helpers/browser.js";
import { enterKey, fillKwPfLoad, MAP_SITE_HOST, ready, serviceApi, SITE_HOST } from "./page.js";

if (!hasChromium) console.warn(`installed-bank page tests SKIPPED: ${CHROMIUM} is not installed (apt-get install -y chromium)`);

let app: FastifyInstance;
let api: ReturnType<typeof serviceApi>;
let key = "";
let site = "";
let context: BrowserContext;
let profile = "";
let shots = "";
let page: Page;
const problems: string[] = [];
const SIZES = [
  { width: 800, height: 1280 },
  { width: 1280, height: 800 },
];

beforeAll(async () => {
  const made = await makeStoreApp();
  app = made.app;
  key = made.key;
  api = serviceApi(app, made.key);
  await app.listen({ port: 0, host: "127.0.0.1" });
  const addr = app.server.address();
  if (addr === null || typeof addr === "string") throw new Error("no port");
  site = `http://${SITE_HOST}:${addr.port}`;
  if (!hasChromium) return;
  shots = mkdtempSync(join(tmpdir(), "pfc-form-bank-shots-"));
  ({ context, profile } = await launchFreshChromium(SIZES[0], [MAP_SITE_HOST]));
  page = context.pages()[0] ?? (await context.newPage());
  page.on("pageerror", (e) => problems.push(`pageerror: ${e.message}`));
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(`console: ${m.text()}`);
  });
});

afterAll(async () => {
  await context?.close();
  if (profile) rmSync(profile, { recursive: true, force: true });
  await app?.close();
  if (shots) console.log(`installed-bank screenshots in ${shots}`);
});

/** Controls under `selector` smaller than a 48 px target (checkboxes sit in 48 px labels), at the current size. */
const smallTargets = (selector: string) =>
  page.evaluate<string[]>(
    `[...document.querySelectorAll("${selector} :is(button, input, select, summary, label.tick)")].filter((e) => e.offsetParent !== null && !(e.tagName === "INPUT" && e.type === "checkbox")).map((e) => [e.id || e.textContent.trim(), e.getBoundingClientRect()]).filter(([, r]) => r.height < 48 || r.width < 48).map(([n, r]) => n + " " + r.width + "x" + r.height)`,
  );

/** Screenshots of one part at both sizes; `inView` shoots the screen with the part scrolled in (the landscape side column scrolls). */
async function shoot(selector: string, name: string, inView = false) {
  for (const size of SIZES) {
    await page.setViewportSize(size);
    expect(await smallTargets(selector), `${name} ${size.width}x${size.height}`).toEqual([]);
    const path = join(shots, `${name}-${size.width}x${size.height}.png`);
    if (inView) {
      await page.evaluate(`document.querySelector("${selector}").scrollIntoView({ block: "start" })`);
      await page.screenshot({ path });
    } else await page.locator(selector).screenshot({ path });
  }
  await page.setViewportSize(SIZES[0]!);
}

// A healthy 50 kvar step rated 400 V behind a 7 % reactor, read at 410 V on a 50 Hz system, by hand:
// Q = 50 × (410/400)² / (1 − 0.07) = 56.488 kvar; I = Q / (√3 × 410 V) = 56 488 / 710.14 = 79.54 A.
const EXPECTED_A = (((50 * (410 / 400) ** 2) / 0.93) * 1000) / (Math.sqrt(3) * 410);

describe.skipIf(!hasChromium)("installed banks on the survey page", () => {
  let buildingId = "";

  it("enters a building with an automatic bank of 5 × 50 kvar and a fixed group bank", async () => {
    await page.goto(site + "/", { waitUntil: "load" });
    await ready(page);
    await enterKey(page, key);
    await page.click("#new-building summary");
    await page.fill("#nb-name", "Harbour cold store");
    await page.selectOption("#nb-system", "400-3-50");
    await page.click("#nb-banks-part summary");
    await page.click("#nb-add-bank");
    await page.fill("#nb-b0-label", "Main bank");
    await page.fill("#nb-b0-steps", "5 × 50");
    await page.fill("#nb-b0-ratedVoltageV", "400");
    await page.fill("#nb-b0-reactorPct", "7");
    await page.selectOption("#nb-b0-connection", "delta");
    await page.fill("#nb-b0-installedOn", "2019-05-14");
    await page.click("#nb-add-bank");
    await page.fill("#nb-b1-label", "Chiller feeder bank");
    await page.selectOption("#nb-b1-location", "group");
    await page.selectOption("#nb-b1-control", "fixed");
    await page.fill("#nb-b1-steps", "2 × 25");
    await page.fill("#nb-b1-ratedVoltageV", "415");
    await page.click("#nb-create");
    // The page says what the service would: a group bank needs its group, a fixed bank is one step.
    expect(await page.locator("#nb-b1-group-msg").textContent()).toBe("a group bank needs the group (MCC or feeder) it corrects");
    expect(await page.locator("#nb-b1-steps-msg").textContent()).toBe("a fixed bank is one step: give its total kvar as one step");
    await page.fill("#nb-b1-group", "MCC-2");
    await page.fill("#nb-b1-steps", "50");
    await shoot("#nb-banks-part", "building-banks");
    await page.click("#nb-create");
    await expect.poll(() => page.inputValue("#building")).not.toBe("");
    buildingId = await page.inputValue("#building");
    const stored = await api.get(`/v1/buildings/${buildingId}`);
    expect(stored.body.installedBanks).toEqual([
      {
        label: "Main bank",
        location: "service",
        control: "automatic",
        ratedVoltageV: 400,
        connection: "delta",
        reactorPct: 7,
        steps: Array(5).fill({ kvar: 50 }),
        installedOn: "2019-05-14",
      },
      { label: "Chiller feeder bank", location: "group", group: "MCC-2", control: "fixed", ratedVoltageV: 415, steps: [{ kvar: 50 }] },
    ]);
    expect(await page.locator("#building-info").textContent()).toContain("installed banks: Main bank, Chiller feeder bank");
  });

  it("reads the bank one panel at a time, flags a current above 3 × the expected, allows 0 A in a phase", async () => {
    await page.fill("#surveyor", "R. Example");
    await page.fill("#targetPF", "0.95");
    await page.selectOption("#scope", "whole_site");
    await fillKwPfLoad(page, 0, "Refrigeration compressors", "250", "0.72");
    await page.fill("#l0-quantity", "2");
    expect(await page.locator("#bank-readings-part").isVisible()).toBe(true);
    expect(await page.locator("#bank-readings details.bank-read").count()).toBe(2);
    await page.click("#br0 summary");
    await page.fill("#br0-voltageV", "410");
    expect(await page.locator('#br0 tr[data-step="1"] .expect').textContent()).toBe(`expect ${EXPECTED_A.toFixed(1)} A`);
    for (const n of [1, 2, 3, 4]) await page.check(`#br0-on-${n}`);
    await page.fill("#br0-amps-1-a", "260"); // a clamp on the wrong range: 260 > 3 × 79.54 = 238.6 A
    expect(await page.locator("#br0-amps-1-a-msg").textContent()).toBe(
      `260 A is more than 3 × the ${EXPECTED_A.toFixed(1)} A a healthy 50 kvar step draws at 410 V: check the clamp's range and the step number`,
    );
    await page.click("#submit");
    expect(await page.locator("#submit-msg").textContent()).toBe("Please correct the fields marked in red.");
    expect(await api.surveyCount(buildingId)).toBe(0);
    await page.fill("#br0-amps-1-a", "79");
    expect(await page.locator("#br0-amps-1-a-msg").textContent()).toBe("");
    await page.fill("#br0-amps-1-b", "80");
    await page.fill("#br0-amps-1-c", "79.5");
    // Step 2 at 68 A a phase: 68 / 79.54 = 85 % of a healthy step's current.
    for (const p of ["a", "b", "c"]) await page.fill(`#br0-amps-2-${p}`, "68");
    expect(await page.locator('#br0 [data-found="2"]').textContent()).toBe(`${Math.round((68 / EXPECTED_A) * 100)} %`);
    await page.fill("#br0-amps-3-a", "79");
    await page.fill("#br0-amps-3-b", "79");
    expect(await page.locator("#br0-amps-3-c-msg").textContent()).toBe(""); // shown once the box is left or sent
    await page.fill("#br0-amps-3-c", "0"); // a blown fuse: allowed, it is the finding
    expect(await page.locator("#br0-amps-3-c-msg").textContent()).toBe("");
    expect(await page.locator('#br0 [data-found="3"]').textContent()).toBe("phase C 0 A");
    expect(await page.locator("#br0 summary").textContent()).toContain("4 of 5 in service, 3 measured");
    // One bank at a time: the next one opens and this one folds.
    await page.click('#br0 [data-next="1"]');
    // the page folds the other bank on the "toggle" event, which the browser fires as a task of its own: wait for it
    await expect.poll(() => page.locator("#br1").getAttribute("open")).not.toBeNull();
    await expect.poll(() => page.locator("#br0").getAttribute("open")).toBeNull();
    await page.click("#br0 summary");
    await shoot("#bank-readings-part", "bank-readings");
  });

  it("stores every new field and shows the verdict with the repairs first", async () => {
    await page.click("#submit");
    await expect.poll(() => page.locator("#submit-msg").textContent(), { timeout: 10_000 }).toBe("Sent and stored.");
    const list = await api.get(`/v1/buildings/${buildingId}/surveys`);
    expect(list.body.items).toHaveLength(1);
    const survey = (await api.get(`/v1/surveys/${list.body.items[0].id}`)).body;
    expect(survey.inputs.scope).toBe("whole_site");
    expect(survey.inputs.bankReadings).toEqual([
      {
        bank: "Main bank",
        inServiceSteps: [1, 2, 3, 4],
        voltageV: 410,
        stepCurrents: [
          { step: 1, amps: [79, 80, 79.5] },
          { step: 2, amps: [68, 68, 68] },
          { step: 3, amps: [79, 79, 0] },
        ],
      },
    ]);
    const main = survey.result.installedBanks.find((b: { label: string }) => b.label === "Main bank");
    expect(main.steps.map((s: { status: string }) => s.status)).toEqual(["healthy", "degraded", "failed", "not_measured", "not_measured"]);
    const c = survey.result.correction;
    expect(c.repairFirst.map((r: { step: number }) => r.step).sort()).toEqual([2, 3]);
    // page 1's lines arrive from the service just after the survey is stored
    await expect.poll(() => page.locator("#r-after").textContent()).toMatch(/^PF /);
    const repair = await page.locator("#r-repair").textContent();
    expect(await page.locator("#r-repair-dt").isVisible()).toBe(true);
    for (const r of c.repairFirst) expect(repair).toContain(`Main bank step ${r.step} (${r.status}, ${r.restoresKvar.toFixed(1)} kvar)`);
    expect(repair).toContain(`${c.kvarRestoredByRepair.toFixed(1)} kvar restored before anything new is bought`);
    expect(repair).toContain(c.kvarAdditional > 0 ? `then ${c.kvarAdditional.toFixed(1)} kvar of new capacitors` : "then nothing new is needed");
    expect(await page.locator("#r-verdict").textContent()).toMatch(/^Repair 2 installed steps/);
    expect(await page.locator("#r-after").textContent()).toContain(`PF ${c.pfAfter.toFixed(3)}`);
    expect(await page.locator("#r-risks").textContent()).toContain("Failing bank: ");
    expect(await page.locator("#r-install").textContent()).not.toBe("");
    await shoot("#result-section", "verdict", true);
    // Over plain HTTP Chromium says it ignores the service's Cross-Origin-Opener-Policy, which only HTTPS origins get.
    expect(problems.filter((p) => !/Cross-Origin-Opener-Policy header has been ignored|origin-keyed agent cluster/.test(p))).toEqual([]);
  });

  it("changes the building later: its transformer and a bank's steps, keeping what the form does not show", async () => {
    // a change begun and cancelled leaves the building and the new-building form as they were
    await page.click("#building-change");
    expect(await page.locator("#new-building").getAttribute("open")).not.toBeNull();
    expect(await page.locator("#nb-summary").textContent()).toBe("Change Harbour cold store");
    expect(await page.inputValue("#nb-name")).toBe("Harbour cold store");
    await page.fill("#nb-name", "Harbour cold store (renamed by mistake)");
    await page.click("#nb-cancel");
    expect((await api.get(`/v1/buildings/${buildingId}`)).body.name).toBe("Harbour cold store");
    await page.click("#new-building summary");
    expect(await page.inputValue("#nb-name")).toBe("");
    expect(await page.locator("#nb-create").textContent()).toBe("Create building");
    await page.click("#new-building summary");

    await page.click("#building-change");
    expect(await page.inputValue("#nb-b0-steps")).toBe("5 × 50");
    expect(await page.inputValue("#nb-b0-installedOn")).toBe("2019-05-14");
    await page.evaluate(`document.querySelectorAll("#nb-fields details").forEach((d) => (d.open = true))`);
    await page.fill("#nb-kVA", "1500");
    await page.fill("#nb-impedancePct", "5.5");
    await page.fill("#nb-b1-steps", "75");
    await shoot("#new-building", "building-change");
    await page.click("#nb-create");
    await expect.poll(() => page.locator("#nb-msg").textContent()).toBe("Saved the changes to Harbour cold store.");
    expect(await page.locator("#new-building").getAttribute("open")).toBeNull();
    const stored = (await api.get(`/v1/buildings/${buildingId}`)).body;
    expect(stored.transformer).toEqual({ kVA: 1500, impedancePct: 5.5 });
    expect(stored.installedBanks[0]).toMatchObject({ label: "Main bank", installedOn: "2019-05-14", steps: Array(5).fill({ kvar: 50 }) });
    expect(stored.installedBanks[1]).toMatchObject({ label: "Chiller feeder bank", steps: [{ kvar: 75 }] });
    expect(await page.locator("#building-info").textContent()).toContain("transformer 1500 kVA at 5.5 %");
    expect((await api.get(`/v1/buildings/${buildingId}/history`)).body.items).toHaveLength(2);
    // saving again with nothing changed writes no new version
    await page.click("#building-change");
    await page.click("#nb-create");
    expect(await page.locator("#nb-msg").textContent()).toBe("Nothing to save: the form shows the building as stored.");
    await page.click("#nb-cancel");
    expect((await api.get(`/v1/buildings/${buildingId}/history`)).body.items).toHaveLength(2);
    expect(problems.filter((p) => !/Cross-Origin-Opener-Policy header has been ignored|origin-keyed agent cluster/.test(p))).toEqual([]);
  });
});
