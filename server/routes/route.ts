// The route table's entry type. Every route declares who may call it (`access`) and the zod
// schemas of its inputs; `mountRoutes` wires validation and the access check for each, so a
// test can walk the same table.
import type { Request, RequestHandler, Response, Router } from 'express';
import type { ZodError, ZodType } from 'zod';
import { can, refusal, roles, rolesThatCan, type Action } from '../../shared/permissions';
import type { AuthContext } from '../auth/context';
import { Forbidden, Invalid, Unauthenticated } from '../http/errors';
import { loadAuthWith } from '../auth/context';
import type { CompanionQuery, SessionCompanion } from '../http/validator';
import { DEFAULT_BODY_LIMIT, jsonBody } from '../http/json-body';
import { fastCompression } from '../http/compress';

export type Access = 'public' | 'signedIn' | Action;
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

export interface HandlerInput<B, P, Q, A> {
  req: Request;
  res: Response;
  auth: A;
  body: B;
  params: P;
  query: Q;
  /** The route's validator query with the row read with the session (RouteDef.withSession). */
  companion?: SessionCompanion;
}

export interface RouteDef<B = unknown, P = unknown, Q = unknown> {
  method: Method;
  path: string;
  access: Access;
  body?: ZodType<B>;
  params?: ZodType<P>;
  query?: ZodType<Q>;
  /** Middleware that must run before validation (e.g. a multipart parser). */
  before?: RequestHandler[];
  /**
   * 'fast': the answer is compressed at the fastest settings (http/compress.ts), for large answers
   * of mostly random bytes that a route sends often (the push answer).
   */
  compression?: 'fast';
  /** Largest JSON body in bytes (default 64 kB, DEFAULT_BODY_LIMIT); only bulk routes raise it. */
  bodyLimit?: number;
  /** false: the route never looks at the session (health must answer even when sessions cannot be read). */
  session?: false;
  /**
   * A large answer's validator query, read in the same statement as the session: one round trip
   * for both on every request (http/validator.ts SessionCompanion). The handler gets it, with the
   * row read, as `companion`. It runs only for a person whose role the route's access lets in.
   */
  withSession?: (input: { params: P; query: Q }) => CompanionQuery;
  /** Returns the JSON body to send; a handler that writes the response itself returns undefined. */
  handler: (input: HandlerInput<B, P, Q, AuthContext>) => Promise<unknown>;
}

export interface PublicRouteDef<B = unknown, P = unknown, Q = unknown> extends Omit<RouteDef<B, P, Q>, 'handler' | 'access'> {
  access: 'public';
  handler: (input: HandlerInput<B, P, Q, AuthContext | undefined>) => Promise<unknown>;
}

// The route table holds routes of every body, params and query type; each was checked where it was declared.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type AnyRoute = RouteDef<any, any, any> | PublicRouteDef<any, any, any>;

/** Typed helpers: inference of body/params/query from the schemas given. */
export const route = <B, P, Q>(def: RouteDef<B, P, Q>): AnyRoute => def as AnyRoute;
export const publicRoute = <B, P, Q>(def: PublicRouteDef<B, P, Q>): AnyRoute => def as AnyRoute;

type Parsed<T> = { success: true; data: T } | { success: false; error: ZodError };

/** A request's params and query, each parsed once whoever asks first (the validator query or the handler). */
const urlInputs = new WeakMap<Request, { params: Parsed<unknown>; query: Parsed<unknown> }>();

function safeParse<T>(schema: ZodType<T> | undefined, value: unknown): Parsed<T> {
  return schema ? schema.safeParse(value ?? {}) : { success: true, data: value as T };
}

function parsedUrl(def: AnyRoute, req: Request) {
  let inputs = urlInputs.get(req);
  if (!inputs) urlInputs.set(req, (inputs = { params: safeParse(def.params, req.params), query: safeParse(def.query, req.query) }));
  return inputs;
}

function parsed<T>(where: string, r: Parsed<T>): T {
  if (!r.success) throw Invalid.fromZod(where, r.error);
  return r.data;
}

/** The validator query for a request whose params and query parse (else none: the route answers 400 after its access check). */
function companionFor(def: AnyRoute) {
  const withSession = def.withSession;
  if (!withSession) return undefined;
  const allowed = def.access === 'public' || def.access === 'signedIn' ? roles : rolesThatCan(def.access);
  return (req: Request): SessionCompanion | undefined => {
    const { params, query } = parsedUrl(def, req);
    return params.success && query.success ? { ...withSession({ params: params.data, query: query.data }), roles: allowed } : undefined;
  };
}

export function accessCheck(access: Access, auth: AuthContext | undefined): void {
  if (access === 'public') return;
  if (!auth) throw new Unauthenticated();
  if (access === 'signedIn') return;
  if (!can(auth.role, access)) throw new Forbidden(refusal(access));
}

export function mountRoutes(router: Router, routes: AnyRoute[]) {
  for (const def of routes) {
    const run: RequestHandler = async (req, res) => {
      accessCheck(def.access, req.auth);
      const input = {
        req,
        res,
        auth: req.auth,
        body: parsed('body', safeParse(def.body, req.body)),
        params: parsed('params', parsedUrl(def, req).params),
        query: parsed('query', parsedUrl(def, req).query),
        companion: req.sessionCompanion,
      };
      const result = await (def.handler as (i: typeof input) => Promise<unknown>)(input);
      if (result !== undefined && !res.headersSent) res.json(result);
    };
    // The access check runs before any body is read (JSON or an upload), so a caller without the
    // right never costs a parse and never gets a file written.
    const guard: RequestHandler = (req, _res, next) => {
      accessCheck(def.access, req.auth);
      next();
    };
    const session = def.session === false ? [] : [loadAuthWith(companionFor(def))];
    const body = def.method === 'get' ? [] : [jsonBody(def.bodyLimit ?? DEFAULT_BODY_LIMIT)];
    const compress = def.compression === 'fast' ? [fastCompression()] : [];
    router[def.method](def.path, ...compress, ...session, guard, ...body, ...(def.before ?? []), run);
  }
}
