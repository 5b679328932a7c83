// API under load, measured as ratios in one run: autocannon in this process (never in a server's),
// 50 connections on loopback, the configurations interleaved round by round so a change in the
// machine's load (other work on it) falls on all of them alike; each figure is the median of the
// rounds. The app runs as deployed (bundled, production, logging at info) against:
// - B2 (bare-b2.ts): the same statements, PostgreSQL-built JSON passed through by a bare handler,
//   for the review and the pull;
// - itself without its answer cache (an instance with ANSWER_CACHE_MB=0): what every request costs
//   when each follows a change, so the build cost stays in the report;
// - the unsigned /api/health (one SELECT 1), for a signed-in small route (/api/me);
// - itself: two instances (25 connections each, at once) against one (50 connections), for the review.
// Plain requests with no Accept-Encoding, as a load generator sends them (B2 compresses nothing),
// and for the review and the pull also as a browser asks (Accept-Encoding: gzip, deflate, br), the
// kept brotli bytes then being sent; the review's size on the wire is measured on its own.
import autocannon from 'autocannon';
import { randomUUID } from 'node:crypto';
import http from 'node:http';
import type { BenchRow } from './report';
import { sessionChanges, startB2, startInstance, type BenchServer, type Child } from './fixture';
import { describeCpu, postgresPids, withCpuShare, type CpuShare } from './cpu-share';

const CONNECTIONS = 50;
const SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 5);
const ROUNDS = Number(process.env.BENCH_LOAD_ROUNDS ?? 3);
/** The review's raw size before this work (the issue's measurement), for the wire-bytes ratio. */
const REVIEW_RAW_BEFORE = 370_707;
/** What Chromium sends. */
const BROWSER_ENCODINGS = 'gzip, deflate, br';

interface Run {
  rps: number;
  p50: number;
  p99: number;
  bad: number;
}

async function hammer(targets: { url: string; connections: number }[], headers: Record<string, string>): Promise<Run> {
  const results = await Promise.all(targets.map((t) => autocannon({ url: t.url, connections: t.connections, duration: SECONDS, headers })));
  const bad = results.reduce((n, r) => n + r['4xx'] + r['5xx'] + r.errors + r.timeouts, 0);
  // Several targets at once: their rates add up; latency is the worse of them.
  return {
    rps: results.reduce((n, r) => n + r.requests.average, 0),
    p50: Math.max(...results.map((r) => r.latency.p50)),
    p99: Math.max(...results.map((r) => r.latency.p99)),
    bad,
  };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** Each part's median over the rounds. */
function medianCpu(runs: CpuShare[]): CpuShare | null {
  if (runs.length === 0) return null;
  const parts = Object.fromEntries(Object.keys(runs[0].parts).map((k) => [k, median(runs.map((r) => r.parts[k]))]));
  return { parts, machineBusy: median(runs.map((r) => r.machineBusy)), cores: runs[0].cores };
}

function summary(runs: Run[]) {
  return {
    rps: median(runs.map((r) => r.rps)),
    p50: median(runs.map((r) => r.p50)),
    p99: median(runs.map((r) => r.p99)),
    bad: runs.reduce((n, r) => n + r.bad, 0),
  };
}

/** Bytes on the wire of one GET with an Accept-Encoding (the body as sent, before decoding). */
function wireBytes(url: string, cookie: string, encoding: string | null): Promise<{ bytes: number; encoding: string }> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = { Cookie: cookie };
    if (encoding) headers['Accept-Encoding'] = encoding;
    http
      .get(url, { headers }, (res) => {
        let bytes = 0;
        res.on('data', (c: Buffer) => (bytes += c.length));
        res.on('end', () => resolve({ bytes, encoding: String(res.headers['content-encoding'] ?? 'none') }));
      })
      .on('error', reject);
  });
}

const fmtRun = (r: ReturnType<typeof summary>) => `${Math.round(r.rps)} req/s, p50 ${r.p50} ms, p99 ${r.p99} ms${r.bad ? `, ${r.bad} failed` : ''}`;
const ratio = (a: number, b: number) => (a / b).toFixed(2);
const verdict = (met: boolean) => (met ? 'met' : 'NOT met');

export async function runLoadBench(s: BenchServer): Promise<BenchRow[]> {
  // A workshop of its own with two realistic sessions of 30 poses × 12 gauge points × 3 axes,
  // so the pull returns what a phone would meet, not the ingest benchmark's rows.
  const workshop = await s.newWorkshop();
  let sessionId = '';
  for (let i = 0; i < 2; i++) {
    const { sessionId: id, parents, readings } = sessionChanges(30 * 36);
    await s.post(
      '/api/sync/push',
      { idempotencyKey: randomUUID(), changes: [...parents, ...readings.map((record) => ({ entity: 'reading', record }))] },
      workshop.headers,
    );
    sessionId = id;
  }
  const cookie = workshop.headers.Cookie;
  const signedIn = { cookie };
  const a = s.app;
  let b: Child | undefined;
  let b2: Child | undefined;
  let uncached: Child | undefined;
  try {
    b = await startInstance(s.databaseUrl);
    b2 = await startB2(s.databaseUrl);
    uncached = await startInstance(s.databaseUrl, undefined, { ANSWER_CACHE_MB: '0' });
    const review = `/api/sessions/${sessionId}/review`;
    const pull = '/api/sync/pull?since=0';
    // A desk that already holds this review asks again: the validator answers 304.
    const etag = (await fetch(a.baseUrl + review, { headers: signedIn })).headers.get('etag')!;
    // Where the CPU went during the one- and two-instance review rounds (warm-up round included
    // in the list, left out of the median like the figures).
    const pgPort = Number(new URL(s.databaseUrl).port);
    const cpuRuns: Record<'one' | 'two', CpuShare[]> = { one: [], two: [] };
    const measured = async (key: 'one' | 'two', parts: Record<string, () => number[]>, work: () => Promise<Run>) => {
      const { result, cpu } = await withCpuShare(parts, work);
      if (cpu) cpuRuns[key].push(cpu);
      return result;
    };
    const configs: Record<string, () => Promise<Run>> = {
      reviewApp: () =>
        measured('one', { app: () => [a.pid], PostgreSQL: () => postgresPids(pgPort), 'load generator': () => [process.pid] }, () =>
          hammer([{ url: a.baseUrl + review, connections: CONNECTIONS }], signedIn),
        ),
      reviewBrowser: () => hammer([{ url: a.baseUrl + review, connections: CONNECTIONS }], { ...signedIn, 'accept-encoding': BROWSER_ENCODINGS }),
      reviewMiss: () => hammer([{ url: uncached!.baseUrl + review, connections: CONNECTIONS }], signedIn),
      reviewB2: () => hammer([{ url: `${b2!.baseUrl}/review/${workshop.teamId}/${sessionId}`, connections: CONNECTIONS }], {}),
      reviewRevalidated: () => hammer([{ url: a.baseUrl + review, connections: CONNECTIONS }], { ...signedIn, 'if-none-match': etag }),
      pullApp: () => hammer([{ url: a.baseUrl + pull, connections: CONNECTIONS }], signedIn),
      pullBrowser: () => hammer([{ url: a.baseUrl + pull, connections: CONNECTIONS }], { ...signedIn, 'accept-encoding': BROWSER_ENCODINGS }),
      pullMiss: () => hammer([{ url: uncached!.baseUrl + pull, connections: CONNECTIONS }], signedIn),
      pullB2: () => hammer([{ url: `${b2!.baseUrl}/pull/${workshop.teamId}/${workshop.userId}?since=0`, connections: CONNECTIONS }], {}),
      meSignedIn: () => hammer([{ url: `${a.baseUrl}/api/me`, connections: CONNECTIONS }], signedIn),
      healthUnsigned: () => hammer([{ url: `${a.baseUrl}/api/health`, connections: CONNECTIONS }], {}),
      reviewTwoInstances: () =>
        measured('two', { 'two apps': () => [a.pid, b!.pid], PostgreSQL: () => postgresPids(pgPort), 'load generator': () => [process.pid] }, () =>
          hammer(
            [
              { url: a.baseUrl + review, connections: CONNECTIONS / 2 },
              { url: b!.baseUrl + review, connections: CONNECTIONS / 2 },
            ],
            signedIn,
          ),
        ),
    };
    // Round 0 warms every configuration up (JIT, pools, PostgreSQL's caches) and is not counted.
    const runs: Record<string, Run[]> = Object.fromEntries(Object.keys(configs).map((k) => [k, []]));
    for (let round = 0; round <= ROUNDS; round++) {
      for (const [name, run] of Object.entries(configs)) {
        const r = await run();
        if (round > 0) runs[name].push(r);
      }
    }
    const m = Object.fromEntries(Object.entries(runs).map(([k, v]) => [k, summary(v)])) as Record<keyof typeof configs, ReturnType<typeof summary>>;

    const raw = await wireBytes(a.baseUrl + review, cookie, null);
    const br = await wireBytes(a.baseUrl + review, cookie, 'gzip, deflate, br');
    const gz = await wireBytes(a.baseUrl + review, cookie, 'gzip');
    const pullRaw = await wireBytes(a.baseUrl + pull, cookie, null);
    const pullBr = await wireBytes(a.baseUrl + pull, cookie, 'gzip, deflate, br');

    const section = `API load (${CONNECTIONS} connections, ${ROUNDS} interleaved rounds of ${SECONDS} s, medians)`;
    const meRatio = m.meSignedIn.rps / m.healthUnsigned.rps;
    const twoRatio = m.reviewTwoInstances.rps / m.reviewApp.rps;
    /** An answer's rows: the app with the p99 goal, as a browser asks, after every change, B2, and app ÷ B2. */
    const answerRows = (
      measure: string,
      run: { app: Run; browser: Run; miss: Run; b2: Run },
      words: { browser: string; miss: string; b2: string },
    ): BenchRow[] => {
      const toB2 = run.app.rps / run.b2.rps;
      return [
        { section, measure: `${measure}: app`, value: fmtRun(run.app), goal: `p99 < 250 ms: ${verdict(run.app.p99 < 250)}` },
        { section, measure: `… app, ${words.browser}`, value: fmtRun(run.browser) },
        { section, measure: `… app after every change (${words.miss})`, value: fmtRun(run.miss) },
        { section, measure: `… B2${words.b2}`, value: fmtRun(run.b2) },
        { section, measure: '… app ÷ B2', value: ratio(run.app.rps, run.b2.rps), goal: `≥ 0.9: ${verdict(toB2 >= 0.9)}` },
      ];
    };
    return [
      ...answerRows(
        'session review (30 poses × 12 points × 3 axes)',
        { app: m.reviewApp, browser: m.reviewBrowser, miss: m.reviewMiss, b2: m.reviewB2 },
        {
          browser: `asked as a browser asks (${BROWSER_ENCODINGS}: the kept brotli bytes)`,
          miss: 'a cache miss each request: ANSWER_CACHE_MB=0',
          b2: ' (bare handler, same statement, PostgreSQL-built JSON)',
        },
      ),
      { section, measure: '… app, asked again unchanged (If-None-Match → 304, no body)', value: fmtRun(m.reviewRevalidated) },
      ...answerRows(
        'sync pull since 0 (2 sessions, 2,160 readings)',
        { app: m.pullApp, browser: m.pullBrowser, miss: m.pullMiss, b2: m.pullB2 },
        { browser: 'asked as a browser asks', miss: 'a cache miss each request', b2: '' },
      ),
      { section, measure: 'signed-in small route (GET /api/me)', value: fmtRun(m.meSignedIn) },
      { section, measure: '… unsigned GET /api/health (SELECT 1)', value: fmtRun(m.healthUnsigned) },
      { section, measure: '… signed-in ÷ unsigned', value: ratio(m.meSignedIn.rps, m.healthUnsigned.rps), goal: `≥ 0.7: ${verdict(meRatio >= 0.7)}` },
      { section, measure: 'session review on two instances (25 + 25 connections at once)', value: fmtRun(m.reviewTwoInstances) },
      {
        section,
        measure: '… two instances ÷ one',
        value: ratio(m.reviewTwoInstances.rps, m.reviewApp.rps),
        goal: `grows with the processes (> 1): ${verdict(twoRatio > 1.05)}`,
      },
      { section, measure: '… CPU during the one-instance review (median round)', value: describeCpu(medianCpu(cpuRuns.one.slice(1))) },
      { section, measure: '… CPU during the two-instance review (median round)', value: describeCpu(medianCpu(cpuRuns.two.slice(1))) },
      {
        section: 'bytes on the wire',
        measure: 'session review',
        value: `${raw.bytes.toLocaleString('en')} B raw; ${br.bytes.toLocaleString('en')} B ${br.encoding}; ${gz.bytes.toLocaleString('en')} B ${gz.encoding}`,
        goal: `≤ 12 % of ${REVIEW_RAW_BEFORE.toLocaleString('en')} B: ${((br.bytes / REVIEW_RAW_BEFORE) * 100).toFixed(1)} % (${gz.encoding} ${((gz.bytes / REVIEW_RAW_BEFORE) * 100).toFixed(1)} %): ${verdict(Math.max(br.bytes, gz.bytes) <= 0.12 * REVIEW_RAW_BEFORE)}`,
      },
      {
        section: 'bytes on the wire',
        measure: 'sync pull since 0',
        value: `${pullRaw.bytes.toLocaleString('en')} B raw; ${pullBr.bytes.toLocaleString('en')} B ${pullBr.encoding}`,
      },
    ];
  } finally {
    await b?.stop();
    await b2?.stop();
    await uncached?.stop();
  }
}
