/**
 * The run-length edge rule (Rønnow et al., "Defining and detecting quantum speedup", Science 345, 420 (2014)):
 * a randomised solver's time to solution must be taken at its optimal run length at every size, or the fitted
 * scaling is wrong. When the optimum found on the scanned grid sits at the grid's edge, the true optimum may lie
 * beyond it, so that size's TTS is only an upper bound on the optimal TTS:
 * - edges at the largest sizes of the fit: their TTS is too high, so the slope is too steep: the exponent is an
 *   upper bound ("optimal run length at the grid edge: exponent is an upper bound");
 * - edges at the smallest sizes: their TTS is too high, the slope too shallow: the exponent is a lower bound
 *   (the case that makes a spurious speedup, the paper's warning);
 * - edges elsewhere or at both ends: the direction is unknown.
 * Input is a per-size list of (run length, TTS) so that either source plugs in: the scanned run lengths of
 * runs.csv (median TTS over instances per run length) or a fine grid derived from per-trial run-length
 * distributions.
 */

/** One candidate run length at one size: its TTS (median over instances; null when undefined). */
export interface RunLengthPoint {
  readonly runLength: number;
  readonly tts: number | null;
}

/** The candidates of one size. */
export interface SizeRunLengths {
  readonly n: number;
  readonly points: ReadonlyArray<RunLengthPoint>;
}

/** Kind of number the exponent is under this rule. */
export type ExponentStatus = "estimate" | "upper bound" | "lower bound" | "bound (direction unknown)" | "not scanned";

/** Per-size optimum and the rule's outcome. */
export interface RunLengthEdgeResult {
  readonly perSize: ReadonlyArray<{ n: number; optimal: number | null; edge: "low" | "high" | null }>;
  readonly status: ExponentStatus;
  /** Empty for an estimate, else the sentence for the row. */
  readonly flag: string;
}

/**
 * Finds each size's TTS-optimal run length (ties: the shorter one) and whether it lies at an edge of that size's
 * grid, then labels the exponent fitted over `sizes`.
 * @param grid - candidates per size.
 * @param sizes - the sizes the fit uses (default: all sizes of `grid`).
 */
export function runLengthEdges(grid: ReadonlyArray<SizeRunLengths>, sizes?: ReadonlyArray<number>): RunLengthEdgeResult {
  const used = new Set(sizes ?? grid.map((g) => g.n));
  const perSize = grid
    .filter((g) => used.has(g.n))
    .sort((a, b) => a.n - b.n)
    .map((g) => {
      const lengths = [...new Set(g.points.map((p) => p.runLength))].sort((a, b) => a - b);
      let best = null as RunLengthPoint | null;
      for (const p of g.points) {
        if (p.tts === null || !Number.isFinite(p.tts)) continue;
        if (best === null || p.tts! < best.tts! || (p.tts === best.tts && p.runLength < best.runLength)) best = p;
      }
      if (best === null || lengths.length < 2) return { n: g.n, optimal: best?.runLength ?? null, edge: null, single: lengths.length < 2 };
      const edge: "low" | "high" | null =
        best.runLength === lengths[0] ? "low" : best.runLength === lengths[lengths.length - 1] ? "high" : null;
      return { n: g.n, optimal: best.runLength, edge, single: false };
    });
  const out = perSize.map(({ n, optimal, edge }) => ({ n, optimal, edge }));
  if (perSize.length > 0 && perSize.every((p) => p.single)) {
    return { perSize: out, status: "not scanned", flag: "one run length only: the optimal run length was not scanned; exponent is for that run length" };
  }
  const idx = perSize.map((p, i) => (p.edge !== null ? i : -1)).filter((i) => i >= 0);
  if (idx.length === 0) return { perSize: out, status: "estimate", flag: "" };
  const k = idx.length;
  const m = perSize.length;
  const atTop = idx.every((i) => i >= m - k);
  const atBottom = idx.every((i) => i < k);
  const where = idx.map((i) => `n = ${perSize[i]!.n} (${perSize[i]!.edge === "low" ? "shortest" : "longest"} run length)`).join(", ");
  if (k < m && atTop) {
    return { perSize: out, status: "upper bound", flag: `optimal run length at the grid edge: exponent is an upper bound (${where})` };
  }
  if (k < m && atBottom) {
    return { perSize: out, status: "lower bound", flag: `optimal run length at the grid edge: exponent is a lower bound (${where})` };
  }
  return { perSize: out, status: "bound (direction unknown)", flag: `optimal run length at the grid edge: exponent is a bound of unknown direction (${where})` };
}
