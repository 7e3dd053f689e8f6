// Scale-out: --shard K/N slices are balanced and disjoint, and `merge` rebuilds exactly the tables of a
// single-machine run; it refuses missing, doubled or foreign shards.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cpSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { shardInstances, instancesOf, type StudySpec } from "../harness/engine/study.js";
import { cli, withoutTiming } from "./helpers/cli.js";

const STUDY = ["--family", "ksat", "--n", "8:14:2", "--instances", "3", "--seed", "shards", "--solvers", "exhaustive,walk", "--trials", "40", "--workers", "1"];
let root = "";

beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-shards-"));
  expect(cli(["run", ...STUDY, "--out", join(root, "whole")]).code).toBe(0);
  for (const k of [1, 2, 3]) expect(cli(["run", ...STUDY, "--shard", `${k}/3`, "--out", join(root, `s${k}`)]).code).toBe(0);
});
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe("shards", () => {
  it("partition the instances, balanced by 2^n work", () => {
    const spec = { files: [], sizes: [10, 12, 14, 16, 18, 20], instances: 5 } as unknown as StudySpec;
    const all = instancesOf(spec);
    const parts = [1, 2, 3, 4].map((k) => shardInstances(all, k, 4));
    expect(parts.flat()).toHaveLength(all.length);
    expect(new Set(parts.flat()).size).toBe(all.length);
    const loads = parts.map((p) => p.reduce((s, i) => s + 2 ** i.n, 0));
    const total = loads.reduce((a, b) => a + b, 0);
    // Greedy largest-first: no shard exceeds the mean by more than the largest single item (Graham 1969 bound).
    for (const l of loads) expect(l).toBeLessThanOrEqual(total / 4 + 2 ** 20);
  });

  it("merged shards give the single-machine tables", () => {
    const r = cli(["merge", join(root, "merged"), join(root, "s1"), join(root, "s2"), join(root, "s3")]);
    expect(r.code, r.stderr).toBe(0);
    for (const t of ["instances.csv", "runs.csv", "predictions.csv"]) expect(withoutTiming(join(root, "merged"), t), t).toEqual(withoutTiming(join(root, "whole"), t));
  });

  it("refuses a missing shard", () => {
    const r = cli(["merge", join(root, "m2"), join(root, "s1"), join(root, "s3")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/shard 2 of 3 missing/);
  });

  it("refuses a shard given twice", () => {
    cpSync(join(root, "s2"), join(root, "s2copy"), { recursive: true });
    const r = cli(["merge", join(root, "m3"), join(root, "s1"), join(root, "s2"), join(root, "s2copy"), join(root, "s3")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/shard 2\/3 given twice/);
  });

  it("refuses shards of different studies", () => {
    expect(cli(["run", ...STUDY.map((a) => (a === "shards" ? "other" : a)), "--shard", "2/3", "--out", join(root, "foreign")]).code).toBe(0);
    const r = cli(["merge", join(root, "m4"), join(root, "s1"), join(root, "foreign"), join(root, "s3")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/belongs to a different study/);
  });
});
