import { describe, expect, it } from 'vitest';
import { count, fixed, labelCompare, meanSd, paramsText, settingLabel } from '../../src/report/format.js';

describe('report formatting', () => {
  it('prints numbers with three decimals, never as negative zero, and a dash when missing', () => {
    expect(fixed(0.81249)).toBe('0.812');
    expect(fixed(-0.0001)).toBe('0.000');
    expect(fixed(null)).toBe('—');
    expect(fixed(NaN)).toBe('—');
    expect(meanSd({ mean: 0.9234, sd: 0.0041 })).toBe('0.923 ± 0.004');
    expect(meanSd({ mean: 0.9234, sd: null })).toBe('0.923');
    expect(meanSd({ mean: null, sd: null })).toBe('—');
  });

  it('writes parameters as short phrases, known keys first', () => {
    expect(paramsText({ init: 'pca', perplexity: 30 })).toBe('perplexity 30, init pca');
    expect(paramsText({ minDist: 0.1, nNeighbors: 15 })).toBe('neighbours 15, min-dist 0.1');
    expect(paramsText({ zeta: 1, learningRate: 200, someThing_else: 'x' })).toBe(
      'learning rate 200, some thing else x, zeta 1',
    );
    expect(paramsText({})).toBe('no parameters');
    expect(settingLabel('pca', {})).toBe('PCA');
    expect(settingLabel('umap', { nNeighbors: 15 })).toBe('UMAP, neighbours 15');
  });

  it('groups thousands without depending on the locale', () => {
    expect(count(3000)).toBe('3,000');
    expect(count(1234567)).toBe('1,234,567');
    expect(count(12)).toBe('12');
  });

  it('orders labels naturally: numbers numerically, digit runs inside text as whole numbers', () => {
    const labels = ['group 10', 'b', 'group 3', '10', '-2', '1.5', 'group 03', 'a'];
    expect([...labels].sort(labelCompare)).toEqual(['-2', '1.5', '10', 'a', 'b', 'group 03', 'group 3', 'group 10']);
  });
});
