// The keystroke worker: runs a keystroke's guessed write (guessed-put.ts) on a connection of its
// own to the page's IndexedDB database, off the page's main thread. IndexedDB's answers to the
// page wait in its queue behind the frame that paints the typed digit, the key's release and the
// browser's autofill task, and the transaction cannot commit before the page has read them and
// checked the guess; here they are read, checked and committed at once, and the page is told after.
// Messages in: { open: { name, version } } to connect ahead of the first keystroke, and
// { n, name, version, put } for a write. Out: { n, result } (null: no connection here, the page
// writes itself) or { n, error: { name, message } }.
import { putOnGuessIn, type GuessedPut } from './guessed-put';

export interface WorkerWrite {
  n: number;
  name: string;
  version: number;
  put: GuessedPut;
}

const connections = new Map<string, Promise<IDBDatabase | null>>();

/**
 * A connection to `name` at `version`, the page's own. It never creates the database nor changes
 * its schema: when the database is missing or at another version, there is no connection (null).
 * It closes as soon as the page (or another tab) asks for a new version or deletes the database.
 */
function connect(name: string, version: number): Promise<IDBDatabase | null> {
  const key = `${version}|${name}`;
  const known = connections.get(key);
  if (known) return known;
  const forget = () => void (connections.get(key) === opening && connections.delete(key));
  const opening = new Promise<IDBDatabase | null>((resolve) => {
    let request: IDBOpenDBRequest;
    try {
      request = indexedDB.open(name, version);
    } catch {
      return resolve(null);
    }
    request.onupgradeneeded = () => request.transaction?.abort();
    request.onsuccess = () => {
      const idb = request.result;
      idb.onversionchange = () => {
        idb.close();
        forget();
      };
      idb.onclose = forget;
      resolve(idb);
    };
    request.onerror = (e) => {
      e.preventDefault();
      resolve(null);
    };
  });
  connections.set(key, opening);
  void opening.then((idb) => idb ?? forget());
  return opening;
}

// A connection closed meanwhile: the page writes this keystroke itself.
const STALE = new Set(['InvalidStateError', 'NotFoundError']);

self.onmessage = async ({ data }: MessageEvent<WorkerWrite | { open: { name: string; version: number } }>) => {
  if ('open' in data) return void connect(data.open.name, data.open.version);
  try {
    const idb = await connect(data.name, data.version);
    self.postMessage({ n: data.n, result: idb ? await putOnGuessIn(idb, data.put) : null });
  } catch (err) {
    const { name, message } = err as { name?: string; message?: string };
    if (name && STALE.has(name)) {
      connections.delete(`${data.version}|${data.name}`);
      return self.postMessage({ n: data.n, result: null });
    }
    self.postMessage({ n: data.n, error: { name: name ?? 'Error', message: message ?? String(err) } });
  }
};
