import { useEffect } from 'react';
import { setMeta } from '@/lib/db/meta';
import { useMetaValue } from '@/lib/db/live';

/**
 * Asks the browser to keep Twistlog's storage (navigator.storage.persist()); without it, a phone
 * short of space may evict unsynced readings. The answer is kept and shown.
 */
export function usePersistentStorage(): boolean | null | undefined {
  const granted = useMetaValue('persisted');
  useEffect(() => {
    const storage = navigator.storage;
    if (!storage?.persist) return;
    void (async () => {
      const already = await storage.persisted();
      await setMeta('persisted', already || (await storage.persist()));
    })();
  }, []);
  return granted;
}
