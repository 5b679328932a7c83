// A session: one test outing of one vehicle.
import * as z from 'zod';
import { id, isoDate, isoDateTime, shortText, syncedFields } from '../schemas/common';
import { defineRecord } from './define';

/** One test outing of one vehicle. `readingMode` says whether readings are raw gaps or displacements. */
export const testSession = z.object({
  ...syncedFields,
  vehicleId: id,
  title: shortText(120),
  testedOn: isoDate,
  conditions: shortText(),
  loadState: shortText(),
  tyrePressures: shortText(),
  crew: shortText(),
  readingMode: z.enum(['gap', 'displacement']),
  safetyAckAt: isoDateTime.nullable(),
  notes: shortText(4_000),
});
export type TestSession = z.infer<typeof testSession>;

export const testSessionRecord = defineRecord({
  entity: 'testSession',
  schema: testSession,
  table: 'test_sessions',
  columns: {
    vehicleId: 'uuid',
    title: 'text',
    testedOn: 'date',
    conditions: 'text',
    loadState: 'text',
    tyrePressures: 'text',
    crew: 'text',
    readingMode: 'text',
    safetyAckAt: 'timestamptz',
    notes: 'text',
  },
  references: { vehicleId: 'vehicle' },
  createdBy: 'createdBy',
  // Who acknowledged the safety checklist: the person who first sent the acknowledgement.
  serverColumns: { safetyAckBy: { type: 'uuid', nullable: true } },
  dexie: { table: 'sessions', indexes: ['vehicleId', 'testedOn'] },
  pullKey: 'testSessions',
});

/** A new session of a vehicle, tested today (UTC date unless given), readings as raw gaps, checklist not yet ticked. */
export function newTestSession(fields: Pick<TestSession, 'vehicleId'> & Partial<TestSession>): TestSession {
  return {
    id: crypto.randomUUID(),
    version: 1,
    title: '',
    testedOn: new Date().toISOString().slice(0, 10),
    conditions: '',
    loadState: '',
    tyrePressures: '',
    crew: '',
    readingMode: 'gap',
    safetyAckAt: null,
    notes: '',
    ...fields,
  };
}
