import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import { MIN_NORMAL, powChecked, powTables, powWith } from '../../../src/embed/umap/index.js';

describe('powWith (x^b from tables built for one b)', () => {
  it('agrees with Math.pow to 1e-14 relative over x from e^−40 to e^40 and b from 0.5 to 2', () => {
    const rng = new Rng(99);
    let worst = 0;
    for (let s = 0; s < 200; s++) {
      const b = 0.5 + 1.5 * rng.next();
      const t = powTables(b);
      for (let r = 0; r < 1000; r++) {
        const x = Math.exp(80 * (rng.next() - 0.5));
        const ref = Math.pow(x, b);
        worst = Math.max(worst, Math.abs(powWith(t, x) - ref) / ref);
      }
    }
    expect(worst).toBeLessThan(1e-14);
  });

  it('is accurate to 5e-14 at both ends of every mantissa interval and at powers of two and their neighbours, from 2^−300 to 2^300', () => {
    // b values: the fitted b for min_dist 0, 0.1 and 0.5 (spread 1) in test/fixtures/umap-ab.json (scipy 1.10.1 curve_fit, as umap-learn fits them), plus 2 and 0.25.
    const tables = [0.7904949734010681, 0.8950608779914887, 1.3341669929263487, 2, 0.25].map(powTables);
    let worst = 0;
    for (let e = -300; e <= 300; e += 7) {
      for (let i = 0; i <= 256; i++) {
        for (const eps of [-2.3e-16, 0, 2.3e-16]) {
          const x = 2 ** e * (1 + i / 256 + eps);
          for (const t of tables) {
            const ref = Math.pow(x, t.b);
            if (ref === 0 || !Number.isFinite(ref)) continue;
            worst = Math.max(worst, Math.abs(powWith(t, x) - ref) / ref);
          }
        }
      }
    }
    expect(worst).toBeLessThan(5e-14);
  });

  it('is exact where the series vanishes: integer b gives the same value as repeated multiplication', () => {
    const t = powTables(2);
    for (const x of [1, 1.5, 3, 0.1, 12345.678]) expect(Math.abs(powWith(t, x) - x * x) / (x * x)).toBeLessThan(1e-15);
  });

  it('powChecked hands zero, subnormal, infinite and NaN inputs to Math.pow', () => {
    const t = powTables(0.9);
    expect(powChecked(t, 0)).toBe(0);
    expect(powChecked(t, 5e-324)).toBe(Math.pow(5e-324, 0.9));
    expect(powChecked(t, MIN_NORMAL / 2)).toBe(Math.pow(MIN_NORMAL / 2, 0.9));
    expect(powChecked(t, Infinity)).toBe(Infinity);
    expect(Number.isNaN(powChecked(t, Number.NaN))).toBe(true);
    expect(powChecked(powTables(3), 1e300)).toBe(Infinity);
    expect(powChecked(powTables(3), 1e-300)).toBe(0);
    expect(powChecked(t, 2.5)).toBe(powWith(t, 2.5));
  });

  it('rejects a non-finite exponent', () => {
    expect(() => powTables(Number.NaN)).toThrow(/finite/);
  });
});
