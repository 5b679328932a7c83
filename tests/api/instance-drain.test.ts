// An instance behind a load balancer: /api/ready says when it may take traffic, and SIGTERM drains
// it: readiness turns 503 at once while it keeps serving for DRAIN_DELAY_MS, then it takes no new
// connections, finishes the request in flight (a sync batch whose body is still arriving), and
// exits 0 with that batch stored. Runs the real server as a child process.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import { createTeam, TEST_PASSWORD, startTestServer, type TestServer, type TestTeam } from '../support/test-app';
import { vehicleRecord } from '../support/sync';
import { signInCookie, startServerProcess, type ServerProcess } from '../faults/fault-rig';
import { VehicleModel } from '../../server/models';

let ts: TestServer;
let server: ServerProcess;
let team: TestTeam;
let cookie: string;

beforeAll(async () => {
  // The in-process test server only gives this file its models and database connection.
  ts = await startTestServer();
  team = await createTeam('Drain workshop');
  server = await startServerProcess(process.env.DATABASE_URL!, { DRAIN_DELAY_MS: '1500', DRAIN_TIMEOUT_MS: '20000' });
  cookie = await signInCookie(server.baseUrl, team.members.tester.email, TEST_PASSWORD);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  await ts?.close();
});

/** A request on a connection of its own, for a path, with the status and body it gets. */
function get(baseUrl: string, path: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const req = http.get(baseUrl + path, { agent: false }, (res) => {
      let body = '';
      res.on('data', (d) => (body += d));
      res.on('end', () => resolve({ status: res.statusCode!, body }));
    });
    req.on('error', reject);
  });
}

describe('readiness and draining', () => {
  it('is ready once started, with the database and photo store up', async () => {
    const ready = await get(server.baseUrl, '/api/ready');
    expect(ready.status).toBe(200);
    expect(JSON.parse(ready.body)).toMatchObject({ ready: true, database: 'up', photos: 'up' });
  });

  it('on SIGTERM stops being ready, finishes the batch still arriving, then exits 0 and takes no more connections', async () => {
    const vehicle = vehicleRecord();
    const body = JSON.stringify({ idempotencyKey: `drain-${randomUUID()}`, changes: [{ entity: 'vehicle', record: { ...vehicle, version: 1 } }] });
    const url = new URL(`${server.baseUrl}/api/sync/push`);
    // The batch starts: headers and half its body are sent.
    const answer = new Promise<{ status: number; text: string }>((resolve, reject) => {
      const req = http.request(
        url,
        {
          method: 'POST',
          agent: false,
          headers: { Cookie: cookie, Origin: server.baseUrl, 'Content-Type': 'application/json', 'Content-Length': Buffer.byteLength(body) },
        },
        (res) => {
          let text = '';
          res.on('data', (d) => (text += d));
          res.on('end', () => resolve({ status: res.statusCode!, text }));
        },
      );
      req.on('error', reject);
      req.write(body.slice(0, 40));
      setTimeout(() => req.end(body.slice(40)), 3000);
    });
    await new Promise((r) => setTimeout(r, 300));
    const exited = new Promise<number | null>((resolve) => server.child.once('exit', (code) => resolve(code)));
    server.child.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 300));
    // Within the delay it still answers, but tells the load balancer to send nothing more.
    const draining = await get(server.baseUrl, '/api/ready');
    expect(draining.status).toBe(503);
    expect(JSON.parse(draining.body)).toMatchObject({ ready: false, state: 'draining' });
    // After the delay: new connections are refused while the batch is still in flight.
    await new Promise((r) => setTimeout(r, 1500));
    await expect(get(server.baseUrl, '/api/health')).rejects.toThrow(/ECONNREFUSED/);
    expect(server.child.exitCode).toBeNull();
    const { status, text } = await answer;
    expect(status, text).toBe(200);
    expect(await exited).toBe(0);
    expect(await VehicleModel.count({ where: { id: vehicle.id, teamId: team.teamId } })).toBe(1);
  });
});
