/**
 * The ground-truth cell's two times (issue 11, item 7): runs.csv `cpu_ns` is the sum of its parallel slices' own
 * times, `wall_ns` the span from the first slice's start to the last slice's end. Check values follow from that
 * definition by hand (interval arithmetic), not from the code.
 */
import { describe, expect, it } from "vitest";
import { slicesElapsed } from "../harness/engine/ground-truth.js";
import type { TruthSliceAnswer } from "../harness/engine/tasks.js";

const slice = (start: bigint, wall: number): TruthSliceAnswer =>
  ({ result: {} as TruthSliceAnswer["result"], wall_ns: wall, start_ns: String(start), floor_ns: null, meta: {}, seed: "", mean: 0 });

describe("elapsed time of a cell run in slices", () => {
  it("overlapping slices: span [1000, 1250] = 250 ns while the slices sum to 400 ns", () => {
    expect(slicesElapsed([slice(1000n, 200), slice(1050n, 200)])).toBe(250);
  });

  it("a slice that started late (queued) stretches the span beyond the sum: [0, 100] ∪ [500, 600] = 600 ns", () => {
    expect(slicesElapsed([slice(500n, 100), slice(0n, 100)])).toBe(600);
  });

  it("one slice: its own time", () => {
    expect(slicesElapsed([slice(123n, 77)])).toBe(77);
  });

  it("start times beyond 2^53 ns (a machine up for > 104 days) keep nanosecond precision", () => {
    const base = 2n ** 60n;
    expect(slicesElapsed([slice(base + 3n, 10), slice(base, 5)])).toBe(13);
  });
});
