import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { powPositive } from '../../../src/embed/umap/index.js';

describe('powPositive', () => {
  it('agrees with Math.pow to 5e-14 relative over x from e^−40 to e^40 and b from 0.5 to 2', () => {
    const rng = new Rng(99);
    let worst = 0;
    for (let t = 0; t < 200_000; t++) {
      const x = Math.exp(80 * (rng.next() - 0.5));
      const b = 0.5 + 1.5 * rng.next();
      const ref = Math.pow(x, b);
      worst = Math.max(worst, Math.abs(powPositive(x, b) - ref) / ref);
    }
    expect(worst).toBeLessThan(5e-14);
  });

  it('is accurate across every table interval and at powers of two and their neighbours', () => {
    let worst = 0;
    for (let e = -60; e <= 60; e++) {
      for (let i = 0; i <= 128; i++) {
        for (const eps of [-1e-15, 0, 1e-15]) {
          const x = 2 ** e * (1 + i / 128 + eps);
          for (const b of [0.7904949734010681, 0.8950608779914887, 1.3341669929263487]) {
            const ref = Math.pow(x, b);
            worst = Math.max(worst, Math.abs(powPositive(x, b) - ref) / ref);
          }
        }
      }
    }
    expect(worst).toBeLessThan(5e-14);
  });

  it('hands zero, subnormal, infinite and overflowing inputs to the library functions', () => {
    expect(powPositive(0, 0.9)).toBe(0);
    expect(powPositive(5e-324, 0.5)).toBe(Math.exp(0.5 * Math.log(5e-324)));
    expect(powPositive(Infinity, 0.9)).toBe(Infinity);
    expect(powPositive(1e300, 3)).toBe(Infinity);
    expect(powPositive(1e-300, 3)).toBe(0);
    expect(Number.isNaN(powPositive(Number.NaN, 1))).toBe(true);
  });
});
