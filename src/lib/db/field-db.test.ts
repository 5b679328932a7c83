// The phone's record tables come from the registry (shared/records). Dexie only upgrades a phone's
// database when the version number rises, so the stores of version 1 must never change under it:
// an index added in the registry needs a new version() in field-db.ts, and this pin moves with it.
import { describe, expect, it } from 'vitest';
import { recordStores, VERSION_1_RECORDS } from './field-db';

describe('the phone database', () => {
  it("keeps version 1's record stores as the registry declares them", () => {
    expect(recordStores(VERSION_1_RECORDS)).toEqual({
      vehicles: 'id',
      gaugePoints: 'id, vehicleId',
      sessions: 'id, vehicleId, testedOn',
      poses: 'id, sessionId',
      readings: 'id, poseId, [poseId+gaugePointId+axis]',
    });
  });

  it("keeps version 2's re-test requests as the registry declares them", () => {
    expect(recordStores(['retestRequest'])).toEqual({ retestRequests: 'id, sessionId' });
  });

  it('has a table for every synced record', () => {
    expect(Object.keys(recordStores()).sort()).toEqual(Object.keys({ ...recordStores(VERSION_1_RECORDS), ...recordStores(['retestRequest']) }).sort());
  });
});
