/**
 * The parameters (a, b) of UMAP's low-dimensional similarity
 * 1 / (1 + a·d^(2b)) (McInnes, Healy & Melville 2018, arXiv 1802.03426,
 * §3.2 and Appendix C), fitted as umap-learn's `find_ab_params` does: least
 * squares against the target curve ψ(d) = 1 for d < min_dist and
 * exp(−(d − min_dist)/spread) otherwise, on 300 evenly spaced d in
 * [0, 3·spread]. umap-learn uses scipy's `curve_fit` (MINPACK
 * Levenberg–Marquardt from a = b = 1); here Levenberg–Marquardt with the
 * analytic Jacobian runs from the same start until the step stops changing
 * the parameters, so the two agree to the precision of the minimum.
 */

/** Number of sample points of the target curve (umap-learn: 300). */
export const CURVE_POINTS = 300;

export interface CurveParams {
  a: number;
  b: number;
}

/**
 * Fit (a, b) for the given min_dist and spread.
 *
 * @param minDist umap-learn's min_dist, 0 ≤ minDist ≤ spread. Default in UMAP 0.1.
 * @param spread umap-learn's spread (> 0). Default 1.
 * @returns a > 0, b > 0 minimising Σ_i (1/(1 + a·x_i^(2b)) − ψ(x_i))².
 */
export function fitAB(minDist: number, spread = 1): CurveParams {
  if (!(spread > 0) || !Number.isFinite(spread)) throw new RangeError(`spread must be a positive number, got ${spread}`);
  if (!(minDist >= 0 && minDist <= spread)) {
    throw new RangeError(`minDist must be in [0, spread] = [0, ${spread}], got ${minDist}`);
  }
  const m = CURVE_POINTS;
  const x = new Float64Array(m);
  const y = new Float64Array(m);
  const step = (3 * spread) / (m - 1);
  for (let i = 0; i < m; i++) {
    x[i] = i === m - 1 ? 3 * spread : i * step;
    y[i] = x[i] < minDist ? 1 : Math.exp(-(x[i] - minDist) / spread);
  }
  const logx = new Float64Array(m);
  for (let i = 0; i < m; i++) logx[i] = x[i] > 0 ? Math.log(x[i]) : Number.NEGATIVE_INFINITY;

  const cost = (a: number, b: number): number => {
    let s = 0;
    for (let i = 0; i < m; i++) {
      const p = x[i] > 0 ? Math.exp(2 * b * logx[i]) : 0;
      const r = 1 / (1 + a * p) - y[i];
      s += r * r;
    }
    return s;
  };

  let a = 1;
  let b = 1;
  let c = cost(a, b);
  let lambda = 1e-3;
  for (let iter = 0; iter < 1000; iter++) {
    // Normal equations JᵀJ δ = −Jᵀr with the analytic Jacobian.
    let jaa = 0;
    let jab = 0;
    let jbb = 0;
    let ga = 0;
    let gb = 0;
    for (let i = 0; i < m; i++) {
      if (!(x[i] > 0)) {
        // f(0) = 1 for every (a, b): no derivative.
        continue;
      }
      const p = Math.exp(2 * b * logx[i]);
      const den = 1 + a * p;
      const f = 1 / den;
      const r = f - y[i];
      const da = -p / (den * den);
      const db = (-a * p * 2 * logx[i]) / (den * den);
      jaa += da * da;
      jab += da * db;
      jbb += db * db;
      ga += da * r;
      gb += db * r;
    }
    let accepted = false;
    for (let tries = 0; tries < 60; tries++) {
      const A = jaa * (1 + lambda);
      const B = jbb * (1 + lambda);
      const det = A * B - jab * jab;
      if (!(det > 0)) {
        lambda *= 10;
        continue;
      }
      const da = (-B * ga + jab * gb) / det;
      const db = (jab * ga - A * gb) / det;
      const na = a + da;
      const nb = b + db;
      const nc = na > 0 && nb > 0 ? cost(na, nb) : Number.POSITIVE_INFINITY;
      if (nc <= c) {
        const small = Math.abs(da) <= 1e-15 * (Math.abs(a) + 1e-15) && Math.abs(db) <= 1e-15 * (Math.abs(b) + 1e-15);
        a = na;
        b = nb;
        const improvement = c - nc;
        c = nc;
        lambda = Math.max(lambda / 10, 1e-12);
        accepted = true;
        if (small || improvement <= 1e-17 * Math.max(c, 1e-300)) return { a, b };
        break;
      }
      lambda *= 10;
    }
    if (!accepted) break;
  }
  return { a, b };
}
