// A Vitest reporter that counts what `npm test` prints in its last line: tests passed, failed and
// skipped, and how many passed only on a retry (a flake made visible, not hidden by the retry).
// It writes the counts as JSON to the file named by TWISTLOG_TEST_SUMMARY; test.mjs reads them.
import fs from 'node:fs';
import path from 'node:path';
import { stripVTControlCharacters } from 'node:util';
import type { Reporter, TestCase, TestModule } from 'vitest/node';

export interface TestSummary {
  passed: number;
  failed: number;
  skipped: number;
  passedOnRetry: string[];
  failedModules: number;
}

/**
 * A failed try on one line: the error's first lines (a browser step's timeout names the step, and
 * its call log what it was waiting for: an element not found, not enabled, not visible) and the
 * line of the test file it was thrown at.
 */
export function describeFailure(err: { message?: string; stack?: string; diff?: string }): string {
  const lines = (text: string) =>
    stripVTControlCharacters(text)
      .split('\n')
      .map((l) => l.replace(/\s+/g, ' ').trim())
      .filter(Boolean);
  const at = (err.stack ?? '').match(/([\w./-]+\.test\.tsx?:\d+)/)?.[1];
  // An assertion on a whole object says only "expected { Object … }": the lines that differ say what.
  const changed = lines(err.diff ?? '').filter((l) => /^[-+]\s/.test(l));
  const diff = changed.length ? ` {diff: ${changed.slice(0, 12).join(' ⏎ ').slice(0, 800)}}` : '';
  return `${lines(err.message ?? String(err))
    .slice(0, 8)
    .join(' ⏎ ')
    .slice(0, 800)}${diff}${at ? ` [at ${at}]` : ''}`;
}

export default class TestSummaryReporter implements Reporter {
  private summary: TestSummary = { passed: 0, failed: 0, skipped: 0, passedOnRetry: [], failedModules: 0 };

  onTestCaseResult(testCase: TestCase): void {
    const state = testCase.result().state;
    if (state === 'passed') {
      this.summary.passed += 1;
      if (testCase.diagnostic()?.flaky) {
        // What the failed try threw (vitest keeps it on a test passed on a retry): without it a
        // flake leaves nothing to investigate.
        const first = testCase.result().errors?.[0];
        const why = first ? ` (the failed try: ${describeFailure(first)})` : '';
        this.summary.passedOnRetry.push(`${path.relative(process.cwd(), testCase.module.moduleId)}: ${testCase.fullName}${why}`);
      }
    } else if (state === 'failed') this.summary.failed += 1;
    else if (state === 'skipped') this.summary.skipped += 1;
  }

  onTestRunEnd(testModules: ReadonlyArray<TestModule>, unhandledErrors: ReadonlyArray<unknown>): void {
    // A module that fails to load runs no test case; count it so the run cannot look green.
    this.summary.failedModules = testModules.filter((m) => m.state() === 'failed').length + unhandledErrors.length;
    const out = process.env.TWISTLOG_TEST_SUMMARY;
    if (out) fs.writeFileSync(out, JSON.stringify(this.summary));
  }
}
