/**
 * Night-to-night comparison of two output folders of the same study: ground truth that differs (never allowed
 * for the same seeds), scaling exponents that moved by more than their combined intervals, and solvers whose
 * time per elementary step changed by more than a tolerance. Work exponents cannot move through timing noise:
 * the run length per size is chosen from work (report/observations.ts), and work is deterministic for a seed.
 * Two folders that differ only in the master seed are compared as a seed-to-seed check: every median exponent
 * of both, with its interval, and whether the intervals overlap (a referee's question), no ground-truth check.
 */
import { join } from "node:path";
import { InputError } from "../errors.js";
import { readJournal, type JournalRecord, type TruthRecord } from "../engine/journal.js";
import type { StudySpec } from "../engine/study.js";
import { OUT_FILES, readStudyFolder } from "../engine/output-folder.js";
import { buildTables } from "./tables.js";
import { fitStudy, type FitRow } from "./fits.js";
import { REPORT_BOOTSTRAP_SEED } from "./paper.js";
import type { RunRow } from "../types.js";
import { quantileOf } from "../stats/quantiles.js";

/** One finding of a comparison. */
export interface Finding {
  readonly kind: "ground-truth" | "exponent" | "speed" | "seed-to-seed";
  /** True when a nightly job should alert. */
  readonly regression: boolean;
  readonly what: string;
  readonly old: number | null;
  readonly new: number | null;
  readonly detail: string;
}

/** Default relative change in time per step that counts (25 %: shared machines vary by about that, common practice). */
export const DEFAULT_SPEED_TOLERANCE = 0.25;

/** Compares two folders; throws InputError when they are not the same study. */
export function compareFolders(oldDir: string, newDir: string, tolerance: number): Finding[] {
  const a = readStudyFolder(oldDir);
  const b = readStudyFolder(newDir);
  const seedOnly = JSON.stringify(a.spec) !== JSON.stringify(b.spec) && JSON.stringify({ ...a.spec, seed: "" }) === JSON.stringify({ ...b.spec, seed: "" });
  if (JSON.stringify(a.spec) !== JSON.stringify(b.spec) && !seedOnly) {
    throw new InputError(`${newDir}: is not the same study as ${oldDir} (spec.json differs beyond the seed); compare runs of one study`);
  }
  const oldRecords = readJournal(join(oldDir, OUT_FILES.journal)).records;
  const newRecords = readJournal(join(newDir, OUT_FILES.journal)).records;
  const findings: Finding[] = [];

  if (seedOnly) return seedToSeed(a.spec, b.spec, oldRecords, newRecords);

  // 1. Ground truth must be identical for the same seeds.
  const truths = (rs: typeof oldRecords) => new Map(rs.filter((r): r is TruthRecord => r.kind === "truth" && r.status === "ok").map((r) => [r.key, r]));
  const oldTruth = truths(oldRecords);
  for (const [key, t] of truths(newRecords)) {
    const o = oldTruth.get(key);
    if (!o) continue;
    const scale = Math.max(1, Math.abs(o.optimum ?? 0));
    if (Math.abs((o.optimum ?? 0) - (t.optimum ?? 0)) > 1e-9 * scale || o.degeneracy !== t.degeneracy) {
      findings.push({ kind: "ground-truth", regression: true, what: key, old: o.optimum, new: t.optimum, detail: `optimum/degeneracy ${o.optimum}/${o.degeneracy} → ${t.optimum}/${t.degeneracy}: same seed, different ground truth (a bug)` });
    }
  }

  // 2. Exponents of the median fits, per method and measure.
  const fitsOf = (records: typeof oldRecords): FitRow[] => {
    const t = buildTables(a.spec, records);
    return fitStudy(t.runs, t.predictions, { resamples: a.spec.report.resamples, seed: REPORT_BOOTSTRAP_SEED, fitFrom: a.spec.report.fitFrom, floorFactor: a.spec.report.floorFactor, quantiles: [0.5] });
  };
  const oldFits = new Map(fitsOf(oldRecords).map((f) => [`${f.method}|${f.measure}`, f]));
  for (const f of fitsOf(newRecords)) {
    const o = oldFits.get(`${f.method}|${f.measure}`);
    if (!o || o.exponent === null || f.exponent === null || o.exponent_low === null || o.exponent_high === null || f.exponent_low === null || f.exponent_high === null) continue;
    // Combined half-width of two independent intervals (root-sum-square), common practice.
    const h = Math.hypot((o.exponent_high - o.exponent_low) / 2, (f.exponent_high - f.exponent_low) / 2);
    const delta = f.exponent - o.exponent;
    if (Math.abs(delta) > h) {
      const worse = f.method_kind === "solver" ? delta > 0 : false;
      const deterministic = f.method_kind === "predictor"
        ? "; a predictor is deterministic: check the code change"
        : f.basis === "work"
          ? "; work is deterministic for a seed (exhaustive: for a worker count): check the code change or the limits"
          : "";
      findings.push({ kind: "exponent", regression: worse, what: `${f.method} ${f.measure}`, old: o.exponent, new: f.exponent, detail: `exponent moved by ${delta.toFixed(4)} (combined interval half-width ${h.toFixed(4)})${deterministic}` });
    }
  }

  // 3. Time per elementary step, per solver: median over sizes of the per-size median ratio.
  const perStep = (rows: RunRow[]): Map<string, number> => {
    const groups = new Map<string, number[]>();
    for (const r of rows) {
      if (r.status !== "ok" || !(r.work > 0)) continue;
      // CPU time per step (exhaustive: summed over its parallel slices), so the ratio does not depend on --workers.
      const key = `${r.solver}|${r.n}`;
      const list = groups.get(key) ?? [];
      list.push(r.cpu_ns / r.work);
      groups.set(key, list);
    }
    return new Map([...groups].map(([k, v]) => [k, quantileOf(v, 0.5)]));
  };
  const oldSteps = perStep(buildTables(a.spec, oldRecords).runs);
  const newSteps = perStep(buildTables(b.spec, newRecords).runs);
  const ratios = new Map<string, number[]>();
  for (const [key, v] of newSteps) {
    const o = oldSteps.get(key);
    if (o === undefined || !(o > 0)) continue;
    const solver = key.split("|")[0];
    const list = ratios.get(solver) ?? [];
    list.push(v / o);
    ratios.set(solver, list);
  }
  for (const [solver, list] of ratios) {
    const ratio = quantileOf(list, 0.5);
    if (Math.abs(ratio - 1) > tolerance) {
      findings.push({ kind: "speed", regression: ratio > 1, what: `${solver} time per step`, old: 1, new: ratio, detail: `${ratio > 1 ? "slower" : "faster"} by ${(Math.abs(ratio - 1) * 100).toFixed(1)} % (median over ${list.length} sizes; tolerance ${(tolerance * 100).toFixed(0)} %)` });
    }
  }
  return findings;
}

/**
 * Seed-to-seed comparison: the median exponent of every method and measure in both folders, with intervals. A
 * pair whose intervals do not overlap is worth a look (not a regression: different instances).
 */
function seedToSeed(specA: StudySpec, specB: StudySpec, recordsA: JournalRecord[], recordsB: JournalRecord[]): Finding[] {
  const fitsOf = (spec: StudySpec, records: JournalRecord[]): FitRow[] => {
    const t = buildTables(spec, records);
    return fitStudy(t.runs, t.predictions, { resamples: spec.report.resamples, seed: REPORT_BOOTSTRAP_SEED, fitFrom: spec.report.fitFrom, floorFactor: spec.report.floorFactor, quantiles: [0.5] });
  };
  const before = new Map(fitsOf(specA, recordsA).map((f) => [`${f.method}|${f.measure}`, f]));
  const out: Finding[] = [];
  const iv = (f: FitRow): string =>
    f.exponent === null ? "no fit" : `${f.exponent.toFixed(4)} [${f.exponent_low?.toFixed(4) ?? "–"}, ${f.exponent_high?.toFixed(4) ?? "–"}]`;
  for (const f of fitsOf(specB, recordsB)) {
    const o = before.get(`${f.method}|${f.measure}`);
    if (o === undefined) continue;
    const overlap =
      o.exponent_low !== null && o.exponent_high !== null && f.exponent_low !== null && f.exponent_high !== null
        ? o.exponent_low <= f.exponent_high && f.exponent_low <= o.exponent_high
          ? "intervals overlap"
          : "intervals do not overlap"
        : "no intervals";
    out.push({
      kind: "seed-to-seed",
      regression: false,
      what: `${f.method} ${f.measure}`,
      old: o.exponent,
      new: f.exponent,
      detail: `seed ${specA.seed}: ${iv(o)}; seed ${specB.seed}: ${iv(f)}; ${overlap}`,
    });
  }
  return out;
}
