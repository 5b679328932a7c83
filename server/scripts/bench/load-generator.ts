// The bench's load generator: a fixed number of keep-alive connections per target, each sending
// its next GET as soon as the last answer has come in whole, for a set time. It reads what a server
// sends only to count it: no body is decoded, kept or parsed, so its CPU a request stays small
// whatever the answer's size, and the machine's cores go to what is measured. (autocannon, the
// generator before it, decoded every body chunk to a string and appended it to the answer, 50
// connections in one thread: on the large plain answers its garbage collection made much of the
// latency it reported.) Every answer is still checked: its status, and its full length — as many
// body bytes as its Content-Length, or the closing chunk of a chunked one; a short answer, a
// connection error or a timeout is counted as failed, never as served.
// Node's own HTTP client (llhttp, the parser of its server) and latency histograms from
// hdr-histogram-js.
import http from 'node:http';
import * as hdr from 'hdr-histogram-js';

export interface LoadTarget {
  url: string;
  connections: number;
}

export interface LoadOptions {
  seconds: number;
  headers: Record<string, string>;
  /** The status every answer must have (200, or 304 for a revalidation). */
  status?: number;
  /** A request whose connection stays silent this long is counted as a timeout and its connection closed. */
  timeoutMs?: number;
}

export interface TargetRun {
  /** Whole answers with the expected status that came in during the round, per second. */
  rps: number;
  /** Latency of those answers, from the request's start to the last body byte, in ms. */
  p50: number;
  p99: number;
  /** Wrong status, short body, connection error or timeout. */
  bad: number;
  /** The first failure seen, to say what went wrong. */
  firstFailure: string | null;
  /** Body bytes received (as sent, before any decoding). */
  bodyBytes: number;
}

/** Why an answer is not counted as served, or null when it came in whole with the expected status. */
export function answerFailure(
  expectedStatus: number,
  res: { statusCode?: number; headers: http.IncomingHttpHeaders; complete: boolean },
  bodyBytes: number,
): string | null {
  if (res.statusCode !== expectedStatus) return `status ${res.statusCode}, expected ${expectedStatus}`;
  // Without a Content-Length the body is chunked (or ends with the connection): the parser marks
  // it complete only once its end has been read.
  if (!res.complete) return `body cut short after ${bodyBytes} B`;
  const declared = res.headers['content-length'];
  if (declared !== undefined && Number(declared) !== bodyBytes) return `body of ${bodyBytes} B, Content-Length ${declared}`;
  return null;
}

/** Loads one target for `seconds`: `connections` loops, each one request at a time. */
async function loadTarget(target: LoadTarget, opts: LoadOptions, until: number): Promise<TargetRun> {
  const url = new URL(target.url);
  const agent = new http.Agent({ keepAlive: true, maxSockets: target.connections });
  const request: http.RequestOptions = {
    host: url.hostname,
    port: url.port,
    path: url.pathname + url.search,
    method: 'GET',
    headers: opts.headers,
    agent,
  };
  const expected = opts.status ?? 200;
  const timeoutMs = opts.timeoutMs ?? 10_000;
  // Microseconds, up to a minute; resized beyond that rather than clipped.
  const latency = hdr.build({ lowestDiscernibleValue: 1, highestTrackableValue: 60_000_000, numberOfSignificantValueDigits: 3 });
  let served = 0;
  let bad = 0;
  let bodyBytes = 0;
  let firstFailure: string | null = null;

  const once = () =>
    new Promise<void>((resolve) => {
      const t0 = performance.now();
      let bytes = 0;
      let settled = false;
      const settle = (failure: string | null) => {
        if (settled) return;
        settled = true;
        const t1 = performance.now();
        // An answer that ends after the round has ended is not counted either way.
        if (t1 <= until) {
          if (failure === null) {
            served++;
            latency.recordValue(Math.max(1, Math.round((t1 - t0) * 1000)));
          } else {
            bad++;
            firstFailure ??= failure;
          }
        }
        resolve();
      };
      const req = http.request(request, (res) => {
        res.on('data', (chunk: Buffer) => {
          bytes += chunk.length;
          bodyBytes += chunk.length;
        });
        res.on('end', () => settle(answerFailure(expected, res, bytes)));
        // A connection closed mid-body ('aborted', then 'error' or 'close' without 'end').
        res.on('error', (err) => settle(`${err.message} after ${bytes} B`));
        res.on('close', () => settle(answerFailure(expected, res, bytes)));
      });
      req.setTimeout(timeoutMs, () => {
        settle(`nothing received for ${timeoutMs} ms`);
        req.destroy();
      });
      req.on('error', (err) => settle(err.message));
      req.end();
    });

  const connection = async () => {
    while (performance.now() < until) await once();
  };
  try {
    await Promise.all(Array.from({ length: target.connections }, connection));
  } finally {
    agent.destroy();
  }
  return {
    rps: served / opts.seconds,
    p50: latency.getValueAtPercentile(50) / 1000,
    p99: latency.getValueAtPercentile(99) / 1000,
    bad,
    firstFailure,
    bodyBytes,
  };
}

/** Loads every target at once for `opts.seconds`; one result per target, in their order. */
export function generateLoad(targets: LoadTarget[], opts: LoadOptions): Promise<TargetRun[]> {
  const until = performance.now() + opts.seconds * 1000;
  return Promise.all(targets.map((t) => loadTarget(t, opts, until)));
}
