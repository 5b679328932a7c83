// Runs sync by itself: when the connection returns ('online'), when the app comes back to the
// front (visibilitychange), on a timer, and shortly after the tester saves something. One run
// at a time. Its live state (running, upload progress) is a tiny external store for React.
import { fieldDb } from '@/lib/db/field-db';
import { httpTransport } from '../api/transport';
import { runSync, type Progress } from './sync-run';

const TIMER_MS = 30_000;
const AFTER_SAVE_MS = 1_500;

export interface EngineState {
  running: boolean;
  progress: Progress | null;
  online: boolean;
}

let state: EngineState = { running: false, progress: null, online: typeof navigator === 'undefined' ? true : navigator.onLine };
const listeners = new Set<() => void>();
const set = (patch: Partial<EngineState>) => {
  state = { ...state, ...patch };
  for (const l of listeners) l();
};

export const syncState = {
  subscribe(l: () => void) {
    listeners.add(l);
    return () => listeners.delete(l);
  },
  get: () => state,
};

let current: Promise<void> | null = null;
let again = false;

/** Off until the store is claimed by the signed-in person (StoreGuard), and again at sign-out. */
let enabled = false;

let forced = false;
let retryTimer: ReturnType<typeof setTimeout> | undefined;

/**
 * Starts a run now, or right after the current one. `force` is a person asking (Sync now): held
 * records and a batch that is backing off go at once.
 */
export function syncNow(opts: { force?: boolean } = {}): Promise<void> {
  if (!enabled) return Promise.resolve();
  forced ||= Boolean(opts.force);
  if (current) {
    again = true;
    return current;
  }
  current = (async () => {
    set({ running: true });
    try {
      do {
        again = false;
        const force = forced;
        forced = false;
        const result = await runSync(fieldDb, httpTransport, (progress) => set({ progress }), { force });
        // A batch backing off is sent again when its wait is over, not only at the next timer tick.
        clearTimeout(retryTimer);
        if (!result.ok && result.retryAt) retryTimer = setTimeout(() => void syncNow(), Math.max(0, Date.parse(result.retryAt) - Date.now()) + 50);
        if (!result.ok && result.error.isNetwork) break;
      } while (again);
    } finally {
      current = null;
      set({ running: false, progress: null });
    }
  })();
  return current;
}

let saveTimer: ReturnType<typeof setTimeout> | undefined;

/** Called after a local save: sync soon, batching a burst of keystrokes into one run. */
export function syncSoon() {
  clearTimeout(saveTimer);
  saveTimer = setTimeout(() => {
    if (navigator.onLine) void syncNow();
  }, AFTER_SAVE_MS);
}

let started = false;

/** Stops further runs (a run under way finishes): the store may not be this session's any more. */
export function stopSyncEngine(): void {
  enabled = false;
}

export function startSyncEngine(): void {
  enabled = true;
  if (started) {
    if (navigator.onLine) void syncNow();
    return;
  }
  started = true;
  window.addEventListener('online', () => {
    set({ online: true });
    void syncNow();
  });
  window.addEventListener('offline', () => set({ online: false }));
  window.addEventListener('twistlog:saved', syncSoon);
  document.addEventListener('visibilitychange', () => {
    if (document.visibilityState === 'visible' && navigator.onLine) void syncNow();
  });
  setInterval(() => {
    if (navigator.onLine) void syncNow();
  }, TIMER_MS);
  if (navigator.onLine) void syncNow();
}
