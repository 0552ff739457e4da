// Prints the plain closing line "N passed, N failed[, N skipped]" from vitest's JSON reports (one per suite run:
// the whole suite on the default store, then the API and auth suites again on PostgreSQL), summed.
import { existsSync, readFileSync } from "node:fs";

const files = process.argv.slice(2);
let passed = 0;
let failed = 0;
let skipped = 0;
for (const file of files) {
  if (!existsSync(file)) {
    console.log(`no test report was written at ${file}`);
    failed += 1;
    continue;
  }
  const r = JSON.parse(readFileSync(file, "utf8"));
  passed += r.numPassedTests ?? 0;
  failed += (r.numFailedTests ?? 0) + (r.numFailedTestSuites ?? 0);
  skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
}
if (files.length === 0) {
  console.log("no test report was written");
  failed += 1;
}
// CHECKS_FAILED: checks run before the tests (the type check, lint) that failed, each counted once.
failed += Number(process.env.CHECKS_FAILED ?? 0);
console.log(skipped > 0 ? `${passed} passed, ${failed} failed, ${skipped} skipped` : `${passed} passed, ${failed} failed`);
if (passed === 0 || failed > 0) process.exit(1);
