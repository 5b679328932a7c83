// How many local writes are started but not yet committed to IndexedDB (no storage of its own:
// a counter in memory). Screens show "saving…" while it is above zero, so a tester knows when
// it is safe to put the phone away.
import { useSyncExternalStore } from 'react';

let inFlight = 0;
const listeners = new Set<() => void>();
const changed = () => listeners.forEach((l) => l());

/** Counts `write` as in flight until it settles, whatever its outcome. */
export async function tracked<T>(write: () => Promise<T>): Promise<T> {
  inFlight += 1;
  changed();
  try {
    return await write();
  } finally {
    inFlight -= 1;
    changed();
  }
}

export function useWritesInFlight(): number {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => inFlight,
  );
}
