// For tests (not a test itself): each test of a file gets a fresh field store on fake-indexeddb,
// opened before it and deleted after it.
import { afterEach, beforeEach } from 'vitest';
import { FieldDb } from './field-db';

/** `let db: FieldDb; freshFieldDbPerTest('records', (opened) => (db = opened));` */
export function freshFieldDbPerTest(prefix: string, use: (db: FieldDb) => void): void {
  let db: FieldDb | undefined;
  beforeEach(async () => {
    db = new FieldDb(`${prefix}-${crypto.randomUUID()}`);
    await db.open();
    use(db);
  });
  afterEach(async () => {
    db?.close();
    await db?.delete();
  });
}
