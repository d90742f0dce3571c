// The connection work of a scoring run, as jobs that need nothing but the posterior source: for
// each pair of routes that some connection joins, P(make) by joint draw at each of its slacks
// and the minimum layover. Jobs come in groups whose route tables overlap (the connections at
// one airport), so that a group can be solved anywhere, by this thread or by another, without
// tabulating a route twice; the answers are the same wherever a group is solved.
import type { PosteriorSource } from '../delay/predictive';
import { ConnectionPair, minimumLayover } from './connection-probability';
import { RouteTables } from './delay-table';
import { TableStore } from './table-store';

/** One pair of routes: the inbound leg's arrivals and the outbound leg's departures. */
export interface PairJob {
  readonly inbound: { readonly origin: string; readonly destination: string };
  readonly outbound: { readonly origin: string; readonly destination: string };
  /** The slacks (layover - MCT, whole minutes) of its connections: distinct, ascending. */
  readonly slacks: readonly number[];
  readonly mctMinutes: number;
}

/** What a scoring run hands out: its jobs, grouped, and the settings every job shares. */
export interface PairPlan {
  readonly draws: number;
  readonly target: number;
  readonly jobs: readonly PairJob[];
  /** Job indices by group, the heaviest group first (the order to hand them out in). */
  readonly groups: readonly (readonly number[])[];
}

/** One job's answer: P(make) by draw at slacks[k] in byDraw[k * draws, (k + 1) * draws). */
export interface PairAnswer {
  readonly byDraw: Float64Array;
  /** Null when no layover up to the longest reaches the target. */
  readonly minLayover: number | null;
}

/**
 * Groups jobs by the airport where their connections are made (`airportOf(k)` of job k), each group's
 * weight an estimate of its work: a route table per distinct route and kind, and a pass per
 * slack and minimum-layover search. Heaviest first; ties by airport, so the plan is stable.
 */
export function groupJobs(jobs: readonly PairJob[], airportOf: (job: number) => string): (readonly number[])[] {
  const byAirport = new Map<string, number[]>();
  jobs.forEach((job, k) => {
    const airport = airportOf(k);
    let group = byAirport.get(airport);
    if (!group) byAirport.set(airport, (group = []));
    group.push(k);
  });
  const weighed = [...byAirport].map(([airport, group]) => {
    const routes = new Set<string>();
    let passes = 0;
    for (const k of group) {
      const job = jobs[k]!;
      routes.add(`${job.inbound.origin}-${job.inbound.destination}:a`);
      routes.add(`${job.outbound.origin}-${job.outbound.destination}:d`);
      passes += job.slacks.length / 2 + MIN_LAYOVER_PASSES;
    }
    return { airport, group, weight: routes.size * TABLE_PASSES + passes };
  });
  weighed.sort((a, b) => b.weight - a.weight || (a.airport < b.airport ? -1 : a.airport > b.airport ? 1 : 0));
  return weighed.map((w) => w.group);
}

/**
 * Rough costs in all-draw quadrature passes, estimated from profiles of the risk benchmark: a
 * route's tables, a minimum-layover search. Only the order of the groups depends on them.
 */
const TABLE_PASSES = 6;
const MIN_LAYOVER_PASSES = 2;

/**
 * The memory of a group's route tables, handed back when the group is solved and reused by the
 * next (this thread solves one group at a time, synchronously).
 */
const groupTables = new TableStore(true);

/**
 * Solves the jobs of one group against the source, with route tables built once for the group.
 * Every job's answer depends only on its own routes, slacks, MCT and the plan's settings. The
 * tables live only while the group is solved: the answers are copies, and the tables' memory
 * goes back to groupTables.
 */
export function solveGroup(source: PosteriorSource, plan: PairPlan, group: readonly number[], answers: (PairAnswer | undefined)[]): void {
  const tables = new Map<string, RouteTables>();
  const tablesOf = (origin: string, destination: string, kind: 'arrival' | 'departure'): RouteTables => {
    const key = `${origin}-${destination}:${kind}`;
    let t = tables.get(key);
    if (!t) tables.set(key, (t = new RouteTables(source.route(origin, destination, kind), plan.draws, groupTables)));
    return t;
  };
  try {
    for (const k of group) {
      const job = plan.jobs[k]!;
      const pair = new ConnectionPair(tablesOf(job.inbound.origin, job.inbound.destination, 'arrival'), tablesOf(job.outbound.origin, job.outbound.destination, 'departure'));
      pair.prepare(job.slacks);
      const byDraw = new Float64Array(job.slacks.length * plan.draws);
      job.slacks.forEach((slack, i) => byDraw.set(pair.drawProbabilities(slack), i * plan.draws));
      answers[k] = { byDraw, minLayover: minimumLayover(pair, job.mctMinutes, plan.target) };
    }
  } finally {
    tables.clear();
    groupTables.reset();
  }
}

/** Solves every group in turn (one thread). */
export function solvePlan(source: PosteriorSource, plan: PairPlan): PairAnswer[] {
  const answers: (PairAnswer | undefined)[] = new Array(plan.jobs.length);
  for (const group of plan.groups) solveGroup(source, plan, group, answers);
  return answers as PairAnswer[];
}

/** P(make) by draw of a job's answer at one of its slacks (a view, not a copy). */
export function answerAt(plan: PairPlan, job: number, answer: PairAnswer, slack: number): Float64Array {
  const k = plan.jobs[job]!.slacks.findIndex((s) => Object.is(s, slack));
  if (k < 0) throw new RangeError(`slack ${slack} is not one of the job's`);
  return answer.byDraw.subarray(k * plan.draws, (k + 1) * plan.draws);
}
