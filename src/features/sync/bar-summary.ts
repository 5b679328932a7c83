import type { PendingCounts } from '@/lib/db/live';
import type { LocalWrites } from '@/lib/db/writes-in-flight';

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
const clock = (iso: string) => new Date(iso).toLocaleTimeString([], { hour: '2-digit', minute: '2-digit', second: '2-digit' });

/**
 * The sync bar's one-line summary. "All saved on the server" only when it is so: no write still
 * going to the phone's storage, counts read after the last one, nothing waiting, held back or in
 * flight, no photo waiting or refused, and no conflict open.
 */
export function barSummary(counts: PendingCounts | undefined, writes: LocalWrites): { allSaved: boolean; text: string } {
  if (!counts || writes.inFlight > 0 || counts.settledAtRead !== writes.settled) return { allSaved: false, text: 'Saving on this phone…' };
  const sending = counts.records - counts.held;
  const parts: string[] = [];
  if (sending > 0 || counts.photos > 0) {
    parts.push(
      `Waiting to send: ${plural(sending, 'record')}, ${plural(counts.photos, 'photo')}${counts.retryAt ? ` (next try at ${clock(counts.retryAt)})` : ''}`,
    );
  }
  if (counts.held > 0) parts.push(`${plural(counts.held, 'record')} held back: the server refused ${counts.held === 1 ? 'it' : 'them'}`);
  if (parts.length) return { allSaved: false, text: parts.join(' · ') };
  if (counts.conflicts > 0 || counts.failedPhotos > 0) return { allSaved: false, text: 'Sent, but not all as typed' };
  return { allSaved: true, text: 'All saved on the server' };
}
