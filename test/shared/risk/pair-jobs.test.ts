// The connection work as jobs (shared/risk/pair-jobs.ts): planned by route pair and grouped by
// connecting airport, with answers that do not depend on which groups are solved together or
// in what order, so that any thread can solve any group. The answers themselves are checked
// against references in connection-probability.test.ts and score-trips.test.ts.
import { describe, expect, it } from 'vitest';
import { answerAt, groupJobs, solveGroup, solvePlan, type PairAnswer, type PairJob } from '../../../shared/risk/pair-jobs';
import { assembleScoring, prepareScoring, scoreTrips, simulateScoring } from '../../../shared/risk/score-trips';
import { findAirport } from '../../../shared/time/airports';
import { groupTrips } from '../../fixtures/risk/group-trips';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';
import { makeTrip, parsedOf } from '../../fixtures/risk/trips';

const options = { countryOf: (code: string) => findAirport(code)?.country, simulations: 500, seed: 3 };

describe('the plan of a scoring run', () => {
  const parsed = groupTrips(60);
  const { plan } = prepareScoring(parsed, syntheticSource(), options);

  it('has one job per scored route pair, with its distinct slacks in ascending order', () => {
    // The MCT of each connection (with any transfer allowance) as the scored output gives it.
    const pairs = new Map<string, Set<number>>();
    for (const trip of scoreTrips(parsed, syntheticSource(), options).trips) {
      trip.connections.forEach((c) => {
        if (!c.scored) return;
        const a = trip.legs[c.inboundLeg]!;
        const b = trip.legs[c.inboundLeg + 1]!;
        const key = `${a.from}-${a.to}>${b.from}-${b.to}`;
        if (!pairs.has(key)) pairs.set(key, new Set());
        pairs.get(key)!.add(c.layoverMinutes - c.mctMinutes);
      });
    }
    expect(plan.jobs.length).toBe(pairs.size);
    for (const job of plan.jobs) {
      const key = `${job.inbound.origin}-${job.inbound.destination}>${job.outbound.origin}-${job.outbound.destination}`;
      expect([...job.slacks]).toEqual([...pairs.get(key)!].sort((x, y) => x - y));
      expect(job.slacks.length).toBe(new Set(job.slacks).size);
    }
    // The stopover's pair (ORD-LGA after MSN-ORD two days earlier) is not scored, so no job.
    expect(plan.jobs.some((j) => j.inbound.origin === 'MSN' && j.outbound.destination === 'LGA')).toBe(false);
  });

  it('groups every job once, by the airport its connections are made at, heaviest first', () => {
    const all = plan.groups.flat().sort((x, y) => x - y);
    expect(all).toEqual(plan.jobs.map((_, k) => k));
    for (const group of plan.groups) expect(new Set(group.map((k) => plan.jobs[k]!.inbound.destination)).size).toBe(1);
    const airports = plan.groups.map((g) => plan.jobs[g[0]!]!.inbound.destination);
    expect(new Set(airports).size).toBe(airports.length);
    // The three hubs, with ten arrival routes each, outweigh the gateways and the airport change.
    expect(new Set(airports.slice(0, 3))).toEqual(new Set(['ORD', 'DEN', 'ATL']));
    expect(airports).toContain('LGA');
  });

  it('weighs a group by its routes and passes, and breaks ties by airport', () => {
    const job = (from: string, at: string, to: string, slacks: number[]): PairJob => ({ inbound: { origin: from, destination: at }, outbound: { origin: at, destination: to }, slacks, mctMinutes: 45 });
    const jobs = [job('MSN', 'ORD', 'JFK', [10]), job('DSM', 'DEN', 'JFK', [10]), job('OMA', 'DEN', 'BOS', [10, 20]), job('ICT', 'ATL', 'JFK', [10])];
    const at = (k: number) => jobs[k]!.inbound.destination;
    expect(groupJobs(jobs, at)).toEqual([[1, 2], [3], [0]]);
    expect(groupJobs([], at)).toEqual([]);
  });
});

describe('solving the plan', () => {
  const source = syntheticSource();
  const parsed = groupTrips(60);
  const prepared = prepareScoring(parsed, source, options);
  const { plan } = prepared;
  const reference = solvePlan(source, plan);

  const same = (answers: readonly (PairAnswer | undefined)[]) => {
    for (let k = 0; k < plan.jobs.length; k++) {
      expect(Array.from(answers[k]!.byDraw)).toEqual(Array.from(reference[k]!.byDraw));
      expect(answers[k]!.minLayover).toBe(reference[k]!.minLayover);
    }
  };

  it('gives the same answers, bit for bit, whatever the order of the groups and a fresh source', () => {
    const answers: (PairAnswer | undefined)[] = [];
    for (const group of [...plan.groups].reverse()) solveGroup(syntheticSource(), plan, group, answers);
    same(answers);
  });

  it('gives the same answers when each job is solved alone, with no tables shared', () => {
    const answers: (PairAnswer | undefined)[] = [];
    for (let k = plan.jobs.length - 1; k >= 0; k--) solveGroup(syntheticSource(), plan, [k], answers);
    same(answers);
  });

  it('hands a group\'s table memory back even when the group fails, and the next answers are unchanged', () => {
    // A source that fails on one route once it has tabulated others: the group stops midway.
    const failing = syntheticSource();
    const route = failing.route.bind(failing);
    const bad = plan.jobs[plan.groups[0]!.at(-1)!]!.outbound;
    failing.route = (origin, destination, kind) => {
      if (origin === bad.origin && destination === bad.destination && kind === 'departure') throw new Error('no such route');
      return route(origin, destination, kind);
    };
    expect(() => solveGroup(failing, plan, plan.groups[0]!, [])).toThrow(/no such route/);
    const answers: (PairAnswer | undefined)[] = [];
    for (const group of plan.groups) solveGroup(source, plan, group, answers);
    same(answers);
  });

  it('assembles into scoreTrips\'s result from answers solved in any order', () => {
    const answers: (PairAnswer | undefined)[] = [];
    for (const group of [...plan.groups].reverse()) solveGroup(source, plan, group, answers);
    const assembled = assembleScoring(prepared, answers as PairAnswer[], simulateScoring(prepared));
    expect(JSON.stringify(assembled)).toBe(JSON.stringify(scoreTrips(parsed, syntheticSource(), options)));
  });

  it('holds P(make) by draw at each slack, and the minimum layover reaches the target', () => {
    const k = plan.groups[0]![0]!;
    const job = plan.jobs[k]!;
    const byDraw = answerAt(plan, k, reference[k]!, job.slacks[0]!);
    expect(byDraw.length).toBe(plan.draws);
    for (const p of byDraw) expect(p >= 0 && p <= 1).toBe(true);
    expect(Number.isInteger(reference[k]!.minLayover)).toBe(true);
    expect(() => answerAt(plan, k, reference[k]!, 100000)).toThrow(/not one of the job's/);
  });

  it('refuses to assemble a run with an answer missing', () => {
    const answers = [...reference];
    answers[plan.groups[0]![0]!] = undefined as unknown as PairAnswer;
    expect(() => assembleScoring(prepared, answers, simulateScoring(prepared))).toThrow(/lost the answer/);
  });

  it('plans nothing for trips whose only connection is a stopover', () => {
    const stopover = makeTrip('Ines Okafor', 'visit', '', [
      { flight: 'QX1', from: 'ORD', to: 'DEN', depart: '2026-05-08T10:00', arrive: '2026-05-08T12:30' },
      { flight: 'QX2', from: 'DEN', to: 'SFO', depart: '2026-05-10T10:00', arrive: '2026-05-10T12:00' },
    ]);
    const empty = prepareScoring(parsedOf([stopover]), source, options).plan;
    expect(empty.jobs).toEqual([]);
    expect(empty.groups).toEqual([]);
  });
});
