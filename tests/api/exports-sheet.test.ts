// Outputs of a signed envelope through HTTP: the fabrication sheet PDF carries the envelope's
// numbers (read back with pdf-parse), the CSV files round-trip, and the e-mailed sheet reaches the
// SMTP sink with the PDF attached and is logged on the envelope.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import type request from 'supertest';
import { PDFParse } from 'pdf-parse';
import { createTeam, signedInAgent, startTestServer, type Agent, type TestServer } from '../support/test-app';
import { createDeskSession } from '../support/desk';
import { waitForMail } from '../support/mail';
import { DEFAULT_DRAFT_PARAMS, type EnvelopeRecord } from '../../shared/schemas/envelope';
import { envelopeRows } from '../../shared/envelope-rows';
import { buildLines, buildToSentence, drawingNumber, gaugePointDimensions } from '../../shared/build-sheet';
import { UNIT_WORDS, formatBuildLength, formatLengthValue, formatRatio } from '../../shared/format';
import { EnvelopeSendModel } from '../../server/models';

let ts: TestServer;
beforeAll(async () => {
  ts = await startTestServer();
});
afterAll(async () => ts.close());

const params = { ...DEFAULT_DRAFT_PARAMS, designTwistDeg: 20, seal: { freeHeightMm: 150, minCompressionPercent: 25, maxCompressionPercent: 50 } };

async function signedEnvelope(): Promise<{ agent: Agent; envelope: EnvelopeRecord; sessionId: string; team: Awaited<ReturnType<typeof createTeam>> }> {
  const team = await createTeam();
  const s = await createDeskSession(team);
  const agent = await signedInAgent(ts, team.members.engineer.email);
  await agent
    .patch(`/api/readings/${s.readingIds.get('2:P03:vertical')}/review`)
    .send({ version: 1, flagNote: 'read twice, "same", value' })
    .expect(200);
  await agent
    .patch(`/api/readings/${s.readingIds.get('4:P05:lateral')}/review`)
    .send({ version: 1, excluded: true, excludeReason: '=tape slipped, redo' })
    .expect(200);
  // A reading 20 mm off what the others explain, kept in the computation and acknowledged at sign-off.
  const kept = s.readingIds.get('5:P02:vertical')!;
  const value = (await agent.get(`/api/sessions/${s.sessionId}/review`)).body.readings.find((r: { id: string }) => r.id === kept).valueMm;
  await agent
    .patch(`/api/readings/${kept}/review`)
    .send({ version: 1, valueMm: value + 20 })
    .expect(200);
  const draft = (await agent.post(`/api/sessions/${s.sessionId}/envelopes`).send({ params }).expect(201)).body;
  const envelope = (
    await agent
      .post(`/api/envelopes/${draft.id}/sign`)
      .send({ version: draft.version, acknowledgements: [{ readingId: kept, note: 'Re-read on site: same value' }] })
      .expect(200)
  ).body;
  return { agent, envelope, sessionId: s.sessionId, team };
}

const binary = (res: request.Response, done: (err: Error | null, body: Buffer) => void) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};

async function pdfPages(pdf: Buffer): Promise<string[]> {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    return (await parser.getText()).pages.map((p) => p.text.replace(/\s+/g, ' '));
  } finally {
    await parser.destroy();
  }
}

async function pdfText(pdf: Buffer) {
  const parser = new PDFParse({ data: new Uint8Array(pdf) });
  try {
    return (await parser.getText()).text.replace(/\s+/g, ' ');
  } finally {
    await parser.destroy();
  }
}

describe('fabrication sheet', () => {
  it('prints the envelope, boot spans, sign-off and hash of the snapshot in the PDF, in the chosen unit', async () => {
    const { agent, envelope } = await signedEnvelope();
    for (const unit of ['mm', 'in'] as const) {
      const res = await agent.get(`/api/envelopes/${envelope.id}/sheet.pdf?unit=${unit}`).buffer(true).parse(binary);
      expect(res.status).toBe(200);
      expect(res.headers['content-type']).toMatch(/application\/pdf/);
      const text = await pdfText(res.body as Buffer);
      const s = envelope.snapshot!;
      for (const r of envelopeRows(s.result)) {
        expect(text).toContain(`${r.name} ${formatLengthValue(r.measuredWorstMm, unit)}`);
        expect(text).toContain(`${r.sign}${formatLengthValue(r.envelopeMm, unit)}`);
      }
      // The flagged reading kept in the computation, with the engineer's acknowledgement.
      expect(text).toContain('Flagged readings kept in the computation');
      expect(text).toMatch(/Diagonal 5 P02 vertical .* acknowledged: Re-read on site: same value/);
      expect(text).toContain(formatRatio(s.boot!.left.extensionRatio));
      expect(text).toContain(formatLengthValue(s.boot!.top.gapMaxMm, unit));
      expect(text).toContain(envelope.contentHash!);
      expect(text).toContain(envelope.signedBy!.name);
      expect(text).toContain(`All lengths in ${UNIT_WORDS[unit]}`);
      // "Why these values" and the remarks are written in the reader's unit: under inches no length
      // is printed in mm, save the increment the engineer chose in mm, with its inch value beside it.
      for (const r of envelopeRows(s.result, unit)) expect(text).toContain(r.reasons[r.reasons.length - 1].slice(0, 40));
      if (unit === 'in') expect(text.replace(/\d+ mm \(\d+\.\d\d in\)/g, '')).not.toMatch(/\d mm\b/);
      expect(text).toMatch(/Planning aid only.*not a structural or road-legality approval.*Local codes and qualified professionals decide/);
    }
  });

  it('is a sheet a boot maker builds from: the chosen option, flat lengths, both frames, page x of y and the signature on every page, in inches', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const design = { ...params.design, option: 'both' as const, driverSide: 'right' as const, fastening: 'bead' as const };
    const first = (
      await agent
        .post(`/api/sessions/${s.sessionId}/envelopes`)
        .send({ params: { ...params, design } })
        .expect(201)
    ).body;
    // Signed once (acknowledging whatever the outlier rule flags), re-opened and signed again.
    const tried = await agent.post(`/api/envelopes/${first.id}/sign`).send({ version: first.version });
    const acknowledgements: { readingId: string }[] =
      tried.status === 400 ? tried.body.error.fields.map((f: { field: string }) => ({ readingId: f.field.replace('acknowledgements.', '') })) : [];
    if (tried.status === 400) await agent.post(`/api/envelopes/${first.id}/sign`).send({ version: first.version, acknowledgements }).expect(200);
    else expect(tried.status).toBe(200);
    const draft2 = (await agent.post(`/api/envelopes/${first.id}/reopen`).expect(201)).body;
    const envelope = (await agent.post(`/api/envelopes/${draft2.id}/sign`).send({ version: draft2.version, acknowledgements }).expect(200))
      .body as EnvelopeRecord;
    const snapshot = envelope.snapshot!;
    expect(snapshot.format === 2 && snapshot.supersedesRevision).toBe(1);

    const res = await agent.get(`/api/envelopes/${envelope.id}/sheet.pdf?unit=in`).buffer(true).parse(binary);
    expect(res.status).toBe(200);
    const pages = await pdfPages(res.body as Buffer);
    expect(pages.length).toBeGreaterThan(1);
    const drawing = drawingNumber(snapshot);
    pages.forEach((page, i) => {
      // Each page alone says what it is, which revision it replaces, who signed it, and where it sits.
      expect(page).toContain(`page ${i + 1} of ${pages.length}`);
      expect(page).toContain(`Drawing ${drawing} revision 2 (supersedes revision 1)`);
      expect(page).toContain(`signed off by ${envelope.signedBy!.name}`);
    });
    const text = pages.join(' ');
    expect(text).toContain('Build: Both: bulb seal on the frames, fabric boot inside');
    expect(text).toContain(buildToSentence(snapshot, 'in').slice(0, 60));
    // The flat lengths of the chosen option, in decimals and to the nearest 1/16 in.
    const top = snapshot.format === 2 ? snapshot.passThrough!.both.boot.panels.top : null;
    expect(text).toContain(`${formatBuildLength(top!.flatLengthMm, 'in')} × ${formatBuildLength(top!.flatWidthMm, 'in')}`);
    expect(text).toMatch(/\d+\.\d\d in \(\d+ \d+\/\d+ in\) × /);
    for (const line of buildLines(snapshot, 'in')) expect(text).toContain(line.figure.slice(0, 30));
    expect(text).toContain('Cab-side frame');
    expect(text).toContain('Body-side frame');
    expect(text).toContain('R (−y), driver side');
    expect(text).toContain('L (+y), passenger side');
    for (const g of gaugePointDimensions(snapshot, 'in')) expect(text).toContain(g.across);
    expect(text).toContain('bead (keder) in a channel');
    // A tolerance is never rounded to a looser fraction: decimals only.
    expect(text).toContain('fabric cut ± 0.12 in');
    expect(text).toMatch(/Planning aid only.*Local codes and qualified professionals decide/);
    expect(text).not.toMatch(/All lengths in in\./);

    // The CSV carries the same build figures.
    const csv = await agent.get(`/api/envelopes/${envelope.id}/envelope.csv?unit=in`);
    const rows = Papa.parse<Record<string, string>>(csv.text, { header: true, skipEmptyLines: true }).data;
    const built = rows.filter((r) => r.kind === 'build');
    expect(built.map((r) => [r.name, r.figure])).toEqual(buildLines(snapshot, 'in').map((l) => [l.item, l.figure]));
    expect(rows.find((r) => r.kind === 'drawing')).toMatchObject({
      name: drawing,
      option: 'Both: bulb seal on the frames, fabric boot inside',
      supersedes_revision: '1',
    });
  });

  it('is not printed for a draft, nor shown to a viewer before sign-off', async () => {
    const team = await createTeam();
    const s = await createDeskSession(team);
    const agent = await signedInAgent(ts, team.members.engineer.email);
    const draft = (await agent.post(`/api/sessions/${s.sessionId}/envelopes`).send({ params }).expect(201)).body;
    expect((await agent.get(`/api/envelopes/${draft.id}/sheet.pdf`)).status).toBe(409);
    const viewer = await signedInAgent(ts, team.members.viewer.email);
    expect((await viewer.get(`/api/envelopes/${draft.id}/sheet.pdf`)).status).toBe(404);
    expect((await viewer.get(`/api/envelopes/${draft.id}/envelope.csv`)).status).toBe(404);
  });
});

describe('CSV exports', () => {
  it('round-trips the readings: every reading once, exact mm, the screen digits, flags and exclusions', async () => {
    const { agent, sessionId } = await signedEnvelope();
    const review = (await agent.get(`/api/sessions/${sessionId}/review`)).body;
    const res = await agent.get(`/api/sessions/${sessionId}/readings.csv?unit=in`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const parsed = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(review.readings.length);
    const byId = new Map(parsed.data.map((row) => [row.reading_id, row]));
    for (const r of review.readings) {
      const row = byId.get(r.id)!;
      expect(Number(row.value_mm_exact)).toBe(r.valueMm);
      expect(row.value_in).toBe(formatLengthValue(r.valueMm, 'in'));
      expect(row.excluded).toBe(r.excluded ? 'yes' : 'no');
      expect(row.flag_note).toBe(r.flagNote ?? '');
    }
    const excluded = parsed.data.find((row) => row.excluded === 'yes')!;
    // A reason starting with "=" is kept from running as a spreadsheet formula.
    expect(excluded.exclude_reason).toBe("'=tape slipped, redo");
    expect(parsed.data.find((row) => row.flag_note)?.flag_note).toBe('read twice, "same", value');
  });

  it('round-trips the envelope: the same numbers as the snapshot through the one formatter', async () => {
    const { agent, envelope } = await signedEnvelope();
    const res = await agent.get(`/api/envelopes/${envelope.id}/envelope.csv?unit=mm`);
    expect(res.status).toBe(200);
    const rows = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true }).data;
    const s = envelope.snapshot!;
    for (const r of envelopeRows(s.result)) {
      const row = rows.find((x) => x.kind === 'envelope' && x.name === r.name)!;
      expect(row.sign).toBe({ '+': 'opens (+)', '−': 'closes (−)', '±': 'either way (±)' }[r.sign]);
      expect(row.envelope_mm).toBe(formatLengthValue(r.envelopeMm, 'mm'));
      expect(row.measured_worst_mm).toBe(formatLengthValue(r.measuredWorstMm, 'mm'));
      expect(row.content_hash).toBe(envelope.contentHash);
    }
    const left = rows.find((r) => r.kind === 'side' && r.name.startsWith('left'))!;
    expect(left.largest_shear_mm).toBe(formatLengthValue(s.boot!.left.largestShearMm, 'mm'));
    const acknowledged = rows.filter((r) => r.kind === 'acknowledged flag');
    expect(acknowledged.map((r) => r.name)).toEqual(['Diagonal 5 P02 vertical']);
    expect(acknowledged[0].note).toMatch(/^entered .* mm, .* mm off the fit; Re-read on site: same value$/);
    expect(rows).toHaveLength(4 + 4 + 1 + 1 + buildLines(s, 'mm').length);
  });
});

describe('sending the sheet', () => {
  it('e-mails the PDF to the fabricator, logs the send and refuses testers', async () => {
    const { agent, envelope, team } = await signedEnvelope();
    const tester = await signedInAgent(ts, team.members.tester.email);
    expect((await tester.post(`/api/envelopes/${envelope.id}/send`).send({ to: 'cutter@bootmakers.test' })).status).toBe(403);
    const bad = await agent.post(`/api/envelopes/${envelope.id}/send`).send({ to: 'not-an-address' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].field).toBe('body.to');

    const res = await agent.post(`/api/envelopes/${envelope.id}/send`).send({ to: 'Cutter@Bootmakers.test', note: 'Two boots please' });
    expect(res.status).toBe(201);
    const mail = await waitForMail(ts, 'cutter@bootmakers.test', /Fabrication sheet/);
    expect(mail.attachments).toHaveLength(1);
    expect(mail.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
    expect(mail.attachments[0].filename).toMatch(/^fabrication-sheet-test-truck-rev1\.pdf$/);
    const pdf = await agent.get(`/api/envelopes/${envelope.id}/sheet.pdf`).buffer(true).parse(binary);
    expect(mail.attachments[0].size).toBe((pdf.body as Buffer).length);
    expect(mail.text).toContain('Two boots please');
    const lateral = envelopeRows(envelope.snapshot!.result).find((r) => r.key === 'lateral')!;
    expect(mail.text).toContain(`lateral: ±${formatLengthValue(lateral.envelopeMm, 'mm')} mm`);
    expect(mail.text).toContain('not a structural or road-legality approval');

    const logged = await EnvelopeSendModel.findAll({ where: { envelopeId: envelope.id } });
    expect(logged.map((l) => l.toEmail)).toEqual(['cutter@bootmakers.test']);
    const after = (await agent.get(`/api/envelopes/${envelope.id}`)).body;
    expect(after.sends).toMatchObject([{ toEmail: 'cutter@bootmakers.test' }]);
  });
});
