import { z } from "zod";
import { buildingCreateSchema, buildingHistorySchema, buildingPageSchema, buildingPatchSchema, buildingSchema } from "../schemas/buildings.js";
import { idempotencyHeaders, idParams, json, pagingQuery, problems, withKey, type RouteContract } from "./types.js";

/** Buildings: created, listed, read, changed (keeping every version). */

export const createBuilding: RouteContract = {
  operationId: "createBuilding",
  summary: "Create a building",
  tags: ["buildings"],
  security: withKey,
  headers: idempotencyHeaders,
  body: buildingCreateSchema,
  response: { "201": json("the building, version 1", buildingSchema), ...problems(withKey, 400, 413, 415, 422) },
};

export const listBuildings: RouteContract = {
  operationId: "listBuildings",
  summary: "List buildings by name",
  tags: ["buildings"],
  security: withKey,
  querystring: z.object({ q: z.string().max(200).optional().describe("part of the name, case-insensitive"), ...pagingQuery }),
  response: { "200": json("a page, ordered by name then id", buildingPageSchema), ...problems(withKey, 400) },
};

export const getBuilding: RouteContract = {
  operationId: "getBuilding",
  summary: "A building",
  tags: ["buildings"],
  security: withKey,
  params: idParams,
  response: { "200": json("the current version", buildingSchema), ...problems(withKey, 404) },
};

export const updateBuilding: RouteContract = {
  operationId: "updateBuilding",
  summary: "Change a building (keeps history)",
  description:
    "Omitted fields stay; null clears address, notes, transformer, utility or economics (economics is replaced whole). A change makes a new version; an unchanged body writes nothing.",
  tags: ["buildings"],
  security: withKey,
  params: idParams,
  headers: idempotencyHeaders,
  body: buildingPatchSchema,
  response: { "200": json("the new current version", buildingSchema), ...problems(withKey, 400, 404, 413, 415, 422) },
};

export const buildingHistory: RouteContract = {
  operationId: "buildingHistory",
  summary: "Every version of a building, oldest first",
  tags: ["buildings"],
  security: withKey,
  params: idParams,
  response: { "200": json("versions, oldest first; the last is current", buildingHistorySchema), ...problems(withKey, 404) },
};
