// The one HTTP client's validators: an answer with an ETag is kept and asked for again with
// If-None-Match; a 304 gives back the kept copy; another path, a POST, a sign-out or a 401 never
// reuse it.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { api, forgetKeptAnswers } from './api-client';

const json = (body: unknown, init: ResponseInit = {}) =>
  new Response(JSON.stringify(body), { status: 200, headers: { 'Content-Type': 'application/json', ...(init.headers ?? {}) }, ...init });
const sentHeaders = (call: unknown[]) => (call[1] as RequestInit).headers as Record<string, string>;

let fetchMock: ReturnType<typeof vi.fn>;
beforeEach(() => {
  forgetKeptAnswers();
  fetchMock = vi.fn();
  vi.stubGlobal('fetch', fetchMock);
});
afterEach(() => vi.unstubAllGlobals());

describe('api client validators', () => {
  it('sends If-None-Match with the kept ETag and answers a 304 from the kept copy', async () => {
    fetchMock.mockResolvedValueOnce(json({ readings: [1, 2, 3] }, { headers: { ETag: 'W/"review.41.2.9"' } }));
    fetchMock.mockResolvedValueOnce(new Response(null, { status: 304, headers: { ETag: 'W/"review.41.2.9"' } }));
    const first = await api<{ readings: number[] }>('/api/sessions/s1/review');
    const second = await api<{ readings: number[] }>('/api/sessions/s1/review');
    expect(sentHeaders(fetchMock.mock.calls[0])['If-None-Match']).toBeUndefined();
    expect(sentHeaders(fetchMock.mock.calls[1])['If-None-Match']).toBe('W/"review.41.2.9"');
    expect(second).toEqual({ readings: [1, 2, 3] });
    expect(second).toBe(first);
  });

  it('replaces the kept copy when the answer changed', async () => {
    fetchMock.mockResolvedValueOnce(json({ v: 1 }, { headers: { ETag: 'W/"a"' } }));
    fetchMock.mockResolvedValueOnce(json({ v: 2 }, { headers: { ETag: 'W/"b"' } }));
    fetchMock.mockResolvedValueOnce(new Response(null, { status: 304 }));
    await api('/api/x');
    expect(await api('/api/x')).toEqual({ v: 2 });
    expect(await api('/api/x')).toEqual({ v: 2 });
    expect(sentHeaders(fetchMock.mock.calls[2])['If-None-Match']).toBe('W/"b"');
  });

  it('keeps nothing for answers without an ETag, for other paths, or for POSTs', async () => {
    fetchMock.mockImplementation(async () => json({ ok: true }));
    await api('/api/plain');
    await api('/api/plain');
    await api('/api/plain', { method: 'POST', body: {} });
    for (const call of fetchMock.mock.calls) expect(sentHeaders(call)['If-None-Match']).toBeUndefined();
  });

  it('forgets every kept answer at sign-out and on a 401', async () => {
    fetchMock.mockResolvedValueOnce(json({ v: 1 }, { headers: { ETag: 'W/"a"' } }));
    await api('/api/x');
    forgetKeptAnswers();
    fetchMock.mockResolvedValueOnce(json({ v: 1 }, { headers: { ETag: 'W/"a"' } }));
    await api('/api/x');
    expect(sentHeaders(fetchMock.mock.calls[1])['If-None-Match']).toBeUndefined();
    fetchMock.mockResolvedValueOnce(json({ error: { code: 'unauthenticated', message: 'sign in first' } }, { status: 401 }));
    await expect(api('/api/x')).rejects.toMatchObject({ status: 401 });
    fetchMock.mockResolvedValueOnce(json({ v: 1 }));
    await api('/api/x');
    expect(sentHeaders(fetchMock.mock.calls[3])['If-None-Match']).toBeUndefined();
  });
});
