// The engineer's desk in a real browser on the demo data: review a session (exclude a reading with a
// reason), re-open and sign off its envelope — acknowledging the flagged reading it keeps — check the
// numbers on screen against the PDF and the CSV, send the sheet to a fabricator, and compare the
// two demo vehicles.
import { describe, expect, it } from 'vitest';
import path from 'node:path';
import Papa from 'papaparse';
import { PDFParse } from 'pdf-parse';
import { screenshotDir, browserHarness } from '../support/browser';
import { waitForMail } from '../support/mail';
import { DEMO_SIGN_IN } from '../../server/seed/demo';

const h = browserHarness({ seedDemo: true });

const MEASURES = ['foreAftOpening', 'foreAftClosing', 'lateral', 'vertical'] as const;

describe('the engineer desk', () => {
  it('goes from review to sign-off to a sent sheet, with the same numbers on screen, in the PDF and in the CSV', async () => {
    const { page } = await h.open(DEMO_SIGN_IN.email, { viewport: { width: 1280, height: 900 }, password: DEMO_SIGN_IN.password });
    await page.waitForURL('**/desk');

    // Review: the crew's flag note is shown; exclude one reading with a reason.
    await page.getByRole('link', { name: /Yard flex test before boot order/ }).click();
    await page.getByRole('table').waitFor();
    expect(await page.getByLabel('has a note').count()).toBe(1);
    expect(await page.getByLabel('far from the fit').count()).toBeGreaterThan(0);
    await page.getByRole('button', { name: 'Reading Diagonal FL + RR 300 B lateral' }).click();
    const editor = page.getByRole('dialog', { name: 'Review reading' });
    await editor.getByLabel('Exclude from the computation').check();
    await editor.getByRole('button', { name: 'Save review' }).click();
    await editor.getByRole('alert').filter({ hasText: /Reason: excluding a reading needs a reason/ }).waitFor();
    await editor.getByLabel('Reason for excluding').fill('Dial gauge touched by the spotter');
    await editor.getByRole('button', { name: 'Save review' }).click();
    await editor.waitFor({ state: 'detached' });
    await page.getByText(/1 reading\(s\) excluded/).waitFor();
    await page.getByRole('region', { name: 'Remarks on the readings and the fit' }).getByText(/Ramp 20°, FL up .*: reading at D \(vertical\) is far from the fit/).waitFor();
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
    // The flagged ramp reading stays in: sign-off waits until the engineer acknowledges it.
    const signButton = page.getByRole('button', { name: 'Sign off revision 2' });
    await page.getByText('1 flagged reading(s) still to acknowledge or exclude before signing off.').waitFor();
    expect(await signButton.isDisabled()).toBe(true);
    await page.getByRole('checkbox', { name: /Keep Ramp 20°, FL up D vertical/ }).check();
    await page.getByLabel('Note on keeping Ramp 20°, FL up D vertical').fill('Crew re-read it after re-seating the gauge');
    await signButton.click();
    await page.waitForURL('**/desk/envelopes/*');
    await page.getByText('The stored snapshot matches its hash.').waitFor();
    const envelopeId = page.url().split('/').pop()!;
    const screen: Record<string, string> = {};
    for (const measure of MEASURES) screen[measure] = (await page.getByTestId(`envelope-${measure}`).textContent())!;
    expect(screen.lateral).not.toBe(before);
    await page.getByRole('list', { name: 'Acknowledged flagged readings' }).getByText(/Ramp 20°, FL up · point D · vertical: .* acknowledged: Crew re-read it after re-seating the gauge/).waitFor();

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

    // Send the sheet to a fabricator: it reaches the mail sink with the PDF attached and is logged.
    await page.getByLabel("Fabricator's e-mail").fill('stitch@fernbootworks.test');
    await page.getByRole('button', { name: 'Send sheet' }).click();
    await page.getByText('Sent to stitch@fernbootworks.test.').waitFor();
    const mail = await waitForMail(h.ts, 'stitch@fernbootworks.test', /Fabrication sheet/);
    expect(mail.attachments.map((a) => a.contentType)).toEqual(['application/pdf']);
    await page.getByRole('list', { name: 'Sheets sent' }).getByText(/stitch@fernbootworks\.test · by Mara Venn/).waitFor();
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
