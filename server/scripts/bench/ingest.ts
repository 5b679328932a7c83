// Sync ingest: 10,000 readings through the app's own push route (HTTP to the app's process, JSON,
// validation, checks, one transaction per batch, the batch's stored answer), beside one plain
// multi-row INSERT of the same rows into the same table from this process, interleaved in the same
// run. Median of five rounds each: the plain INSERT itself swings by a third from round to round
// (364–733 ms in one run of ingest-ab.ts on 2026-12-03, PostgreSQL's CPU 350–690 ms), and the
// ratio's denominator is that median.
import { randomUUID } from 'node:crypto';
import type { BenchRow } from './report';
import { CLIENT_BATCH_CHANGES } from '../../../shared/schemas/sync';
import { sessionChanges, type BenchServer } from './fixture';

const READINGS = 10_000;
/** The field client's batch size. */
const CLIENT_BATCH = CLIENT_BATCH_CHANGES;
const ROUNDS = 5;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

export async function pushAll(s: BenchServer, batchSize: number) {
  const { parents, readings } = sessionChanges(READINGS);
  await s.post('/api/sync/push', { idempotencyKey: randomUUID(), changes: parents });
  const started = performance.now();
  for (let i = 0; i < readings.length; i += batchSize) {
    const changes = readings.slice(i, i + batchSize).map((record) => ({ entity: 'reading', record }));
    await s.post('/api/sync/push', { idempotencyKey: randomUUID(), changes });
  }
  return performance.now() - started;
}

/** The same rows straight into PostgreSQL: one INSERT … VALUES statement of 10,000 rows. */
export async function plainInsert(s: BenchServer) {
  const { parents, readings } = sessionChanges(READINGS);
  await s.post('/api/sync/push', { idempotencyKey: randomUUID(), changes: parents });
  // Ids, numbers and axis names only: safe to write as literals.
  const values = readings.map((r) => `('${r.id}', '${s.teamId}', '${r.poseId}', '${r.gaugePointId}', '${r.axis}', ${r.valueMm}, '${s.userId}')`).join(',\n');
  const started = performance.now();
  await s.sequelize.query(`INSERT INTO readings (id, team_id, pose_id, gauge_point_id, axis, value_mm, entered_by) VALUES ${values}`);
  return performance.now() - started;
}

export async function runIngestBench(s: BenchServer): Promise<BenchRow[]> {
  const app: number[] = [];
  const oneBatch: number[] = [];
  const plain: number[] = [];
  for (let round = 0; round < ROUNDS; round++) {
    app.push(await pushAll(s, CLIENT_BATCH));
    oneBatch.push(await pushAll(s, READINGS));
    plain.push(await plainInsert(s));
  }
  const rate = (ms: number) => (READINGS / ms) * 1000;
  const appRate = rate(median(app));
  const oneRate = rate(median(oneBatch));
  const plainRate = rate(median(plain));
  const fmt = (r: number) => `${Math.round(r).toLocaleString('en')} readings/s`;
  const clientRatio = appRate / plainRate;
  return [
    {
      section: 'sync ingest',
      measure: `plain multi-row INSERT of ${READINGS.toLocaleString('en')} readings`,
      value: `${fmt(plainRate)} (${median(plain).toFixed(0)} ms)`,
    },
    {
      section: 'sync ingest',
      measure: `app push, one batch of ${READINGS.toLocaleString('en')}`,
      value: `${fmt(oneRate)} (${median(oneBatch).toFixed(0)} ms), ratio ${(oneRate / plainRate).toFixed(2)}`,
    },
    {
      section: 'sync ingest',
      measure: `app push, the client's batches of ${CLIENT_BATCH}`,
      value: `${fmt(appRate)} (${median(app).toFixed(0)} ms), ratio ${clientRatio.toFixed(2)}`,
      goal: `≥ 0.65 of plain: ${clientRatio >= 0.65 ? 'met' : 'NOT met'}`,
    },
  ];
}
