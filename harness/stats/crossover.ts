/**
 * Crossover size between a measured classical scaling and a predicted quantum one, under a cost model
 * (after arXiv:2011.04149: quantum time = queries × Toffolis per query × Toffoli time; classical time = measured
 * time divided by the parallelism S).
 *
 *   classical: log₂ seconds(n) = a_c·n + c_c − log₂ S            (c_c for one core)
 *   quantum:   log₂ seconds(n) = a_q·n + c_q + log₂ T(n)          (T(n) = seconds per query, may grow with n)
 *
 * n* is the smallest n in the search range where the difference D(n) = classical − quantum (in log₂ seconds)
 * changes from negative to non-negative: a scan in unit steps brackets the first sign change and bisection
 * narrows it to 1e−9 in n. For constant T the answer is the closed form
 *   n* = (c_q + log₂ T − c_c + log₂ S) / (a_c − a_q).
 */

/** Default search range for n* (inclusive): 1 … 1000 variables. */
export const DEFAULT_CROSSOVER_RANGE: readonly [number, number] = [1, 1000];

/** A line in log₂ units: log₂ y = slope·n + intercept. */
export interface Log2Line {
  readonly slope: number;
  readonly intercept: number;
}

/** Inputs of {@link findCrossover}. */
export interface CrossoverSpec {
  /** Classical log₂ seconds on one core. */
  readonly classical: Log2Line;
  /** Classical parallelism S ≥ 1 the classical time is divided by; default 1. */
  readonly parallelism?: number;
  /** Quantum log₂ queries. */
  readonly quantum: Log2Line;
  /** Seconds per query T(n) (Toffolis per query × seconds per Toffoli); must be > 0. */
  readonly secondsPerQuery: (n: number) => number;
  /** Inclusive search range [from, to] in n; default {@link DEFAULT_CROSSOVER_RANGE}. */
  readonly range?: readonly [number, number];
}

/** How the two cost curves relate over the search range. */
export type CrossoverStatus = "crossing" | "none in range" | "quantum faster throughout";

/** Result of {@link findCrossover}. */
export interface Crossover {
  readonly status: CrossoverStatus;
  /** n* (real-valued), or null. */
  readonly n: number | null;
  /** Wall time at n* (both sides equal there), seconds; null without a crossing. */
  readonly seconds: number | null;
  /** log₂ of `seconds` (useful when seconds overflows a double). */
  readonly log2Seconds: number | null;
  /** Extra remarks (e.g. the curves cross back later in the range). */
  readonly note: string;
}

/**
 * Closed-form crossover for constant seconds per query.
 * @param classical - classical log₂ seconds on one core (a_c, c_c).
 * @param quantum - quantum log₂ queries (a_q, c_q).
 * @param log2SecondsPerQuery - log₂ T.
 * @param parallelism - S; default 1.
 * @returns n* = (c_q + log₂T − c_c + log₂S)/(a_c − a_q); ±∞ or NaN when the slopes are equal.
 */
export function crossoverClosedForm(
  classical: Log2Line,
  quantum: Log2Line,
  log2SecondsPerQuery: number,
  parallelism = 1,
): number {
  return (
    (quantum.intercept + log2SecondsPerQuery - classical.intercept + Math.log2(parallelism)) /
    (classical.slope - quantum.slope)
  );
}

/**
 * Finds the first n in the range where the quantum time drops to or below the classical time.
 * @returns status "crossing" with n* and the time there; "quantum faster throughout" when the quantum side is
 * already no slower at the start of the range; "none in range" when it is slower everywhere in the range.
 */
export function findCrossover(spec: CrossoverSpec): Crossover {
  const [from, to] = spec.range ?? DEFAULT_CROSSOVER_RANGE;
  const log2S = Math.log2(spec.parallelism ?? 1);
  const classicalLog2 = (n: number): number => spec.classical.slope * n + spec.classical.intercept - log2S;
  const diff = (n: number): number =>
    classicalLog2(n) - (spec.quantum.slope * n + spec.quantum.intercept + Math.log2(spec.secondsPerQuery(n)));

  const at = (n: number): Crossover => {
    const l2 = classicalLog2(n);
    return { status: "crossing", n, seconds: 2 ** l2, log2Seconds: l2, note: "" };
  };
  if (!(diff(from) < 0)) {
    if (Number.isNaN(diff(from))) return none("none in range", "cost curves undefined at the range start");
    return { ...none("quantum faster throughout"), note: `quantum no slower already at n = ${from}` };
  }
  // 1. Bracket the first sign change on a unit grid.
  let a = from;
  let b = NaN;
  for (let n = from + 1; ; n++) {
    const x = Math.min(n, to);
    if (diff(x) >= 0) {
      b = x;
      break;
    }
    a = x;
    if (x >= to) break;
  }
  if (Number.isNaN(b)) return none("none in range", `quantum slower for every n in [${from}, ${to}]`);
  // 2. Bisection: D(a) < 0 ≤ D(b).
  while (b - a > 1e-9) {
    const m = 0.5 * (a + b);
    if (diff(m) < 0) a = m;
    else b = m;
  }
  const result = at(b);
  // 3. Does the classical side overtake again later in the range (possible when T(n) grows fast)?
  for (let n = Math.ceil(b) + 1; n <= to; n++) {
    if (diff(n) < 0) return { ...result, note: `classical faster again from n ≈ ${n}` };
  }
  return result;
}

function none(status: CrossoverStatus, note = ""): Crossover {
  return { status, n: null, seconds: null, log2Seconds: null, note };
}
