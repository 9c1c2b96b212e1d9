/** The closing line of `npm test`, read from vitest's JSON report. */
import fs from 'node:fs';

interface VitestJson {
  numPassedTests?: number;
  numFailedTests?: number;
  numPendingTests?: number;
  numTodoTests?: number;
  testResults?: { status?: string; name?: string; message?: string; assertionResults?: { status?: string }[] }[];
}

export interface Summary {
  passed: number;
  failed: number;
  skipped: number;
  /** `tests: N passed, M failed[, K skipped]` */
  line: string;
  note?: string;
}

export function summarise(reportFile: string): Summary {
  let report: VitestJson | null = null;
  try {
    report = JSON.parse(fs.readFileSync(reportFile, 'utf8')) as VitestJson;
  } catch {
    report = null;
  }
  if (!report) {
    return {
      passed: 0,
      failed: 0,
      skipped: 0,
      line: 'tests: 0 passed, 0 failed',
      note: 'vitest wrote no JSON report (it stopped before running tests)',
    };
  }
  const passed = report.numPassedTests ?? 0;
  let failed = report.numFailedTests ?? 0;
  const skipped = (report.numPendingTests ?? 0) + (report.numTodoTests ?? 0);
  let note: string | undefined;
  // A test file that fails to load (syntax error, failing beforeAll) has no failed test of its own.
  const brokenFiles = (report.testResults ?? []).filter(
    (f) => f.status === 'failed' && !(f.assertionResults ?? []).some((a) => a.status === 'failed'),
  );
  if (brokenFiles.length > 0) {
    failed += brokenFiles.length;
    note = `counted ${brokenFiles.length} test file(s) that failed outside any test as failures: ${brokenFiles.map((f) => f.name).join(', ')}`;
  }
  const line = `tests: ${passed} passed, ${failed} failed${skipped > 0 ? `, ${skipped} skipped` : ''}`;
  return { passed, failed, skipped, line, note };
}
