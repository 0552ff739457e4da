/**
 * Shared by the survey-page browser tests: the service's API through app.inject (no network, so it works the same
 * for the plain-HTTP and the HTTPS app), and filling the page as an electrician would.
 */
import type { FastifyInstance } from "fastify";
import type { Page } from "playwright-core";
import { expect } from "vitest";

/** A LAN-like host name, mapped to 127.0.0.1 in Chromium: not localhost, so plain HTTP there is not a secure context. */
export const SITE_HOST = "site-server.test";
export const MAP_SITE_HOST = `--host-resolver-rules=MAP ${SITE_HOST} 127.0.0.1`;

export function serviceApi(app: FastifyInstance, key: string) {
  const headers = { authorization: `Bearer ${key}` };
  return {
    async get(url: string): Promise<{ status: number; body: any }> {
      const r = await app.inject({ method: "GET", url, headers });
      return { status: r.statusCode, body: (r.headers["content-type"] ?? "").toString().includes("json") ? r.json() : r.body };
    },
    async post(url: string, body: unknown): Promise<{ status: number; body: any }> {
      const r = await app.inject({ method: "POST", url, headers, payload: body as object });
      return { status: r.statusCode, body: r.json() };
    },
    async surveyCount(buildingId: string): Promise<number> {
      const r = await app.inject({ method: "GET", url: `/v1/buildings/${buildingId}/surveys?limit=100`, headers });
      expect(r.statusCode).toBe(200);
      return r.json().items.length;
    },
  };
}

export async function ready(page: Page): Promise<void> {
  await page.locator("body[data-ready='1']").waitFor();
}

/** Enter the key and wait until the service has accepted it. */
export async function enterKey(page: Page, key: string): Promise<void> {
  await page.fill("#api-key", key);
  await page.click("#key-save");
  await expect.poll(() => page.locator("#key-state").textContent()).toBe("Key accepted.");
}

/** One load with a kW-and-PF reading, in load slot `i`. */
export async function fillKwPfLoad(page: Page, i: number, label: string, kW: string, pf: string): Promise<void> {
  await page.fill(`#l${i}-label`, label);
  await page.fill(`#l${i}-kW`, kW);
  await page.fill(`#l${i}-pf`, pf);
}
