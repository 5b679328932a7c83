// The registry of synced records: the one list of what the phone and the server keep in step,
// parents before children (so a batch's inserts satisfy the foreign keys). Adding a field to a
// record touches its file here, one migration and the form that edits it (DEVELOPERS.md).
import type * as z from 'zod';
import { vehicleRecord } from './vehicle';
import { gaugePointRecord } from './gauge-point';
import { testSessionRecord } from './test-session';
import { poseRecord } from './pose';
import { readingRecord } from './reading';
import { retestRequestRecord } from './retest-request';

export const records = {
  vehicle: vehicleRecord,
  gaugePoint: gaugePointRecord,
  testSession: testSessionRecord,
  pose: poseRecord,
  reading: readingRecord,
  retestRequest: retestRequestRecord,
};

export type SyncEntity = keyof typeof records;
export type RecordDefinitionOf<E extends SyncEntity> = (typeof records)[E];

/** Every synced entity, parents first. */
export const syncEntities = Object.keys(records) as SyncEntity[];

/** The record type of each synced entity. */
export type RecordOf<E extends SyncEntity> = z.output<RecordDefinitionOf<E>['schema']>;
/** A record as a batch may carry it (fields added later may be absent: their defaults fill them). */
export type RecordInputOf<E extends SyncEntity> = z.input<RecordDefinitionOf<E>['schema']>;
/** The key of each entity's list in a pull answer. */
export type PullKeyOf<E extends SyncEntity> = RecordDefinitionOf<E>['pullKey'];

export { newVehicle } from './vehicle';
export { newGaugePoint } from './gauge-point';
export { newTestSession } from './test-session';
export { newPose } from './pose';
export { newReading } from './reading';
export { newRetestRequest } from './retest-request';
