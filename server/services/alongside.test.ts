import { describe, expect, it } from 'vitest';
import { alongside } from './alongside';

describe('alongside', () => {
  it('runs the work after the pending promise has had its promise steps, and gives both results', async () => {
    const steps: string[] = [];
    const pending = (async () => {
      for (let i = 0; i < 5; i++) await Promise.resolve();
      steps.push('sent');
      await new Promise((r) => setTimeout(r, 5));
      steps.push('answered');
      return 'rows';
    })();
    const result = await alongside(pending, () => {
      steps.push('work');
      return 42;
    });
    expect(result).toEqual(['rows', 42]);
    expect(steps).toEqual(['sent', 'work', 'answered']);
  });

  it('passes on the failure of the pending promise, even one that fails before the work is done, and leaves none unhandled', async () => {
    const unhandled: unknown[] = [];
    const onUnhandled = (reason: unknown) => unhandled.push(reason);
    process.on('unhandledRejection', onUnhandled);
    try {
      const failing = Promise.reject(new Error('statement failed'));
      await expect(alongside(failing, () => 1)).rejects.toThrow('statement failed');
      await new Promise((r) => setTimeout(r, 10));
      expect(unhandled).toEqual([]);
    } finally {
      process.off('unhandledRejection', onUnhandled);
    }
  });
});
