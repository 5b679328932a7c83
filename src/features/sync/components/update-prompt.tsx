import { useEffect } from 'react';
import { useRegisterSW } from 'virtual:pwa-register/react';

/** How long the "works offline now" note stays: it is news, not a question. */
const OFFLINE_READY_MS = 8_000;

/**
 * Registers the service worker and offers a new version when one is waiting. It never reloads
 * by itself: the tester finishes the entry, then taps Update (everything typed is already saved).
 */
export function UpdatePrompt() {
  const {
    needRefresh: [needRefresh, setNeedRefresh],
    offlineReady: [offlineReady, setOfflineReady],
    updateServiceWorker,
  } = useRegisterSW();
  useEffect(() => {
    if (!offlineReady) return;
    const t = setTimeout(() => setOfflineReady(false), OFFLINE_READY_MS);
    return () => clearTimeout(t);
  }, [offlineReady, setOfflineReady]);
  if (!needRefresh && !offlineReady) return null;
  return (
    <>
      {/* Room at the end of the page, so the note never hides the last button under it. */}
      <div aria-hidden className="h-32" />
      <div
        role="status"
        className="fixed inset-x-2 bottom-2 z-50 mx-auto flex max-w-xl flex-wrap items-center gap-2 rounded-xl border-2 border-slate bg-paper p-3 shadow-lg"
      >
        {needRefresh ? (
          <>
            <span className="font-bold">A new version of Twistlog is ready.</span>
            <button type="button" className="btn-primary" onClick={() => void updateServiceWorker(true)}>
              Update now
            </button>
            <button type="button" className="btn" onClick={() => setNeedRefresh(false)}>
              Later
            </button>
          </>
        ) : (
          <>
            <span className="font-bold">Twistlog now works offline on this device.</span>
            <button type="button" className="btn" onClick={() => setOfflineReady(false)}>
              OK
            </button>
          </>
        )}
      </div>
    </>
  );
}
