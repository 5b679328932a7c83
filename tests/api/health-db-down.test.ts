// /api/health when PostgreSQL cannot be reached: 503 with "database down", whether or not the
// caller carries a session cookie (the session look-up needs the database too, and must not turn
// the answer into a 500). The app here is bound to an address where no database listens.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import net from 'node:net';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { pino } from 'pino';
import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { initModels } from '../../server/models';
import { createApp } from '../../server/app';

let server: http.Server;
let sequelize: Sequelize;

/** A loopback port nobody listens on (taken, then released). */
async function deadPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', r));
  const { port } = s.address() as AddressInfo;
  await new Promise((r) => s.close(r));
  return port;
}

beforeAll(async () => {
  sequelize = createSequelize(`postgres://postgres@127.0.0.1:${await deadPort()}/nowhere`, 2);
  initModels(sequelize);
  server = http.createServer(createApp({ logger: pino({ level: 'silent' }) }));
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
});
afterAll(async () => {
  await new Promise((r) => server?.close(r));
  await sequelize?.close();
});

describe('/api/health with the database down', () => {
  it('answers 503 without a cookie', async () => {
    const res = await request(server).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body).toMatchObject({ ok: false, database: 'down' });
  });

  it('answers 503 with a session cookie too', async () => {
    const res = await request(server).get('/api/health').set('Cookie', 'twistlog_session=abcdefghijklmnopqrstuvwxyz234567');
    expect(res.status).toBe(503);
    expect(res.body).toMatchObject({ ok: false, database: 'down' });
  });

  it('answers other routes 503 (not 500) while the database is unreachable', async () => {
    const res = await request(server).get('/api/me').set('Cookie', 'twistlog_session=abcdefghijklmnopqrstuvwxyz234567');
    expect(res.status).toBe(503);
    expect(res.headers['retry-after']).toBeDefined();
  });
});
