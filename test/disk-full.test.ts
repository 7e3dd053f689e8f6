// Issue 14: the disk fills up while a study runs. A small tmpfs stands in for a full disk (CI runs as root; the test
// skips with a message where mount is not permitted). The journal keeps every acknowledged record (whole lines only),
// the run stops with one clear line and a non-zero exit, and a resume on a disk with room ends with the same tables
// as an uninterrupted run (timing columns aside).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cpSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync } from "node:fs";
import { spawnSync } from "node:child_process";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { cli, withoutTiming } from "./helpers/cli.js";

const STUDY = ["--n", "6:9", "--instances", "12", "--trials", "5", "--sweeps", "10,20", "--predict", "grover", "--workers", "2", "--seed", "full-1"];
const TABLES = ["instances.csv", "runs.csv", "predictions.csv"];
let root = "";
let mounted = false;
beforeAll(() => {
  root = mkdtempSync(join(tmpdir(), "speedbound-full-"));
  mkdirSync(join(root, "small"));
  // 48 KiB: room for spec.json and part of the journal (~4 cells of 4 sizes × 12 instances × 4 cells, ~350 B each).
  mounted = process.getuid?.() === 0 && spawnSync("mount", ["-t", "tmpfs", "-o", "size=48k", "tmpfs", join(root, "small")]).status === 0;
});
afterAll(() => {
  if (mounted) spawnSync("umount", [join(root, "small")]);
  rmSync(root, { recursive: true, force: true });
});

describe("disk full during a study", () => {
  it("keeps whole acknowledged records, stops with one line, and resumes elsewhere to the same tables", (ctx) => {
    if (!mounted) return ctx.skip("cannot mount a small tmpfs here (needs root): disk-full case not checked");
    const whole = join(root, "whole");
    expect(cli(["run", ...STUDY, "--out", whole]).code).toBe(0);
    const full = join(root, "small", "study");
    const r = cli(["run", ...STUDY, "--out", full]);
    expect(r.code, r.stderr).toBe(74);
    const errors = r.stderr.split("\n").filter((l) => /cannot write/.test(l));
    expect(errors, r.stderr).toHaveLength(1);
    expect(errors[0]).toMatch(/no space left on the device, ENOSPC/);
    expect(r.stderr).not.toMatch(/\n\s+at /);
    // Every line of the journal is a whole record; none is doubled; no temporary file is left.
    const text = readFileSync(join(full, "journal.jsonl"), "utf8");
    expect(text.endsWith("\n") || text === "").toBe(true);
    const keys = text.split("\n").filter((l) => l !== "").map((l) => (JSON.parse(l) as { key: string }).key);
    expect(keys.length).toBeGreaterThan(0);
    expect(new Set(keys).size).toBe(keys.length);
    expect(readdirSync(full).filter((f) => f.includes(".tmp-"))).toEqual([]);
    // Resume on a disk with room.
    const moved = join(root, "moved");
    cpSync(full, moved, { recursive: true });
    const again = cli(["run", ...STUDY, "--out", moved]);
    expect(again.code, again.stderr).toBe(0);
    expect(again.stdout).toMatch(/resumed from the journal/);
    for (const t of TABLES) expect(withoutTiming(moved, t), t).toEqual(withoutTiming(whole, t));
  });
});
