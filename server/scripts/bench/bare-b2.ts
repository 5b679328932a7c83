// B2, the bench's reference for the review and the pull: a bare handler in a process of its own
// (node:http and a plain pg pool of the app's size), running the very statements the app runs —
// PostgreSQL builds the whole JSON — and passing the text through. No Express, no session look-up,
// no access check, no validator query, no logging, no compression: what is left is the least a
// Node process must do to serve these answers, and the app's req/s is measured against it.
//   GET /review/:teamId/:sessionId      the session review (one statement)
//   GET /pull/:teamId/:userId?since=N   the sync pull (its transaction: shared team lock, one statement)
// Prints "b2 listening <port>" when ready.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import pg from 'pg';
import { createSequelize } from '../../db';
import { initModels } from '../../models';
import { reviewSql } from '../../services/review.service';
import { pullSql } from '../../services/pull-answer';

const url = process.env.DATABASE_URL!;
// The statements are written from the models' columns; the models need no connection for that.
initModels(createSequelize(url));
const review = reviewSql();
const pullStatement = pullSql();
const pool = new pg.Pool({ connectionString: url, max: Number(process.env.DB_POOL_MAX ?? 10) });

async function pull(teamId: string, userId: string, since: number): Promise<string> {
  const client = await pool.connect();
  try {
    await client.query('BEGIN');
    await client.query(`SELECT pg_advisory_xact_lock_shared(hashtextextended('twistlog-sync:' || $1, 0))`, [teamId]);
    const { rows } = await client.query<{ body: string }>(pullStatement, [teamId, since, 2000, userId]);
    await client.query('COMMIT');
    return rows[0].body;
  } catch (err) {
    await client.query('ROLLBACK').catch(() => {});
    throw err;
  } finally {
    client.release();
  }
}

const server = http.createServer(async (req, res) => {
  try {
    const u = new URL(req.url!, 'http://b2');
    const [, kind, a, b] = u.pathname.split('/');
    let body: string;
    if (kind === 'review') body = (await pool.query<{ body: string }>(review, [a, b])).rows[0].body;
    else if (kind === 'pull') body = await pull(a, b, Number(u.searchParams.get('since') ?? 0));
    else {
      res.writeHead(404).end();
      return;
    }
    res.writeHead(200, { 'Content-Type': 'application/json; charset=utf-8', 'Content-Length': Buffer.byteLength(body) }).end(body);
  } catch (err) {
    res.writeHead(500).end(String(err));
  }
});
server.keepAliveTimeout = 65_000;
server.listen(0, '127.0.0.1', () => process.stdout.write(`b2 listening ${(server.address() as AddressInfo).port}\n`));
process.on('SIGTERM', () => server.close(() => void pool.end().then(() => process.exit(0))));
