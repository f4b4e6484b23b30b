/**
 * Seeded pseudo-random numbers. xoshiro128** (Blackman & Vigna 2018) on
 * 32-bit integers, seeded through splitmix32 so that nearby seeds give
 * unrelated streams. Every stage that needs randomness receives an `Rng`;
 * nothing in the project calls the platform's unseeded generator.
 */
export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal: number | null = null;

  constructor(seed: number) {
    let x = seed >>> 0;
    const next = (): number => {
      // splitmix32
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1;
  }

  /** Next unsigned 32-bit integer. */
  nextU32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 = (this.s2 ^ this.s0) >>> 0;
    this.s3 = (this.s3 ^ this.s1) >>> 0;
    this.s1 = (this.s1 ^ this.s2) >>> 0;
    this.s0 = (this.s0 ^ this.s3) >>> 0;
    this.s2 = (this.s2 ^ t) >>> 0;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform double in [0, 1) with 53 random bits. */
  next(): number {
    const hi = this.nextU32() >>> 5; // 27 bits
    const lo = this.nextU32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform integer in [0, n). */
  int(n: number): number {
    return Math.floor(this.next() * n);
  }

  /** Standard normal variate (Marsaglia polar method). */
  normal(): number {
    if (this.spareNormal !== null) {
      const v = this.spareNormal;
      this.spareNormal = null;
      return v;
    }
    let u: number;
    let v: number;
    let s: number;
    do {
      u = 2 * this.next() - 1;
      v = 2 * this.next() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const m = Math.sqrt((-2 * Math.log(s)) / s);
    this.spareNormal = v * m;
    return u * m;
  }

  /** A function returning uniform [0,1) numbers, for libraries that take one. */
  asFunction(): () => number {
    return () => this.next();
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/**
 * Derive a 32-bit seed from a base seed and labels (run id, stage name), so a
 * stage's stream never depends on scheduling or on what other stages drew.
 * FNV-1a over the UTF-16 code units, finished with a murmur3 avalanche.
 */
export function deriveSeed(base: number, ...parts: Array<string | number>): number {
  let h = 0x811c9dc5 ^ (base >>> 0);
  const text = parts.join('\u0000');
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * m distinct indices from 0..n−1, drawn uniformly without replacement
 * (partial Fisher–Yates), returned in ascending order.
 */
export function sampleIndices(n: number, m: number, rng: Rng): Int32Array {
  if (!(Number.isInteger(m) && m >= 0 && m <= n)) throw new RangeError(`cannot draw ${m} of ${n} indices`);
  const idx = Int32Array.from({ length: n }, (_, i) => i);
  for (let i = 0; i < m; i++) {
    const j = i + rng.int(n - i);
    const t = idx[i];
    idx[i] = idx[j];
    idx[j] = t;
  }
  return idx.slice(0, m).sort();
}
