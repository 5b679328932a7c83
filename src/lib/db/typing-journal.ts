// Edits typed but not yet committed to IndexedDB, kept in sessionStorage under
// 'twistlog-typing:<database name>'. A keystroke's IndexedDB write takes some milliseconds (two
// round trips and a strict-durability commit, more on a busy phone); a reload or a killed tab
// inside that window would drop the last digit typed. Each edit is noted here synchronously,
// before its write starts, and crossed off when the write settles; whatever is left when the page opens again is replayed, in the order it was typed,
// before any screen reads the store (claimStore). sessionStorage belongs to the tab: it survives
// the tab's reloads and is never shared with another tab, so two tabs never replay each other's
// typing. Where there is no sessionStorage (Node), a map in memory stands in.
import type { Reading } from '@shared/schemas';
import type { SyncEntity } from '@shared/schemas/sync';

export type TypedEdit =
  | { op: 'reading'; slot: { poseId: string; gaugePointId: string; axis: Reading['axis'] }; valueMm: number | null }
  | { op: 'patch'; entity: SyncEntity; id: string; patch: Record<string, unknown> };

export type JournalEntry = TypedEdit & { n: number };

const memory = new Map<string, string>();
const store = {
  get: (key: string) => (typeof sessionStorage !== 'undefined' ? sessionStorage.getItem(key) : (memory.get(key) ?? null)),
  set: (key: string, value: string) => (typeof sessionStorage !== 'undefined' ? sessionStorage.setItem(key, value) : void memory.set(key, value)),
};

const keyOf = (dbName: string) => `twistlog-typing:${dbName}`;

export function journalEntries(dbName: string): JournalEntry[] {
  try {
    return JSON.parse(store.get(keyOf(dbName)) ?? '[]') as JournalEntry[];
  } catch {
    return [];
  }
}

function write(dbName: string, entries: JournalEntry[]) {
  try {
    store.set(keyOf(dbName), JSON.stringify(entries));
  } catch {
    // Storage full or refused: the IndexedDB write still goes ahead; only the reload guard is lost.
  }
}

/** Notes an edit before its write starts; returns the entry's number for crossOff. */
export function noteTyping(dbName: string, edit: TypedEdit): number {
  const entries = journalEntries(dbName);
  const n = (entries.at(-1)?.n ?? 0) + 1;
  write(dbName, [...entries, { ...edit, n }]);
  return n;
}

/** The edit's write settled (stored, or refused and reported): nothing to replay. */
export function crossOff(dbName: string, n: number) {
  write(
    dbName,
    journalEntries(dbName).filter((e) => e.n !== n),
  );
}
