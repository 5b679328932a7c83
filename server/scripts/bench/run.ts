// Runs every benchmark in one process against the cluster bench.mjs started.
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { renderReport, writeReport, type BenchRow } from './report';
import { measureInitialJs } from './bundle';
import { runFlexBench } from '../bench-flex';

const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

async function main() {
  const rows: BenchRow[] = [];
  const clientDir = process.env.CLIENT_DIR ?? path.join(repoRoot, 'dist');

  rows.push(...measureInitialJs(clientDir));

  const flex = await runFlexBench();
  for (const r of flex.rows) {
    rows.push({
      section: 'envelope computation',
      measure: `${r.poses} poses × ${r.gaugePoints} points × 3 axes (${r.readings} readings)`,
      value: `${r.ms.toFixed(0)} ms (${r.usPerReading.toFixed(2)} µs/reading)`,
    });
  }

  const text = renderReport(rows);
  console.log('\n' + text);
  console.log(`written to ${writeReport(repoRoot, text)}`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
