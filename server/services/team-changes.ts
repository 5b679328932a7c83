// The team's change lock. change_seq comes from one global sequence, stamped when a row is
// written; a transaction that took a number but commits later would be skipped by a pull whose
// cursor already moved past it. So every writer of synced rows holds the team's lock until it
// commits, and pulls wait on it (shared).
import { QueryTypes, type Transaction } from 'sequelize';
import { VehicleModel } from '../models';

const db = () => VehicleModel.sequelize!;

/** Serialises writers of one team's synced rows against pulls (see the header). */
export async function lockTeamChanges(teamId: string, transaction: Transaction, mode: 'write' | 'read' = 'write') {
  const fn = mode === 'write' ? 'pg_advisory_xact_lock' : 'pg_advisory_xact_lock_shared';
  await db().query(`SELECT ${fn}(hashtextextended('twistlog-sync:' || $1, 0))`, { bind: [teamId], transaction, type: QueryTypes.SELECT });
}

/**
 * Runs `fn` in a transaction holding the team's change lock: every writer of synced rows (the
 * desk's edits, uploads, vehicle setup) goes through here or pushBatch, so a pull's cursor never
 * passes a change that commits late.
 */
export function withTeamChanges<T>(teamId: string, fn: (transaction: Transaction) => Promise<T>): Promise<T> {
  return db().transaction(async (transaction) => {
    await lockTeamChanges(teamId, transaction);
    return fn(transaction);
  });
}
