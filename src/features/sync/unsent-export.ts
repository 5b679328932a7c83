// Records not on the server yet, as a file the tester can keep (JSON with every field, CSV to read
// in a spreadsheet), so nothing typed is lost even if the phone never gets them through.
import Papa from 'papaparse';
import type { UnitSystem } from '@shared/schemas';
import type { FieldLookups, UnsentRecord } from '@/lib/db/unsent';
import { recordTitle, valuesLine } from './describe';

const STATE_WORDS: Record<UnsentRecord['state'], string> = { waiting: 'waiting to send', sending: 'being sent', held: 'held back' };

export function unsentAsJson(unsent: UnsentRecord[], look: FieldLookups, exportedAt = new Date()): string {
  return JSON.stringify(
    {
      app: 'Twistlog',
      what: 'records this phone has not got onto the server',
      exportedAt: exportedAt.toISOString(),
      records: unsent.map((u) => ({
        what: recordTitle(u.entity, u.record, look),
        state: u.state,
        problem: u.problem,
        fields: u.fields,
        entity: u.entity,
        record: u.record,
      })),
    },
    null,
    2,
  );
}

export function unsentAsCsv(unsent: UnsentRecord[], look: FieldLookups, unit: UnitSystem): string {
  return Papa.unparse(
    unsent.map((u) => ({
      what: recordTitle(u.entity, u.record, look),
      values: valuesLine(u.entity, u.record, look, unit),
      state: STATE_WORDS[u.state],
      problem: u.problem ?? '',
      entity: u.entity,
      id: u.record.id,
      record: JSON.stringify(u.record),
    })),
    // A typed value starting with = or + must not run as a formula in a spreadsheet.
    { columns: ['what', 'values', 'state', 'problem', 'entity', 'id', 'record'], escapeFormulae: true },
  );
}

export const exportFileName = (ext: 'json' | 'csv', at = new Date()) => `twistlog-unsent-${at.toISOString().slice(0, 16).replace(/[:T]/g, '-')}.${ext}`;
