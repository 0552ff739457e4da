import { existsSync, mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { chromium, type BrowserContext } from "playwright-core";

/** Debian's Chromium; browser tests skip, with a message, where it is not installed. */
export const CHROMIUM = "/usr/bin/chromium";
export const hasChromium = existsSync(CHROMIUM);

/** Flags for a root, offline, headless run: no sandbox, no background traffic to the closed network. */
export const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

/**
 * Chromium on a fresh profile directory (nothing cached from another run); the caller removes `profile`.
 * `extraArgs` add flags, e.g. a host-name mapping for a LAN-like origin.
 */
export async function launchFreshChromium(
  viewport?: { width: number; height: number },
  extraArgs: string[] = [],
): Promise<{ context: BrowserContext; profile: string }> {
  const profile = mkdtempSync(join(tmpdir(), "pfc-chromium-profile-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    ...(viewport ? { viewport } : {}),
    args: [...CHROMIUM_ARGS, ...extraArgs],
  });
  return { context, profile };
}
