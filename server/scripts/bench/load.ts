// API under load, measured as ratios in one run: the load generator in this process (never in a
// server's; load-generator.ts: it counts each answer's bytes and checks its status and length, and
// decodes nothing), 50 connections on loopback, the configurations interleaved round by round so a
// change in the machine's load (other work on it) falls on all of them alike; each figure is the
// median of the rounds. The app runs as deployed (bundled, production, logging at info) against:
// - B2 (bare-b2.ts): the same statements, PostgreSQL-built JSON passed through by a bare handler,
//   for the review and the pull;
// - itself without its answer cache (an instance with ANSWER_CACHE_MB=0): what every request costs
//   when each follows a change, so the build cost stays in the report;
// - the unsigned /api/health (one SELECT 1), for a signed-in small route (/api/me);
// - itself: two instances (25 connections each, at once) against one (50 connections), for the review;
//   as they run on this machine, and with each instance given the same share of a core
//   (cpu-budget.ts, BENCH_INSTANCE_CORES, 0.4 unless set), as containers' CPU limits give it, so the
//   ratio shows what a second process adds rather than what this machine's cores have left.
// Plain requests with no Accept-Encoding, as a load generator sends them (B2 compresses nothing),
// and for the review and the pull also as a browser asks (Accept-Encoding: gzip, deflate, br), the
// kept brotli bytes then being sent; the review's size on the wire is measured on its own.
// Each round also reads, from /proc, the CPU that the server, PostgreSQL and the generator used,
// given per request served, so a ratio can be read beside what it cost and what the cores allow.
// BENCH_LOAD_AUTOCANNON=1 also runs every configuration through autocannon (the former generator)
// right before or after this one's (alternately), in the same rounds, to compare the two.
import autocannon from 'autocannon';
import { randomUUID } from 'node:crypto';
import http from 'node:http';
import type { BenchRow } from './report';
import { sessionChanges, startB2, startInstance, type BenchServer, type Child } from './fixture';
import { describeCpu, postgresPids, processTitle, withCpuShare, type CpuShare } from './cpu-share';
import { generateLoad, type LoadTarget } from './load-generator';
import { cpuBudget, type CpuBudget } from './cpu-budget';

const CONNECTIONS = 50;
const SECONDS = Number(process.env.BENCH_LOAD_SECONDS ?? 5);
/** The unmeasured priming before each measured run (see measure). */
const PRIME_SECONDS = 1;
const ROUNDS = Number(process.env.BENCH_LOAD_ROUNDS ?? 3);
const COMPARE_AUTOCANNON = process.env.BENCH_LOAD_AUTOCANNON === '1';
/** The review's raw size before this work (the issue's measurement), for the wire-bytes ratio. */
const REVIEW_RAW_BEFORE = 370_707;
/** What Chromium sends. */
const BROWSER_ENCODINGS = 'gzip, deflate, br';
/**
 * Share of a core each budgeted instance is given: two of them, PostgreSQL and the generator at the
 * one-instance CPU a request (about 0.8, 0.45 and 0.25 ms) stay under this machine's 2 cores.
 */
const INSTANCE_CORES = Number(process.env.BENCH_INSTANCE_CORES ?? 0.4);

type Generator = 'own' | 'autocannon';

interface Run {
  rps: number;
  p50: number;
  p99: number;
  bad: number;
  firstFailure: string | null;
  /** Where the CPU went during the round (null without /proc). */
  cpu: CpuShare | null;
}

/** One configuration: what is loaded, how it is asked, and the processes that serve it. */
interface Config {
  targets: LoadTarget[];
  headers: Record<string, string>;
  /** The status every answer must have. */
  status?: number;
  /** The name of the serving processes in the CPU figures, and their pids. */
  server: string;
  pids: () => number[];
}

/** Several targets at once: their rates add up; latency is the worse of them. */
async function hammer(generator: Generator, c: Config): Promise<Omit<Run, 'cpu'>> {
  if (generator === 'own') {
    const runs = await generateLoad(c.targets, { seconds: SECONDS, headers: c.headers, status: c.status });
    return {
      rps: runs.reduce((n, r) => n + r.rps, 0),
      p50: Math.max(...runs.map((r) => r.p50)),
      p99: Math.max(...runs.map((r) => r.p99)),
      bad: runs.reduce((n, r) => n + r.bad, 0),
      firstFailure: runs.find((r) => r.firstFailure)?.firstFailure ?? null,
    };
  }
  const results = await Promise.all(c.targets.map((t) => autocannon({ url: t.url, connections: t.connections, duration: SECONDS, headers: c.headers })));
  const bad = results.reduce((n, r) => n + r['4xx'] + r['5xx'] + r.errors + r.timeouts, 0);
  return {
    rps: results.reduce((n, r) => n + r.requests.average, 0),
    p50: Math.max(...results.map((r) => r.latency.p50)),
    p99: Math.max(...results.map((r) => r.latency.p99)),
    bad,
    firstFailure: bad ? 'see autocannon' : null,
  };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** Each part's median over the rounds. */
function medianCpu(runs: CpuShare[]): CpuShare | null {
  if (runs.length === 0) return null;
  const parts = Object.fromEntries(Object.keys(runs[0].parts).map((k) => [k, median(runs.map((r) => r.parts[k]))]));
  return { parts, machineBusy: median(runs.map((r) => r.machineBusy)), cores: runs[0].cores };
}

/** Milliseconds of CPU a request served, per part, or null without /proc or with nothing served. */
function cpuPerRequest(r: Run): Record<string, number> | null {
  if (!r.cpu || r.rps === 0) return null;
  return Object.fromEntries(Object.entries(r.cpu.parts).map(([k, pct]) => [k, (pct * 10) / r.rps]));
}

function summary(runs: Run[]) {
  const perRequest = runs.map(cpuPerRequest).filter((x): x is Record<string, number> => x !== null);
  return {
    rps: median(runs.map((r) => r.rps)),
    p50: median(runs.map((r) => r.p50)),
    p99: median(runs.map((r) => r.p99)),
    bad: runs.reduce((n, r) => n + r.bad, 0),
    firstFailure: runs.find((r) => r.firstFailure)?.firstFailure ?? null,
    cpu: medianCpu(runs.flatMap((r) => (r.cpu ? [r.cpu] : []))),
    /** Median ms of CPU a request, per part. */
    cpuMs: perRequest.length ? Object.fromEntries(Object.keys(perRequest[0]).map((k) => [k, median(perRequest.map((p) => p[k]))])) : null,
  };
}
type Summary = ReturnType<typeof summary>;

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

/** PostgreSQL's processes that began during a run: new connections' backends, autovacuum workers. */
function newPostgresProcesses(cpu: CpuShare | null): string {
  const pids = cpu?.started?.PostgreSQL ?? [];
  if (pids.length === 0) return '';
  const kinds = new Map<string, number>();
  for (const pid of pids) {
    // 'postgres: bench twistlog_bench 127.0.0.1(41234) idle' → 'client backend'
    const title = processTitle(pid).replace(/^postgres: /, '');
    const kind = /\d+\.\d+\.\d+\.\d+\(\d+\)/.test(title) ? 'client backend' : title;
    kinds.set(kind, (kinds.get(kind) ?? 0) + 1);
  }
  return `; PostgreSQL processes begun: ${[...kinds].map(([k, n]) => `${n} ${k}`).join(', ')}`;
}

const ms = (x: number) => (x < 10 ? x.toFixed(2) : x.toFixed(1));
/** "512 req/s, p50 80 ms, p99 150 ms; CPU a request: app 1.30 ms, PostgreSQL 0.61 ms, load generator 0.20 ms" */
const fmtRun = (r: Summary) =>
  `${Math.round(r.rps)} req/s, p50 ${Math.round(r.p50)} ms, p99 ${Math.round(r.p99)} ms` +
  (r.bad ? `, ${r.bad} failed (${r.firstFailure})` : '') +
  (r.cpuMs
    ? `; CPU a request: ${Object.entries(r.cpuMs)
        .map(([k, v]) => `${k} ${ms(v)} ms`)
        .join(', ')}`
    : '');
const ratio = (a: number, b: number) => (a / b).toFixed(2);
const verdict = (met: boolean) => (met ? 'met' : 'NOT met');

/**
 * Whether the review's req/s can grow with a second instance on this machine: the CPU a request
 * of each part in both configurations (an added instance that costs no more a request scales with
 * the cores it is given), and the ceilings the cores set at the one instance's CPU a request — one
 * core for a single Node process's JavaScript, all the machine's cores for the app, PostgreSQL and
 * the generator together (on a machine that runs them all).
 */
function scalingRows(section: string, one: Summary, two: Summary): BenchRow[] {
  if (!one.cpuMs || !two.cpuMs || !one.cpu) return [];
  const appOne = one.cpuMs.app;
  const appTwo = two.cpuMs['two apps'];
  const allOne = Object.values(one.cpuMs).reduce((x, y) => x + y, 0);
  const machineCeiling = (one.cpu.cores * 1000) / allOne;
  const growth = appTwo / appOne;
  return [
    {
      section,
      measure: '… CPU a request, one instance → two',
      value:
        `app ${ms(appOne)} → ${ms(appTwo)} ms (× ${growth.toFixed(2)}), PostgreSQL ${ms(one.cpuMs.PostgreSQL)} → ${ms(two.cpuMs.PostgreSQL)} ms, ` +
        `load generator ${ms(one.cpuMs['load generator'])} → ${ms(two.cpuMs['load generator'])} ms`,
    },
    {
      section,
      measure: '… what the cores allow the review, at the one-instance CPU a request',
      value:
        `one process on one core ${Math.round(1000 / appOne)} req/s; the machine's ${one.cpu.cores} cores for app, PostgreSQL and generator ${Math.round(machineCeiling)} req/s; ` +
        `measured: one instance ${Math.round(one.rps)} (${Math.round((one.rps / machineCeiling) * 100)} % of the machine's), two ${Math.round(two.rps)} (${Math.round((two.rps / machineCeiling) * 100)} %)`,
    },
  ];
}

/**
 * The review on instances given the same CPU budget each: one against two. The budgets together
 * stay under what the machine has beside PostgreSQL and the generator, so the ratio measures the
 * app (whether its instances share anything that serialises them), not the machine's last cores.
 */
function budgetRows(section: string, one: Summary | undefined, two: Summary | undefined, noBudget: string | null): BenchRow[] {
  const measure = `two instances ÷ one, each given ${INSTANCE_CORES} of a core (a CPU quota, as a container's limit)`;
  if (!one || !two) return [{ section, measure, value: `not measured: ${noBudget ?? 'left out of this run'}` }];
  const growth = two.rps / one.rps;
  const cpu = (x: Summary) => (x.cpu ? ` (machine ${Math.round(x.cpu.machineBusy)} % busy)` : '');
  return [
    { section, measure: `session review on one instance given ${INSTANCE_CORES} of a core`, value: fmtRun(one) + cpu(one) },
    { section, measure: `… on two instances given ${INSTANCE_CORES} of a core each (25 + 25 connections)`, value: fmtRun(two) + cpu(two) },
    { section, measure: `… ${measure}`, value: growth.toFixed(2), goal: `grows with the processes (> 1): ${verdict(growth > 1.05)}` },
  ];
}

const LABELS: Record<string, string> = {
  reviewApp: 'session review, app',
  reviewBrowser: '… as a browser asks',
  reviewMiss: '… after every change',
  reviewB2: '… B2',
  reviewRevalidated: '… asked again unchanged (304)',
  pullApp: 'sync pull since 0, app',
  pullBrowser: '… as a browser asks',
  pullMiss: '… after every change',
  pullB2: '… B2',
  meSignedIn: 'GET /api/me',
  healthUnsigned: 'GET /api/health',
  reviewTwoInstances: 'session review on two instances',
  reviewOneBudgeted: 'session review, one instance on a CPU budget',
  reviewTwoBudgeted: 'session review, two instances on a CPU budget each',
};

/** BENCH_LOAD_AUTOCANNON=1: every configuration through both generators, in the same rounds. */
function comparisonRows(own: Record<string, Summary>, ac: Record<string, Summary>): BenchRow[] {
  const section = 'API load: the former generator (autocannon) against this one, the same rounds';
  const ratios = (x: Record<string, Summary>) =>
    `review ÷ B2 ${ratio(x.reviewApp.rps, x.reviewB2.rps)}, pull ÷ B2 ${ratio(x.pullApp.rps, x.pullB2.rps)}, ` +
    `/api/me ÷ /api/health ${ratio(x.meSignedIn.rps, x.healthUnsigned.rps)}, two instances ÷ one ${ratio(x.reviewTwoInstances.rps, x.reviewApp.rps)}`;
  return [
    ...Object.keys(LABELS)
      .filter((k) => own[k] && ac[k])
      .map((k) => ({ section, measure: LABELS[k], value: `autocannon: ${fmtRun(ac[k])} ‖ this generator: ${fmtRun(own[k])}` })),
    { section, measure: 'ratios', value: `autocannon: ${ratios(ac)} ‖ this generator: ${ratios(own)}` },
  ];
}

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
  /** Two more instances, each under a CPU budget of its own, or why there are none. */
  const budgeted: { instance: Child; budget: CpuBudget }[] = [];
  let noBudget: string | null = null;
  try {
    b = await startInstance(s.databaseUrl);
    b2 = await startB2(s.databaseUrl);
    uncached = await startInstance(s.databaseUrl, undefined, { ANSWER_CACHE_MB: '0' });
    for (const name of ['c', 'd']) {
      const budget = cpuBudget(name, INSTANCE_CORES);
      if (typeof budget === 'string') {
        noBudget = budget;
        break;
      }
      // Started first, then put under the budget: a budget of 0.4 of a core would slow the start only.
      const instance = await startInstance(s.databaseUrl).catch((err: unknown) => {
        budget.remove();
        throw err;
      });
      budgeted.push({ instance, budget });
      budget.add(instance.pid);
    }
    const review = `/api/sessions/${sessionId}/review`;
    const pull = '/api/sync/pull?since=0';
    // A desk that already holds this review asks again: the validator answers 304.
    const etag = (await fetch(a.baseUrl + review, { headers: signedIn })).headers.get('etag')!;
    // Where the CPU went during the one- and two-instance review rounds (warm-up round included
    // in the list, left out of the median like the figures).
    const pgPort = Number(new URL(s.databaseUrl).port);
    const pg = () => postgresPids(pgPort);
    const app = () => [a.pid];
    const one = (url: string) => [{ url, connections: CONNECTIONS }];
    const browser = { ...signedIn, 'accept-encoding': BROWSER_ENCODINGS };
    const configs = {
      reviewApp: { targets: one(a.baseUrl + review), headers: signedIn, server: 'app', pids: app },
      reviewBrowser: { targets: one(a.baseUrl + review), headers: browser, server: 'app', pids: app },
      reviewMiss: { targets: one(uncached.baseUrl + review), headers: signedIn, server: 'app', pids: () => [uncached!.pid] },
      reviewB2: { targets: one(`${b2.baseUrl}/review/${workshop.teamId}/${sessionId}`), headers: {}, server: 'B2', pids: () => [b2!.pid] },
      reviewRevalidated: { targets: one(a.baseUrl + review), headers: { ...signedIn, 'if-none-match': etag }, status: 304, server: 'app', pids: app },
      pullApp: { targets: one(a.baseUrl + pull), headers: signedIn, server: 'app', pids: app },
      pullBrowser: { targets: one(a.baseUrl + pull), headers: browser, server: 'app', pids: app },
      pullMiss: { targets: one(uncached.baseUrl + pull), headers: signedIn, server: 'app', pids: () => [uncached!.pid] },
      pullB2: { targets: one(`${b2.baseUrl}/pull/${workshop.teamId}/${workshop.userId}?since=0`), headers: {}, server: 'B2', pids: () => [b2!.pid] },
      meSignedIn: { targets: one(`${a.baseUrl}/api/me`), headers: signedIn, server: 'app', pids: app },
      healthUnsigned: { targets: one(`${a.baseUrl}/api/health`), headers: {}, server: 'app', pids: app },
      reviewTwoInstances: {
        targets: [
          { url: a.baseUrl + review, connections: CONNECTIONS / 2 },
          { url: b.baseUrl + review, connections: CONNECTIONS / 2 },
        ],
        headers: signedIn,
        server: 'two apps',
        pids: () => [a.pid, b!.pid],
      },
      ...(budgeted.length === 2
        ? {
            reviewOneBudgeted: {
              targets: one(budgeted[0].instance.baseUrl + review),
              headers: signedIn,
              server: 'app',
              pids: () => [budgeted[0].instance.pid],
            },
            reviewTwoBudgeted: {
              targets: budgeted.map(({ instance }) => ({ url: instance.baseUrl + review, connections: CONNECTIONS / 2 })),
              headers: signedIn,
              server: 'two apps',
              pids: () => budgeted.map(({ instance }) => instance.pid),
            },
          }
        : {}),
    } satisfies Record<string, Config>;
    type Name = keyof typeof configs;
    // BENCH_LOAD_CONFIGS=meSignedIn,healthUnsigned (say) runs only those, for a closer look; the table needs them all.
    const chosen = process.env.BENCH_LOAD_CONFIGS?.split(',');
    const toRun = Object.entries(configs).filter(([name]) => !chosen || chosen.includes(name));
    const generators: Generator[] = COMPARE_AUTOCANNON ? ['own', 'autocannon'] : ['own'];
    const measure = async (c: Config, generator: Generator): Promise<Run> => {
      // An unmeasured second at the same target first: an instance's pool closes the connections
      // beyond DB_POOL_MIN once idle DB_POOL_IDLE_MS (db.ts; 10 s before 2026-12-03, when the
      // other configurations' rounds left /api/me's instance idle that long and each of its rounds
      // met 10 new PostgreSQL backends mid-run). A busy instance keeps its connections; that is
      // what is measured, whatever the pool's settings.
      await generateLoad(c.targets, { seconds: PRIME_SECONDS, headers: c.headers, status: c.status });
      const { result, cpu } = await withCpuShare({ [c.server]: c.pids, PostgreSQL: pg, 'load generator': () => [process.pid] }, () => hammer(generator, c));
      return { ...result, cpu };
    };
    // Round 0 warms every configuration up (JIT, pools, PostgreSQL's caches) and is not counted.
    // With the comparison on, each configuration runs through both generators, one right after the
    // other, the first of them alternating from round to round, so neither is always the one that
    // follows the other's load (the unmeasured second in measure keeps the pool warm for both).
    const runs = Object.fromEntries(generators.map((g) => [g, Object.fromEntries(Object.keys(configs).map((k) => [k, [] as Run[]]))]));
    for (let round = 0; round <= ROUNDS; round++) {
      for (const [name, c] of toRun) {
        for (const g of round % 2 ? generators : [...generators].reverse()) {
          const r = await measure(c, g);
          if (round > 0) runs[g][name].push(r);
          // Every run's figures as they come, for a look at the rounds behind the medians.
          const perRequest = cpuPerRequest(r);
          console.error(
            `[load] round ${round} ${name} ${g}: ${Math.round(r.rps)} req/s, p50 ${Math.round(r.p50)} ms, p99 ${Math.round(r.p99)} ms` +
              (r.bad ? `, ${r.bad} failed (${r.firstFailure})` : '') +
              (perRequest ? `; CPU ms a request ${Object.values(perRequest).map(ms).join(' / ')}` : '') +
              (r.cpu ? `; machine ${Math.round(r.cpu.machineBusy)} % busy` : '') +
              newPostgresProcesses(r.cpu),
          );
        }
      }
    }
    // A subset's figures are the stderr lines above; the table's rows need every configuration.
    if (chosen) return [];
    const summarize = (g: Generator) => Object.fromEntries(Object.entries(runs[g]).map(([k, v]) => [k, summary(v)])) as Record<Name, Summary>;
    const m = summarize('own');

    const raw = await wireBytes(a.baseUrl + review, cookie, null);
    const br = await wireBytes(a.baseUrl + review, cookie, 'gzip, deflate, br');
    const gz = await wireBytes(a.baseUrl + review, cookie, 'gzip');
    const pullRaw = await wireBytes(a.baseUrl + pull, cookie, null);
    const pullBr = await wireBytes(a.baseUrl + pull, cookie, 'gzip, deflate, br');

    const section = `API load (${CONNECTIONS} connections, ${ROUNDS} interleaved rounds of ${SECONDS} s, medians)`;
    const meRatio = m.meSignedIn.rps / m.healthUnsigned.rps;
    const twoRatio = m.reviewTwoInstances.rps / m.reviewApp.rps;
    const budgetedOne = (m as Partial<typeof m>).reviewOneBudgeted;
    const budgetedTwo = (m as Partial<typeof m>).reviewTwoBudgeted;
    /** An answer's rows: the app with the p99 goal, as a browser asks, after every change, B2, and app ÷ B2. */
    const answerRows = (
      measure: string,
      run: { app: Summary; browser: Summary; miss: Summary; b2: Summary },
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
        measure: '… two instances ÷ one, as they run on this machine',
        value: ratio(m.reviewTwoInstances.rps, m.reviewApp.rps),
        // With budgets, the goal is judged on them (below): here the machine's cores are the ceiling.
        goal: budgetedOne && budgetedTwo ? 'see the budgeted ratio' : `grows with the processes (> 1): ${verdict(twoRatio > 1.05)}`,
      },
      { section, measure: '… CPU during the one-instance review (median round)', value: describeCpu(m.reviewApp.cpu) },
      { section, measure: '… CPU during the two-instance review (median round)', value: describeCpu(m.reviewTwoInstances.cpu) },
      ...scalingRows(section, m.reviewApp, m.reviewTwoInstances),
      ...budgetRows(section, budgetedOne, budgetedTwo, noBudget),
      ...(COMPARE_AUTOCANNON ? comparisonRows(m, summarize('autocannon')) : []),
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
    for (const { instance, budget } of budgeted) {
      await instance.stop();
      budget.remove();
    }
  }
}
