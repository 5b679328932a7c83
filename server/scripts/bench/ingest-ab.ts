// Ingest, old against new: two (or more) server bundles against one database, round by round in
// alternating order, each round the client's batches of 1,000 and the plain INSERT back to back,
// so a change in the machine's load falls on every bundle alike (README "Performance", Ingest).
// An older bundle: `git archive <commit> server shared migrations package.json tsconfig.json`
// unpacked under .data/ with node_modules linked, bundled as build-server.mjs bundles.
// Usage, on a cluster of its own: DATABASE_URL=… BUNDLES=old/main.mjs,new/main.mjs ROUNDS=12
//   node --import tsx server/scripts/bench/ingest-ab.ts
// Profile the app instances with APP_NODE_ARGS="--cpu-prof --cpu-prof-dir=.data/prof" (one
// .cpuprofile per instance, written when the run stops them).
// Prints per round each bundle's push time, the plain INSERT's, their ratio, and the CPU the app
// process and PostgreSQL spent in the push (from /proc); at the end the medians per bundle and the
// load average (each CPU figure includes the push of the session's parents before the timed part,
// alike for every bundle, and PostgreSQL's includes its autovacuum). The other work on the machine
// adds nothing to the CPU figures, but they swing too: on 2026-12-03 at load 4-10, a bundle's
// PostgreSQL CPU per push ranged over half its median between rounds, the wall time over twice.
import os from 'node:os';
import { startBenchServer, type BenchServer } from './fixture';
import { CLIENT_BATCH_CHANGES } from '../../../shared/schemas/sync';
import { plainInsert, pushAll } from './ingest';
import { cpuSecondsOf, postgresPids, statFields } from './cpu-share';

const bundles = process.env.BUNDLES!.split(',');
const rounds = Number(process.env.ROUNDS ?? 6);
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/**
 * CPU seconds the database cluster on `port` has used: the postmaster, its live children (the
 * backends and helpers) and the children that have ended (the kernel adds them to its counters).
 */
function databaseCpu(port: number): number {
  const [postmaster, ...children] = postgresPids(port);
  const own = postmaster === undefined ? null : statFields(postmaster);
  if (!own) return NaN;
  let ticks = Number(own[11]) + Number(own[12]) + Number(own[13]) + Number(own[14]);
  for (const pid of children) {
    // One that ended meanwhile is counted in the postmaster's figures from now on.
    const f = statFields(pid);
    if (f) ticks += Number(f[11]) + Number(f[12]);
  }
  return ticks / 100;
}

async function main() {
  const dbPort = Number(new URL(process.env.DATABASE_URL!).port);
  const servers: BenchServer[] = [];
  // APP_NODE_ARGS (say `--cpu-prof --cpu-prof-dir=…`) goes to the app instances only (fixture.ts);
  // BUNDLE_ARGS, one entry per bundle split by '|', adds node flags to one bundle only (say
  // `|--max-semi-space-size=32` to compare a V8 setting on the same bundle twice).
  const perBundle = process.env.BUNDLE_ARGS?.split('|') ?? [];
  const common = process.env.APP_NODE_ARGS ?? '';
  for (const [k, bundle] of bundles.entries()) {
    process.env.SERVER_BUNDLE = bundle;
    process.env.APP_NODE_ARGS = `${common} ${perBundle[k] ?? ''}`;
    servers.push(await startBenchServer(process.env.DATABASE_URL!));
  }
  const ratios: number[][] = bundles.map(() => []);
  const cpu: number[][] = bundles.map(() => []);
  const pushes: number[][] = bundles.map(() => []);
  const dbCpu: number[][] = bundles.map(() => []);
  try {
    // A warm-up round each, not counted.
    for (const s of servers) await pushAll(s, CLIENT_BATCH_CHANGES);
    for (let round = 0; round < rounds; round++) {
      const order = round % 2 ? [...servers.keys()].reverse() : [...servers.keys()];
      const line: string[] = [];
      for (const k of order) {
        const s = servers[k];
        const before = cpuSecondsOf(s.app.pid);
        const dbBefore = databaseCpu(dbPort);
        const app = await pushAll(s, CLIENT_BATCH_CHANGES);
        const spent = cpuSecondsOf(s.app.pid) - before;
        const dbSpent = databaseCpu(dbPort) - dbBefore;
        const plainDbBefore = databaseCpu(dbPort);
        const plain = await plainInsert(s);
        const plainDb = databaseCpu(dbPort) - plainDbBefore;
        ratios[k].push(plain / app);
        pushes[k].push(app);
        cpu[k].push(spent);
        dbCpu[k].push(dbSpent);
        line.push(
          `${k}: push ${app.toFixed(0)} ms (app CPU ${(spent * 1000).toFixed(0)} ms, PostgreSQL ${(dbSpent * 1000).toFixed(0)} ms), plain ${plain.toFixed(0)} ms (PostgreSQL ${(plainDb * 1000).toFixed(0)} ms), ratio ${(plain / app).toFixed(2)}`,
        );
      }
      console.log(`round ${round + 1} [load ${os.loadavg()[0].toFixed(1)}]  ${line.join(' | ')}`);
    }
  } finally {
    for (const s of servers) await s.close();
  }
  bundles.forEach((b, k) =>
    console.log(
      `${k} ${b}: median ratio ${median(ratios[k]).toFixed(3)} (${ratios[k].map((r) => r.toFixed(2)).join(' ')}), median push ${median(pushes[k]).toFixed(0)} ms, app CPU ${(median(cpu[k]) * 1000).toFixed(0)} ms and PostgreSQL's ${(median(dbCpu[k]) * 1000).toFixed(0)} ms per 10,000 (${dbCpu[k].map((c) => (c * 1000).toFixed(0)).join(' ')})`,
    ),
  );
  console.log(
    `load average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' / ')}`,
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
