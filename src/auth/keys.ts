import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

/**
 * API keys look like `pfc_<prefix>_<secret>`: an 8-character public prefix (40 random bits, Crockford
 * base32) that finds the row, and a 43-character base64url secret (256 random bits). Only the SHA-256 of
 * the secret is stored: with that much entropy a fast hash is enough — there is nothing to guess from it.
 */
export const ROLES = ["admin", "surveyor", "auditor"] as const;
export type Role = (typeof ROLES)[number];

export const KEY_PATTERN = /^pfc_([0-9a-hjkmnp-tv-z]{8})_([A-Za-z0-9_-]{43})$/;

const ALPHABET = "0123456789abcdefghjkmnpqrstvwxyz";

export interface ParsedKey {
  prefix: string;
  secret: string;
}

export function parseKey(key: string): ParsedKey | undefined {
  const m = KEY_PATTERN.exec(key);
  return m ? { prefix: m[1] as string, secret: m[2] as string } : undefined;
}

export function generateKey(): { key: string; prefix: string; secretSha256: string } {
  let prefix = "";
  for (const byte of randomBytes(8)) prefix += ALPHABET[byte & 31];
  const secret = randomBytes(32).toString("base64url");
  return { key: `pfc_${prefix}_${secret}`, prefix, secretSha256: hashSecret(secret) };
}

export function hashSecret(secret: string): string {
  return createHash("sha256").update(secret, "utf8").digest("hex");
}

/** A hash no secret has, compared against when the prefix is unknown, so both paths do the same work. */
const DUMMY_HASH = hashSecret(randomBytes(32).toString("base64url"));

/** Constant-time comparison of the secret's hash with the stored one (or the dummy when there is none). */
export function secretMatches(secret: string, storedSha256: string | undefined): boolean {
  const given = Buffer.from(hashSecret(secret), "hex");
  const stored = Buffer.from(storedSha256 ?? DUMMY_HASH, "hex");
  const same = stored.length === given.length && timingSafeEqual(given, stored);
  return same && storedSha256 !== undefined;
}
