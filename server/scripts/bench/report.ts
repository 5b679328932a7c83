// Collects benchmark rows and prints them as one Markdown table (also written to a file).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

export interface BenchRow {
  section: string;
  measure: string;
  value: string;
  goal?: string;
}

export function renderReport(rows: BenchRow[]): string {
  const header =
    `# Twistlog benchmark\n\nRun ${new Date().toISOString()} on ${os.cpus().length} × ${os.cpus()[0]?.model ?? 'CPU'}, ` +
    `${Math.round(os.totalmem() / 2 ** 30)} GiB, Node ${process.version}; load average at the end ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' / ')} ` +
    `(1 / 5 / 15 min: anything above the core count means other work shared the machine).\n\n`;
  const lines = ['| section | measure | value | goal |', '| --- | --- | --- | --- |'];
  for (const r of rows) lines.push(`| ${r.section} | ${r.measure} | ${r.value} | ${r.goal ?? ''} |`);
  return header + lines.join('\n') + '\n';
}

export function writeReport(repoRoot: string, text: string): string {
  const dir = path.join(repoRoot, 'bench-results');
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, 'latest.md');
  fs.writeFileSync(file, text);
  return file;
}
