// How the two scoring threads share out groups (main/scoring/group-claims.ts).
import { Worker } from 'node:worker_threads';
import { describe, expect, it } from 'vitest';
import { claimNext, createClaims, isClaims } from '../../../main/scoring/group-claims';

describe('group claims', () => {
  it('hands every group out once, in the plan\'s order, then -1', () => {
    for (const groups of [0, 1, 7]) {
      const claims = new Int32Array(createClaims());
      const taken: number[] = [];
      for (let g = claimNext(claims, groups); g >= 0; g = claimNext(claims, groups)) taken.push(g);
      expect(taken).toEqual(Array.from({ length: groups }, (_, k) => k));
      expect(claimNext(claims, groups)).toBe(-1);
    }
  });

  it('never gives one group to both of two threads claiming at once', async () => {
    const groups = 200_000;
    const buffer = createClaims();
    const taken = new Uint8Array(new SharedArrayBuffer(groups));
    const worker = new Worker(
      `const { workerData, parentPort } = require('node:worker_threads');
       const claims = new Int32Array(workerData.buffer);
       const taken = new Uint8Array(workerData.taken);
       let n = 0;
       for (let g = Atomics.add(claims, 0, 1); g < ${groups}; g = Atomics.add(claims, 0, 1)) { Atomics.add(taken, g, 1); n++; }
       parentPort.postMessage(n);`,
      { eval: true, workerData: { buffer, taken: taken.buffer } },
    );
    const claims = new Int32Array(buffer);
    let here = 0;
    for (let g = claimNext(claims, groups); g >= 0; g = claimNext(claims, groups)) {
      Atomics.add(taken, g, 1);
      here++;
    }
    const there = await new Promise<number>((resolve) => worker.once('message', resolve));
    await worker.terminate();
    expect(here + there).toBe(groups);
    expect(taken.every((t) => t === 1)).toBe(true);
  });

  it('recognises only a shared buffer', () => {
    expect(isClaims(createClaims())).toBe(true);
    expect(isClaims(new SharedArrayBuffer(2))).toBe(false);
    expect(isClaims(new ArrayBuffer(4))).toBe(false);
  });
});
