// Cold start: from spawning an instance's process to its first successful /api/health answer, on
// a database already migrated (as every instance but the first finds it), polled every 5 ms. The
// bundled server (npm run build:server), as deployed, and the TypeScript sources under tsx, as
// `npm start` runs them, alternately; the median of the runs, and the bundle's memory once started.
import fs from 'node:fs';
import type { BenchRow } from './report';
import { startInstance, type BenchServer } from './fixture';

const RUNS = 5;

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function rssMb(pid: number): number {
  const m = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) / 1024 : NaN;
}

export async function runColdStartBench(s: BenchServer): Promise<BenchRow[]> {
  const bundle = process.env.SERVER_BUNDLE!;
  const bundled: number[] = [];
  const sources: number[] = [];
  const rss: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const b = await startInstance(s.databaseUrl, bundle);
    bundled.push(b.startMs);
    rss.push(rssMb(b.pid));
    await b.stop();
    const t = await startInstance(s.databaseUrl, null);
    sources.push(t.startMs);
    await t.stop();
  }
  const fmt = (xs: number[]) => `median ${median(xs).toFixed(0)} ms (${Math.min(...xs).toFixed(0)}–${Math.max(...xs).toFixed(0)} ms over ${xs.length} starts)`;
  const met = median(bundled) <= 1000;
  return [
    {
      section: 'cold start',
      measure: 'process spawned → first health answer, bundled server (dist-server/)',
      value: fmt(bundled),
      goal: `≤ 1 s: ${met ? 'met' : 'NOT met'}`,
    },
    { section: 'cold start', measure: '… from the TypeScript sources (tsx, as npm start)', value: fmt(sources) },
    { section: 'cold start', measure: 'resident memory of the bundled server just started', value: `median ${median(rss).toFixed(0)} MB` },
  ];
}
