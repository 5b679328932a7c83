// A flake's report names what the failed try waited for and where in the test it stood.
import { describe, expect, it } from 'vitest';
import { describeFailure } from './test-summary-reporter';

describe('describeFailure', () => {
  it('keeps the call log and the test line of a browser step that timed out', () => {
    const err = {
      message:
        "locator.selectOption: Timeout 30000ms exceeded.\nCall log:\n  - waiting for getByLabel('Role of Joss Harl')\n    - locator resolved to <select disabled>\n  - element is not enabled\n",
      stack:
        'TimeoutError: locator.selectOption: Timeout 30000ms exceeded.\n    at /work/repo/tests/browser/desk-plain-words.test.ts:43:16\n    at processTicksAndRejections (node:internal/process/task_queues:95:5)',
    };
    expect(describeFailure(err)).toBe(
      "locator.selectOption: Timeout 30000ms exceeded. ⏎ Call log: ⏎ - waiting for getByLabel('Role of Joss Harl') ⏎ - locator resolved to <select disabled> ⏎ - element is not enabled [at /work/repo/tests/browser/desk-plain-words.test.ts:43]",
    );
  });

  it("adds the lines that differ when an object's assertion says only that it differs", () => {
    const err = {
      message: 'expected { Object (path, findings, ...) } to deeply equal { Object (path, findings, ...) }',
      diff: '- Expected\n+ Received\n\n  {\n    "findings": [],\n-   "small": [],\n+   "small": [\n+     "a \\"Forgot your password?\\" 160×20",\n+   ],\n  }',
    };
    expect(describeFailure(err)).toBe(
      'expected { Object (path, findings, ...) } to deeply equal { Object (path, findings, ...) } {diff: - Expected ⏎ + Received ⏎ - "small": [], ⏎ + "small": [ ⏎ + "a \\"Forgot your password?\\" 160×20", ⏎ + ],}',
    );
  });

  it('gives a plain message as it is, without a place when the stack names no test file', () => {
    expect(describeFailure({ message: 'expected 2 to be 1' })).toBe('expected 2 to be 1');
  });
});
