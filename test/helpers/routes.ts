import type { FastifyInstance } from "fastify";
import type { RouteContract } from "../../src/http/contracts/types.js";
import type { RegisteredRoute } from "../../src/http/openapi.js";
import { csvOfSeries, syntheticYear } from "../core/interval/fixtures.js";
import { buildingBody, surveyBody } from "../store/fixtures.js";
import { makeTestApp } from "./app.js";
import { exampleSizingBody } from "./bodies.js";

/**
 * The app's real routes, read from the app itself (the route table src/http/openapi.ts keeps as routes are
 * registered), so the tests that walk every route cannot miss a new one.
 */

export interface AppRoute {
  /** GET, POST, … */
  method: string;
  /** The pattern as registered: /v1/buildings/:id */
  url: string;
  contract: RouteContract | undefined;
}

/**
 * Every route of the app, but HEAD (fastify adds one to every GET, answered by the GET's
 * handler) and OPTIONS (the CORS preflight on every path).
 */
export const routesOf = (app: FastifyInstance): AppRoute[] =>
  app.routeTable.filter((r: RegisteredRoute) => r.method !== "HEAD" && r.method !== "OPTIONS").map((r) => ({ ...r }));

/** The same, of a throw-away app: for listing test cases before any test runs. */
export async function appRoutes(): Promise<AppRoute[]> {
  const app = await makeTestApp();
  try {
    return routesOf(app);
  } finally {
    await app.close();
  }
}

/** The routes of the API under /v1 (every one needs a key). */
export const v1Routes = async (): Promise<AppRoute[]> => (await appRoutes()).filter((r) => r.url.startsWith("/v1/"));

/** The OpenAPI path of a route pattern: /v1/buildings/:id → /v1/buildings/{id}. */
export const openapiPath = (url: string): string => url.replace(/:(\w+)/g, "{$1}");

export const label = (r: AppRoute): string => `${r.method} ${r.url}`;

/** Ids of real resources, by the collection a path's :id belongs to. */
export interface RouteIds {
  building: string;
  survey: string;
  interval: string;
  key: string;
}

/**
 * The route's URL with every parameter filled with a real id (n: revision 1). A parameter not known here stays in
 * the URL as ":name", which the walking tests refuse: a new kind of parameter must be taught here.
 */
export function urlWithIds(url: string, ids: RouteIds): string {
  return url
    .replace(/^\/v1\/buildings\/:id/, `/v1/buildings/${ids.building}`)
    .replace(/^\/v1\/surveys\/:id/, `/v1/surveys/${ids.survey}`)
    .replace(/^\/v1\/interval-analyses\/:id/, `/v1/interval-analyses/${ids.interval}`)
    .replace(/^\/v1\/keys\/:id/, `/v1/keys/${ids.key}`)
    .replace(":n", "1")
    .replace(/^\/problems\/:type$/, "/problems/validation");
}

/** A week of hourly interval data, 300 kW and 200 kvar: a valid upload. */
export const weekCsv = csvOfSeries(syntheticYear(24, () => ({ kW: 300, kvar: 200 }), 7));

/** Whether the route takes the interval upload (its declared body is CSV or a form). */
export const takesUpload = (r: AppRoute): boolean => {
  const body = r.contract?.body;
  return body !== undefined && "content" in body && "text/csv" in (body.content as object);
};

/** Whether the route declares a request body. */
export const takesBody = (r: AppRoute): boolean => r.contract?.body !== undefined;

/** The query parameters the route declares. */
export const queryNames = (r: AppRoute): string[] => Object.keys(r.contract?.querystring?.shape ?? {});

/** A valid body for a route that takes one (a sizing request unless the route takes something else). */
export function validBody(r: AppRoute, tag = "test"): { payload: unknown; contentType: string } | undefined {
  if (!takesBody(r)) return undefined;
  if (takesUpload(r)) return { payload: weekCsv, contentType: "text/csv" };
  const byRoute: Record<string, () => unknown> = {
    "POST /v1/buildings": () => buildingBody({ name: `Hall ${tag} ${Math.random().toString(36).slice(2, 8)}` }),
    "PATCH /v1/buildings/:id": () => ({ notes: `changed (${tag})` }),
    "POST /v1/buildings/:id/surveys": () => surveyBody(),
    "POST /v1/surveys/:id/revisions": () => ({ ...surveyBody(), reason: `revised (${tag})` }),
    "POST /v1/keys": () => ({ role: "auditor" }),
  };
  return { payload: (byRoute[label(r)] ?? exampleSizingBody)(), contentType: "application/json" };
}
