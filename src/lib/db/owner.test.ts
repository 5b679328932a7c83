// The field store belongs to one person in one workshop: a phone handed to someone else is
// emptied when nothing waits to be sent, and kept (and reported) when something does.
import 'fake-indexeddb/auto';
import { describe, expect, it } from 'vitest';
import type { FieldDb } from './field-db';
import { freshFieldDbPerTest } from './fresh-field-db';
import { saveRecord } from './records';
import { getMeta, setMeta } from './meta';
import { claimStore, discardForeignStore } from './owner';
import { newVehicle } from '@shared/records';

let db: FieldDb;
freshFieldDbPerTest('owner', (opened) => (db = opened));

const ada = { userId: crypto.randomUUID(), teamId: crypto.randomUUID(), email: 'ada@one.test' };
const bo = { userId: crypto.randomUUID(), teamId: crypto.randomUUID(), email: 'bo@two.test' };
const vehicle = () => newVehicle({ name: 'Unit 5', trackRearMm: 1880 });

describe('claimStore', () => {
  it('takes a store nobody owns, and keeps it for the same person', async () => {
    expect(await claimStore(ada, db)).toEqual({ kind: 'own' });
    await saveRecord('vehicle', vehicle(), db);
    expect(await claimStore(ada, db)).toEqual({ kind: 'own' });
    expect(await db.vehicles.count()).toBe(1);
  });

  it('empties a store of someone else with nothing to send, keeping the phone unit', async () => {
    await claimStore(ada, db);
    await db.vehicles.put(vehicle());
    await setMeta('unit', 'in', db);
    await setMeta('pullCursor', 42, db);
    expect(await claimStore(bo, db)).toEqual({ kind: 'own' });
    expect(await db.vehicles.count()).toBe(0);
    expect(await getMeta('pullCursor', db)).toBe(0);
    expect(await getMeta('unit', db)).toBe('in');
    expect(await getMeta('owner', db)).toEqual(bo);
  });

  it("leaves someone else's unsent records untouched and reports them", async () => {
    await claimStore(ada, db);
    await saveRecord('vehicle', vehicle(), db);
    expect(await claimStore(bo, db)).toEqual({ kind: 'foreign', owner: ada, waiting: 1 });
    expect(await db.vehicles.count()).toBe(1);
    expect(await db.outbox.count()).toBe(1);
    expect(await getMeta('owner', db)).toEqual(ada);
    // The same workshop under another person is someone else too.
    expect((await claimStore({ ...ada, userId: crypto.randomUUID() }, db)).kind).toBe('foreign');
  });

  it('discards them only when asked, then belongs to the new person', async () => {
    await claimStore(ada, db);
    await saveRecord('vehicle', vehicle(), db);
    await discardForeignStore(bo, db);
    expect(await db.vehicles.count()).toBe(0);
    expect(await db.outbox.count()).toBe(0);
    expect(await claimStore(bo, db)).toEqual({ kind: 'own' });
  });
});
