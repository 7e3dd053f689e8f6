/**
 * Exponential or polynomial? (issue 13.) On the points of a scaling fit, y = log₂ cost at sizes n, both
 *   exponential: y = a·n + c        and        polynomial: y = d·log₂ n + c
 * are fitted by ordinary least squares and compared by Akaike's information criterion for Gaussian residuals,
 * AIC = m·ln(RSS/m) + 2·k with k = 3 (slope, intercept, residual variance) for both (Akaike 1974, IEEE Trans.
 * Autom. Control 19, 716). Both models have the same k, so the comparison is one of residual sums of squares;
 * AIC is reported so that a reader can weigh the difference. The rule: the polynomial model is preferred when
 * it is as good or better, AIC_poly ≤ AIC_exp, and then no exponential verdict is given ("scaling looks
 * polynomial over n = …"). With fewer than 3 points the models cannot be told apart ("undetermined").
 *
 * Why it matters: local search on random 3-SAT below the threshold runs in polynomial time, and its measured
 * costs fitted as an exponential give a small but positive "exponent" (Mu & Hoos, IJCAI 2015, on the empirical
 * scaling of SAT solvers on random 3-SAT).
 */

/** Which model describes a series better. */
export type GrowthModel = "exponential" | "polynomial" | "undetermined";

/** Both fits and the choice. */
export interface GrowthComparison {
  /** Exponential fit: log₂ cost = slope·n + intercept. */
  readonly expSlope: number | null;
  readonly expIntercept: number | null;
  /** Polynomial fit: log₂ cost = degree·log₂ n + intercept (cost ∝ n^degree). */
  readonly polyDegree: number | null;
  readonly polyIntercept: number | null;
  readonly aicExponential: number | null;
  readonly aicPolynomial: number | null;
  readonly preferred: GrowthModel;
}

/** Statement of the rule for captions and the README. */
export const GROWTH_MODEL_RULE =
  "each series is fitted as log2 cost = a*n + c (exponential) and log2 cost = d*log2 n + c (polynomial) by least squares " +
  "and compared by AIC (Gaussian residuals, 3 parameters each); when AIC_polynomial <= AIC_exponential the series " +
  "'looks polynomial' and gets no exponential verdict";

/** Residual sums below this (per point) are treated as this: exact counts fit either model perfectly only in theory. */
const RSS_FLOOR_PER_POINT = 1e-12;

function ols(xs: ReadonlyArray<number>, ys: ReadonlyArray<number>): { slope: number; intercept: number; rss: number } | null {
  const m = xs.length;
  const mx = xs.reduce((s, x) => s + x, 0) / m;
  const my = ys.reduce((s, y) => s + y, 0) / m;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < m; i++) {
    sxy += (xs[i]! - mx) * (ys[i]! - my);
    sxx += (xs[i]! - mx) ** 2;
  }
  if (!(sxx > 0)) return null;
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let rss = 0;
  for (let i = 0; i < m; i++) rss += (ys[i]! - slope * xs[i]! - intercept) ** 2;
  return { slope, intercept, rss };
}

function aic(rss: number, m: number): number {
  return m * Math.log(Math.max(rss, RSS_FLOOR_PER_POINT * m) / m) + 2 * 3;
}

/**
 * Fits both models to (n, log₂ cost) points and says which one is preferred.
 * @param points - the fit's points; n > 0.
 */
export function compareGrowthModels(points: ReadonlyArray<{ readonly n: number; readonly log2: number }>): GrowthComparison {
  const usable = points.filter((p) => p.n > 0 && Number.isFinite(p.log2));
  const none: GrowthComparison = {
    expSlope: null, expIntercept: null, polyDegree: null, polyIntercept: null, aicExponential: null, aicPolynomial: null,
    preferred: "undetermined",
  };
  if (usable.length < 2) return none;
  const ys = usable.map((p) => p.log2);
  const e = ols(usable.map((p) => p.n), ys);
  const q = ols(usable.map((p) => Math.log2(p.n)), ys);
  if (e === null || q === null) return none;
  const m = usable.length;
  const aicE = aic(e.rss, m);
  const aicP = aic(q.rss, m);
  return {
    expSlope: e.slope,
    expIntercept: e.intercept,
    polyDegree: q.slope,
    polyIntercept: q.intercept,
    aicExponential: aicE,
    aicPolynomial: aicP,
    preferred: m < 3 ? "undetermined" : aicP <= aicE ? "polynomial" : "exponential",
  };
}
