// The bench's load generator: a fixed number of keep-alive connections per target, each sending
// its next GET as soon as the last answer has come in whole, for a set time. It reads what a server
// sends only to count it: no body is decoded, kept or parsed, so its CPU a request stays small
// whatever the answer's size, and the machine's cores go to what is measured. (autocannon, the
// generator before it, decoded every body chunk to a string and appended it to the answer, 50
// connections in one thread: on the large plain answers its garbage collection made much of the
// latency it reported.) Every answer is still checked: its status, and its full length — as many
// body bytes as its Content-Length, or a chunked body read to its closing chunk; a short answer, a
// connection error or a timeout is counted as failed, never as served.
// undici's pool (one connection a client, no pipelining) driven through its dispatch interface,
// which hands over each body chunk as a Buffer with no stream in between; latency histograms from
// hdr-histogram-js.
import type { IncomingHttpHeaders } from 'node:http';
import * as hdr from 'hdr-histogram-js';
import { Pool, errors } from 'undici';

export interface LoadTarget {
  url: string;
  connections: number;
}

export interface LoadOptions {
  seconds: number;
  headers: Record<string, string>;
  /** The status every answer must have (200, or 304 for a revalidation). */
  status?: number;
  /** A request whose answer's headers, or next body bytes, take longer than this is counted as a timeout. */
  timeoutMs?: number;
}

export interface TargetRun {
  /** Whole answers with the expected status that came in during the round, per second. */
  rps: number;
  /** Latency of those answers, from the request's start to the last body byte, in ms. */
  p50: number;
  p99: number;
  /** Wrong status, short body, connection error or timeout (also after the round, for a request sent in it). */
  bad: number;
  /** The first failure seen, to say what went wrong. */
  firstFailure: string | null;
  /** Body bytes received (as sent, before any decoding). */
  bodyBytes: number;
}

/**
 * Why an answer that came to its end (as HTTP frames it) is not counted as served, or null when
 * it has the expected status and as many body bytes as it declared.
 */
export function answerFailure(expectedStatus: number, status: number, headers: IncomingHttpHeaders, bodyBytes: number): string | null {
  if (status !== expectedStatus) return `status ${status}, expected ${expectedStatus}`;
  const declared = headers['content-length'];
  if (declared !== undefined && Number(declared) !== bodyBytes) return `body of ${bodyBytes} B, Content-Length ${declared}`;
  return null;
}

/** Loads one target until `until`: `connections` loops, each one request at a time. */
async function loadTarget(target: LoadTarget, opts: LoadOptions, until: number): Promise<TargetRun> {
  const url = new URL(target.url);
  const timeoutMs = opts.timeoutMs ?? 10_000;
  const pool = new Pool(url.origin, { connections: target.connections, pipelining: 1, headersTimeout: timeoutMs, bodyTimeout: timeoutMs });
  const path = url.pathname + url.search;
  const expected = opts.status ?? 200;
  // Microseconds, up to a minute; resized beyond that rather than clipped.
  const latency = hdr.build({ lowestDiscernibleValue: 1, highestTrackableValue: 60_000_000, numberOfSignificantValueDigits: 3 });
  let served = 0;
  let bad = 0;
  let bodyBytes = 0;
  let firstFailure: string | null = null;

  const once = () =>
    new Promise<void>((resolve) => {
      const t0 = performance.now();
      let status = 0;
      let headers: IncomingHttpHeaders = {};
      let bytes = 0;
      const settle = (failure: string | null) => {
        const t1 = performance.now();
        if (failure !== null) {
          bad++;
          firstFailure ??= failure;
        } else if (t1 <= until) {
          // A whole answer that ends after the round has ended is not counted as served in it.
          served++;
          latency.recordValue(Math.max(1, Math.round((t1 - t0) * 1000)));
        }
        resolve();
      };
      pool.dispatch(
        { method: 'GET', path, headers: opts.headers },
        {
          // Its presence is what marks this handler as one of undici's current interface.
          onRequestStart() {},
          onResponseStart(_controller, statusCode, responseHeaders) {
            status = statusCode;
            headers = responseHeaders;
          },
          onResponseData(_controller, chunk) {
            bytes += chunk.length;
            bodyBytes += chunk.length;
          },
          // Called once the parser has read the whole message (Content-Length bytes, or the closing chunk).
          onResponseEnd() {
            settle(answerFailure(expected, status, headers, bytes));
          },
          // A connection closed mid-answer, a length mismatch undici saw itself, or a timeout.
          onResponseError(_controller, err) {
            const timedOut = err instanceof errors.HeadersTimeoutError || err instanceof errors.BodyTimeoutError;
            settle(timedOut ? `nothing received for ${timeoutMs} ms` : `${err.message} after ${bytes} B`);
          },
        },
      );
    });

  const connection = async () => {
    while (performance.now() < until) await once();
  };
  try {
    await Promise.all(Array.from({ length: target.connections }, connection));
  } finally {
    await pool.destroy();
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
