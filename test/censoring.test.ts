import { describe, expect, it } from "vitest";
import { median, quantile } from "simple-statistics";
import { Rng, deriveSeed } from "../harness/random.js";
import { bootstrap } from "../harness/stats/bootstrap.js";
import { bootstrapCensoredQuantiles, censoredQuantile } from "../harness/stats/censoring.js";

function draws(seed: string, count: number): number[] {
  const rng = new Rng(deriveSeed("censoring-test", seed));
  return Array.from({ length: count }, () => 2 ** (10 + 2 * rng.normal()));
}

/** Marks the `k` largest values censored and replaces each by a lower bound still above every uncensored value. */
function censorLargest(values: number[], k: number): { bounds: number[]; censored: boolean[] } {
  const order = values.map((v, i) => [v, i] as const).sort((a, b) => a[0] - b[0]);
  const cut = order[values.length - k - 1]![0];
  const bounds = values.slice();
  const censored = values.map(() => false);
  for (const [v, i] of order.slice(values.length - k)) {
    censored[i] = true;
    bounds[i] = cut + (v - cut) / 2; // "at least" a value between the largest uncensored one and the truth
  }
  return { bounds, censored };
}

describe("quantiles under right-censoring", () => {
  it("with fewer than half censored (above the median), the median equals the uncensored median of the same data", () => {
    // The true values of censored cells lie above their bounds, hence above the median; the median's order
    // statistics are then uncensored (censoring rule, harness/stats/censoring.ts). Reference: simple-statistics median.
    for (const [count, k] of [[101, 50], [100, 49], [11, 5], [10, 4]] as const) {
      const values = draws(`below-half-${count}`, count);
      const { bounds, censored } = censorLargest(values, k);
      const q = censoredQuantile(bounds, censored, 0.5);
      expect(q.value).toBe(median(values));
      expect(q.flag).toBe("");
      expect(q.censored).toBe(k);
    }
  });

  it("with half or more censored the median is null with a flag and a valid lower bound", () => {
    // Type-7 median of N values reads the order statistics ⌊(N−1)/2⌋ and ⌈(N−1)/2⌉ (Hyndman & Fan 1996);
    // with N/2 or more censored at +∞ the upper one is censored, so the median is undetermined.
    for (const [count, k] of [[101, 51], [100, 50], [100, 70], [10, 5]] as const) {
      const values = draws(`half-or-more-${count}-${k}`, count);
      const { bounds, censored } = censorLargest(values, k);
      const q = censoredQuantile(bounds, censored, 0.5);
      expect(q.value).toBeNull();
      expect(q.flag).toContain("median censored");
      expect(q.flag).toContain(`${k} of ${count}`);
      expect(q.lower).toBe(median(bounds)); // censored cells at their bounds: the smallest possible median
      expect(q.lower).toBeLessThanOrEqual(median(values));
      expect(q.upper).toBe(Infinity);
    }
  });

  it("the 90 % quantile of 20 values tolerates one censored value, not two", () => {
    // Type 7: h = 19·0.9 = 17.1 reads order statistics 17 and 18 (0-based), so at most 20 − 1 − 18 = 1 censored
    // value can lie above them (hand computation from the definition).
    const values = draws("q90", 20);
    const one = censorLargest(values, 1);
    expect(censoredQuantile(one.bounds, one.censored, 0.9).value).toBe(quantile(values, 0.9));
    const two = censorLargest(values, 2);
    expect(censoredQuantile(two.bounds, two.censored, 0.9).value).toBeNull();
  });

  it("a censored bound below the median leaves the median undetermined", () => {
    // Censored 1.5 could truly be 1.6 (median of 1, 1.6, 2, 3, 4 → 2) or 10 (median → 3): not determined
    // (hand computation).
    const q = censoredQuantile([1, 1.5, 2, 3, 4], [false, true, false, false, false], 0.5);
    expect(q.value).toBeNull();
    expect(q.lower).toBe(2);
    expect(q.upper).toBe(3);
  });

  it("without censoring the bootstrap interval is the plain percentile bootstrap of the median", () => {
    // Both draw N indices per resample from the same seeded stream, so the replicates are identical
    // (reference: the generic bootstrap with simple-statistics' median).
    const values = draws("plain", 37);
    const [med] = bootstrapCensoredQuantiles(values, null, [0.5], { resamples: 2000, seed: "plain" });
    const plain = bootstrap(values, (s) => median(s as number[]), 2000, "plain");
    expect(med!.value).toBe(plain.estimate);
    expect(med!.low).toBe(plain.low);
    expect(med!.high).toBe(plain.high);
    expect(med!.low!).toBeLessThan(med!.value!);
    expect(med!.high!).toBeGreaterThan(med!.value!);
  });

  it("intervals are reproducible from the seed and unbounded above when censoring can reach the upper end", () => {
    // Seeded generator (harness/random.ts): same seed, same interval.
    const values = draws("seeded", 30);
    const { bounds, censored } = censorLargest(values, 12);
    const a = bootstrapCensoredQuantiles(bounds, censored, [0.5, 0.9], { resamples: 1000, seed: "s" });
    const b = bootstrapCensoredQuantiles(bounds, censored, [0.5, 0.9], { resamples: 1000, seed: "s" });
    expect(a).toEqual(b);
    // 12 of 30 censored: median defined (12 < 15), but a resample can hold 15 or more censored cells, so the
    // 97.5 % end of the upper values is +∞ → not reported (rule of censoring.ts).
    expect(a[0]!.value).toBe(median(values));
    expect(a[0]!.low).not.toBeNull();
    expect(a[0]!.high).toBeNull();
    // 90 %: h = 26.1 needs order statistics 26 and 27, at most 2 censored: undefined.
    expect(a[1]!.value).toBeNull();
    expect(a[1]!.flag).toContain("q90 censored");
  });
});
