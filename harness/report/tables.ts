/**
 * Rebuilds the tidy tables (instances.csv, runs.csv, predictions.csv) from journal records. Closed-form
 * predictors are evaluated here from the recorded ground truth and measured success probabilities: they
 * are pure functions of those, so they need no cells of their own and change when the journal does.
 */
import type { JournalRecord, RunRecord, SpectralRecord, TruthRecord } from "../engine/journal.js";
import type { StudySpec } from "../engine/study.js";
import type { InstanceRow, PredictionRow, RunRow } from "../types.js";
import { ttsFromCounts } from "../stats/tts.js";
import { PREDICTORS, predictorNamed } from "../predict/registry.js";
import { familyNamed } from "../families/registry.js";

/** The three per-observation tables. */
export interface Tables {
  readonly instances: InstanceRow[];
  readonly runs: RunRow[];
  readonly predictions: PredictionRow[];
}

type Cell = string | number | boolean | null;

const byInstance = (a: { n: number; index: number }, b: { n: number; index: number }): number => a.n - b.n || a.index - b.index;

/** Builds the tables of a study from its journal records (deterministic order: n, instance, method, run length). */
export function buildTables(spec: StudySpec, records: ReadonlyArray<JournalRecord>): Tables {
  const truths = records.filter((r): r is TruthRecord => r.kind === "truth").sort(byInstance);
  const runsRec = records.filter((r): r is RunRecord => r.kind === "run").sort(
    (a, b) => byInstance(a, b) || a.solver.localeCompare(b.solver) || a.run_length - b.run_length,
  );
  const spectralRec = records.filter((r): r is SpectralRecord => r.kind === "spectral").sort((a, b) => byInstance(a, b) || a.b - b.b);
  const truthOf = new Map(truths.map((t) => [`${t.n}|${t.index}`, t]));

  const instances: InstanceRow[] = truths.map((t) => ({
    family: spec.family,
    n: t.n,
    instance: t.index,
    seed: t.seed,
    ...t.meta,
    optimum: t.optimum,
    degeneracy: t.degeneracy,
    satisfiable: t.optimum === null || !isCnf(spec) ? null : t.optimum === 0,
    ...(familyNamed(spec.family).describe?.(t.meta, t.optimum) ?? {}),
    mean_cost: t.mean,
    status: t.status,
  }));

  const runs: RunRow[] = [];
  for (const t of truths) {
    runs.push({
      family: spec.family, n: t.n, instance: t.index, solver: "exhaustive", run_length: null, status: t.status,
      wall_ns: t.wall_ns, work: t.evaluated ?? t.assignments, floor_ns: t.floor_ns ?? null, trials: null, successes: null, p: null, p_low: null, p_high: null,
      work_per_trial: null, wall_ns_per_trial: null, tts_ns: t.status === "ok" ? t.wall_ns : null, tts_ns_low: null,
      tts_ns_high: null, tts_work: t.status === "ok" ? (t.evaluated ?? t.assignments) : null, tts_work_low: null, message: t.message,
    });
  }
  for (const r of runsRec) runs.push(runRow(spec, r));
  runs.sort((a, b) => a.n - b.n || a.instance - b.instance || a.solver.localeCompare(b.solver) || (a.run_length ?? 0) - (b.run_length ?? 0));

  const predictions: PredictionRow[] = [];
  for (const t of truths) {
    if (t.status !== "ok" || t.optimum === null || t.degeneracy === null) continue;
    const base = { family: spec.family, n: t.n, instance: t.index };
    const view = { n: t.n, kind: familyNamed(spec.family).kind, optimum: t.optimum, degeneracy: t.degeneracy };
    for (const name of spec.predictors) {
      const parts = predictorNamed(name).fromTruth?.(view) ?? null;
      if (parts !== null) predictions.push(prediction(base, name, parts));
    }
  }
  for (const r of runsRec) {
    const predictor = PREDICTORS.find((p) => p.amplifies === r.solver && p.fromTrials !== undefined && spec.predictors.includes(p.name));
    if (!predictor || r.status === "error" || r.trials === 0) continue;
    const row = runRow(spec, r);
    const parts = predictor.fromTrials!({
      n: r.n, solver: r.solver, runLength: r.run_length, p: row.p ?? 0, pLow: row.p_low ?? undefined, pHigh: row.p_high ?? undefined,
      workPerTrial: row.work_per_trial ?? undefined,
    });
    predictions.push(prediction({ family: spec.family, n: r.n, instance: r.index }, predictor.name, parts));
  }
  for (const s of spectralRec) {
    const truth = truthOf.get(`${s.n}|${s.index}`);
    if (!truth) continue;
    predictions.push({
      family: spec.family, n: s.n, instance: s.index, predictor: s.predictor ?? "spectral", status: s.status,
      queries: null, queries_log2: null, queries_low: null, queries_high: null,
      ...s.row, wall_ns: s.wall_ns, message: s.message,
    } as PredictionRow);
  }
  markBestB(predictions);
  predictions.sort((a, b) => a.n - b.n || a.instance - b.instance || a.predictor.localeCompare(b.predictor) || Number(a.b ?? 0) - Number(b.b ?? 0));
  return { instances, runs, predictions };
}

/**
 * With a b scan, marks per instance the spectral row with the fewest predicted queries among those whose gap
 * passes its threshold (`b_best`); rows with a failing gap are never chosen.
 */
function markBestB(predictions: PredictionRow[]): void {
  const best = new Map<string, PredictionRow>();
  for (const row of predictions) {
    if (row.predictor !== "spectral") continue;
    row.b_best = false;
    if (row.status !== "ok" || row.gap_ok !== true || row.queries === null) continue;
    const key = `${row.n}|${row.instance}`;
    const current = best.get(key);
    if (current === undefined || (row.queries as number) < (current.queries as number)) best.set(key, row);
  }
  for (const row of best.values()) row.b_best = true;
}

function isCnf(spec: StudySpec): boolean {
  return familyNamed(spec.family).kind === "cnf";
}

function runRow(spec: StudySpec, r: RunRecord): RunRow {
  const wallPerTrial = r.trials > 0 ? r.wall_ns / r.trials : null;
  const workPerTrial = r.trials > 0 ? r.work / r.trials : null;
  const tts = r.trials > 0 && wallPerTrial !== null ? ttsFromCounts(r.successes, r.trials, wallPerTrial) : null;
  const ttsWork = r.trials > 0 && workPerTrial !== null ? ttsFromCounts(r.successes, r.trials, workPerTrial) : null;
  const finite = (x: number | null | undefined): number | null => (x === null || x === undefined || !Number.isFinite(x) ? null : x);
  return {
    family: spec.family, n: r.n, instance: r.index, solver: r.solver, run_length: r.run_length, status: r.status,
    wall_ns: r.wall_ns, work: r.work, floor_ns: r.floor_ns ?? null, trials: r.trials, successes: r.successes,
    p: tts ? tts.p : null, p_low: tts ? tts.p_low : null, p_high: tts ? tts.p_high : null,
    work_per_trial: workPerTrial, wall_ns_per_trial: wallPerTrial,
    tts_ns: finite(tts?.tts), tts_ns_low: finite(tts?.tts_low), tts_ns_high: finite(tts?.tts_high),
    tts_work: finite(ttsWork?.tts),
    tts_work_low: finite(ttsWork?.tts_low),
    message: r.message,
  };
}

function prediction(base: { family: string; n: number; instance: number }, predictor: string, parts: object): PredictionRow {
  const p = parts as Record<string, Cell>;
  return {
    ...base, predictor, status: "ok",
    queries: (p.queries as number | null) ?? null,
    queries_log2: (p.queries_log2 as number | null) ?? null,
    queries_low: (p.queries_low as number | null) ?? null,
    queries_high: (p.queries_high as number | null) ?? null,
    ...p,
  };
}
