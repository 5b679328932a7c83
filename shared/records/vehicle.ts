// A vehicle (a build: chassis and body) with its dimensions and the pass-through opening.
import * as z from 'zod';
import { positiveMm, shortText, syncedFields, text } from '../schemas/common';
import { defineRecord } from './define';

/**
 * The pass-through opening on the body's front wall (plane x = 0): a rectangle with rounded
 * corners, located by its centre's y (from the vehicle centreline, + = left) and its bottom edge's
 * z (from the top of the frame rail, + = up), ISO 8855 axes.
 */
export const opening = z
  .object({
    widthMm: positiveMm,
    heightMm: positiveMm,
    cornerRadiusMm: z.number().finite().min(0).max(5_000),
    centreYMm: z.number().finite().min(-5_000).max(5_000),
    bottomZMm: z.number().finite().min(-5_000).max(10_000),
  })
  .refine((o) => o.cornerRadiusMm * 2 <= Math.min(o.widthMm, o.heightMm), {
    message: 'corner radius must be at most half the smaller side',
    path: ['cornerRadiusMm'],
  });
export type Opening = z.infer<typeof opening>;

export const vehicle = z.object({
  ...syncedFields,
  name: text(120, 1),
  chassis: shortText(),
  body: shortText(),
  wheelbaseMm: positiveMm,
  trackFrontMm: positiveMm,
  trackRearMm: positiveMm,
  opening,
  nominalGapMm: z.number().finite().min(0).max(2_000),
  notes: shortText(4_000),
});
export type Vehicle = z.infer<typeof vehicle>;

export const vehicleRecord = defineRecord({
  entity: 'vehicle',
  schema: vehicle,
  table: 'vehicles',
  columns: {
    name: 'text',
    chassis: 'text',
    body: 'text',
    wheelbaseMm: 'float8',
    trackFrontMm: 'float8',
    trackRearMm: 'float8',
    opening: 'jsonb',
    nominalGapMm: 'float8',
    notes: 'text',
  },
  references: {},
  createdBy: null,
  serverColumns: {},
  dexie: { table: 'vehicles', indexes: [] },
  pullKey: 'vehicles',
});

/** A new vehicle as the setup screen starts it (a mid-size truck with a common opening): name it before it is valid. */
export function newVehicle(fields: Partial<Vehicle> = {}): Vehicle {
  return {
    id: crypto.randomUUID(),
    version: 1,
    name: '',
    chassis: '',
    body: '',
    wheelbaseMm: 3800,
    trackFrontMm: 1900,
    trackRearMm: 1900,
    opening: { widthMm: 700, heightMm: 500, cornerRadiusMm: 80, centreYMm: 0, bottomZMm: 350 },
    nominalGapMm: 90,
    notes: '',
    ...fields,
  };
}
