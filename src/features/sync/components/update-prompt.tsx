import { useRegisterSW } from 'virtual:pwa-register/react';

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
  if (!needRefresh && !offlineReady) return null;
  return (
    <div role="status" className="fixed inset-x-2 bottom-2 z-50 mx-auto flex max-w-xl flex-wrap items-center gap-2 rounded-xl border-2 border-slate bg-paper p-3 shadow-lg">
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
  );
}
