import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateLoad } from './load-generator';

const BODY = Buffer.alloc(200_000, 'x');

// /whole: the body as declared; /chunked: no Content-Length; /short: Content-Length 200,000 but
// half of it, then the connection closed; /missing: 404; /slow: an answer only after 300 ms;
// /stall: no answer at all.
const server = http.createServer((req, res) => {
  if (req.url === '/whole') res.writeHead(200, { 'Content-Length': BODY.length }).end(BODY);
  else if (req.url === '/chunked') {
    res.writeHead(200);
    res.write(BODY.subarray(0, 1000));
    res.end(BODY.subarray(1000, 3000));
  } else if (req.url === '/short') {
    res.writeHead(200, { 'Content-Length': BODY.length });
    res.write(BODY.subarray(0, BODY.length / 2), () => res.destroy());
  } else if (req.url === '/stall') return;
  else if (req.url === '/slow') setTimeout(() => res.writeHead(200, { 'Content-Length': 2 }).end('ok'), 300);
  else res.writeHead(404, { 'Content-Length': 0 }).end();
});
let base = '';

beforeAll(async () => {
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(() => new Promise<void>((r) => server.close(() => r())));

describe('the bench load generator', () => {
  it('counts whole answers with the expected status and every body byte', async () => {
    const [run] = await generateLoad([{ url: `${base}/whole`, connections: 4 }], { seconds: 0.3, headers: {} });
    expect(run.bad).toBe(0);
    expect(run.rps).toBeGreaterThan(0);
    expect(run.bodyBytes).toBeGreaterThanOrEqual(run.rps * 0.3 * BODY.length);
    expect(run.p99).toBeGreaterThanOrEqual(run.p50);
  });

  it('accepts a chunked answer read to its end', async () => {
    const [run] = await generateLoad([{ url: `${base}/chunked`, connections: 2 }], { seconds: 0.2, headers: {} });
    expect(run.bad).toBe(0);
    expect(run.rps).toBeGreaterThan(0);
  });

  it('counts an answer cut short as failed, never as served', async () => {
    const [run] = await generateLoad([{ url: `${base}/short`, connections: 2 }], { seconds: 0.3, headers: {} });
    expect(run.rps).toBe(0);
    expect(run.bad).toBeGreaterThan(0);
    expect(run.firstFailure).toMatch(/100000 B|aborted/);
  });

  it('counts an unexpected status as failed', async () => {
    const [run] = await generateLoad([{ url: `${base}/missing`, connections: 2 }], { seconds: 0.2, headers: {} });
    expect(run.rps).toBe(0);
    expect(run.bad).toBeGreaterThan(0);
    expect(run.firstFailure).toBe('status 404, expected 200');
  });

  it('counts a request with no answer as a timeout, even when it times out after the round', async () => {
    // undici checks its timeouts about every half second.
    const [run] = await generateLoad([{ url: `${base}/stall`, connections: 1 }], { seconds: 0.2, headers: {}, timeoutMs: 100 });
    expect(run.rps).toBe(0);
    expect(run.firstFailure).toBe('nothing received for 100 ms');
  });

  it('measures latency from the request to the last byte', async () => {
    const [run] = await generateLoad([{ url: `${base}/slow`, connections: 2 }], { seconds: 0.7, headers: {} });
    expect(run.bad).toBe(0);
    expect(run.p50).toBeGreaterThanOrEqual(300);
    expect(run.p50).toBeLessThan(400);
  });
});
