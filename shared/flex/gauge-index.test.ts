import { describe, it, expect } from 'vitest';
import { indexGaugeLocations } from './gauge-index';

describe('indexGaugeLocations', () => {
  it('indexes the points by id', () => {
    const index = indexGaugeLocations('f', 'points', [
      { id: 'A', y: 0, z: 700 },
      { id: 'B', y: 300, z: 700 },
    ]);
    expect([...index]).toEqual([
      ['A', 0],
      ['B', 1],
    ]);
  });

  it('names the bad field under the caller’s function and list', () => {
    expect(() => indexGaugeLocations('designEnvelope', 'gaugePoints', [])).toThrowError('designEnvelope: gaugePoints must be a non-empty array');
    expect(() =>
      indexGaugeLocations('f', 'points', [
        { id: 'A', y: 0, z: 1 },
        { id: 'A', y: 1, z: 1 },
      ]),
    ).toThrowError("f: points[1].id repeats gauge point id 'A'");
    expect(() => indexGaugeLocations('f', 'points', [{ id: 'A', y: 0, z: NaN }])).toThrowError(/f: points\[0\]\.z must be a finite number/);
    expect(() => indexGaugeLocations('f', 'points', [{ y: 0, z: 1 } as never])).toThrowError(/points\[0\]\.id must be a string/);
  });
});
