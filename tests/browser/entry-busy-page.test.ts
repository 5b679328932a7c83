// A keystroke in a reading's box is stored on the phone even while the page itself is busy: the
// keystroke worker reads, checks and commits the write on its own thread (src/lib/db/guessed-write.ts),
// so a page stuck in its own work (a long render, a slow phone) does not hold the reading back,
// and a tab killed in that moment has already kept it.
import { describe, expect, it } from 'vitest';
import { browserHarness } from '../support/browser';
import { settled, testerOnPose, typeInto } from '../support/field-entry';

const h = browserHarness();

describe('a keystroke while the page is busy', () => {
  it('is committed to the phone while the page is still busy with that keystroke', async () => {
    const { pointIds, poseId, context, page } = await testerOnPose(h, 'Busy page workshop');
    await typeInto(page, 'A lateral', '12');
    await settled(page);

    // Another tab of the phone reads the store itself: a page of the server, not the app, so it
    // neither syncs nor writes.
    const other = await context.newPage();
    await other.goto(`${h.ts.baseUrl}/api/health`);

    // The page's next input event holds its main thread for 4 s once the recorder has handled it.
    await page.evaluate(() => {
      addEventListener(
        'input',
        () => {
          const until = Date.now() + 4000;
          while (Date.now() < until);
          (window as unknown as { busyUntil: number }).busyUntil = Date.now();
        },
        { once: true },
      );
    });
    const typed = page.keyboard.press('3');
    const seenAt = await other.evaluate(
      async ({ poseId, gaugePointId }) => {
        const idb = await new Promise<IDBDatabase>((resolve, reject) => {
          const request = indexedDB.open('twistlog-field');
          request.onsuccess = () => resolve(request.result);
          request.onerror = () => reject(request.error);
        });
        const stored = () =>
          new Promise<number | null>((resolve, reject) => {
            const request = idb.transaction('readings').objectStore('readings').index('[poseId+gaugePointId+axis]').getAll([poseId, gaugePointId, 'lateral']);
            request.onsuccess = () => resolve((request.result as { valueMm: number; deletedAt: string | null }[]).find((r) => !r.deletedAt)?.valueMm ?? null);
            request.onerror = () => reject(request.error);
          });
        const giveUp = Date.now() + 20_000;
        while (Date.now() < giveUp) {
          if ((await stored()) === 123) return Date.now();
          await new Promise((r) => setTimeout(r, 20));
        }
        return null;
      },
      { poseId, gaugePointId: pointIds[0] },
    );
    await typed;
    const busyUntil = await page.evaluate(() => (window as unknown as { busyUntil: number }).busyUntil);
    expect(seenAt, 'the reading is stored').not.toBeNull();
    expect(seenAt!, 'stored before the page was free again').toBeLessThan(busyUntil);
    await settled(page);
    expect(await page.getByLabel('A lateral').inputValue()).toBe('123');
    await context.close();
  });
});
