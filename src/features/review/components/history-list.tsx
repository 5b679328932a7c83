import type { HistoryEventRecord } from '@shared/schemas/envelope';
import { formatTimestamp } from '@shared/format';

const ACTION_WORDS: Record<string, string> = {
  'field.sync': 'sent records from the field',
  'reading.exclude': 'excluded a reading',
  'reading.include': 'included a reading again',
  'reading.flag': 'noted a reading',
  'reading.correct': 'corrected a reading',
  'reading.edit': 'edited a reading',
  'envelope.draft': 'opened an envelope draft',
  'envelope.params': 'changed envelope parameters',
  'envelope.sign': 'signed off an envelope',
  'envelope.send': 'sent a fabrication sheet',
};

function describe(event: HistoryEventRecord, labelOf: (readingId: string) => string | null) {
  const d = event.detail as Record<string, { before?: unknown; after?: unknown } | unknown>;
  const parts: string[] = [];
  if (event.entity === 'reading') {
    const label = labelOf(event.entityId);
    if (label) parts.push(label);
    for (const [key, change] of Object.entries(d)) {
      const c = change as { before?: unknown; after?: unknown };
      if (key === 'excluded') continue;
      parts.push(`${key === 'excludeReason' ? 'reason' : key === 'flagNote' ? 'note' : key === 'valueMm' ? 'value (mm)' : key}: ${String(c.before ?? '—')} → ${String(c.after ?? '—')}`);
    }
  } else if (event.action === 'field.sync') {
    const words: Record<string, string> = { testSession: 'session', pose: 'pose', reading: 'reading', gaugePoint: 'gauge point', vehicle: 'vehicle' };
    const count = (m: unknown, verb: string) =>
      Object.entries((m ?? {}) as Record<string, number>).map(([k, n]) => `${n} ${words[k] ?? k}${n > 1 ? 's' : ''} ${verb}`);
    parts.push(...count(d.added, 'added'), ...count(d.changed, 'changed'));
    if (Number(d.conflicts) > 0) parts.push(`${String(d.conflicts)} kept as conflict${Number(d.conflicts) > 1 ? 's' : ''}`);
  } else if ('revision' in d) {
    parts.push(`revision ${String(d.revision)}`);
    if ('to' in d) parts.push(`to ${String(d.to)}`);
    const kept = Array.isArray(d.acknowledgedReadings) ? (d.acknowledgedReadings as string[]) : [];
    if (kept.length > 0) parts.push(`kept flagged ${kept.map((id) => labelOf(id) ?? 'reading').join(', ')}`);
  }
  return parts.join(' · ');
}

/** The session's history: every change a person made, from the field or the desk, newest first. */
export function HistoryList({ events, labelOf }: { events: HistoryEventRecord[]; labelOf: (readingId: string) => string | null }) {
  if (events.length === 0) return <p className="text-sm">No changes yet: readings are as the crew entered them.</p>;
  return (
    <ol className="space-y-1 text-sm" aria-label="Session history">
      {events.map((e) => (
        <li key={e.id} className="border-b border-rule py-1">
          <span className="tabular-nums">{formatTimestamp(e.createdAt)}</span> · <b>{e.userName ?? 'someone'}</b> {ACTION_WORDS[e.action] ?? e.action}
          {describe(e, labelOf) && <> — {describe(e, labelOf)}</>}
        </li>
      ))}
    </ol>
  );
}
