import { describe, expect, it } from 'vitest';
import { consoleProgress, fmtTime } from '../../src/cli/progress.js';

function sink() {
  const chunks: string[] = [];
  const stream = { isTTY: false, write: (s: string) => { chunks.push(s); return true; } } as unknown as NodeJS.WriteStream;
  return { chunks, stream };
}

describe('consoleProgress', () => {
  it('writes plain lines with counts and a time left when not on a terminal', () => {
    const { chunks, stream } = sink();
    let t = 0;
    const p = consoleProgress({ quiet: false, stream, now: () => t });
    p.stage('runs', 4, 20);
    t = 6000;
    p.tick(1, 'umap-n15-d0.1-s1');
    t = 20000;
    p.tick(4);
    const text = chunks.join('');
    expect(text).toContain('runs: started (4 to do, estimate 20 s)');
    expect(text).toContain('runs: 1/4 (umap-n15-d0.1-s1), 6.0 s elapsed, about 18 s left');
    expect(text).toContain('runs: 4/4, 20 s elapsed');
    expect(text).not.toMatch(/\x1b/);
  });

  it('takes the time left from the share of work done when it is given', () => {
    const { chunks, stream } = sink();
    let t = 0;
    const p = consoleProgress({ quiet: false, stream, now: () => t });
    p.stage('runs', 3, 120);
    t = 120_000;
    p.tick(1, 'tsne-p30-random-s1', 0.75);
    expect(chunks.join('')).toContain('runs: 1/3 (tsne-p30-random-s1), 2 min 0 s elapsed, about 40 s left');
  });

  it('prints nothing but warnings when quiet', () => {
    const { chunks, stream } = sink();
    const p = consoleProgress({ quiet: true, stream });
    p.stage('runs', 2);
    p.tick(1);
    p.warn('dropped 2 rows');
    expect(chunks.join('')).toBe('warning: dropped 2 rows\n');
  });
});

describe('fmtTime', () => {
  it('formats seconds and minutes', () => {
    expect(fmtTime(3.21)).toBe('3.2 s');
    expect(fmtTime(42.4)).toBe('42 s');
    expect(fmtTime(125)).toBe('2 min 5 s');
  });

  it('rounds before splitting, so no time reads as 60 s or 1 min 60 s', () => {
    expect(fmtTime(9.97)).toBe('10 s');
    expect(fmtTime(59.6)).toBe('1 min 0 s');
    expect(fmtTime(119.6)).toBe('2 min 0 s');
    expect(fmtTime(3599.5)).toBe('60 min 0 s');
  });
});
