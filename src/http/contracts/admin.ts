import { z } from "zod";
import { auditPageSchema } from "../schemas/surveys.js";
import { keyCreatedSchema, keyCreateSchema, keyListSchema } from "../schemas/keys.js";
import { idParams, json, pagingQuery, problems, withKey, type RouteContract } from "./types.js";

/** The organisation's API keys and its audit log. */

export const createKey: RouteContract = {
  operationId: "createKey",
  summary: "Create an API key in the caller's organisation (admin)",
  description: "The key is in the answer this once; only its SHA-256 and public prefix are stored.",
  tags: ["keys"],
  security: withKey,
  body: keyCreateSchema,
  response: { "201": json("the key, shown once", keyCreatedSchema), ...problems(withKey, 400, 413, 415) },
};

export const listKeys: RouteContract = {
  operationId: "listKeys",
  summary: "The organisation's API keys, without secrets (admin)",
  tags: ["keys"],
  security: withKey,
  response: { "200": json("every key, revoked ones included, oldest first", keyListSchema), ...problems(withKey) },
};

export const revokeKey: RouteContract = {
  operationId: "revokeKey",
  summary: "Revoke an API key (admin)",
  description: "A revoked key is refused from then on (401); revoking it again changes nothing. The last active admin key cannot be revoked (409).",
  tags: ["keys"],
  security: withKey,
  params: idParams,
  response: { "204": { description: "revoked" }, ...problems(withKey, 404, 409) },
};

export const auditLog: RouteContract = {
  operationId: "auditLog",
  summary: "Every write, newest first",
  tags: ["audit"],
  security: withKey,
  querystring: z.object(pagingQuery),
  response: { "200": json("a page of audit entries", auditPageSchema), ...problems(withKey, 400) },
};
