/**
 * Rebuilds the tidy tables (instances.csv, runs.csv, predictions.csv) from journal records. Closed-form
 * predictors are evaluated here from the recorded ground truth and measured success probabilities: they
 * are pure functions of those, so they need no cells of their own and change when the journal does.
 */
import { RUN_RECORD_FIELDS, type JournalRecord, type RunRecord, type SpectralRecord, type TruthRecord } from "../engine/journal.js";
import type { StudySpec } from "../engine/study.js";
import type { InstanceRow, PredictionRow, RunRow } from "../types.js";
import { ttsFromCounts } from "../stats/tts.js";
import { bestCutoff, medianFlips, runLengthsFromSteps } from "../stats/run-length.js";
import { PREDICTORS, predictorNamed } from "../predict/registry.js";
import { familyNamed } from "../families/registry.js";

/**
 * instances.csv names of family descriptors whose journal name (kept, so older folders rebuild) is ambiguous:
 * the p-spin order `p` (p is a success probability elsewhere).
 */
export const INSTANCE_COLUMNS: Readonly<Record<string, string>> = { p: "order" };

/**
 * predictions.csv names of predictor result fields whose journal/result name meant two things (issue 11, item 7).
 * Keys are `field` (every predictor) or `predictor:field` (one predictor); the predictors' result types and the
 * journal keep their own names.
 *  - p, p_low, p_high (amplified solvers: the measured per-trial success probability) → trial_success_p…, as in runs.csv;
 *  - success_probability (Grover and amplified solvers: success probability of one attempt) → attempt_success_p;
 *  - rounds: amplified solvers' amplification rounds per attempt m* → amplification_rounds; the spectral method's
 *    1/(|⟨+|ψ_b⟩|·√P_opt), expected preparations of ψ_b, each one phase estimation → state_preparations;
 *  - iterations: grover-unknown's expected Grover iterations → grover_iterations; the spectral method's products
 *    with H_b in its Lanczos solve → lanczos_products;
 *  - steps, steps_low, steps_high (work per trial × expected trial runs: elementary operations, the unit of runs.csv
 *    `work`) → expected_work, expected_work_low, expected_work_high.
 */
export const PREDICTION_COLUMNS: Readonly<Record<string, string>> = {
  p: "trial_success_p",
  p_low: "trial_success_p_low",
  p_high: "trial_success_p_high",
  success_probability: "attempt_success_p",
  rounds: "amplification_rounds",
  "spectral:rounds": "state_preparations",
  iterations: "grover_iterations",
  "spectral:iterations": "lanczos_products",
  steps: "expected_work",
  steps_low: "expected_work_low",
  steps_high: "expected_work_high",
};

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
    ...renamed(t.meta, INSTANCE_COLUMNS),
    optimum: t.optimum,
    // issue 16: exact even beyond 2^53 (the decimal digits), and the method that gave it.
    degeneracy: t.degeneracy !== null && t.degeneracy >= 2 ** 53 && t.degeneracy_exact ? t.degeneracy_exact : t.degeneracy,
    truth_method: t.truth_method ?? "enumeration",
    satisfiable: t.optimum === null || !isCnf(spec) ? null : t.optimum === 0,
    ...(familyNamed(spec.family).describe?.(t.meta, t.optimum) ?? {}),
    mean_cost: t.mean,
    status: t.status,
  }));

  const runs: RunRow[] = [];
  for (const t of truths) {
    runs.push({
      // issue 16: the counting methods report under their own name, with decisions as their work.
      family: spec.family, n: t.n, instance: t.index, solver: truthSolver(t), run_length: null, status: t.status,
      // The journal's wall_ns of a truth cell is the sum over its parallel slices: CPU time. Its elapsed time is
      // elapsed_ns (absent in older journals: wall_ns stays empty). TTS is CPU time, independent of --workers.
      wall_ns: t.elapsed_ns ?? null, cpu_ns: t.wall_ns, work: truthWork(t), floor_ns: t.floor_ns ?? null, trials: null, successes: null,
      trial_success_p: null, trial_success_p_low: null, trial_success_p_high: null,
      work_per_trial: null, wall_ns_per_trial: null, tts_ns: t.status === "ok" ? t.wall_ns : null, tts_ns_low: null,
      tts_ns_high: null, tts_work: t.status === "ok" ? truthWork(t) : null, tts_work_low: null, message: t.message,
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
      n: r.n, solver: r.solver, runLength: r.run_length, p: row.trial_success_p ?? 0, pLow: row.trial_success_p_low ?? undefined,
      pHigh: row.trial_success_p_high ?? undefined,
      workPerTrial: row.work_per_trial ?? undefined,
    });
    predictions.push(prediction({ family: spec.family, n: r.n, instance: r.index }, predictor.name, parts));
  }
  for (const s of spectralRec) {
    const truth = truthOf.get(`${s.n}|${s.index}`);
    if (!truth) continue;
    // The record's status is the cell's (ok, skipped, error); a row's own `status` and `n` would only repeat it.
    const { status: _status, n: _n, ...row } = s.row;
    predictions.push({
      family: spec.family, n: s.n, instance: s.index, predictor: s.predictor ?? "spectral", status: s.status,
      queries: null, queries_log2: null, queries_low: null, queries_high: null,
      ...renamed(row as Record<string, Cell>, PREDICTION_COLUMNS, s.predictor ?? "spectral"), wall_ns: s.wall_ns, message: s.message,
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
  const row = runRowColumns(spec, r);
  // The distribution travels with the row for the report's fine-grid rule, but is no runs.csv column.
  if (r.steps_to_solution !== undefined) Object.defineProperty(row, "steps_to_solution", { value: r.steps_to_solution, enumerable: false });
  return row;
}

function runRowColumns(spec: StudySpec, r: RunRecord): RunRow {
  const wallPerTrial = r.trials > 0 ? r.wall_ns / r.trials : null;
  const workPerTrial = r.trials > 0 ? r.work / r.trials : null;
  const tts = r.trials > 0 && wallPerTrial !== null ? ttsFromCounts(r.successes, r.trials, wallPerTrial) : null;
  const ttsWork = r.trials > 0 && workPerTrial !== null ? ttsFromCounts(r.successes, r.trials, workPerTrial) : null;
  const finite = (x: number | null | undefined): number | null => (x === null || x === undefined || !Number.isFinite(x) ? null : x);
  return {
    family: spec.family, n: r.n, instance: r.index, solver: r.solver, run_length: r.run_length, status: r.status,
    // One worker ran the whole cell: its elapsed time is its CPU time.
    wall_ns: r.wall_ns, cpu_ns: r.wall_ns, work: r.work, floor_ns: r.floor_ns ?? null, trials: r.trials, successes: r.successes,
    trial_success_p: tts ? tts.p : null, trial_success_p_low: tts ? tts.p_low : null, trial_success_p_high: tts ? tts.p_high : null,
    work_per_trial: workPerTrial, wall_ns_per_trial: wallPerTrial,
    tts_ns: finite(tts?.tts), tts_ns_low: finite(tts?.tts_low), tts_ns_high: finite(tts?.tts_high),
    tts_work: finite(ttsWork?.tts),
    tts_work_low: finite(ttsWork?.tts_low),
    ...extraColumns(r),
    message: r.message,
  };
}

/**
 * The solver-specific columns of a run row: the solver's own extra results (every scalar field of the record the
 * report does not treat itself), a summary of the run-length distribution when the solver recorded one (median
 * flips to solution, and the restart cut-off minimising TTS with its success probability and TTS, in flips:
 * harness/stats/run-length.ts), and tempering's exchange acceptance rates (one `;`-separated column, hot end first,
 * and their minimum: a pair that never swaps cuts the ladder in two).
 */
function extraColumns(r: RunRecord): Record<string, Cell> {
  const out: Record<string, Cell> = {};
  for (const [key, value] of Object.entries(r)) {
    if (RUN_RECORD_FIELDS.has(key)) continue;
    if (value === null || typeof value === "number" || typeof value === "string" || typeof value === "boolean") out[key] = value;
  }
  if (r.steps_to_solution !== undefined) {
    const rld = runLengthsFromSteps(r.steps_to_solution, r.run_length);
    const median = medianFlips(rld);
    const best = bestCutoff(rld);
    out.rld_median_flips = Number.isFinite(median) ? median : null;
    out.rld_best_cutoff = best?.cutoff ?? null;
    out.rld_best_trial_success_p = best?.p ?? null;
    out.rld_best_tts_flips = best?.tts ?? null;
  }
  if (r.exchange_acceptance !== undefined) {
    const rates = r.exchange_acceptance.map((x) => (x === null || !Number.isFinite(x) ? null : x));
    out.exchange_acceptance = rates.map((x) => (x === null ? "" : x.toFixed(4))).join(";");
    out.exchange_acceptance_min = rates.length > 0 && rates.every((x) => x !== null) ? Math.min(...(rates as number[])) : null;
  }
  return out;
}

function prediction(base: { family: string; n: number; instance: number }, predictor: string, parts: object): PredictionRow {
  const p = renamed(parts as Record<string, Cell>, PREDICTION_COLUMNS);
  return {
    ...base, predictor, status: "ok",
    queries: (p.queries as number | null) ?? null,
    queries_log2: (p.queries_log2 as number | null) ?? null,
    queries_low: (p.queries_low as number | null) ?? null,
    queries_high: (p.queries_high as number | null) ?? null,
    ...p,
  };
}

// --- issue 16 (exact counting) ---
/** Solver name of a truth cell in runs.csv: "exhaustive" for enumeration, else the counting method ("none" if none ran). */
function truthSolver(t: TruthRecord): string {
  return t.truth_method === "count" || t.truth_method === "maxsat" || t.truth_method === "none" ? t.truth_method : "exhaustive";
}

/** Work of a truth cell: configurations evaluated by enumeration, decisions made by the counting methods. */
function truthWork(t: TruthRecord): number {
  return t.truth_method === "count" || t.truth_method === "maxsat" ? (t.nodes ?? 0) : (t.evaluated ?? t.assignments);
}
// --- end issue 16 ---

/**
 * A copy of `fields` with keys renamed by `names` (`key` or, with `scope`, `scope:key` first), order kept.
 */
function renamed(fields: Readonly<Record<string, Cell>>, names: Readonly<Record<string, string>>, scope?: string): Record<string, Cell> {
  const out: Record<string, Cell> = {};
  for (const [key, value] of Object.entries(fields)) out[(scope !== undefined ? names[`${scope}:${key}`] : undefined) ?? names[key] ?? key] = value;
  return out;
}
