// The bar says "All saved on the server" only when it is so.
import { describe, expect, it } from 'vitest';
import type { PendingCounts } from '@/lib/db/live';
import { barSummary } from './bar-summary';

const nothing: PendingCounts = { records: 0, held: 0, photos: 0, failedPhotos: 0, conflicts: 0, retryAt: null, settledAtRead: 5 };
const idle = { inFlight: 0, settled: 5 };

describe('barSummary', () => {
  it('says all is saved only with nothing waiting, held, refused or in conflict, counted after the last write', () => {
    expect(barSummary(nothing, idle)).toEqual({ allSaved: true, text: 'All saved on the server' });
  });

  it('never claims it while a keystroke is still going to the phone, or before the counts saw the last one', () => {
    expect(barSummary(nothing, { inFlight: 1, settled: 5 }).allSaved).toBe(false);
    expect(barSummary(nothing, { inFlight: 0, settled: 6 })).toEqual({ allSaved: false, text: 'Saving on this phone…' });
    expect(barSummary(undefined, idle).allSaved).toBe(false);
  });

  it('says what waits, what is held back, and that sent is not all as typed when a conflict or a refused photo is open', () => {
    expect(barSummary({ ...nothing, records: 3, photos: 1 }, idle).text).toBe('Waiting to send: 3 records, 1 photo');
    expect(barSummary({ ...nothing, records: 3, held: 1 }, idle).text).toBe('Waiting to send: 2 records, 0 photos · 1 record held back: the server refused it');
    expect(barSummary({ ...nothing, conflicts: 1 }, idle)).toEqual({ allSaved: false, text: 'Sent, but not all as typed' });
    expect(barSummary({ ...nothing, failedPhotos: 1 }, idle).allSaved).toBe(false);
  });
});
