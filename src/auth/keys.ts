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

const SECRET_CHARS = 43;
const LETTERS = "abcdefghijklmnopqrstuvwxyz";
/** The letters Crockford's base32 leaves out: i and l (they look like 1), o (like 0), u (so that no word is spelt by chance). */
const LEFT_OUT = [...LETTERS].filter((c) => !ALPHABET.includes(c));
const PREFIX_CHARS_IN_WORDS = `the digits 0-9 and the lower-case letters a-z except ${LEFT_OUT.slice(0, -1).join(", ")} and ${LEFT_OUT.at(-1)}`;
/** How a key is written, in words, alphabets included. */
export const KEY_SHAPE_IN_WORDS = `pfc_<8 characters: ${PREFIX_CHARS_IN_WORDS}>_<${SECRET_CHARS} characters: A-Z, a-z, 0-9, - and _>`;

/**
 * What is wrong with a string meant as a key, in words that never repeat any of it (it may be a real secret);
 * undefined when it has the key's shape.
 */
export function keyShapeProblem(key: string): string | undefined {
  if (KEY_PATTERN.test(key)) return undefined;
  if (key.trim() !== key) return "it has white space before or after it";
  if (!key.startsWith("pfc_")) return "it does not start with pfc_";
  const rest = key.slice(4);
  const end = rest.indexOf("_");
  const prefix = end < 0 ? rest : rest.slice(0, end);
  if (prefix.length !== 8) return `its prefix (between pfc_ and the next _) has ${prefix.length} characters, not 8`;
  if (![...prefix].every((c) => ALPHABET.includes(c))) return `its prefix may hold only ${PREFIX_CHARS_IN_WORDS}`;
  if (end < 0) return "the _ between the prefix and the secret is missing";
  const secret = rest.slice(end + 1);
  if (secret.length !== SECRET_CHARS) return `its secret (after the prefix's _) has ${secret.length} characters, not ${SECRET_CHARS}`;
  return "its secret may hold only A-Z, a-z, 0-9, - and _ (base64url)";
}

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
