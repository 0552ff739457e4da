/**
 * /docs in headless Chromium under the API's security headers: the interactive docs render the operations
 * with no CSP violation. Skipped, loudly, where /usr/bin/chromium is not installed.
 */
import { rmSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { makeStoreApp } from "../helpers/db.js";
import { CHROMIUM, hasChromium, launchFreshChromium } from "../helpers/browser.js";

if (!hasChromium) console.warn(`docs browser test SKIPPED: ${CHROMIUM} is not installed`);

describe("/docs in a browser", () => {
  it.skipIf(!hasChromium)(
    "renders the operations without a CSP violation",
    async () => {
      const { app } = await makeStoreApp();
      const { context, profile } = await launchFreshChromium();
      try {
        const base = await app.listen({ host: "127.0.0.1", port: 0 });
        const page = await context.newPage();
        const errors: string[] = [];
        page.on("console", (m) => {
          if (m.type() === "error") errors.push(m.text());
        });
        page.on("pageerror", (e) => errors.push(e.message));
        await page.goto(`${base}/docs`, { waitUntil: "load" });
        // rendering the whole document takes seconds of CPU: 13 s was seen on a loaded 2-core machine
        await page.waitForSelector(".opblock", { timeout: 45_000 });
        expect(await page.locator(".opblock").count()).toBeGreaterThan(15);
        expect(errors.filter((e) => /Content Security Policy|Refused/i.test(e))).toEqual([]);
      } finally {
        await context.close();
        await app.close();
        rmSync(profile, { recursive: true, force: true });
      }
    },
    60_000,
  );
});
