// Downloads: the readings of a session and a signed envelope as CSV, the fabrication sheet as PDF.
// `?unit=mm|in` overrides the person's unit for one file.
import * as z from 'zod';
import { route } from './route';
import { id, unitSystem, type UnitSystem } from '../../shared/schemas';
import type { Action } from '../../shared/permissions';
import type { AuthContext } from '../auth/context';
import { readingsCsv, envelopeCsv } from '../services/csv.service';
import { buildSheetPdf } from '../services/fabrication-sheet.service';
import { getSignedEnvelope } from '../services/envelope.service';
import { sheetFileName, unitFor } from '../services/envelope-send.service';
import { getReview } from '../services/review.service';

const byId = z.object({ id });
const unitQuery = z.object({ unit: unitSystem.optional() });

interface Download {
  name: string;
  type: string;
  body: string | Buffer;
}

/** A file about one record, by id, in the person's unit unless `?unit=` names another for this file. */
const download = (path: string, access: Action, make: (auth: AuthContext, id: string, unit: UnitSystem) => Promise<Download>) =>
  route({
    method: 'get',
    path,
    access,
    params: byId,
    query: unitQuery,
    handler: async ({ auth, params, query, res }) => {
      const file = await make(auth, params.id, await unitFor(auth, query.unit));
      res.attachment(file.name).type(file.type).send(file.body);
      return undefined;
    },
  });

const CSV = 'text/csv; charset=utf-8';

export const exportRoutes = [
  download('/api/sessions/:id/readings.csv', 'session.review', async (auth, id, unit) => {
    const review = await getReview(auth, id);
    return { name: `readings-${review.session.testedOn}-${id.slice(0, 8)}.csv`, type: CSV, body: readingsCsv(review, unit) };
  }),
  download('/api/envelopes/:id/envelope.csv', 'envelope.readSigned', async (auth, id, unit) => {
    const envelope = await getSignedEnvelope(auth, id);
    return { name: `envelope-rev${envelope.revision}-${id.slice(0, 8)}.csv`, type: CSV, body: envelopeCsv(envelope.snapshot, envelope.contentHash, unit) };
  }),
  download('/api/envelopes/:id/sheet.pdf', 'envelope.readSigned', async (auth, id, unit) => {
    const envelope = await getSignedEnvelope(auth, id);
    const status = envelope.status === 'superseded' ? 'superseded' : 'signed';
    const pdf = await buildSheetPdf({ snapshot: envelope.snapshot, contentHash: envelope.contentHash, status, unit });
    return { name: sheetFileName(envelope.vehicleName, envelope.revision), type: 'application/pdf', body: pdf };
  }),
];
