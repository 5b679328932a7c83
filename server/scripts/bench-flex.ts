/**
 * Benchmark of the flex computation: designEnvelope on a synthetic session of 200 poses × 12 gauge
 * points × 3 axes (prediction method), then 10× and 100× as many poses, and the tolerance method on
 * 200 repeated runs of one pose. Each figure is the median of 20 warm runs, with the spread
 * (fastest–slowest) beside it; the first, cold run of each size is printed apart. Warm means after
 * up to 50 unmeasured runs (at most 2 s of them): V8 compiles the hot functions with its optimising
 * compiler in the background after some dozens of calls, later still on a machine whose cores are
 * busy, and until then a run takes several times as long as in a tab or a server that has been
 * computing envelopes for a while (the case the goals are about).
 *
 * Run: npx tsx server/scripts/bench-flex.ts
 * A wider bench script imports runFlexBench() and prints or stores its rows.
 */
import os from 'node:os';
import { pathToFileURL } from 'node:url';
import { buildSyntheticSession, designEnvelope, syntheticEnvelopeInput, type EnvelopeInput } from '../../shared/flex/index';

export interface FlexBenchRow {
  label: string;
  poses: number;
  gaugePoints: number;
  readings: number;
  coldMs: number;
  medianMs: number;
  minMs: number;
  maxMs: number;
  runs: number;
  goalMs: number | null;
}

const GAUGE_POINTS = 12;
const WARM_UP_RUNS = 50;
const WARM_UP_MS = 2000;
const RUNS = 20;

function predictionInput(poses: number): EnvelopeInput {
  return syntheticEnvelopeInput(buildSyntheticSession({ poses, gaugePoints: GAUGE_POINTS, seed: 2026, mode: 'gap' }), { designTwistDeg: 20 }, 'gap');
}

/** Repeated runs of one diagonal pose (the same lifts each time, fresh reading noise). */
function toleranceInput(runs: number): EnvelopeInput {
  // The same twist every run (repeats of one pose), fresh reading noise and 5 % scatter of the response.
  const session = buildSyntheticSession({
    twistsDeg: Array.from({ length: runs }, () => 16),
    gaugePoints: GAUGE_POINTS,
    seed: 2027,
    mode: 'gap',
    proportionalScatter: 0.05,
  });
  return syntheticEnvelopeInput(session, { designTwistDeg: 20, method: 'tolerance' }, 'gap');
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid] : 0.5 * (sorted[mid - 1] + sorted[mid]);
}

async function measure(label: string, input: EnvelopeInput, goalMs: number | null, runs = RUNS): Promise<FlexBenchRow> {
  const readings = input.poses.reduce((sum, pose) => sum + pose.readings.length, 0);
  let started = performance.now();
  designEnvelope(input);
  const coldMs = performance.now() - started;
  const warming = performance.now();
  for (let i = 0; i < WARM_UP_RUNS && performance.now() - warming < WARM_UP_MS; i++) designEnvelope(input);
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    started = performance.now();
    designEnvelope(input);
    times.push(performance.now() - started);
    // Let other work (a wider bench, the event loop) run between runs.
    await new Promise((resolve) => setImmediate(resolve));
  }
  return {
    label,
    poses: input.poses.length - 1,
    gaugePoints: GAUGE_POINTS,
    readings,
    coldMs,
    medianMs: median(times),
    minMs: Math.min(...times),
    maxMs: Math.max(...times),
    runs,
    goalMs,
  };
}

export async function runFlexBench(): Promise<{ rows: FlexBenchRow[] }> {
  const rows: FlexBenchRow[] = [];
  rows.push(await measure('prediction', predictionInput(200), 2));
  rows.push(await measure('tolerance (repeated runs)', toleranceInput(200), 5));
  rows.push(await measure('prediction', predictionInput(2000), null));
  rows.push(await measure('prediction', predictionInput(20000), null, 5));
  return { rows };
}

function printTable(rows: FlexBenchRow[]): void {
  const header = ['method', 'poses', 'readings', 'cold ms', 'warm median ms', 'fastest–slowest', 'runs', 'goal'];
  const lines = rows.map((r) => [
    r.label,
    String(r.poses),
    String(r.readings),
    r.coldMs.toFixed(2),
    r.medianMs.toFixed(2),
    `${r.minMs.toFixed(2)}–${r.maxMs.toFixed(2)}`,
    String(r.runs),
    r.goalMs === null ? '' : `≤ ${r.goalMs} ms`,
  ]);
  const widths = header.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i].length)));
  const format = (cells: string[]): string => cells.map((c, i) => c.padStart(widths[i])).join('  ');
  console.log(`designEnvelope, gap readings, ${GAUGE_POINTS} gauge points × 3 axes, 1 baseline pose included`);
  console.log(format(header));
  for (const line of lines) console.log(format(line));
  // Other work on the machine stretches every figure: say how busy it was.
  const load = os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(' / ');
  console.log(`load average ${load} (1 / 5 / 15 min) on ${os.cpus().length} cores`);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { rows } = await runFlexBench();
  printTable(rows);
}
