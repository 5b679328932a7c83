// Downloads: the readings of a session and a signed envelope as CSV, the fabrication sheet as PDF.
// `?unit=mm|in` overrides the person's unit for one file.
import * as z from 'zod';
import { route } from './route';
import { id, unitSystem } from '../../shared/schemas';
import { readingsCsv, envelopeCsv } from '../services/csv.service';
import { buildSheetPdf } from '../services/fabrication-sheet.service';
import { getSignedEnvelope } from '../services/envelope.service';
import { sheetFileName, unitFor } from '../services/envelope-send.service';
import { getReview } from '../services/review.service';

const byId = z.object({ id });
const unitQuery = z.object({ unit: unitSystem.optional() });

export const exportRoutes = [
  route({
    method: 'get',
    path: '/api/sessions/:id/readings.csv',
    access: 'session.review',
    params: byId,
    query: unitQuery,
    handler: async ({ auth, params, query, res }) => {
      const review = await getReview(auth, params.id);
      const csv = readingsCsv(review, await unitFor(auth, query.unit));
      res
        .attachment(`readings-${review.session.testedOn}-${params.id.slice(0, 8)}.csv`)
        .type('text/csv; charset=utf-8')
        .send(csv);
      return undefined;
    },
  }),
  route({
    method: 'get',
    path: '/api/envelopes/:id/envelope.csv',
    access: 'envelope.readSigned',
    params: byId,
    query: unitQuery,
    handler: async ({ auth, params, query, res }) => {
      const envelope = await getSignedEnvelope(auth, params.id);
      const csv = envelopeCsv(envelope.snapshot, envelope.contentHash, await unitFor(auth, query.unit));
      res
        .attachment(`envelope-rev${envelope.revision}-${params.id.slice(0, 8)}.csv`)
        .type('text/csv; charset=utf-8')
        .send(csv);
      return undefined;
    },
  }),
  route({
    method: 'get',
    path: '/api/envelopes/:id/sheet.pdf',
    access: 'envelope.readSigned',
    params: byId,
    query: unitQuery,
    handler: async ({ auth, params, query, res }) => {
      const envelope = await getSignedEnvelope(auth, params.id);
      const pdf = await buildSheetPdf({
        snapshot: envelope.snapshot,
        contentHash: envelope.contentHash,
        status: envelope.status === 'superseded' ? 'superseded' : 'signed',
        unit: await unitFor(auth, query.unit),
      });
      res.attachment(sheetFileName(envelope.vehicleName, envelope.revision)).type('application/pdf').send(pdf);
      return undefined;
    },
  }),
];
