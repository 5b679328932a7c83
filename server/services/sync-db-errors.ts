// What PostgreSQL refuses while a batch is written, turned into answers the field client can act
// on instead of a 500: a database that cannot be reached (or is busy) is a 503, so the phone keeps
// the batch as it is and tries again; a row the database refuses (a constraint, a value out of its
// range) is a 400 naming the record and field where the constraint's key points at one, so the
// phone holds that record for the tester and sends the rest.
import { isDatabaseUnavailable } from '../db';
import { AppError, Invalid, Unavailable, type FieldError } from '../http/errors';

interface PgError {
  code?: string;
  detail?: string;
  constraint?: string;
  message?: string;
}

const pgOf = (err: unknown): PgError => {
  const e = err as { parent?: PgError; original?: PgError } & PgError;
  return e?.parent ?? e?.original ?? e ?? {};
};

/** `Key (vehicle_id, label)=(…, A)` of a constraint error's detail, as column → value. */
export function constraintKey(detail: string | undefined): Record<string, string> {
  const m = /Key \(([^)]*)\)=\((.*?)\)( already exists| conflicts with)/.exec(detail ?? '');
  if (!m) return {};
  const cols = m[1].split(', ');
  const vals = m[2].split(', ');
  // A value may itself hold ", ": the last column takes what is left.
  const out: Record<string, string> = {};
  cols.forEach((c, i) => (out[c] = i === cols.length - 1 ? vals.slice(i).join(', ') : vals[i]));
  return out;
}

/**
 * Rethrows `err` as an answer the client can act on. `name` finds the field of the batch a
 * constraint's key points at (or null); anything not understood is rethrown as it is.
 */
export function translateDbError(err: unknown, name: (constraint: string, key: Record<string, string>) => FieldError | null): never {
  if (err instanceof AppError) throw err;
  if (isDatabaseUnavailable(err)) throw new Unavailable('the database cannot be reached right now; nothing was written, try again shortly');
  const pg = pgOf(err);
  if (pg.code?.startsWith('23') || pg.code?.startsWith('22')) {
    const named = pg.constraint ? name(pg.constraint, constraintKey(pg.detail)) : null;
    const what = `the database refused the batch, nothing was written: ${pg.detail ?? pg.message ?? pg.code}`;
    throw new Invalid(named ? `${named.field}: ${named.message}` : what, named ? [named] : []);
  }
  throw err;
}
