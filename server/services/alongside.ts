// CPU work done while a statement runs in PostgreSQL: the two overlap instead of following each
// other (a push computes its hash and its records' JSON while its rows are read and locked).

/** Runs `work` while `pending`, a statement already on its way, runs in PostgreSQL; gives both results. */
export async function alongside<T, U>(pending: Promise<T>, work: () => U): Promise<[T, U]> {
  // Awaited below; a failure meanwhile must not count as unhandled.
  pending.catch(() => undefined);
  // Lets the statement leave first (Sequelize sends it a few promise steps after the call).
  await new Promise((resolve) => setImmediate(resolve));
  const done = work();
  return [await pending, done];
}
