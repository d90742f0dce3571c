// The messages between the scoring thread and a pair worker (pair-workers.ts,
// pair-worker-host.ts), checked on arrival on both sides: a thread built from another version
// or a corrupted message fails with a message, not with wrong numbers.
import type { PairAnswer, PairPlan } from '../../shared/risk/pair-jobs';
import { isClaims } from './group-claims';

export interface PairRequest {
  readonly id: number;
  /** What the worker's source factory makes the posterior source from. */
  readonly source: unknown;
  readonly plan: PairPlan;
  /** The claims both threads take groups by (group-claims.ts). */
  readonly claims: SharedArrayBuffer;
}

/** One job's answer as it travels: the job's index in the plan, then its PairAnswer. */
export interface JobAnswer extends PairAnswer {
  readonly job: number;
}

export type PairReply =
  | { readonly id: number; readonly sourceId: string; readonly answers: readonly JobAnswer[] }
  | { readonly id: number; readonly error: string };

function fail(what: string): never {
  throw new TypeError(`bad pair request: ${what}`);
}

const isRoute = (r: unknown) => typeof r === 'object' && r !== null && typeof (r as { origin?: unknown }).origin === 'string' && typeof (r as { destination?: unknown }).destination === 'string';

export function checkPairRequest(message: unknown): PairRequest {
  if (typeof message !== 'object' || message === null) fail('not an object');
  const m = message as Partial<PairRequest>;
  if (!Number.isInteger(m.id)) fail('id');
  if (!isClaims(m.claims)) fail('claims');
  const plan = m.plan as Partial<PairPlan> | undefined;
  if (!plan || !Number.isInteger(plan.draws) || plan.draws! < 1 || !(plan.target! > 0 && plan.target! < 1)) fail('plan settings');
  if (!Array.isArray(plan.jobs) || !Array.isArray(plan.groups)) fail('plan jobs');
  for (const job of plan.jobs!) {
    if (!isRoute(job?.inbound) || !isRoute(job?.outbound) || !Number.isInteger(job.mctMinutes) || !Array.isArray(job.slacks) || !job.slacks.every((s: unknown) => typeof s === 'number')) fail('a job');
  }
  const count = plan.jobs!.length;
  for (const group of plan.groups!) if (!Array.isArray(group) || !group.every((k) => Number.isInteger(k) && k >= 0 && k < count)) fail('a group');
  return m as PairRequest;
}

export function checkPairReply(message: unknown, plan: PairPlan): PairReply {
  if (typeof message !== 'object' || message === null) throw new TypeError('bad pair reply: not an object');
  const m = message as { id?: unknown; error?: unknown; answers?: unknown };
  if (!Number.isInteger(m.id)) throw new TypeError('bad pair reply: id');
  if (typeof m.error === 'string') return m as PairReply;
  if (typeof (m as { sourceId?: unknown }).sourceId !== 'string') throw new TypeError('bad pair reply: source id');
  if (!Array.isArray(m.answers)) throw new TypeError('bad pair reply: answers');
  for (const a of m.answers as { job?: unknown; byDraw?: unknown; minLayover?: unknown }[]) {
    const job = a?.job;
    if (!Number.isInteger(job) || (job as number) < 0 || (job as number) >= plan.jobs.length) throw new TypeError('bad pair reply: job');
    const length = plan.jobs[job as number]!.slacks.length * plan.draws;
    if (!(a.byDraw instanceof Float64Array) || a.byDraw.length !== length) throw new TypeError('bad pair reply: P(make) by draw');
    if (a.minLayover !== null && !Number.isInteger(a.minLayover)) throw new TypeError('bad pair reply: minimum layover');
  }
  return m as PairReply;
}
