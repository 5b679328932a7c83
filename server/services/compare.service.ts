// Comparison across sessions and vehicles (brief step 9): per session the twist reached, the worst
// perimeter displacement per axis and the slope in mm per degree of twist, from the readings in use
// now (excluded readings left out), with compareSessions of shared/flex.
//
// The input is bounded (at most 12 sessions by the query schema, and MAX_COMPARE_READINGS readings
// in all), and the fitting runs in a worker thread (compare-worker.ts), one comparison at a time
// with a short queue, so the request thread keeps answering everyone else meanwhile.
import { Worker } from 'node:worker_threads';
import { runsBundled } from '../paths';
import { QueryTypes } from 'sequelize';
import type { AuthContext } from '../auth/context';
import { Invalid, Unavailable } from '../http/errors';
import { VehicleModel } from '../models';
import { compareSessions } from '../../shared/flex';
import type { ComparedSession } from '../../shared/schemas/envelope';
import { getSessionDetail } from './sessions.service';
import type { CompareAnswer, CompareJob, SessionSummary } from './compare-worker';

/** Most readings one comparison reads (12 long sessions of 64 points × 3 axes × 10 poses). */
export const MAX_COMPARE_READINGS = 25_000;
/** Comparisons that may wait for the worker before a request is asked to come back. */
const MAX_QUEUED = 4;

let worker: Worker | null = null;
let nextId = 1;
const waiting = new Map<number, { resolve: (s: SessionSummary[]) => void; reject: (e: Error) => void }>();

function failAll(err: Error) {
  for (const w of waiting.values()) w.reject(err);
  waiting.clear();
  worker = null;
}

function theWorker(): Worker {
  if (worker) return worker;
  // From the TypeScript sources (tsx, tests) ts-worker.mjs gives the worker the same loader; the
  // bundled server has the worker bundled beside it (server/scripts/build-server.mjs).
  const w = runsBundled
    ? new Worker(new URL('./compare-worker.mjs', import.meta.url))
    : new Worker(new URL('./ts-worker.mjs', import.meta.url), { workerData: { entry: new URL('./compare-worker.ts', import.meta.url).href } });
  w.unref();
  w.on('message', (answer: CompareAnswer) => {
    const job = waiting.get(answer.id);
    if (!job) return;
    waiting.delete(answer.id);
    if ('error' in answer) job.reject(new Error(`comparison failed in its worker: ${answer.error}`));
    else job.resolve(answer.summaries);
  });
  w.on('error', (err) => failAll(err));
  w.on('exit', (code) => failAll(new Error(`the comparison worker stopped (exit code ${code})`)));
  worker = w;
  return w;
}

function summariseInWorker(details: CompareJob['details']): Promise<SessionSummary[]> {
  if (waiting.size >= MAX_QUEUED) throw new Unavailable('the server is busy with other comparisons: try again in a moment', 5);
  const id = nextId++;
  return new Promise((resolve, reject) => {
    waiting.set(id, { resolve, reject });
    theWorker().postMessage({ id, details } satisfies CompareJob);
  });
}

/** Refuses a comparison that would read too many readings, before any is loaded. */
async function checkSize(teamId: string, sessionIds: string[]) {
  const [{ n }] = await VehicleModel.sequelize!.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM readings r JOIN poses p ON p.id = r.pose_id
     WHERE r.team_id = $1 AND p.session_id = ANY($2::uuid[]) AND r.deleted_at IS NULL AND p.deleted_at IS NULL`,
    { bind: [teamId, sessionIds], type: QueryTypes.SELECT },
  );
  if (n > MAX_COMPARE_READINGS) {
    throw new Invalid(`these sessions hold ${n} readings, more than ${MAX_COMPARE_READINGS} compared at once: compare fewer sessions`, [
      { field: 'query.sessionIds', message: `more than ${MAX_COMPARE_READINGS} readings in all` },
    ]);
  }
}

export async function compare(auth: Pick<AuthContext, 'teamId'>, sessionIds: string[]): Promise<ComparedSession[]> {
  const unique = [...new Set(sessionIds)];
  await checkSize(auth.teamId, unique);
  const details = await Promise.all(unique.map((id) => getSessionDetail(auth, id)));
  const summaries = await summariseInWorker(details);
  const rows = details.map((detail, i) => {
    const s = summaries[i];
    if ('inputError' in s) {
      throw new Invalid(`session "${detail.session.title || detail.session.testedOn}" of ${detail.vehicle.name} cannot be compared: ${s.inputError}`);
    }
    return { detail, poses: s.poses };
  });
  const compared = compareSessions(rows.map(({ detail, poses }) => ({ sessionId: detail.session.id, vehicleId: detail.vehicle.id, poses })));
  return compared.map((c, i) => {
    const { detail } = rows[i];
    return {
      sessionId: c.sessionId,
      vehicleId: detail.vehicle.id,
      vehicleName: detail.vehicle.name,
      title: detail.session.title,
      testedOn: detail.session.testedOn,
      poseCount: c.poseCount,
      twistReachedDeg: c.twistReachedDeg,
      worstMm: c.worstMm,
      slopeMmPerDeg: c.slopeMmPerDeg,
    };
  });
}
