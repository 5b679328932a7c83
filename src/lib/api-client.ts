// The one HTTP client: JSON in and out, same-origin cookies, and failures as a typed ApiError
// carrying the server's message and field errors.
import type { FieldError } from '@shared/schemas/common';

export type { FieldError };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldError[] = [],
  ) {
    super(message);
  }
  /** No answer at all: offline, DNS, server down. */
  get isNetwork() {
    return this.status === 0;
  }
}

export async function api<T>(path: string, init: { method?: string; body?: unknown; signal?: AbortSignal; headers?: Record<string, string> } = {}): Promise<T> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: init.method ?? 'GET',
      credentials: 'same-origin',
      signal: init.signal,
      headers: {
        Accept: 'application/json',
        ...(init.body !== undefined && !(init.body instanceof FormData) ? { 'Content-Type': 'application/json' } : {}),
        ...init.headers,
      },
      body: init.body === undefined ? undefined : init.body instanceof FormData ? init.body : JSON.stringify(init.body),
    });
  } catch (err) {
    if ((err as Error).name === 'AbortError') throw err;
    throw new ApiError(0, 'network', 'no connection to the server');
  }
  const text = await res.text();
  const data = text ? safeJson(text) : undefined;
  if (!res.ok) {
    const e = (data as { error?: { code?: string; message?: string; fields?: FieldError[] } } | undefined)?.error;
    throw new ApiError(res.status, e?.code ?? 'http', e?.message ?? `request failed (${res.status})`, e?.fields ?? []);
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
