import { describe, expect, it } from 'vitest';
import { pathTo } from './paths';

describe('pathTo', () => {
  it('fills a named page with its ids', () => {
    expect(pathTo('fieldPose', { id: 's1', poseId: 'p2' })).toBe('/field/sessions/s1/poses/p2');
    expect(pathTo('vehicle', { id: 'new' })).toBe('/field/vehicles/new');
    expect(pathTo('desk')).toBe('/desk');
    expect(pathTo('deskVehicle', { id: 'v1' })).toBe('/desk/vehicles/v1');
  });

  it('refuses, at type-check time, a page that does not exist or an id left out', () => {
    // `npm test` type-checks this file first: each line below must stay a type error.
    // @ts-expect-error there is no desk gauge-point page
    expect(() => pathTo('deskGaugePoint', { id: 'g1' })).toThrow();
    // @ts-expect-error a pose needs its session's id too
    expect(() => pathTo('fieldPose', { poseId: 'p2' })).toThrow(/:id/);
    // @ts-expect-error a session page needs the session's id
    expect(() => pathTo('deskSession')).toThrow(/:id/);
  });
});
