// Initial JavaScript of the built client, gzipped: the entry script plus every chunk the HTML
// preloads. Chunks loaded on demand (charts, PDF, review) are not counted.
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
  const lazy = fs.readdirSync(path.join(clientDir, 'assets')).filter((f) => f.startsWith('lazy-') && f.endsWith('.js'));
  return [
    { section: 'client', measure: `initial JS (${srcs.length} files), gzipped`, value: `${(gz / 1000).toFixed(1)} kB (raw ${(raw / 1000).toFixed(1)} kB)`, goal: '≤ 170 kB' },
    { section: 'client', measure: 'chunks loaded on demand', value: String(lazy.length) },
  ];
}
