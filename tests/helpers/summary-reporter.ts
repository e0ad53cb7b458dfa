/**
 * Adds one plain closing line, `N passed, N failed, N skipped`, after Vitest's own summary, so a
 * reader of the CI log (human or machine) sees the counts in the form most test runners print.
 *
 * Vitest reports the tests of a suite whose `beforeAll` threw as skipped, and a file that failed to
 * import as no tests at all; here both count as failed, so a broken setup can never read as green.
 * An error outside every file (an unhandled rejection) counts as one failure each, and a run that
 * failed with nothing else to show for it (a global setup that throws: no test runs at all) as one,
 * so that "0 failed" never reads as green.
 * Only a test marked to skip (`it.skip`, `skipIf`, `todo`) counts as skipped.
 *
 * Each unhandled error also gets a line of its own just above the counts (what it said, the file that
 * was running, the first frame of the project's own code), since a CI log is often read from its tail.
 */
import path from 'node:path';
import type { SerializedError } from 'vitest';
import type { Reporter, TestCase, TestModule, TestRunEndReason, Vitest } from 'vitest/node';

export interface Counts {
  passed: number;
  failed: number;
  skipped: number;
}

/** Whether a suite or the file around the test failed outside any test (a hook, an import). */
function underFailure(test: TestCase): boolean {
  for (let parent = test.parent; ; parent = parent.parent) {
    if (parent.state() === 'failed') return true;
    if (parent.type === 'module') return false;
  }
}

export function countResults(testModules: ReadonlyArray<TestModule>): Counts {
  const counts: Counts = { passed: 0, failed: 0, skipped: 0 };
  for (const module of testModules) {
    let failedHere = 0;
    for (const test of module.children.allTests()) {
      const state = test.result().state;
      if (state === 'passed') counts.passed += 1;
      else if (state === 'failed') failedHere += 1;
      else if (test.options.mode === 'skip' || test.options.mode === 'todo') counts.skipped += 1;
      else if (underFailure(test)) failedHere += 1;
      else counts.skipped += 1;
    }
    // A file that threw before any test was collected, or broke in a hook after all its tests passed.
    if (failedHere === 0 && module.state() === 'failed') failedHere = 1;
    counts.failed += failedHere;
  }
  return counts;
}

/** `unhandled: Error: message (while tests/x.test.ts ran, at server/y.ts:12:3)`, on one line. */
export function describeUnhandled(error: SerializedError, root: string): string {
  const file = typeof error.VITEST_TEST_PATH === 'string' ? error.VITEST_TEST_PATH : null;
  const ours = (error.stack ?? '')
    .split('\n')
    .map((line) => /\(?((?:file:\/\/)?\/[^\s()]+:\d+:\d+)\)?\s*$/.exec(line.trim())?.[1])
    .find((frame) => frame && frame.replace('file://', '').startsWith(root) && !frame.includes('node_modules'));
  const where = [
    file ? `while ${path.relative(root, file)} ran` : null,
    ours ? `at ${path.relative(root, ours.replace('file://', ''))}` : null,
  ].filter(Boolean);
  const said = `${error.name ?? 'Error'}: ${String(error.message ?? '').split('\n')[0]}`;
  return `unhandled: ${said}${where.length ? ` (${where.join(', ')})` : ''}`;
}

export default class SummaryReporter implements Reporter {
  private root = process.cwd();

  onInit(vitest: Vitest): void {
    this.root = vitest.config.root;
  }

  onTestRunEnd(
    testModules: ReadonlyArray<TestModule>,
    unhandledErrors: ReadonlyArray<SerializedError>,
    reason: TestRunEndReason,
  ): void {
    const { passed, failed, skipped } = countResults(testModules);
    const said = unhandledErrors.map((error) => `${describeUnhandled(error, this.root)}\n`).join('');
    let total = failed + unhandledErrors.length;
    // A global setup that throws reaches no reporter as an error, only as a run that failed.
    if (reason === 'failed' && total === 0) total = 1;
    process.stdout.write(`\n${said}${passed} passed, ${total} failed, ${skipped} skipped\n`);
  }
}
