/**
 * Cross-check against an independent JavaScript implementation, tsne-js 1.0.3
 * (dev dependency). Its `dist/joint-probabilities.js` runs the same
 * perplexity bisection (β from 1, ×2 / ÷2 until bracketed, 100 steps,
 * tolerance 1e-5) on whatever distance matrix it is given, symmetrises by the
 * total and floors at machine epsilon; its `dist/kl-divergence.js` returns
 * KL(P‖Q) and the gradient of a given layout, including the factor
 * 2(α + 1)/α = 4 for α = 1. Its own pipeline feeds unsquared distances to
 * the bisection, so here it is given squared distances, which is the
 * kernel of van der Maaten & Hinton 2008 used by this project.
 */
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { Rng } from '../../../src/core/rng.js';
import type { Matrix } from '../../../src/core/types.js';
import { jointExact } from '../../../src/embed/tsne/affinities.js';
import { exactGradient } from '../../../src/embed/tsne/gradient.js';
import { klDivergence } from '../../../src/embed/tsne/kl.js';
import { maxAbs } from './helpers.js';

interface NdArray {
  shape: number[];
  data: Float64Array;
  get(i: number, j: number): number;
}

const require = createRequire(import.meta.url);
const ndarray = require('ndarray') as (data: Float64Array, shape: number[]) => NdArray;
const tsnejsJoint = require('tsne-js/dist/joint-probabilities.js') as (distances: NdArray, perplexity: number) => NdArray;
const tsnejsKl = require('tsne-js/dist/kl-divergence.js') as (y: NdArray, P: NdArray, alpha: number) => [number, NdArray];

function smallInput(): { X: Matrix; y: Float64Array } {
  const rng = new Rng(2024);
  const n = 40;
  const d = 6;
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let t = 0; t < d; t++) data[i * d + t] = (i % 3) * 2 + rng.normal();
  const y = new Float64Array(2 * n);
  for (let e = 0; e < 2 * n; e++) y[e] = 2 * rng.normal();
  return { X: { n, d, data }, y };
}

function squaredDistanceNd(X: Matrix): NdArray {
  const { n, d, data } = X;
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    let s = 0;
    for (let t = 0; t < d; t++) s += (data[i * d + t] - data[j * d + t]) ** 2;
    out[i * n + j] = s;
  }
  return ndarray(out, [n, n]);
}

describe('cross-check with tsne-js 1.0.3', () => {
  const { X, y } = smallInput();
  const n = X.n;
  const P = jointExact(X, 8);
  const theirP = tsnejsJoint(squaredDistanceNd(X), 8);

  it('computes the same exact joint P (1e-12 absolute; entries are about 1e-3)', () => {
    let worst = 0;
    for (let i = 0; i < n; i++) {
      for (let e = P.indptr[i]; e < P.indptr[i + 1]; e++) {
        worst = Math.max(worst, Math.abs(P.values[e] - theirP.get(i, P.indices[e])));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('computes the same gradient and KL at a given layout (both include the factor 4; 1e-10 relative)', () => {
    const [theirKl, theirGrad] = tsnejsKl(ndarray(y.slice(), [n, 2]), theirP, 1);
    const ours = exactGradient(P, { n, data: y });
    const diff = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      diff[2 * i] = ours.grad[2 * i] - theirGrad.get(i, 0);
      diff[2 * i + 1] = ours.grad[2 * i + 1] - theirGrad.get(i, 1);
    }
    expect(maxAbs(diff) / maxAbs(ours.grad)).toBeLessThan(1e-10);
    expect(Math.abs(klDivergence(P, { n, data: y }) - theirKl)).toBeLessThan(1e-10);
  });
});
