import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { parseSweepFile, resolveSweep } from '../../src/config/sweep.js';
import { toOverrides } from '../../src/cli/options.js';

function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('parseSweepFile', () => {
  it('reads the demo sweep shipped in sweeps/', () => {
    const text = readFileSync(new URL('../../sweeps/demo.yaml', import.meta.url), 'utf8');
    const cfg = resolveSweep(parseSweepFile('sweeps/demo.yaml', text), {});
    expect(cfg.methods).toEqual(['tsne', 'umap', 'pca']);
    expect(cfg.tsne.perplexity).toEqual([10, 30, 50]);
    expect(cfg.umap.nNeighbors).toEqual([10, 30]);
    expect(cfg.umap.minDist).toEqual([0.1, 0.5]);
    expect(cfg.seeds).toEqual([1, 2, 3]);
    expect(cfg.data.label).toBe('regime');
  });

  it('points at the line and column of a wrong value', () => {
    const text = 'seeds: 3\ntsne:\n  perplexity: [10, thirty]\n';
    const e = inputError(() => parseSweepFile('s.yaml', text));
    expect(e.code).toBe('sweep.invalid');
    expect(e.message).toMatch(/^s\.yaml:3:20: tsne\.perplexity\[1\] must be a number$/);
  });

  it('names an unknown key and lists the allowed ones', () => {
    const e = inputError(() => parseSweepFile('s.yaml', 'umap:\n  neighbours: [10]\n'));
    expect(e.code).toBe('sweep.unknown-key');
    expect(e.message).toBe("s.yaml:2:3: unknown key 'umap.neighbours'; allowed here: n_neighbors, min_dist, init");
  });

  it('rejects out-of-range values with the allowed range', () => {
    expect(inputError(() => parseSweepFile('s.yaml', 'umap:\n  min_dist: 1.5\n')).message).toBe('s.yaml:2:13: umap.min_dist[0] must be at most 1');
    expect(inputError(() => parseSweepFile('s.yaml', 'k: 0\n')).message).toBe('s.yaml:1:4: k must be at least 1');
  });

  it('reports YAML syntax errors with a position', () => {
    const e = inputError(() => parseSweepFile('s.yaml', 'tsne: [1, 2\n'));
    expect(e.code).toBe('sweep.yaml-syntax');
    expect(e.message).toMatch(/^s\.yaml:\d+:\d+: /);
  });
});

describe('resolveSweep', () => {
  it('lets flags override the file key by key and fills defaults', () => {
    const file = parseSweepFile('s.yaml', 'seeds: 5\ntsne:\n  perplexity: [10, 30]\nk: 20\n');
    const flags = toOverrides({ perplexity: '50', seeds: '7,11' });
    const cfg = resolveSweep(file, flags);
    expect(cfg.tsne.perplexity).toEqual([50]);
    expect(cfg.seeds).toEqual([7, 11]);
    expect(cfg.k).toBe(20);
    expect(cfg.tsne.init).toEqual(['pca']);
    expect(cfg.umap.nNeighbors).toEqual([15]);
    expect(cfg.data.pcaDims).toBe('auto');
  });

  it('takes spectral, pca and random as initialisations for both methods, and rejects others with the allowed list', () => {
    const cfg = resolveSweep(null, toOverrides({ init: 'spectral,random' }));
    expect(cfg.tsne.init).toEqual(['spectral', 'random']);
    expect(cfg.umap.init).toEqual(['spectral', 'random']);
    const file = parseSweepFile('s.yaml', 'tsne:\n  init: [spectral, pca]\n');
    expect(resolveSweep(file, toOverrides({})).tsne.init).toEqual(['spectral', 'pca']);
    const e = inputError(() => parseSweepFile('s.yaml', 'tsne:\n  init: [laplacian]\n'));
    expect(e.message).toMatch(/^s\.yaml:2:\d+: .*spectral/);
  });

  it('turns a seed count into seeds 1..N', () => {
    expect(resolveSweep(null, toOverrides({ seeds: '4' })).seeds).toEqual([1, 2, 3, 4]);
  });
});

describe('toOverrides', () => {
  it('names the flag and the bad value', () => {
    const e = inputError(() => toOverrides({ perplexity: '10,3o' }));
    expect(e.message).toBe("--perplexity: '3o' is not a number; give a comma-separated list of numbers such as 10,30");
    expect(inputError(() => toOverrides({ methods: 'tsne,mds' })).message).toBe('--methods: must be one of tsne, umap, pca');
    expect(inputError(() => toOverrides({ neighbors: '1' })).message).toBe('--neighbors: must be at least 2');
  });
});
