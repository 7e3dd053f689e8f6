// Issue 14: quick commands that start and stop the worker pool must never abort. Before the fix, destroying the pool
// while a worker was still loading its ESM entry through require() aborted the process (exit 134, "FATAL ERROR:
// v8::Module::IsGraphAsync"). This is the short loop (a few seconds); test/stress/quick-commands.ts is the long count
// that .ci/run runs (1000 commands).
import { describe, expect, it } from "vitest";
import { stressQuickCommands } from "./helpers/stress.js";

describe("quick commands under repetition", () => {
  it("16 commands (solve, tiny run, spectral, pool start/stop) all exit 0", async () => {
    const r = await stressQuickCommands(16, 2);
    expect(r.abnormal, JSON.stringify(r.abnormal)).toEqual([]);
    expect(r.byKind).toEqual({ solve: 4, run: 4, spectral: 4, pool: 4 });
  });
});
