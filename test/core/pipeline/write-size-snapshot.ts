/**
 * Writes fixtures/size-outputs.json.br: the full size() output of each snapshot case, as JSON, Brotli-compressed
 * (1.6 MB of JSON, 0.13 MB stored). Run it only when an output is meant to change, and say why in the commit:
 * `npx tsx test/core/pipeline/write-size-snapshot.ts`.
 */
import { writeFileSync } from "node:fs";
import { brotliCompressSync } from "node:zlib";
import { snapshotOutputs, SNAPSHOT_FIXTURE } from "./size-snapshot.js";

writeFileSync(SNAPSHOT_FIXTURE, brotliCompressSync(JSON.stringify(snapshotOutputs())));
console.log(`wrote ${SNAPSHOT_FIXTURE.pathname}`);
