/**
 * The report in a real browser (Debian's headless Chromium): it renders without console errors, fetches nothing
 * but itself, and prints to A4 and Letter. Skipped, loudly, where /usr/bin/chromium is not installed.
 */
import { mkdtempSync, rmSync, statSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import type { BrowserContext } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { buildReportModel, renderReportHtml } from "../../src/report/index.js";
import { fullReportInput } from "./fixtures.js";
import { CHROMIUM, hasChromium, launchFreshChromium } from "../helpers/browser.js";

if (!hasChromium) console.warn(`report browser tests SKIPPED: ${CHROMIUM} is not installed (apt-get install -y chromium)`);

describe("report in headless Chromium", () => {
  let context: BrowserContext | undefined;
  let profile = "";
  // Kept after the run (the path is printed) so a person can look at the screenshots and printed PDFs.
  let shots = "";
  let file = "";

  beforeAll(async () => {
    if (!hasChromium) return;
    shots = mkdtempSync(join(tmpdir(), "pfc-report-shots-"));
    file = join(shots, "report.html");
    writeFileSync(file, renderReportHtml(buildReportModel(fullReportInput())));
    ({ context, profile } = await launchFreshChromium({ width: 1200, height: 900 }));
  });

  afterAll(async () => {
    await context?.close();
    if (profile) rmSync(profile, { recursive: true, force: true });
  });

  it.skipIf(!hasChromium)("renders with no console errors, requests nothing but the document, and prints A4 and Letter", async () => {
    const page = await (context as BrowserContext).newPage();
    const errors: string[] = [];
    const requests: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error" || m.type() === "warning") errors.push(`${m.type()}: ${m.text()}`);
    });
    page.on("pageerror", (e) => errors.push(`pageerror: ${e.message}`));
    page.on("request", (r) => requests.push(r.url()));
    const url = pathToFileURL(file).href;
    await page.goto(url, { waitUntil: "load" });

    expect(errors).toEqual([]);
    expect(requests).toEqual([url]);

    // The charts are laid out, visible and of a sensible size.
    const boxes = await page.$$eval("svg[data-role=chart]", (els) => els.map((e) => e.getBoundingClientRect()).map((r) => [r.width, r.height]));
    expect(boxes.length).toBeGreaterThanOrEqual(3);
    for (const [w, h] of boxes) {
      expect(w).toBeGreaterThan(500);
      expect(h).toBeGreaterThan(150);
    }
    // Text is black on white where it matters: body and section headings (inverted bar).
    // (a string expression: the test project compiles without the DOM library)
    const colours = await page.evaluate<string[]>(
      `(() => { const b = getComputedStyle(document.body); const h = getComputedStyle(document.querySelector("h2")); return [b.color, b.backgroundColor, h.color, h.backgroundColor]; })()`,
    );
    expect(colours).toEqual(["rgb(0, 0, 0)", "rgb(255, 255, 255)", "rgb(255, 255, 255)", "rgb(0, 0, 0)"]);

    const shot = join(shots, "report-top.png");
    await page.screenshot({ path: shot });
    await page.screenshot({ path: join(shots, "report-full.png"), fullPage: true });
    console.log(`report screenshots in ${shots}`);
    expect(statSync(shot).size).toBeGreaterThan(10_000);

    for (const [format, widthPt] of [
      ["A4", 595.3],
      ["Letter", 612],
    ] as const) {
      const pdf = await page.pdf({ format, printBackground: true });
      writeFileSync(join(shots, `report-${format}.pdf`), pdf);
      const doc = await getDocument({ data: new Uint8Array(pdf), isEvalSupported: false, disableFontFace: true, verbosity: 0 }).promise;
      expect(doc.numPages).toBeGreaterThan(3);
      const first = await doc.getPage(1);
      expect(Math.abs((first.view[2] as number) - widthPt), `${format} page width`).toBeLessThan(1);
      const text = (await first.getTextContent()).items.map((i) => ("str" in i ? i.str : "")).join(" ");
      expect(text).toContain("Power-factor correction report");
      await doc.destroy();
    }
    expect(errors).toEqual([]);
    await page.close();
  });
});
