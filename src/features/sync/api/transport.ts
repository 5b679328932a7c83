// The sync module's only network calls: push a batch, pull a page, upload a photo (XHR, for its
// progress events). Screens never call these; the sync engine does.
import { ApiError, api } from '@/lib/api-client';
import { pullResponse, type PullResponse, type PushRequest, type PushResponse } from '@shared/schemas/sync';

export interface SyncTransport {
  push(batch: PushRequest): Promise<PushResponse>;
  pull(since: number): Promise<PullResponse>;
  uploadPhoto(form: FormData, onProgress: (loaded: number, total: number) => void): Promise<void>;
}

export const httpTransport: SyncTransport = {
  push: (batch) => api<PushResponse>('/api/sync/push', { method: 'POST', body: batch }),
  async pull(since) {
    const data = await api<unknown>(`/api/sync/pull?since=${since}`);
    const parsed = pullResponse.safeParse(data);
    if (!parsed.success) throw new ApiError(502, 'bad_pull', `the server's changes did not match the contract: ${parsed.error.issues[0].path.join('.')}`);
    return parsed.data;
  },
  uploadPhoto(form, onProgress) {
    return new Promise((resolve, reject) => {
      const xhr = new XMLHttpRequest();
      xhr.open('POST', '/api/photos');
      xhr.withCredentials = true;
      xhr.setRequestHeader('Accept', 'application/json');
      xhr.upload.onprogress = (e) => onProgress(e.loaded, e.lengthComputable ? e.total : 0);
      xhr.onerror = () => reject(new ApiError(0, 'network', 'no connection to the server'));
      xhr.onload = () => {
        if (xhr.status >= 200 && xhr.status < 300) return resolve();
        let body: { error?: { code?: string; message?: string; fields?: { field: string; message: string }[] } } = {};
        try {
          body = JSON.parse(xhr.responseText);
        } catch {
          // not JSON: keep the status alone
        }
        reject(new ApiError(xhr.status, body.error?.code ?? 'http', body.error?.message ?? `upload failed (${xhr.status})`, body.error?.fields ?? []));
      };
      xhr.send(form);
    });
  },
};
