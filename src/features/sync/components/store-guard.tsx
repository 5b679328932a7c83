import { plural } from '@shared/plural';
import { useEffect, useState, type ReactNode } from 'react';
import { useMe } from '@/lib/auth/get-me';
import { useSignOut } from '@/lib/auth/sign-out';
import { claimStore, discardForeignStore, type StoreClaim } from '@/lib/db/owner';
import { startSyncEngine, stopSyncEngine } from '../engine/sync-engine';

/**
 * The field store belongs to one person in one workshop. Until it is theirs, neither the pages
 * nor the sync engine touch it; when another account left unsent records on this phone, say so
 * and offer the two ways on.
 */
export function StoreGuard({ children }: { children: ReactNode }) {
  const me = useMe().data;
  const signOut = useSignOut();
  const [claim, setClaim] = useState<StoreClaim | null>(null);
  const [error, setError] = useState<string | null>(null);
  const owner = me ? { userId: me.user.id, teamId: me.team.id, email: me.user.email } : null;
  const key = owner ? `${owner.userId}:${owner.teamId}` : '';

  useEffect(() => {
    if (!owner) return;
    let live = true;
    setClaim(null);
    claimStore(owner).then(
      (c) => live && setClaim(c),
      (err: Error) => live && setError(`could not open this phone's storage: ${err.message}`),
    );
    return () => {
      live = false;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- the identity is the whole key
  }, [key]);

  useEffect(() => {
    if (claim?.kind !== 'own') return;
    startSyncEngine();
    return stopSyncEngine;
  }, [claim]);

  if (error)
    return (
      <p role="alert" className="m-4 rounded-lg bg-alert-light p-3 text-alert">
        {error}
      </p>
    );
  if (!owner || !claim)
    return (
      <p className="p-6" role="status">
        Opening this phone's records…
      </p>
    );
  if (claim.kind === 'own') return <>{children}</>;
  return (
    <section className="mx-auto max-w-xl space-y-4 p-4" aria-labelledby="foreign-store">
      <h1 id="foreign-store" className="text-2xl font-bold">
        Unsent records of another account
      </h1>
      <p>
        This phone holds {claim.waiting} record{claim.waiting > 1 ? 's' : ''} or photo{claim.waiting > 1 ? 's' : ''} that <strong>{claim.owner.email}</strong>{' '}
        recorded and has not sent yet. They can only go to that account's workshop.
      </p>
      <p>Sign out and let that person sign in on this phone to send them, or discard them for good.</p>
      <div className="flex flex-wrap gap-2">
        <button type="button" className="btn-primary" onClick={() => signOut.mutate(undefined, { onSuccess: () => window.location.assign('/sign-in') })}>
          Sign out
        </button>
        <button
          type="button"
          className="btn border-alert text-alert"
          onClick={() => {
            if (window.confirm(`Discard ${plural(claim.waiting, 'unsent record')} of ${claim.owner.email}? This cannot be undone.`)) {
              void discardForeignStore(owner).then(() => setClaim({ kind: 'own' }));
            }
          }}
        >
          Discard them
        </button>
      </div>
    </section>
  );
}
