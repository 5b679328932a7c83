// Typing readings on a phone (390 × 844), as a tester with gloves and a tape does: what the trade
// writes is stored exactly; anything else is refused beside the field and never stored as
// something else; the ± key types the minus a decimal keypad lacks; Enter walks the readings in
// order; focus selects; an implausible value waits for the tester to confirm it.
import { describe, expect, it } from 'vitest';
import { browserHarness } from '../support/browser';
import { settled, testerOnPose, typeInto } from '../support/field-entry';
import { PoseModel, ReadingModel } from '../../server/models';

const h = browserHarness();

describe('typing readings', () => {
  it('stores what the trade writes exactly and refuses the rest beside the field, never a prefix of it', async () => {
    const { poseId, pointIds, context, page } = await testerOnPose(h, 'Typing workshop');

    // Millimetres: a comma decimal is a decimal; letters are refused, whatever came before them.
    await typeInto(page, 'A fore-aft', '92,5');
    await typeInto(page, 'A lateral', '3800abc');
    await typeInto(page, 'A vertical', '9o');
    await typeInto(page, 'B fore-aft', '3 5/8');
    await page.getByLabel('B lateral').click();
    await page.getByText('Not a length: “3800abc” has the letter “a”.').waitFor();
    await page.getByText('Not a length: “9o” has the letter “o”.').waitFor();
    await page.getByText(/“3 5\/8” is a fraction: fractions are inch readings/).waitFor();
    // The refused text stays in its field for the tester to fix; it is not replaced or cut short.
    expect(await page.getByLabel('A lateral').inputValue()).toBe('3800abc');

    // Inches: tape fractions are read exactly; 9999 in is refused, not kept as the 99 typed on the way.
    await page.getByRole('group', { name: 'Unit' }).getByRole('button', { name: 'in' }).click();
    await typeInto(page, 'C fore-aft', '3 5/8');
    await typeInto(page, 'C lateral', '3-5/8');
    await typeInto(page, 'C vertical', '9999');
    await page.getByLabel('D fore-aft').click();
    await page.getByText(/Too large: 9999 in is more than the 787\.402 in this field takes/).waitFor();
    await settled(page);

    await page.reload();
    // The unit chosen on this phone (inches) comes back with the page.
    await page.getByRole('group', { name: 'Unit' }).getByRole('button', { name: 'in', pressed: true }).waitFor();
    expect(await page.getByLabel('C fore-aft').inputValue()).toBe('3.625');
    expect(await page.getByLabel('C lateral').inputValue()).toBe('3.625');
    for (const refused of ['A lateral', 'A vertical', 'B fore-aft', 'C vertical']) expect(await page.getByLabel(refused).inputValue(), refused).toBe('');

    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    const stored = await ReadingModel.findAll({ where: { poseId, deletedAt: null } });
    const at = (point: number, axis: string) => stored.find((r) => r.gaugePointId === pointIds[point] && r.axis === axis)?.valueMm;
    expect(at(0, 'foreAft')).toBe(92.5);
    // 3 5/8 in = 3.625 × 25.4 mm = 92.075 mm (1 in = 25.4 mm exactly, NIST SP 811).
    expect(at(2, 'foreAft')).toBe(92.075);
    expect(at(2, 'lateral')).toBe(92.075);
    expect(stored).toHaveLength(3);
    await context.close();
  });

  it('types a minus with the ± key on a phone, and walks the readings with Enter', async () => {
    const { poseId, pointIds, context, page } = await testerOnPose(h, 'Sign workshop');

    // The ± key of A lateral: big enough for a gloved thumb, and it keeps the field's focus.
    const lateral = page.getByLabel('A lateral');
    const signKey = page.getByRole('button', { name: 'Change sign' }).and(page.locator(`[aria-describedby="${await lateral.getAttribute('id')}-label"]`));
    const box = await signKey.boundingBox();
    expect(box!.width).toBeGreaterThanOrEqual(44);
    expect(box!.height).toBeGreaterThanOrEqual(44);
    await lateral.tap();
    await signKey.tap();
    expect(await page.evaluate(() => document.activeElement?.id)).toBe(await lateral.getAttribute('id'));
    await page.keyboard.type('47.5', { delay: 40 });
    expect(await lateral.inputValue()).toBe('-47.5');
    // ± again takes the minus away, and once more puts it back.
    await signKey.tap();
    expect(await lateral.inputValue()).toBe('47.5');
    await signKey.tap();

    // Enter walks: the pose name, the lifts front to rear and left to right, then each point's
    // three axes in turn, points in label order, then the notes.
    await page.getByLabel('Pose name').focus();
    const order: string[] = [];
    for (let i = 0; i < 18; i++) {
      order.push(
        await page.evaluate(() => {
          const el = document.activeElement as HTMLElement;
          return el.id === 'pose-name'
            ? 'Pose name'
            : el.id === 'pose-notes'
              ? 'Notes'
              : (document.querySelector(`label[for="${el.id}"]`)?.textContent ?? '?').replace(/ \((mm|in)\)$/, '');
        }),
      );
      if (order.at(-1) === 'Notes') break;
      await page.keyboard.press('Enter');
    }
    expect(order).toEqual([
      'Pose name',
      ...['front left', 'front right', 'rear left', 'rear right'].map((w) => `Lift ${w}`),
      ...['A', 'B', 'C', 'D'].flatMap((p) => ['fore-aft', 'lateral', 'vertical'].map((a) => `${p} ${a}`)),
      'Notes',
    ]);
    expect(await lateral.getAttribute('enterkeyhint')).toBe('next');

    // Focus selects what is in a field: typing replaces it.
    await lateral.tap();
    expect(
      await page.evaluate(() => (document.activeElement as HTMLInputElement).selectionEnd! - (document.activeElement as HTMLInputElement).selectionStart!),
    ).toBe(5);
    await page.keyboard.type('-12', { delay: 40 });
    expect(await lateral.inputValue()).toBe('-12');
    await settled(page);

    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    const a = await ReadingModel.findOne({ where: { poseId, gaugePointId: pointIds[0], axis: 'lateral' } });
    expect(a?.valueMm).toBe(-12);
    await context.close();
  });

  it('holds an implausible value back until the tester keeps it', async () => {
    const { poseId, pointIds, context, page } = await testerOnPose(h, 'Doubt workshop');

    // The test truck's nominal gap is 90 mm: a raw gap of 900 is a slipped digit, or it is real.
    await typeInto(page, 'B fore-aft', '900');
    await page.getByText('900 mm looks wrong: more than three times the nominal gap of 90.0 mm.').waitFor();
    await typeInto(page, 'Lift front left', '3000');
    await page.getByText(/3000 mm looks wrong: it would tilt the axle more than 30°/).waitFor();
    await settled(page);
    await page.getByText(/Waiting to send/).waitFor();
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    expect(await ReadingModel.count({ where: { poseId, deletedAt: null } })).toBe(0);

    await page.getByRole('button', { name: 'Keep 900 mm' }).tap();
    await settled(page);
    await page.getByText(/Waiting to send/).waitFor();
    await page.getByText('All saved on the server').waitFor({ timeout: 30_000 });
    const b = await ReadingModel.findOne({ where: { poseId, gaugePointId: pointIds[1], axis: 'foreAft' } });
    expect(b?.valueMm).toBe(900);
    // The lift was never kept: the phone still holds the 0 it had, not the 300 typed on the way.
    expect((await PoseModel.findByPk(poseId))?.liftFlMm).toBe(0);
    await context.close();
  });
});
