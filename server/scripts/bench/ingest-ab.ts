// Ingest, old against new: two (or more) server bundles against one database, round by round in
// alternating order, each round the client's batches of 1,000 and the plain INSERT back to back,
// so a change in the machine's load falls on every bundle alike (README "Performance", Ingest).
// An older bundle: `git archive <commit> server shared migrations package.json tsconfig.json`
// unpacked under .data/ with node_modules linked, bundled as build-server.mjs bundles.
// Usage, on a cluster of its own: DATABASE_URL=… BUNDLES=old/main.mjs,new/main.mjs ROUNDS=12
//   node --import tsx server/scripts/bench/ingest-ab.ts
// Prints per round each bundle's push time, the plain INSERT's, their ratio, and the CPU the app
// process spent in the push (from /proc); at the end the medians per bundle and the load average.
import fs from 'node:fs';
import os from 'node:os';
import { startBenchServer, type BenchServer } from './fixture';
import { CLIENT_BATCH_CHANGES } from '../../../shared/schemas/sync';
import { plainInsert, pushAll } from './ingest';

const bundles = process.env.BUNDLES!.split(',');
const rounds = Number(process.env.ROUNDS ?? 6);
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

/** CPU seconds (user + system) a process has used, from /proc. */
function cpuOf(pid: number): number {
  const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  return (Number(fields[11]) + Number(fields[12])) / 100;
}

async function main() {
  const servers: BenchServer[] = [];
  // APP_NODE_OPTIONS (say `--cpu-prof --cpu-prof-dir=…`) goes to the app instances only.
  if (process.env.APP_NODE_OPTIONS) process.env.NODE_OPTIONS = process.env.APP_NODE_OPTIONS;
  for (const bundle of bundles) {
    process.env.SERVER_BUNDLE = bundle;
    servers.push(await startBenchServer(process.env.DATABASE_URL!));
  }
  const ratios: number[][] = bundles.map(() => []);
  const cpu: number[][] = bundles.map(() => []);
  const pushes: number[][] = bundles.map(() => []);
  try {
    // A warm-up round each, not counted.
    for (const s of servers) await pushAll(s, CLIENT_BATCH_CHANGES);
    for (let round = 0; round < rounds; round++) {
      const order = round % 2 ? [...servers.keys()].reverse() : [...servers.keys()];
      const line: string[] = [];
      for (const k of order) {
        const s = servers[k];
        const before = cpuOf(s.app.pid);
        const app = await pushAll(s, CLIENT_BATCH_CHANGES);
        const spent = cpuOf(s.app.pid) - before;
        const plain = await plainInsert(s);
        ratios[k].push(plain / app);
        pushes[k].push(app);
        cpu[k].push(spent);
        line.push(`${k}: push ${app.toFixed(0)} ms (app CPU ${(spent * 1000).toFixed(0)} ms), plain ${plain.toFixed(0)} ms, ratio ${(plain / app).toFixed(2)}`);
      }
      console.log(`round ${round + 1} [load ${os.loadavg()[0].toFixed(1)}]  ${line.join(' | ')}`);
    }
  } finally {
    for (const s of servers) await s.close();
  }
  bundles.forEach((b, k) =>
    console.log(
      `${k} ${b}: median ratio ${median(ratios[k]).toFixed(3)} (${ratios[k].map((r) => r.toFixed(2)).join(' ')}), median push ${median(pushes[k]).toFixed(0)} ms, app CPU ${(median(cpu[k]) * 1000).toFixed(0)} ms per 10,000`,
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
