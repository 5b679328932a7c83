// The server under test: the real app on the real PostgreSQL that `npm test` started
// (DATABASE_URL), listening on a free loopback port, with supertest agents that carry cookies
// and this host's Origin like a browser would. Each test server has its own SMTP sink on a free
// loopback port (the mailer is pointed at it, e-mailed links at the server) and serves the
// development mailbox at /dev/mailbox; `ts.mail` holds what it caught.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import { pino, type Logger } from 'pino';
import request from 'supertest';
import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { initModels, MembershipModel, TeamModel, UserModel } from '../../server/models';
import { migrate } from '../../server/migrate';
import { createApp } from '../../server/app';
import { hashPassword, startSession } from '../../server/auth/lucia';
import { configureMailer } from '../../server/mail/mailer';
import { startMailSink, type MailSink } from '../../server/mail/sink';
import { createMailboxRouter } from '../../server/mail/mailbox';
import { setAppUrl } from '../../server/mail/templates';
import { lifecycle } from '../../server/http/lifecycle';
import type { Role } from '../../shared/schemas';

export const repoRoot = path.resolve(import.meta.dirname, '../..');
/** The client build `npm test` made for this run. */
export const clientDir = process.env.CLIENT_DIR ?? path.join(repoRoot, 'dist');

export interface TestServer {
  sequelize: Sequelize;
  server: http.Server;
  baseUrl: string;
  origin: string;
  /** The SMTP sink this server's e-mail goes to: `ts.mail.messages`, `ts.mail.waitFor(…)`. */
  mail: MailSink;
  close(): Promise<void>;
}

export interface TestServerOptions {
  clientDir?: string;
  /** Express 'trust proxy' (default 'false', as in production without TRUST_PROXY). */
  trustProxy?: string;
  /** Port of the SMTP sink: 0 (default) picks a free one, so test files never collide. */
  smtpPort?: number;
  /** The app's logger (default: silent). */
  logger?: Logger;
}

// Note: models are bound to the Sequelize of the last test server started in a file; start a
// second one only if it lives as long as the first (close both at the end).

export async function startTestServer(opts: TestServerOptions = {}): Promise<TestServer> {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error('DATABASE_URL is not set: run the tests with `npm test`, which starts PostgreSQL');
  const sequelize = createSequelize(url, 10);
  initModels(sequelize);
  await migrate(sequelize);
  const mail = await startMailSink({ port: opts.smtpPort ?? 0 });
  configureMailer({ host: '127.0.0.1', port: mail.port, secure: false, from: 'Twistlog <no-reply@twistlog.invalid>' });
  const app = createApp({
    logger: opts.logger ?? pino({ level: 'silent' }),
    clientDir: opts.clientDir,
    trustProxy: opts.trustProxy,
    extraRouters: [createMailboxRouter(mail)],
  });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  const baseUrl = `http://127.0.0.1:${port}`;
  setAppUrl(baseUrl);
  lifecycle.markReady();
  return {
    sequelize,
    server,
    baseUrl,
    origin: baseUrl,
    mail,
    async close() {
      server.closeAllConnections?.();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await mail.close();
      await sequelize.close();
    },
  };
}

export type Agent = ReturnType<typeof request.agent>;

/** A browser-like client: keeps cookies and sends this server's Origin on every request. */
export function agentFor(ts: TestServer): Agent {
  const agent = request.agent(ts.server);
  agent.set('Origin', ts.origin);
  return agent;
}

export const TEST_PASSWORD = 'correct horse battery staple';
let passwordHash: Promise<string> | undefined;

export interface TestTeam {
  teamId: string;
  members: Record<Role, { userId: string; email: string }>;
}

/** A fresh team with one member of each role (each test builds its own data). */
export async function createTeam(name = 'Test workshop'): Promise<TestTeam> {
  passwordHash ??= hashPassword(TEST_PASSWORD);
  const hash = await passwordHash;
  const teamId = randomUUID();
  await TeamModel.create({ id: teamId, name });
  const members = {} as TestTeam['members'];
  for (const role of ['admin', 'engineer', 'tester', 'viewer'] as const) {
    const userId = randomUUID();
    const email = `${role}-${userId.slice(0, 8)}@workshop.test`;
    await UserModel.create({ id: userId, email, name: `${role} ${userId.slice(0, 4)}`, passwordHash: hash });
    await MembershipModel.create({ id: randomUUID(), teamId, userId, role });
    members[role] = { userId, email };
  }
  return { teamId, members };
}

export async function signedInAgent(ts: TestServer, email: string): Promise<Agent> {
  const agent = agentFor(ts);
  const res = await agent.post('/api/auth/sign-in').send({ email, password: TEST_PASSWORD });
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/**
 * An agent signed in without going through /api/auth/sign-in (no password check, no throttle):
 * for tests that need many sessions, like the access matrix.
 */
export async function sessionAgent(ts: TestServer, userId: string, teamId: string): Promise<Agent> {
  const agent = agentFor(ts);
  const cookie = await startSession(userId, teamId);
  agent.jar.setCookie(cookie.split(';')[0], '127.0.0.1', '/');
  return agent;
}
