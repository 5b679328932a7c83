import type { HistoryEventRecord } from '@shared/schemas/envelope';
import type { UnitSystem } from '@shared/schemas/common';
import { formatLength, formatTimestamp } from '@shared/format';
import { plural } from '@shared/plural';
import { RETEST_STATE_WORDS } from '@shared/retest-words';
import type { RetestState } from '@shared/schemas';

/** Envelope parameters as the engineer reads them: lengths in their unit, fractions in percent. */
const PARAM_WORDS: Record<string, { name: string; show: (v: unknown, unit: UnitSystem) => string }> = {
  designTwistDeg: { name: 'design twist', show: (v) => `${String(v)}°` },
  method: { name: 'method', show: (v) => String(v) },
  confidence: { name: 'confidence', show: (v) => `${Number((Number(v) * 100).toFixed(2))} %` },
  coverage: { name: 'coverage', show: (v) => `${Number((Number(v) * 100).toFixed(2))} %` },
  margin: { name: 'margin', show: (v) => `${Number((Number(v) * 100).toFixed(2))} %` },
  allowanceMm: { name: 'allowance', show: (v, unit) => formatLength(Number(v), unit) },
  incrementMm: { name: 'increment', show: (v, unit) => formatLength(Number(v), unit) },
  throughOrigin: { name: 'line through the origin', show: (v) => (v ? 'yes' : 'no') },
  repeatBandDeg: { name: 'repeat band', show: (v) => `±${String(v)}°` },
};

/** What changed between two sets of parameters, each as "name: before → after". */
function paramChanges(before: Record<string, unknown>, after: Record<string, unknown>, unit: UnitSystem): string[] {
  const out: string[] = [];
  for (const key of new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])) {
    const [b, a] = [before?.[key], after?.[key]];
    if (JSON.stringify(b) === JSON.stringify(a)) continue;
    const words = PARAM_WORDS[key];
    if (words) out.push(`${words.name}: ${b === undefined ? '—' : words.show(b, unit)} → ${a === undefined ? '—' : words.show(a, unit)}`);
    else if (key === 'seal')
      out.push(
        `seal: ${b ? 'checked' : 'none'} → ${a ? 'checked' : 'none'}${a ? ` (free height ${formatLength((a as { freeHeightMm: number }).freeHeightMm, unit)})` : ''}`,
      );
    else if (key === 'design') {
      const d = [b, a].map((x) => (x ?? {}) as Record<string, unknown>);
      const changed = Object.keys({ ...d[0], ...d[1] }).filter((k) => JSON.stringify(d[0][k]) !== JSON.stringify(d[1][k]));
      out.push(`pass-through design: ${changed.map((k) => `${k} ${String(d[0][k] ?? '—')} → ${String(d[1][k] ?? '—')}`).join(', ')}`);
    }
  }
  return out;
}

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
  'retest.ask': 'asked for a re-test',
  'retest.answer': 'answered a re-test request',
  'retest.close': 'closed a re-test request',
  'retest.reopen': 'asked again for a re-test',
  'retest.edit': 'edited a re-test request',
};

/** A re-test request's fields as the history names them; who and when are the event's own. */
const RETEST_FIELDS: Record<string, string> = { comment: 'comment', state: 'state', answer: 'answer' };

function describe(event: HistoryEventRecord, labelOf: (readingId: string) => string | null, retestOf: (id: string) => string | null, unit: UnitSystem) {
  const d = event.detail as Record<string, { before?: unknown; after?: unknown } | unknown>;
  const parts: string[] = [];
  if (event.entity === 'retestRequest') {
    parts.push(`on ${retestOf(event.entityId) ?? 'a request not on this device'}`);
    // In the fields' own order: the stored detail's keys come back in PostgreSQL's (jsonb) order.
    for (const [key, name] of Object.entries(RETEST_FIELDS)) {
      if (!(key in d)) continue;
      const c = d[key] as { before?: unknown; after?: unknown };
      const words = (v: unknown) => (v == null || v === '' ? '—' : key === 'state' ? (RETEST_STATE_WORDS[v as RetestState] ?? String(v)) : `“${String(v)}”`);
      parts.push(`${name}: ${words(c.before)} → ${words(c.after)}`);
    }
  } else if (event.entity === 'reading') {
    const label = labelOf(event.entityId);
    if (label) parts.push(label);
    for (const [key, change] of Object.entries(d)) {
      const c = change as { before?: unknown; after?: unknown };
      if (key === 'excluded') continue;
      if (key === 'valueMm') parts.push(`value: ${formatLength(Number(c.before), unit)} → ${formatLength(Number(c.after), unit)}`);
      else parts.push(`${key === 'excludeReason' ? 'reason' : key === 'flagNote' ? 'note' : key}: ${String(c.before ?? '—')} → ${String(c.after ?? '—')}`);
    }
  } else if (event.action === 'field.sync') {
    const words: Record<string, string> = { testSession: 'session', pose: 'pose', reading: 'reading', gaugePoint: 'gauge point', vehicle: 'vehicle' };
    const count = (m: unknown, verb: string) => Object.entries((m ?? {}) as Record<string, number>).map(([k, n]) => `${plural(n, words[k] ?? k)} ${verb}`);
    parts.push(...count(d.added, 'added'), ...count(d.changed, 'changed'));
    if (Number(d.conflicts) > 0) parts.push(`${plural(Number(d.conflicts), 'record')} kept as ${Number(d.conflicts) === 1 ? 'a conflict' : 'conflicts'}`);
  } else if (event.action === 'envelope.params') {
    const changes = paramChanges(d.before as Record<string, unknown>, d.after as Record<string, unknown>, unit);
    parts.push(...(changes.length > 0 ? changes : ['no change']));
  } else if ('revision' in d) {
    parts.push(`revision ${String(d.revision)}`);
    if ('to' in d) parts.push(`to ${String(d.to)}`);
    const kept = Array.isArray(d.acknowledgedReadings) ? (d.acknowledgedReadings as string[]) : [];
    if (kept.length > 0) parts.push(`kept flagged ${kept.map((id) => labelOf(id) ?? 'reading').join(', ')}`);
  }
  return parts.join(' · ');
}

/** The session's history: every change a person made, from the field or the desk, newest first. */
export function HistoryList({
  events,
  labelOf,
  retestOf = () => null,
  unit,
}: {
  events: HistoryEventRecord[];
  labelOf: (readingId: string) => string | null;
  /** What a re-test request is about, in words. */
  retestOf?: (retestId: string) => string | null;
  unit: UnitSystem;
}) {
  if (events.length === 0) return <p className="text-sm">No changes yet: readings are as the crew entered them.</p>;
  return (
    <ol className="space-y-1 text-sm" aria-label="Session history">
      {events.map((e) => (
        <li key={e.id} className="border-b border-rule py-1">
          <span className="tabular-nums">{formatTimestamp(e.createdAt)}</span> · <b>{e.userName ?? 'someone'}</b> {ACTION_WORDS[e.action] ?? e.action}
          {describe(e, labelOf, retestOf, unit) && <> — {describe(e, labelOf, retestOf, unit)}</>}
        </li>
      ))}
    </ol>
  );
}
