// The comparison's computation, in a worker thread: fitting every pose of several long sessions
// takes hundreds of milliseconds, which on the request thread would stall every other request
// (health checks, syncing phones) for as long. compare.service.ts loads the sessions and sends them here.
import { parentPort } from 'node:worker_threads';
import { FlexInputError, poseSummaries } from '../../shared/flex';
import { computeDeskEnvelope } from '../../shared/desk-envelope';
import { DEFAULT_DRAFT_PARAMS } from '../../shared/schemas/envelope';
import type { getSessionDetail } from './sessions.service';

type SessionDetail = Awaited<ReturnType<typeof getSessionDetail>>;

export type { SessionDetail };

export interface CompareJob {
  id: number;
  details: SessionDetail[];
}

export type SessionSummary = { poses: ReturnType<typeof poseSummaries> } | { inputError: string };

export type CompareAnswer = { id: number; summaries: SessionSummary[] } | { id: number; error: string };

function summarise(detail: SessionDetail): SessionSummary {
  try {
    // Pose results (twist, fit, perimeter worst) do not depend on the design parameters; the
    // defaults only satisfy the computation's input.
    return { poses: poseSummaries(computeDeskEnvelope(detail, DEFAULT_DRAFT_PARAMS).result) };
  } catch (error) {
    if (error instanceof FlexInputError) return { inputError: error.message };
    throw error;
  }
}

parentPort?.on('message', (job: CompareJob) => {
  let answer: CompareAnswer;
  try {
    answer = { id: job.id, summaries: job.details.map(summarise) };
  } catch (error) {
    answer = { id: job.id, error: String((error as Error)?.stack ?? error) };
  }
  parentPort!.postMessage(answer);
});
