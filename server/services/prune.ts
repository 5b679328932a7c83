// Bookkeeping that is only needed for a while is deleted once it is old: the stored answers of
// pushed batches (a phone retries a batch within days, not months), throttle counters past their
// window. Each app instance runs it every hour, the first time a minute after it starts; deleting the same old rows twice does no harm.
import { VehicleModel } from '../models';

/** How long a pushed batch's answer is kept for a retry with the same idempotency key. */
export const SYNC_BATCH_RETENTION_DAYS = 30;
const EVERY_MS = 60 * 60 * 1000;

export async function pruneExpired(): Promise<void> {
  const db = VehicleModel.sequelize!;
  await db.query(`DELETE FROM sync_batches WHERE created_at < now() - make_interval(days => $1)`, { bind: [SYNC_BATCH_RETENTION_DAYS] });
  await db.query(`DELETE FROM rate_limits WHERE expire < $1`, { bind: [Date.now()] });
  await db.query(`DELETE FROM sign_in_throttle WHERE updated_at < now() - interval '1 day'`);
}

/** How long after start the first pruning waits: a starting instance answers its first requests first. */
const FIRST_AFTER_MS = 60 * 1000;

/** Prune a minute after start and every hour from then (the timers do not keep the process alive). */
export function schedulePruning(onError: (err: unknown) => void): () => void {
  const run = () => pruneExpired().catch(onError);
  let every: NodeJS.Timeout | undefined;
  const first = setTimeout(() => {
    void run();
    every = setInterval(run, EVERY_MS).unref();
  }, FIRST_AFTER_MS).unref();
  return () => {
    clearTimeout(first);
    clearInterval(every);
  };
}
