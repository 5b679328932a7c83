// Runs every benchmark against the cluster bench.mjs started: this process sets up data and
// generates load; the app and the bare reference run in processes of their own (fixture.ts).
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderReport, writeReport, type BenchRow } from './report';
import { measureInitialJs } from './bundle';
import { runFlexBench } from '../bench-flex';
import { startBenchServer } from './fixture';
import { runIngestBench } from './ingest';
import { runLoadBench } from './load';
import { runTapBench } from './tap-to-commit';
import { runColdStartBench } from './cold-start';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

async function main() {
  const rows: BenchRow[] = [];
  const clientDir = process.env.CLIENT_DIR ?? path.join(repoRoot, 'dist');

  // BENCH_ONLY=ingest,load (say) runs a part; every part runs by default.
  const only = process.env.BENCH_ONLY?.split(',');
  const wants = (part: string) => !only || only.includes(part);

  if (wants('client')) rows.push(...measureInitialJs(clientDir));

  const flex = wants('envelope') ? await runFlexBench() : { rows: [] };
  for (const r of flex.rows) {
    rows.push({
      section: 'envelope computation',
      measure: `${r.label}, ${r.poses} poses × ${r.gaugePoints} points × 3 axes (${r.readings} readings)`,
      value: `median ${r.medianMs.toFixed(2)} ms over ${r.runs} warm runs (${r.minMs.toFixed(2)}–${r.maxMs.toFixed(2)}); first, cold run ${r.coldMs.toFixed(1)} ms`,
      goal: r.goalMs === null ? undefined : `≤ ${r.goalMs} ms`,
    });
  }

  const server = await startBenchServer(process.env.DATABASE_URL!);
  try {
    if (wants('ingest')) rows.push(...(await runIngestBench(server)));
    if (wants('load')) rows.push(...(await runLoadBench(server)));
    if (wants('tap')) rows.push(...(await runTapBench(server)));
    if (wants('cold')) rows.push(...(await runColdStartBench(server)));
  } finally {
    await server.close();
  }

  const text = renderReport(rows);
  console.log('\n' + text);
  console.log(`written to ${writeReport(repoRoot, text)}`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
