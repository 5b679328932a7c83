// The one HTTP client: JSON in and out, same-origin cookies, and failures as a typed ApiError
// carrying the server's message and field errors. Answers that carry an ETag (the review, the
// pull) are kept in memory with it, and asked for again with If-None-Match: an unchanged answer
// comes back as a 304 with no body and the kept copy is used. API answers are no-store, so the
// browser's own cache keeps none of them.
import { errorAnswer, Failure } from '@shared/schemas/error';

/** A failed request as the client holds it; status 0 when there was no answer at all. */
export class ApiError extends Failure {
  /** No answer at all: offline, DNS, server down. */
  get isNetwork() {
    return this.status === 0;
  }
}

/** How many validated answers are kept (a session review is a few hundred kB). */
const KEPT_ANSWERS = 12;
const kept = new Map<string, { etag: string; data: unknown }>();

/** Drops every kept answer (at sign-out: the next person starts with nothing of the last one's). */
export function forgetKeptAnswers() {
  kept.clear();
}

function keep(path: string, etag: string, data: unknown) {
  kept.delete(path);
  kept.set(path, { etag, data });
  if (kept.size > KEPT_ANSWERS) kept.delete(kept.keys().next().value!);
}

export async function api<T>(path: string, init: { method?: string; body?: unknown; signal?: AbortSignal; headers?: Record<string, string> } = {}): Promise<T> {
  const method = init.method ?? 'GET';
  const copy = method === 'GET' ? kept.get(path) : undefined;
  let res: Response;
  try {
    res = await fetch(path, {
      method,
      credentials: 'same-origin',
      signal: init.signal,
      headers: {
        Accept: 'application/json',
        ...(copy ? { 'If-None-Match': copy.etag } : {}),
        ...(init.body !== undefined && !(init.body instanceof FormData) ? { 'Content-Type': 'application/json' } : {}),
        ...init.headers,
      },
      body: init.body === undefined ? undefined : init.body instanceof FormData ? init.body : JSON.stringify(init.body),
    });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'no connection to the server');
  }
  if (res.status === 304 && copy) {
    keep(path, copy.etag, copy.data);
    return copy.data as T;
  }
  const text = await res.text();
  const data = text ? safeJson(text) : undefined;
  if (res.status === 401) forgetKeptAnswers();
  const etag = res.headers.get('ETag');
  if (method === 'GET' && res.ok && etag) keep(path, etag, data);
  if (!res.ok) {
    const answer = errorAnswer.safeParse(data);
    if (!answer.success) throw new ApiError(res.status, 'http', `request failed (${res.status})`);
    const e = answer.data.error;
    throw new ApiError(res.status, e.code, e.message, e.fields);
  }
  return data as T;
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
