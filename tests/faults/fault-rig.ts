// A rig for fault tests: a PostgreSQL cluster of its own (so stopping it never disturbs other
// tests), the real server as a child process (so it can be killed), a team with a tester signed
// in, and a Node transport for the field client's sync run.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { ApiError } from '@/lib/api-client';
import { pullResponse, type PushRequest, type PushResponse } from '@shared/schemas/sync';
import type { SyncTransport } from '@/features/sync/api/transport';
import { ensureDatabase, startCluster, stopClusterNow, type Cluster } from '../../server/scripts/system.mjs';
import { repoRoot } from '../support/test-app';
import { freePort } from '../../server/scripts/bench/fixture';

export { freePort };

export async function startPrivateCluster(name: string): Promise<{ cluster: Cluster; url: string; restart(): Promise<void>; crash(): void }> {
  const port = await freePort();
  let cluster = await startCluster({ dataDir: path.join(repoRoot, '.data', `pg-${name}-${port}`), port, fresh: true });
  ensureDatabase(cluster, 'twistlog_fault');
  return {
    get cluster() {
      return cluster;
    },
    url: cluster.url('twistlog_fault'),
    crash: () => stopClusterNow(cluster),
    async restart() {
      cluster = await startCluster({ dataDir: cluster.dir, port: cluster.port });
    },
  };
}

export interface ServerProcess {
  baseUrl: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/**
 * The real server as a child process on a free port: from its TypeScript sources, or from a bundle
 * (`bundle`: a main.mjs built by server/scripts/build-server.mjs).
 */
export async function startServerProcess(databaseUrl: string, env: Record<string, string> = {}, bundle?: string): Promise<ServerProcess> {
  const port = await freePort();
  const child = spawn(process.execPath, bundle ? [bundle] : ['--import', 'tsx', 'server/main.ts'], {
    cwd: repoRoot,
    env: { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent', DATABASE_URL: databaseUrl, PORT: String(port), SMTP_PORT: String(await freePort()), ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (d) => (output += d));
  child.stderr!.on('data', (d) => (output += d));
  const baseUrl = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited during start-up:\n${output}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) throw new Error(`server did not start within 60 s:\n${output}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    baseUrl,
    child,
    async stop() {
      if (child.exitCode !== null || child.signalCode) return;
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await exited;
    },
  };
}

export async function waitForHealth(baseUrl: string, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) return;
    } catch {
      // retry
    }
    if (Date.now() > deadline) throw new Error('server not healthy in time');
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function signInCookie(baseUrl: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: baseUrl },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  const cookie = res.headers.getSetCookie().find((c) => c.startsWith('twistlog_session='));
  if (!cookie) throw new Error('no session cookie');
  return cookie.split(';')[0];
}

async function call<T>(baseUrl: string, cookie: string, pathAndQuery: string, body?: unknown): Promise<T> {
  let res: Response;
  try {
    res = await fetch(baseUrl + pathAndQuery, {
      method: body === undefined ? 'GET' : 'POST',
      headers: { Cookie: cookie, Origin: baseUrl, ...(body === undefined ? {} : { 'Content-Type': 'application/json' }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    throw new ApiError(0, 'network', 'no connection to the server');
  }
  const data = await res.json().catch(() => undefined);
  if (!res.ok) throw new ApiError(res.status, data?.error?.code ?? 'http', data?.error?.message ?? `HTTP ${res.status}`, data?.error?.fields ?? []);
  return data as T;
}

/** The field client's transport, over Node's fetch with a session cookie. */
export function nodeTransport(
  baseUrl: string,
  cookie: string,
  hooks: { beforePush?: (req: PushRequest, n: number) => void | Promise<void> } = {},
): SyncTransport & { pushes: number } {
  const t = {
    pushes: 0,
    async push(req: PushRequest) {
      t.pushes += 1;
      const sending = call<PushResponse>(baseUrl, cookie, '/api/sync/push', req);
      await hooks.beforePush?.(req, t.pushes);
      return sending;
    },
    async pull(since: number) {
      return pullResponse.parse(await call(baseUrl, cookie, `/api/sync/pull?since=${since}`));
    },
    async uploadPhoto(form: FormData) {
      let res: Response;
      try {
        res = await fetch(`${baseUrl}/api/photos`, { method: 'POST', headers: { Cookie: cookie, Origin: baseUrl, Accept: 'application/json' }, body: form });
      } catch {
        throw new ApiError(0, 'network', 'no connection to the server');
      }
      const data = await res.json().catch(() => undefined);
      if (!res.ok) throw new ApiError(res.status, data?.error?.code ?? 'http', data?.error?.message ?? `HTTP ${res.status}`, data?.error?.fields ?? []);
    },
  };
  return t;
}
