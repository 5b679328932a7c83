// Start a session on a phone, as a tester does it: open the page and choose the vehicle at once,
// while the first sync is still bringing vehicles down (a vehicle added at the desk arrives and
// sorts before the chosen one). The choice stays, and a disabled button says what is missing.
import { describe, expect, it } from 'vitest';
import { createTeam, signedInAgent } from '../support/test-app';
import { browserHarness } from '../support/browser';
import { change, pushAccepted, vehicleRecord, vehicleWithPoints } from '../support/sync';

const h = browserHarness();

describe('start a session', () => {
  it('keeps the vehicle chosen right after the page opens, and the disabled button says what is missing', async () => {
    const team = await createTeam('Start workshop');
    const desk = await signedInAgent(h.ts, team.members.tester.email);
    await vehicleWithPoints(desk);
    const { context, page } = await h.open(team.members.tester.email);
    await page.goto(`${h.ts.baseUrl}/field/sessions/new`);
    const vehicle = page.getByLabel('Vehicle', { exact: true });
    const start = page.getByRole('button', { name: /start/i });
    await vehicle.selectOption({ label: 'Test truck' });
    const chosen = await vehicle.inputValue();
    expect(chosen).not.toBe('');

    // Meanwhile the desk adds a vehicle; the next sync brings it down and it sorts first.
    await pushAccepted(desk, [change('vehicle', vehicleRecord({ name: 'Alder test rig' }))]);
    await page.evaluate(() => window.dispatchEvent(new Event('online')));
    await vehicle.locator('option', { hasText: 'Alder test rig' }).waitFor({ state: 'attached' });
    expect(await vehicle.inputValue()).toBe(chosen);
    expect(await vehicle.locator('option:checked').textContent()).toBe('Test truck');

    // Not every safety item ticked: the button says so, and how many are left.
    const boxes = await page.getByRole('checkbox').all();
    for (const box of boxes.slice(1)) await box.check();
    expect(await start.isDisabled()).toBe(true);
    expect(await start.textContent()).toMatch(/1 safety item left/);

    // Every item ticked but no vehicle: the button names the vehicle as what is missing.
    await boxes[0].check();
    await vehicle.selectOption({ value: '' });
    expect(await start.isDisabled()).toBe(true);
    expect(await start.textContent()).toMatch(/Choose the vehicle/);

    await vehicle.selectOption({ label: 'Test truck' });
    await page.getByRole('button', { name: 'Start session' }).click();
    await page.waitForURL(/\/field\/sessions\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { name: 'Test truck' }).waitFor();
    await context.close();
  });

  it('keeps a choice made in the phone’s picker while the first sync re-draws the page', async () => {
    const team = await createTeam('Picker workshop');
    const desk = await signedInAgent(h.ts, team.members.tester.email);
    await vehicleWithPoints(desk);
    const { context, page } = await h.open(team.members.tester.email);
    await page.goto(`${h.ts.baseUrl}/field/sessions/new`);
    const vehicle = page.getByLabel('Vehicle', { exact: true });
    await vehicle.locator('option', { hasText: 'Test truck' }).waitFor({ state: 'attached' });

    // A phone's picker shows the choice in the select at once and reports it (the change event)
    // only when it closes. Meanwhile a sync brings a vehicle added at the desk and the page re-draws.
    await vehicle.evaluate((el: HTMLSelectElement) => {
      el.value = [...el.options].find((o) => o.text === 'Test truck')!.value;
    });
    await pushAccepted(desk, [change('vehicle', vehicleRecord({ name: 'Alder test rig' }))]);
    await page.evaluate(() => window.dispatchEvent(new Event('online')));
    await vehicle.locator('option', { hasText: 'Alder test rig' }).waitFor({ state: 'attached' });
    await vehicle.evaluate((el: HTMLSelectElement) => el.dispatchEvent(new Event('change', { bubbles: true })));

    expect(await vehicle.locator('option:checked').textContent()).toBe('Test truck');
    for (const box of await page.getByRole('checkbox').all()) await box.check();
    await page.getByRole('button', { name: 'Start session' }).click();
    await page.waitForURL(/\/field\/sessions\/[0-9a-f-]{36}$/);
    await page.getByRole('heading', { name: 'Test truck' }).waitFor();
    await context.close();
  });
});
