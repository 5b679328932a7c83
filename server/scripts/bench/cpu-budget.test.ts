// A CPU budget holds a busy process to its share of a core (the budgeted two-instance rows of
// `npm run bench` rest on it); where the machine has no writable CPU cgroup it says why instead.
import { spawn } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { cpuBudget } from './cpu-budget';
import { cpuSecondsOf } from './cpu-share';

describe('cpuBudget', () => {
  it('holds a busy process to its share of a core, or names why it cannot', async () => {
    const budget = cpuBudget('test', 0.2);
    if (typeof budget === 'string') {
      // Not root, or no cgroup file system: the bench prints this reason in place of the rows.
      expect(budget).toMatch(/cgroup|quota/);
      return;
    }
    const busy = spawn(process.execPath, ['-e', 'for (;;) {}']);
    try {
      budget.add(busy.pid!);
      const before = cpuSecondsOf(busy.pid!);
      const started = performance.now();
      await new Promise((r) => setTimeout(r, 1500));
      const share = (cpuSecondsOf(busy.pid!) - before) / ((performance.now() - started) / 1000);
      // Unbudgeted, the loop takes a whole core (1.0); the quota allows 0.2 a period, and the
      // counters' 10 ms ticks leave some slack.
      expect(share).toBeGreaterThan(0.1);
      expect(share).toBeLessThan(0.35);
    } finally {
      busy.kill('SIGKILL');
      await new Promise((r) => busy.once('exit', r));
      budget.remove();
    }
  });
});
