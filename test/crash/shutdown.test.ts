import { request } from "node:http";
import { afterEach, describe, expect, it } from "vitest";
import { tempDatabasePath } from "../helpers/db.js";
import { buildingBody } from "../store/fixtures.js";
import { authFetch, startServer, TEST_KEY, type ServerProcess } from "./server-process.js";

let running: ServerProcess | undefined;
afterEach(() => {
  running?.child.kill("SIGKILL");
  running = undefined;
});

describe("graceful shutdown", () => {
  it("lets a request in flight at SIGTERM finish and be stored, then exits 0", async () => {
    const path = tempDatabasePath();
    running = await startServer(path, { SHUTDOWN_TIMEOUT_MS: "10000" });
    const server = running;
    const body = Buffer.from(JSON.stringify(buildingBody({ name: "Slow upload hall" })));
    const url = new URL(`${server.base}/v1/buildings`);
    // A slow client: the headers and half the body now, SIGTERM, then the rest a moment later.
    const answer = new Promise<{ status: number; body: string }>((resolve, reject) => {
      const req = request(
        {
          host: url.hostname,
          port: url.port,
          path: url.pathname,
          method: "POST",
          headers: { "content-type": "application/json", "content-length": body.length, authorization: `Bearer ${TEST_KEY}` },
        },
        (res) => {
          let text = "";
          res.on("data", (d: Buffer) => (text += d.toString()));
          res.on("end", () => resolve({ status: res.statusCode ?? 0, body: text }));
        },
      );
      req.on("error", reject);
      req.write(body.subarray(0, 20));
      setTimeout(() => {
        server.child.kill("SIGTERM");
        setTimeout(() => req.end(body.subarray(20)), 500);
      }, 300);
    });
    const res = await answer;
    expect(res.status).toBe(201);
    const id = (JSON.parse(res.body) as { id: string }).id;
    expect((await server.exited).code).toBe(0);
    running = undefined;

    // stored: a new server on the same file has it
    running = await startServer(path);
    expect((await authFetch(`${running.base}/v1/buildings/${id}`)).status).toBe(200);
  }, 60_000);
});
