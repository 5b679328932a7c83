// A gauge point: a marked spot on the opening where the gap is read.
import * as z from 'zod';
import { id, mm, syncedFields, text } from '../schemas/common';
import { defineRecord } from './define';

/** A marked spot on the opening where the gap is read, at (y, z) mm on the body's front wall. */
export const gaugePoint = z.object({
  ...syncedFields,
  vehicleId: id,
  label: text(20, 1),
  yMm: mm,
  zMm: mm,
});
export type GaugePoint = z.infer<typeof gaugePoint>;

export const gaugePointRecord = defineRecord({
  entity: 'gaugePoint',
  schema: gaugePoint,
  table: 'gauge_points',
  columns: { vehicleId: 'uuid', label: 'text', yMm: 'float8', zMm: 'float8' },
  references: { vehicleId: 'vehicle' },
  createdBy: null,
  serverColumns: {},
  dexie: { table: 'gaugePoints', indexes: ['vehicleId'] },
  pullKey: 'gaugePoints',
});

/** A new gauge point of a vehicle, at the centreline on the frame rail unless placed. */
export function newGaugePoint(fields: Pick<GaugePoint, 'vehicleId'> & Partial<GaugePoint>): GaugePoint {
  return { id: crypto.randomUUID(), version: 1, label: 'A', yMm: 0, zMm: 0, ...fields };
}
