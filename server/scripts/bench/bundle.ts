// Initial JavaScript of the built client, gzipped: the entry script plus every chunk the HTML
// preloads. Chunks loaded on demand (pages, charts) are listed apart.
import fs from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import type { BenchRow } from './report';

export function measureInitialJs(clientDir: string): BenchRow[] {
  const html = fs.readFileSync(path.join(clientDir, 'index.html'), 'utf8');
  const srcs = [...html.matchAll(/<(?:script[^>]+src|link[^>]+rel="modulepreload"[^>]+href)="([^"]+\.js)"/g)].map((m) => m[1]);
  let raw = 0;
  let gz = 0;
  for (const src of new Set(srcs)) {
    const buf = fs.readFileSync(path.join(clientDir, src.replace(/^\//, '')));
    raw += buf.length;
    gz += gzipSync(buf, { level: 9 }).length;
  }
  const all = fs.readdirSync(path.join(clientDir, 'assets')).filter((f) => f.endsWith('.js'));
  const initial = new Set([...srcs].map((src) => path.basename(src)));
  const onDemand = all.filter((f) => !initial.has(f));
  const notPrecached = onDemand.filter((f) => f.startsWith('lazy-'));
  const gzKb = (files: string[]) =>
    (files.reduce((sum, f) => sum + gzipSync(fs.readFileSync(path.join(clientDir, 'assets', f)), { level: 9 }).length, 0) / 1000).toFixed(1);
  return [
    {
      section: 'client',
      measure: `initial JS (${initial.size} files), gzipped`,
      value: `${(gz / 1000).toFixed(1)} kB (raw ${(raw / 1000).toFixed(1)} kB)`,
      goal: '≤ 170 kB',
    },
    {
      section: 'client',
      measure: 'JS loaded on demand: pages (precached for offline)',
      value: `${onDemand.length - notPrecached.length} chunks, ${gzKb(onDemand.filter((f) => !f.startsWith('lazy-')))} kB gzipped`,
    },
    { section: 'client', measure: 'JS loaded on demand: charts (not precached)', value: `${notPrecached.length} chunk, ${gzKb(notPrecached)} kB gzipped` },
  ];
}
