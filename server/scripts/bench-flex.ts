/**
 * Benchmark of the flex computation: designEnvelope on a synthetic session of 200 poses × 12 gauge
 * points × 3 axes, then 10× and 100× as many poses. The work per pose is constant (two small QR
 * fits and a closed-form perimeter worst), so time should grow linearly with the poses.
 *
 * Run: npx tsx server/scripts/bench-flex.ts
 * A wider bench script imports runFlexBench() and prints or stores its rows.
 */
import { pathToFileURL } from 'node:url';
import { buildSyntheticSession, designEnvelope, type EnvelopeInput } from '../../shared/flex/index';

export interface FlexBenchRow {
  poses: number;
  gaugePoints: number;
  readings: number;
  ms: number;
  usPerReading: number;
}

const BASE_POSES = 200;
const GAUGE_POINTS = 12;
const SCALES = [1, 10, 100];

function benchInput(poses: number): EnvelopeInput {
  const session = buildSyntheticSession({ poses, gaugePoints: GAUGE_POINTS, seed: 2026, mode: 'gap' });
  return {
    tracks: session.tracks,
    gaugePoints: session.gaugePoints,
    outline: session.outline,
    readingMode: 'gap',
    baselinePoseId: session.baselinePoseId,
    poses: session.poses,
    parameters: { designTwistDeg: 20 },
  };
}

export async function runFlexBench(): Promise<{ rows: FlexBenchRow[] }> {
  const rows: FlexBenchRow[] = [];
  // One small warm-up run so the first row does not carry the JIT's start-up cost.
  designEnvelope(benchInput(20));
  for (const scale of SCALES) {
    const poses = BASE_POSES * scale;
    const input = benchInput(poses);
    const readings = input.poses.reduce((sum, pose) => sum + pose.readings.length, 0);
    const started = performance.now();
    designEnvelope(input);
    const ms = performance.now() - started;
    rows.push({ poses, gaugePoints: GAUGE_POINTS, readings, ms, usPerReading: (ms * 1000) / readings });
    // Let other work (a wider bench, the event loop) run between sizes.
    await new Promise((resolve) => setImmediate(resolve));
  }
  return { rows };
}

function printTable(rows: FlexBenchRow[]): void {
  const header = ['poses', 'gauge points', 'readings', 'ms', 'µs/reading'];
  const lines = rows.map((r) => [String(r.poses), String(r.gaugePoints), String(r.readings), r.ms.toFixed(1), r.usPerReading.toFixed(2)]);
  const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)));
  const format = (cells: string[]): string => cells.map((c, i) => c.padStart(widths[i])).join('  ');
  console.log('designEnvelope (prediction method, gap readings, 1 baseline pose included)');
  console.log(format(header));
  for (const line of lines) console.log(format(line));
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { rows } = await runFlexBench();
  printTable(rows);
}
