import { describe, expect, it } from 'vitest';

import { InternalError } from '../../src/core/errors.js';
import { Rng } from '../../src/core/rng.js';
import { multiplyABt } from '../../src/preprocess/dense.js';
import { runTasks, sharedFloat64, toSharedFloat64, workerThreadsAvailable } from '../../src/preprocess/parallel.js';
import { gemmTasks } from '../../src/preprocess/tasks.js';

function sharedRandom(seed: number, length: number): Float64Array {
  const rng = new Rng(seed);
  const a = sharedFloat64(length);
  for (let i = 0; i < length; i++) a[i] = rng.normal();
  return a;
}

describe('worker threads', () => {
  it('load from the compiled worker file (npm test builds it first)', () => {
    expect(workerThreadsAvailable()).toBe(true);
  });

  it('compute their share of a product with the same bytes as the calling thread alone', () => {
    const [rA, rB, len] = [12, 401, 37];
    const a = sharedRandom(1, rA * len);
    const b = sharedRandom(2, rB * len);
    const whole = multiplyABt(a, rA, b, rB, len);
    for (const parts of [2, 3]) {
      const out = sharedFloat64(rA * rB).fill(Number.NaN);
      runTasks(gemmTasks(a, rA, b, rB, len, out, parts));
      expect(Array.from(out)).toEqual(Array.from(whole));
    }
  });

  it('refuse a task whose arrays are not in shared memory', () => {
    const a = new Float64Array(8 * 4);
    const out = new Float64Array(8 * 8);
    expect(() => runTasks(gemmTasks(a, 8, a, 8, 4, out, 2))).toThrow(InternalError);
  });
});

describe('toSharedFloat64', () => {
  it('copies a plain array into shared memory and passes a shared one through', () => {
    const plain = new Float64Array([1, 2, 3]);
    const s = toSharedFloat64(plain);
    expect(s.buffer).toBeInstanceOf(SharedArrayBuffer);
    expect(Array.from(s)).toEqual([1, 2, 3]);
    expect(toSharedFloat64(s)).toBe(s);
  });
});
