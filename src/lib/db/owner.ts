// Whose records the phone's store holds (meta 'owner'). A store is synced only by the person and
// workshop who wrote it: pushed under someone else's session, its records would land in the wrong
// workshop, and a second person on a shared phone must not see the first one's records.
import { syncEntities } from '@shared/records';
import { fieldDb, tableOf, type FieldDb } from './field-db';
import { getMeta, setMeta, type StoreOwner } from './meta';
import { replayTyping } from './records';

export type StoreClaim = { kind: 'own' } | { kind: 'foreign'; owner: StoreOwner; waiting: number };

const sameOwner = (a: StoreOwner, b: StoreOwner) => a.userId === b.userId && a.teamId === b.teamId;

function allTables(db: FieldDb) {
  return [...syncEntities.map((e) => tableOf(db, e)), db.outbox, db.batches, db.photos, db.conflicts, db.meta];
}

async function emptyFor(me: StoreOwner, db: FieldDb) {
  // The display unit is the phone's, not the person's: keep it.
  const unit = await getMeta('unit', db);
  for (const t of allTables(db)) await t.clear();
  await setMeta('unit', unit, db);
  await setMeta('owner', me, db);
}

/**
 * Takes the store for the signed-in person: theirs already, or nobody's (first use), or someone
 * else's with nothing left to send (emptied first). Someone else's with unsent work is left
 * untouched and reported, for that person to sign in and send it, or for this one to discard it.
 */
export async function claimStore(me: StoreOwner, db: FieldDb = fieldDb): Promise<StoreClaim> {
  // Typing a reload cut short belongs to the store as it was: store it before anyone reads it.
  await replayTyping(db);
  return db.transaction('rw', allTables(db), async () => {
    const owner = await getMeta('owner', db);
    if (owner && sameOwner(owner, me)) return { kind: 'own' } as const;
    if (!owner) {
      await setMeta('owner', me, db);
      return { kind: 'own' } as const;
    }
    const waiting = (await db.outbox.count()) + (await db.photos.where('status').equals('pending').count());
    if (waiting > 0) return { kind: 'foreign', owner, waiting } as const;
    await emptyFor(me, db);
    return { kind: 'own' } as const;
  });
}

/** Throws away another person's unsent records, at the signed-in person's explicit request. */
export async function discardForeignStore(me: StoreOwner, db: FieldDb = fieldDb): Promise<void> {
  await db.transaction('rw', allTables(db), () => emptyFor(me, db));
}
