// Prints the plain closing line "N passed, N failed[, N skipped]" from vitest's JSON report.
import { existsSync, readFileSync } from "node:fs";

const file = process.argv[2];
if (!file || !existsSync(file)) {
  console.log("no test report was written");
  console.log("0 passed, 1 failed");
  process.exit(1);
}
const r = JSON.parse(readFileSync(file, "utf8"));
const passed = r.numPassedTests ?? 0;
// CHECKS_FAILED: checks run before the tests (the type check) that failed, each counted once.
const failed = (r.numFailedTests ?? 0) + (r.numFailedTestSuites ?? 0) + Number(process.env.CHECKS_FAILED ?? 0);
const skipped = (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
console.log(skipped > 0 ? `${passed} passed, ${failed} failed, ${skipped} skipped` : `${passed} passed, ${failed} failed`);
if (passed === 0 || failed > 0) process.exit(1);
