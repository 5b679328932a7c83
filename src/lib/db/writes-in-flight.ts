// How many local writes are started but not yet committed to IndexedDB, and how many have
// settled since the page opened (no storage of its own: counters in memory). Screens show
// "saving…" while a write is in flight, and the sync bar trusts its counts of what waits only
// when they were read after the last write settled: a count read a moment before a keystroke's
// commit would say "nothing waits" for a value not yet queued.
import { useSyncExternalStore } from 'react';

export interface LocalWrites {
  inFlight: number;
  settled: number;
}

let writes: LocalWrites = { inFlight: 0, settled: 0 };
const listeners = new Set<() => void>();
const bump = (patch: Partial<LocalWrites>) => {
  writes = { ...writes, ...patch };
  listeners.forEach((l) => l());
};

/** Counts `write` as in flight until it settles, whatever its outcome. */
export async function tracked<T>(write: () => Promise<T>): Promise<T> {
  bump({ inFlight: writes.inFlight + 1 });
  try {
    return await write();
  } finally {
    bump({ inFlight: writes.inFlight - 1, settled: writes.settled + 1 });
  }
}

/** The counters now: read synchronously, e.g. at the start of a live query. */
export const localWrites = (): LocalWrites => writes;

const subscribe = (l: () => void) => {
  listeners.add(l);
  return () => listeners.delete(l);
};

export function useLocalWrites(): LocalWrites {
  return useSyncExternalStore(subscribe, localWrites);
}

export function useWritesInFlight(): number {
  return useLocalWrites().inFlight;
}
