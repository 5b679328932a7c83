// API under load: autocannon on loopback, 50 connections, bounded in time, against the session
// review route and the sync pull route of a realistic session.
import autocannon from 'autocannon';
import { randomUUID } from 'node:crypto';
import type { BenchRow } from './report';
import { sessionChanges, type BenchServer } from './fixture';

const CONNECTIONS = 50;
const SECONDS = 8;

async function hammer(s: BenchServer, path: string, cookie: string) {
  const result = await autocannon({
    url: s.baseUrl + path,
    connections: CONNECTIONS,
    duration: SECONDS,
    headers: { cookie },
  });
  const bad = result.non2xx + result.errors + result.timeouts;
  return { p50: result.latency.p50, p99: result.latency.p99, rps: result.requests.average, total: result.requests.total, bad };
}

export async function runLoadBench(s: BenchServer): Promise<BenchRow[]> {
  // A workshop of its own with two realistic sessions of 30 poses × 12 gauge points × 3 axes,
  // so the pull returns what a phone would meet, not the ingest benchmark's rows.
  const workshop = await s.newWorkshop();
  let sessionId = '';
  for (let i = 0; i < 2; i++) {
    const { sessionId: id, parents, readings } = sessionChanges(30 * 36);
    await s.post('/api/sync/push', { idempotencyKey: randomUUID(), changes: [...parents, ...readings.map((record) => ({ entity: 'reading', record }))] }, workshop.headers);
    sessionId = id;
  }
  const rows: BenchRow[] = [];
  for (const [name, path] of [
    ['session review (30 poses × 12 points × 3 axes)', `/api/sessions/${sessionId}/review`],
    ['sync pull since 0 (2 sessions, 2,160 readings)', '/api/sync/pull?since=0'],
  ] as const) {
    const r = await hammer(s, path, workshop.headers.Cookie);
    rows.push({
      section: 'API load',
      measure: `${name}, ${CONNECTIONS} connections, ${SECONDS} s`,
      value: `p50 ${r.p50} ms, p99 ${r.p99} ms, ${Math.round(r.rps)} req/s (${r.total} requests, ${r.bad} failed)`,
    });
  }
  return rows;
}
