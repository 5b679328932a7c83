// The route table's wiring (mountRoutes): what one request costs before its handler runs.
import { describe, expect, it } from 'vitest';
import express, { Router } from 'express';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import * as z from 'zod';
import { mountRoutes, publicRoute } from './route';

/** One GET through a router holding `routes`, on a loopback port of its own. */
async function get(router: Router, path: string): Promise<{ status: number; body: unknown }> {
  const app = express();
  app.use(router);
  app.use((err: { status?: number; message: string }, _req: express.Request, res: express.Response, _next: express.NextFunction) => {
    res.status(err.status ?? 500).json({ error: err.message });
  });
  const server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  try {
    const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}${path}`);
    return { status: res.status, body: await res.json() };
  } finally {
    await new Promise((resolve) => server.close(resolve));
  }
}

describe('mountRoutes', () => {
  it('parses the params and the query of a route read with the session once a request', async () => {
    const parsed = { params: 0, query: 0 };
    const router = Router();
    mountRoutes(router, [
      publicRoute({
        method: 'get',
        path: '/things/:id',
        access: 'public',
        params: z.object({ id: z.string() }).transform((p) => (parsed.params++, p)),
        query: z.object({ since: z.coerce.number() }).transform((q) => (parsed.query++, q)),
        withSession: ({ params, query }) => ({ name: 'thing-validator', sql: 'SELECT $2::text AS id, $3::int AS since', values: [params.id, query.since] }),
        handler: async ({ params, query }) => ({ id: params.id, since: query.since }),
      }),
    ]);
    const res = await get(router, '/things/a1?since=7');
    expect(res).toEqual({ status: 200, body: { id: 'a1', since: 7 } });
    expect(parsed).toEqual({ params: 1, query: 1 });
  });

  it('still answers 400 naming the field when the params of such a route do not parse', async () => {
    const router = Router();
    mountRoutes(router, [
      publicRoute({
        method: 'get',
        path: '/things/:id',
        access: 'public',
        params: z.object({ id: z.string().regex(/^\d+$/) }),
        withSession: ({ params }) => ({ name: 'thing-validator', sql: 'SELECT $2::text AS id', values: [params.id] }),
        handler: async ({ params }) => ({ id: params.id }),
      }),
    ]);
    const res = await get(router, '/things/abc');
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toMatch(/id/);
  });
});
