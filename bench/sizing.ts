import { twentyLoadBody } from "./bodies.js";
import { benchEngine, ENGINE_MS_GOAL } from "./engine.js";
import { AUTH, postLoad, startApp, type Knobs, type LoadResult } from "./http.js";
import type { SectionResult } from "./section.js";
import { sizingRequestSchema } from "../src/http/schemas/sizing.js";
import { parseOr400 } from "../src/http/validate.js";

/** Bench-only baseline: the same HTTP stack, JSON parsing and request validation (the route's own parse), no engine. */
export const BARE_PATH = "/bench/bare";
export const ECHO_PATH = "/bench/bare-answer";
/** Goal: sizing throughput at least 60 % of the bare route's. */
export const SIZING_RATIO_GOAL = 0.6;

/**
 * POST /v1/sizing with a 20-load body against a bare route that only parses the same body, on the real app,
 * same duration and connections for both, each after its own warm-up.
 */
export async function benchSizing(knobs: Knobs): Promise<SectionResult> {
  // The engine alone first, before the HTTP load warms and fragments the heap.
  const engine = benchEngine();
  // A second baseline answers a stored sizing result of the same size: it isolates the engine's cost from the
  // cost of serialising and writing a ~25 KB answer, which the {ok:true} baseline does not pay.
  let stored: unknown = null;
  const running = await startApp((app) => {
    app.post(BARE_PATH, async (request) => {
      parseOr400(sizingRequestSchema, request.body);
      return { ok: true };
    });
    app.post(ECHO_PATH, async (request) => {
      parseOr400(sizingRequestSchema, request.body);
      return stored;
    });
  });
  try {
    const body = JSON.stringify(twentyLoadBody());
    const sizingUrl = `${running.baseUrl}/v1/sizing`;
    const bareUrl = `${running.baseUrl}${BARE_PATH}`;

    // the body must be a valid request, or the bench would measure 400s
    const probe = await fetch(sizingUrl, { method: "POST", headers: { "content-type": "application/json", ...AUTH }, body });
    if (probe.status !== 200) throw new Error(`the bench body is rejected: ${probe.status} ${(await probe.text()).slice(0, 300)}`);
    const answer = await probe.text();
    stored = JSON.parse(answer);
    const echoUrl = `${running.baseUrl}${ECHO_PATH}`;

    if (knobs.warmupSeconds > 0) {
      await postLoad(sizingUrl, body, knobs.warmupSeconds, knobs.connections);
      await postLoad(bareUrl, body, knobs.warmupSeconds, knobs.connections);
      await postLoad(echoUrl, body, knobs.warmupSeconds, knobs.connections);
    }
    // The three routes take turns in one-second windows, so load from outside the bench (a shared machine) falls
    // on all three alike instead of on whichever ran while it lasted.
    const [sizing, bare, echo] = (await interleavedLoads([sizingUrl, bareUrl, echoUrl], body, knobs.seconds, knobs.connections)) as [
      LoadResult,
      LoadResult,
      LoadResult,
    ];
    const ratio = sizing.reqPerSec / bare.reqPerSec;
    const echoRatio = sizing.reqPerSec / echo.reqPerSec;
    const fmt = (n: number) => n.toFixed(0);
    return {
      rows: [
        {
          section: "sizing",
          metric: "POST /v1/sizing (20 loads) req/s",
          value: fmt(sizing.reqPerSec),
          detail: `p50 ${sizing.p50Ms} ms, p99 ${sizing.p99Ms} ms`,
        },
        {
          section: "sizing",
          metric: `POST ${BARE_PATH} (same body) req/s`,
          value: fmt(bare.reqPerSec),
          detail: `p50 ${bare.p50Ms} ms, p99 ${bare.p99Ms} ms`,
        },
        {
          section: "sizing",
          metric: "sizing / bare ratio",
          value: ratio.toFixed(3),
          goal: `≥ ${SIZING_RATIO_GOAL}`,
          pass: ratio >= SIZING_RATIO_GOAL,
        },
        {
          section: "sizing",
          metric: `POST ${ECHO_PATH} (parse, answer a stored result) req/s`,
          value: fmt(echo.reqPerSec),
          detail: `p50 ${echo.p50Ms} ms, p99 ${echo.p99Ms} ms`,
        },
        { section: "sizing", metric: "sizing / same-size-answer ratio", value: echoRatio.toFixed(3), detail: "the engine's own cost" },
        {
          section: "sizing",
          metric: "engine size(), 20 loads with harmonic study, ms",
          value: engine.studyMs.toFixed(3),
          goal: `≤ ${ENGINE_MS_GOAL}`,
          pass: engine.studyMs <= ENGINE_MS_GOAL,
          detail: `${engine.studyRatio.toFixed(0)}× a plain arithmetic loop over the same loads (${(engine.loopMs * 1000).toFixed(2)} µs)`,
        },
        { section: "sizing", metric: "engine size(), the HTTP bench body (no drives), ms", value: engine.plainMs.toFixed(3) },
      ],
      notes: [
        `${knobs.seconds} s, ${knobs.connections} connections each, in turns of 1 s, after ${knobs.warmupSeconds} s warm-up; body ${body.length} bytes, answer ${answer.length} bytes`,
        "both baselines parse and validate the body as the sizing route does; the first answers {ok:true}, the second the stored answer",
      ],
    };
  } finally {
    await running.close();
  }
}

/**
 * Each URL loaded for `seconds` in all, in turns of one second (URL 1, 2, 3, 1, 2, 3…). Per URL: requests over the
 * whole time; p50 the median of the turns' p50, p99 the largest turn's p99.
 */
async function interleavedLoads(urls: string[], body: string, seconds: number, connections: number): Promise<LoadResult[]> {
  const turns: LoadResult[][] = urls.map(() => []);
  for (let t = 0; t < seconds; t++) {
    for (const [i, url] of urls.entries()) turns[i]!.push(await postLoad(url, body, 1, connections));
  }
  return turns.map((rs) => {
    const requests = rs.reduce((n, r) => n + r.requests, 0);
    const p50s = rs.map((r) => r.p50Ms).sort((a, b) => a - b);
    return {
      reqPerSec: requests / rs.length,
      p50Ms: p50s[Math.floor(p50s.length / 2)] ?? NaN,
      p99Ms: Math.max(...rs.map((r) => r.p99Ms)),
      requests,
      non2xx: rs.reduce((n, r) => n + r.non2xx, 0),
      errors: rs.reduce((n, r) => n + r.errors, 0),
    };
  });
}
