// Prints "<passed> <failed> <skipped>" from a vitest JSON report. A file that failed without any
// failing test (an import error, a crashed hook) counts as one failure, so a broken file can never
// pass silently. Skipped tests (e.g. checks against ../shared/data when that folder is absent) are
// counted apart, never as passed.
/* eslint-disable @typescript-eslint/no-require-imports */
const path = require("node:path");
const report = require(path.resolve(process.argv[2]));
let failed = report.numFailedTests || 0;
for (const file of report.testResults || []) {
  const anyTestFailed = (file.assertionResults || []).some((a) => a.status === "failed");
  if (file.status === "failed" && !anyTestFailed) failed += 1;
}
const skipped = (report.numPendingTests || 0) + (report.numTodoTests || 0);
console.log(`${report.numPassedTests || 0} ${failed} ${skipped}`);
