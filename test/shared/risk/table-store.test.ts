// The route tables' memory (shared/risk/table-store.ts): zeroed views, disjoint, and, in a
// recycling store, the same memory handed out again after reset, zeroed again.
import { describe, expect, it } from 'vitest';
import { TableStore } from '../../../shared/risk/table-store';

const filled = (a: Float64Array | Int32Array, v: number) => {
  a.fill(v);
  return a;
};

describe('TableStore', () => {
  it('hands out zeroed, disjoint views of the asked length', () => {
    const store = new TableStore();
    const a = store.floats(100);
    const b = store.floats(7);
    const c = store.ints(33);
    expect([a.length, b.length, c.length]).toEqual([100, 7, 33]);
    expect(a.every((v) => v === 0) && b.every((v) => v === 0) && c.every((v) => v === 0)).toBe(true);
    filled(a, 1);
    expect(b.every((v) => v === 0)).toBe(true);
    filled(b, 2);
    expect(a.every((v) => v === 1)).toBe(true);
    // Many small requests span several chunks and stay disjoint.
    const views = Array.from({ length: 3000 }, (_, k) => filled(store.floats(50), k));
    views.forEach((v, k) => expect(v.every((x) => x === k)).toBe(true));
    expect(store.floats(0).length).toBe(0);
  });

  it('never reuses memory unless it recycles: reset leaves earlier views alone', () => {
    const store = new TableStore();
    const a = filled(store.floats(64), 5);
    store.reset();
    const b = store.floats(64);
    expect(a.every((v) => v === 5)).toBe(true);
    expect(b.every((v) => v === 0)).toBe(true);
  });

  it('recycles: after reset it hands the same memory out again, zeroed', () => {
    const store = new TableStore(true);
    const first = Array.from({ length: 4000 }, () => filled(store.floats(40), 9));
    const ints = filled(store.ints(500), -3);
    store.reset();
    const again = Array.from({ length: 4000 }, () => store.floats(40));
    const intsAgain = store.ints(500);
    expect(again[0]!.buffer).toBe(first[0]!.buffer);
    expect(again[3999]!.buffer).toBe(first[3999]!.buffer);
    expect(intsAgain.buffer).toBe(ints.buffer);
    expect(again.every((v) => v.every((x) => x === 0))).toBe(true);
    expect(intsAgain.every((x) => x === 0)).toBe(true);
    // What lay past the handed-out part was never written and is still zero.
    expect(store.floats(1000).every((x) => x === 0)).toBe(true);
  });

  it('gives a large request an array of its own, never recycled', () => {
    const store = new TableStore(true);
    const big = filled(store.floats(1 << 15), 4);
    store.reset();
    expect(big.every((v) => v === 4)).toBe(true);
    expect(store.floats(1 << 15).buffer).not.toBe(big.buffer);
  });
});
