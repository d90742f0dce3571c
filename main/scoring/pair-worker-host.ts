// The helper thread's side of parallel scoring (pair-workers.ts): it takes a plan, claims
// groups of its jobs, heaviest first, from the claims it shares with the scoring thread,
// solves them against its own copy of the posterior source and sends the answers back.
import { parentPort } from 'node:worker_threads';
import type { PosteriorSource } from '../../shared/delay/predictive';
import { solveGroup, type PairAnswer } from '../../shared/risk/pair-jobs';
import { claimNext } from './group-claims';
import { checkPairRequest, type JobAnswer, type PairReply, type PairRequest } from './pair-messages';

/** Makes the posterior source a request names; a spec it cannot read throws (or rejects). */
export type SourceFactory = (spec: unknown) => PosteriorSource | Promise<PosteriorSource>;

/** Serves pair requests on this worker thread's parent port until the thread is ended. */
export function servePairRequests(makeSource: SourceFactory): void {
  const port = parentPort;
  if (!port) throw new Error('the pair worker must run as a worker thread');
  // One request at a time, in order: a request waiting for its source does not let a later one start.
  let queue = Promise.resolve();
  port.on('message', (message: unknown) => {
    queue = queue.then(() => answer(message));
  });
  const answer = async (message: unknown): Promise<void> => {
    let reply: PairReply;
    const transfer: ArrayBuffer[] = [];
    try {
      const request = checkPairRequest(message);
      const source = await makeSource(request.source);
      reply = { id: request.id, sourceId: source.info.id, answers: solveClaimed(request, source, transfer) };
    } catch (err) {
      const id = typeof (message as { id?: unknown } | null)?.id === 'number' ? (message as { id: number }).id : -1;
      reply = { id, error: err instanceof Error ? err.message : String(err) };
    }
    port.postMessage(reply, transfer);
  };
}

/** Claims groups until none is left; the answers of the jobs in the groups it solved. */
export function solveClaimed(request: PairRequest, source: PosteriorSource, transfer: ArrayBuffer[] = []): JobAnswer[] {
  const { plan } = request;
  const claims = new Int32Array(request.claims);
  const answers: (PairAnswer | undefined)[] = new Array(plan.jobs.length);
  const out: JobAnswer[] = [];
  for (let g = claimNext(claims, plan.groups.length); g >= 0; g = claimNext(claims, plan.groups.length)) {
    const group = plan.groups[g]!;
    solveGroup(source, plan, group, answers);
    for (const job of group) {
      const answer = answers[job]!;
      out.push({ job, byDraw: answer.byDraw, minLayover: answer.minLayover });
      transfer.push(answer.byDraw.buffer as ArrayBuffer);
    }
  }
  return out;
}
