// The engineer's desk in a real browser on the demo data: review a session with its context (a pose's
// photo, full size, and note; the ramp; the session's conditions), exclude a reading with a reason,
// re-open its envelope, compare the pass-through options and pick one, acknowledge the flagged
// reading it keeps, confirm the sign-off, check the numbers on screen against the PDF and the CSV,
// read the sheet in inches as the engineer chose, send it to a fabricator, and compare the two
// demo vehicles.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import Papa from 'papaparse';
import { PDFParse } from 'pdf-parse';
import { screenshotDir, browserHarness } from '../support/browser';
import { waitForMail } from '../support/mail';
import { DEMO_SIGN_IN } from '../../server/seed/demo';
import { buildLines } from '../../shared/build-sheet';
import type { EnvelopeRecord } from '../../shared/schemas/envelope';

const h = browserHarness({ seedDemo: true });

const MEASURES = ['foreAftOpening', 'foreAftClosing', 'lateral', 'vertical'] as const;

describe('the engineer desk', () => {
  it('goes from review to sign-off to a sent sheet, with the same numbers on screen, in the PDF and in the CSV', async () => {
    const { page } = await h.open(DEMO_SIGN_IN.email, { viewport: { width: 1280, height: 900 }, password: DEMO_SIGN_IN.password });
    await page.waitForURL('**/desk');

    // Review: the session's conditions, and per pose the wheels or ramp, the tester's note and photos.
    await page.locator('a[href^="/desk/sessions/"]').filter({ hasText: 'Yard flex test before boot order' }).click();
    await page.getByRole('table').waitFor();
    const conditions = page.getByRole('region', { name: 'Session conditions' });
    await conditions.getByText('Dry gravel yard, 8 °C, overcast').waitFor();
    await conditions.getByText('3.5 bar front, 4.0 bar rear').waitFor();
    await conditions.getByText('Water and fuel full, no crew in body').waitFor();
    // RTI = 1000 × 1500 / 3800 = 394.7 (by hand; the ramp travel index to 0.1, shared/flex/rti.ts)
    await page.getByText(/20\.0° ramp, front left \(FL\) on the ramp, 1500\.0 mm up it \(RTI 394\.7 at 20\.0°\)/).waitFor();
    await page.getByText(/Tester’s notes: RR tyre just off the ground at the top/).waitFor();
    const thumb = page.getByRole('list', { name: 'Photos of Ramp 20°, FL up' }).getByRole('img');
    await thumb.scrollIntoViewIfNeeded();
    await expect.poll(() => thumb.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth)).toBeGreaterThan(0);
    await page.getByRole('button', { name: /Open photo 1 of Ramp 20°, FL up full size/ }).click();
    const full = page.getByRole('dialog', { name: 'Photo of Ramp 20°, FL up, full size' });
    const fullImage = full.getByRole('img');
    await expect
      .poll(() => fullImage.evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth))
      .toBeGreaterThan(await thumb.evaluate((img: HTMLImageElement) => img.naturalWidth));
    await full.getByRole('button', { name: 'Close' }).click();
    await full.waitFor({ state: 'hidden' });

    // The crew's flag note is shown; exclude one reading with a reason, in an editor opened where it was clicked.
    expect(await page.getByLabel('has a note').count()).toBe(1);
    expect(await page.getByLabel('far from the fit').count()).toBeGreaterThan(0);
    const clicked = page.getByRole('button', { name: 'Reading Diagonal FL + RR 300 B lateral' });
    await clicked.click();
    const editor = page.getByRole('dialog', { name: 'Review reading' });
    // The editor opens right under the reading clicked, not far above it.
    const [cellBox, editorBox] = [await clicked.boundingBox(), await editor.boundingBox()];
    expect(editorBox!.y - (cellBox!.y + cellBox!.height)).toBeGreaterThanOrEqual(0);
    expect(editorBox!.y - (cellBox!.y + cellBox!.height)).toBeLessThan(60);
    await editor.getByLabel('Exclude from the computation').check();
    await editor.getByRole('button', { name: 'Save review' }).click();
    await editor
      .getByRole('alert')
      .filter({ hasText: /Reason: excluding a reading needs a reason/ })
      .waitFor();
    await editor.getByLabel('Reason for excluding').fill('Dial gauge touched by the spotter');
    await editor.getByRole('button', { name: 'Save review' }).click();
    await editor.waitFor({ state: 'detached' });
    await page.getByText(/· 1 reading excluded ·/).waitFor();
    await page
      .getByRole('region', { name: 'Remarks on the readings and the fit' })
      .getByText(/Ramp 20°, FL up .*: reading at D \(vertical\) is far from the fit/)
      .waitFor();
    await page.screenshot({ path: path.join(screenshotDir(), 'desk-review.png') });
    await page.getByRole('button', { name: 'History' }).click();
    await page.getByText(/excluded a reading .*Dial gauge touched by the spotter/).waitFor();

    // Plots: the opening to scale with a magnified displaced outline, and the twist charts.
    await page.getByRole('button', { name: 'Plots' }).click();
    await page.getByRole('img', { name: 'Opening drawn to scale with the displaced outline' }).waitFor();
    expect(await page.getByLabel('magnification').textContent()).toMatch(/× \d+/);
    await page.getByRole('figure', { name: 'lateral against twist' }).locator('svg.recharts-surface').first().waitFor();

    // Envelope: re-open the signed demo revision, change the design twist, watch it recompute, sign.
    await page.getByRole('button', { name: 'Envelope and sign-off' }).click();
    await page.getByRole('button', { name: 'Re-open as revision 2' }).click();
    const twist = page.getByLabel('Design twist (°)');
    await expect.poll(() => twist.inputValue()).toBe('20');
    const lateral = page.getByTestId('envelope-lateral');
    const before = await lateral.textContent();
    await twist.fill('30');
    await expect.poll(() => lateral.textContent()).not.toBe(before);
    await twist.fill('3x');
    await page.getByRole('alert').filter({ hasText: 'Design twist: enter a number' }).waitFor();
    await twist.fill('26');
    await page.getByLabel('Margin (%)').fill('250');
    await page.getByRole('alert').filter({ hasText: 'Margin must be between 0 and 200 %' }).waitFor();
    await page.getByLabel('Margin (%)').fill('15');

    // Pass-through options side by side; the engineer sets a least clear width and picks the boot.
    const options = page.getByRole('table', { name: 'Pass-through options compared' });
    await options.waitFor();
    await expect.poll(() => options.locator('tr[data-row="minimum"] td[data-option="boot"]').textContent()).toMatch(/too low/);
    await page.getByLabel('Least clear width (mm)').fill('400');
    await page.getByLabel('Least clear height (mm)').fill('400');
    await expect.poll(() => options.locator('tr[data-row="minimum"] td[data-option="boot"]').textContent()).toBe('meets the minimum');
    // The frames' overlap eats the small Mossback opening: that option says how far short it falls.
    expect(await options.locator('tr[data-row="minimum"] td[data-option="frames"]').textContent()).toMatch(/mm too narrow/);
    expect(await options.locator('tr[data-row="panels"] td[data-option="boot"]').textContent()).toMatch(/^top \d+\.\d × \d+\.\d mm; bottom/);
    expect(await options.locator('tr[data-row="clear"] td[data-option="frames"]').textContent()).toMatch(/^\d+\.\d × \d+\.\d mm$/);
    await page.getByRole('radio', { name: 'Flexible boot on hard frames' }).check();
    await page.getByText('Chosen: Flexible boot on hard frames.').waitFor();

    // The flagged ramp reading stays in: sign-off waits until the engineer acknowledges it, and says so.
    const signButton = page.getByRole('button', { name: 'Sign off revision 2…' });
    await page.getByText('1 flagged reading still to acknowledge or exclude before signing off.').waitFor();
    expect(await signButton.isDisabled()).toBe(true);
    expect(await signButton.getAttribute('aria-describedby')).toBe('sign-off-blocked');
    await page.getByRole('checkbox', { name: /Keep Ramp 20°, FL up D vertical/ }).check();
    await page.getByLabel('Note on keeping Ramp 20°, FL up D vertical').fill('Crew re-read it after re-seating the gauge');
    await signButton.click();
    // The confirmation says what is frozen and lists the flagged reading kept.
    const confirm = page.getByRole('dialog', { name: 'Confirm sign-off' });
    await confirm.getByText('pass-through: Flexible boot on hard frames').waitFor();
    await confirm
      .getByRole('list', { name: 'Flagged readings kept' })
      .getByText(/Ramp 20°, FL up D vertical: .* off the fit — Crew re-read it after re-seating the gauge/)
      .waitFor();
    await confirm.getByRole('button', { name: 'Sign off and freeze' }).click();
    await page.waitForURL('**/desk/envelopes/*');
    await page.getByRole('heading', { name: 'TC-14 "Mossback" · Yard flex test before boot order · revision 2' }).waitFor();
    await page.getByText('Chosen: Flexible boot on hard frames.').waitFor();
    await page.getByText('The stored snapshot matches its hash.').waitFor();
    const envelopeId = page.url().split('/').pop()!;
    const screen: Record<string, string> = {};
    for (const measure of MEASURES) screen[measure] = (await page.getByTestId(`envelope-${measure}`).textContent())!;
    expect(screen.lateral).not.toBe(before);
    await page
      .getByRole('list', { name: 'Acknowledged flagged readings' })
      .getByText(/Ramp 20°, FL up · point D · vertical: .* acknowledged: Crew re-read it after re-seating the gauge/)
      .waitFor();

    // The PDF and the CSV carry the numbers shown on screen.
    const pdf = await page.request.get(`${h.ts.baseUrl}/api/envelopes/${envelopeId}/sheet.pdf?unit=mm`);
    expect(pdf.status()).toBe(200);
    const parser = new PDFParse({ data: new Uint8Array(await pdf.body()) });
    const text = (await parser.getText()).text.replace(/\s+/g, ' ');
    await parser.destroy();
    for (const measure of MEASURES) expect(text).toContain(screen[measure]);
    expect(text).toContain('Design twist 26.0°');
    expect(text).toMatch(/Flagged readings kept in the computation.*Ramp 20°, FL up D vertical .* acknowledged: Crew re-read it after re-seating the gauge/);
    expect(text).toContain('Mara Venn');
    const csv = await page.request.get(`${h.ts.baseUrl}/api/envelopes/${envelopeId}/envelope.csv?unit=mm`);
    const rows = Papa.parse<Record<string, string>>(await csv.text(), { header: true, skipEmptyLines: true }).data;
    expect(rows.filter((r) => r.kind === 'envelope').map((r) => r.envelope_mm)).toEqual(MEASURES.map((m) => screen[m].replace(/^[+−±]/, '')));

    // The engineer reads inches: the sheet follows that choice, with the option, its flat lengths,
    // "page x of y" and the signature on every page.
    await page.getByRole('link', { name: 'Account' }).click();
    await page.getByRole('radio', { name: 'Inches (in)' }).check();
    await expect.poll(async () => (await (await page.request.get(`${h.ts.baseUrl}/api/me`)).json()).user.unitSystem).toBe('in');
    const record = (await (await page.request.get(`${h.ts.baseUrl}/api/envelopes/${envelopeId}`)).json()) as EnvelopeRecord;
    const inches = await page.request.get(`${h.ts.baseUrl}/api/envelopes/${envelopeId}/sheet.pdf`);
    const sheet = new PDFParse({ data: new Uint8Array(await inches.body()) });
    const pages = (await sheet.getText()).pages.map((p) => p.text.replace(/\s+/g, ' '));
    await sheet.destroy();
    const inText = pages.join(' ');
    expect(inText).toContain('All lengths in inches (in)');
    expect(inText).toContain('Build: Flexible boot on hard frames');
    for (const line of buildLines(record.snapshot!, 'in').filter((l) => l.part === 'boot')) expect(inText).toContain(line.figure);
    expect(inText).toMatch(/top panel, cut flat .* \d+\.\d\d in \(\d+( \d+\/\d+)? in\) × \d+\.\d\d in/);
    pages.forEach((text, i) => {
      expect(text).toContain(`page ${i + 1} of ${pages.length}`);
      expect(text).toMatch(/Drawing TWL-[0-9A-F]{8} revision 2 \(supersedes revision 1\)/);
      expect(text).toContain('signed off by Mara Venn');
    });
    await page.goBack();

    // Send the sheet to a fabricator: it reaches the mail sink with the PDF attached and is logged.
    await page.getByLabel("Fabricator's e-mail").fill('stitch@fernbootworks.test');
    await page.getByRole('button', { name: 'Send sheet' }).click();
    await page.getByText('Sent to stitch@fernbootworks.test.').waitFor();
    const mail = await waitForMail(h.ts, 'stitch@fernbootworks.test', /Fabrication sheet/);
    expect(mail.attachments.map((a) => a.contentType)).toEqual(['application/pdf']);
    await page
      .getByRole('list', { name: 'Sheets sent' })
      .getByText(/stitch@fernbootworks\.test · by Mara Venn/)
      .waitFor();
    await page.screenshot({ path: path.join(screenshotDir(), 'desk-envelope.png'), fullPage: true });

    // Compare the two demo vehicles.
    await page.getByRole('link', { name: 'Compare' }).click();
    await page.getByLabel(/TC-14 "Mossback"/).check();
    await page.getByLabel(/TC-09 "Longfen"/).check();
    const table = page.getByRole('table', { name: 'Comparison' });
    await table.waitFor();
    expect(await table.getByRole('row').count()).toBe(3);
    await page.getByRole('figure', { name: 'Slope per axis' }).locator('svg.recharts-surface').first().waitFor();
    await page.screenshot({ path: path.join(screenshotDir(), 'desk-compare.png'), fullPage: true });
    await page.close();
  });
});
