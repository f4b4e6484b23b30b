/**
 * Plain-text formatting shared by the HTML and Markdown renderers. Outputs
 * are unescaped text; the renderer escapes them. Every function is pure and
 * locale-independent, so the same input always gives the same characters.
 */
import type { MeanSd } from '../core/results.js';

/** Shown where a number is missing (null, NaN or infinite). */
export const MISSING = '—';

/** A number with exactly `digits` decimals (default 3); negative zero prints as zero. */
export function fixed(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return MISSING;
  const text = value.toFixed(digits);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** "mean ± sd" with 3 decimals each; just the mean when sd is missing. */
export function meanSd(m: MeanSd | undefined): string {
  if (!m || m.mean === null || !Number.isFinite(m.mean)) return MISSING;
  if (m.sd === null || !Number.isFinite(m.sd)) return fixed(m.mean);
  return `${fixed(m.mean)} ± ${fixed(m.sd)}`;
}

/** An integer with thin grouping for thousands ("12,345"), independent of locale. */
export function count(value: number): string {
  const sign = value < 0 ? '-' : '';
  const digits = String(Math.abs(Math.round(value)));
  return sign + digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

const METHOD_NAMES: Record<string, string> = { tsne: 't-SNE', umap: 'UMAP', pca: 'PCA' };

/** Display name of a method id ('tsne' → 't-SNE'); unknown ids are returned as given. */
export function methodName(method: string): string {
  return METHOD_NAMES[method] ?? method;
}

/** Display words for known parameter keys, in the order they are listed. */
const PARAM_WORDS: Array<[string, string]> = [
  ['perplexity', 'perplexity'],
  ['nNeighbors', 'neighbours'],
  ['n_neighbors', 'neighbours'],
  ['minDist', 'min-dist'],
  ['min_dist', 'min-dist'],
  ['init', 'init'],
  ['iterations', 'iterations'],
  ['n_iter', 'iterations'],
  ['epochs', 'epochs'],
  ['learningRate', 'learning rate'],
  ['learning_rate', 'learning rate'],
];

/**
 * Parameters as a short phrase: known keys first in a fixed order
 * ("perplexity 30, init pca", "neighbours 15, min-dist 0.1"), then any other
 * keys in code-unit order with camelCase/snake_case turned into words.
 * An empty object gives "no parameters".
 */
export function paramsText(params: Readonly<Record<string, number | string>>): string {
  const keys = Object.keys(params);
  if (keys.length === 0) return 'no parameters';
  const parts: string[] = [];
  const used = new Set<string>();
  for (const [key, word] of PARAM_WORDS) {
    if (Object.prototype.hasOwnProperty.call(params, key)) {
      parts.push(`${word} ${valueText(params[key])}`);
      used.add(key);
    }
  }
  const rest = keys.filter((k) => !used.has(k)).sort(codeUnitCompare);
  for (const key of rest) parts.push(`${keyWords(key)} ${valueText(params[key])}`);
  return parts.join(', ');
}

/** "t-SNE, perplexity 30, init pca" — the label used for a setting throughout the report. */
export function settingLabel(method: string, params: Readonly<Record<string, number | string>>): string {
  const p = paramsText(params);
  return p === 'no parameters' ? methodName(method) : `${methodName(method)}, ${p}`;
}

function valueText(v: number | string): string {
  return typeof v === 'number' ? String(v) : v;
}

function keyWords(key: string): string {
  return key
    .replace(/_/g, ' ')
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .toLowerCase();
}

/** Display header of a metric key ('knn_overlap' → 'kNN overlap'). */
export function metricName(key: string): string {
  switch (key) {
    case 'trustworthiness':
      return 'trustworthiness';
    case 'continuity':
      return 'continuity';
    case 'knn_overlap':
      return 'kNN overlap';
    case 'kl_divergence':
      return 'KL divergence';
    case 'auc_rnx':
      return 'AUC of R_NX';
    case 'distance_spearman':
      return 'distance Spearman';
    case 'centroid_spearman':
      return 'centroid Spearman';
    case 'density_correlation':
      return 'density correlation';
    case 'label_silhouette':
      return 'label silhouette';
    case 'label_knn_accuracy':
      return 'label kNN accuracy';
    default:
      return keyWords(key);
  }
}

/** First 12 hex characters of a digest, for running text. */
export function shortHash(sha256: string): string {
  return sha256.length > 12 ? sha256.slice(0, 12) : sha256;
}

/** Compare strings by UTF-16 code units (locale-independent, total order). */
export function codeUnitCompare(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/**
 * Compare labels for display: two labels that are both plain decimal numbers
 * compare numerically ("-2" < "1.5" < "10"); otherwise a natural order in which
 * runs of digits compare as whole numbers ("group 3" < "group 10") and other
 * text by code units; full code-unit order breaks remaining ties.
 */
export function labelCompare(a: string, b: string): number {
  const na = asNumber(a);
  const nb = asNumber(b);
  if (na !== null && nb !== null && na !== nb) return na - nb;
  if (na !== null && nb === null) return -1;
  if (na === null && nb !== null) return 1;
  const ca = a.match(/\d+|\D+/g) ?? [];
  const cb = b.match(/\d+|\D+/g) ?? [];
  for (let i = 0; i < Math.min(ca.length, cb.length); i++) {
    const x = ca[i];
    const y = cb[i];
    if (x === y) continue;
    if (/^\d/.test(x) && /^\d/.test(y)) {
      const xs = x.replace(/^0+(?=\d)/, '');
      const ys = y.replace(/^0+(?=\d)/, '');
      if (xs.length !== ys.length) return xs.length - ys.length;
      if (xs !== ys) return codeUnitCompare(xs, ys);
      continue;
    }
    return codeUnitCompare(x, y);
  }
  return ca.length - cb.length || codeUnitCompare(a, b);
}

function asNumber(s: string): number | null {
  if (!/^-?\d+(\.\d+)?$/.test(s)) return null;
  return Number(s);
}

/** Shorten text for a figure legend, adding an ellipsis when cut. */
export function truncate(text: string, max: number): string {
  const chars = Array.from(text);
  return chars.length <= max ? text : chars.slice(0, max - 1).join('') + '…';
}
