/**
 * Every option of a study as it took effect, for manifest.json: each declared option (options.ts) with the
 * value given or its default (null when it has neither), and the run's own settings after parsing (budget and
 * cell limit in milliseconds, workers, shard, output folder), so a table can be traced to every setting.
 */
import { STUDY_OPTIONS } from "./options.js";

/** The run settings resolved by the command (not part of the study's identity). */
export interface RunSettings {
  readonly out: string;
  readonly workers: number;
  readonly budgetMs: number | null;
  readonly cellLimitMs: number | null;
  readonly shard: { readonly k: number; readonly count: number } | null;
}

/** Option name → value in effect (given or default), plus the parsed run settings. */
export function resolvedOptions(argv: Readonly<Record<string, unknown>>, run: RunSettings): Record<string, unknown> {
  const options: Record<string, unknown> = {};
  for (const o of STUDY_OPTIONS) {
    const given = argv[o.name];
    options[o.name] = given === undefined ? (o.default ?? null) : given;
  }
  return {
    ...options,
    out: run.out,
    workers: run.workers,
    budget_ms: run.budgetMs,
    cell_limit_ms: run.cellLimitMs,
    shard: run.shard === null ? null : `${run.shard.k}/${run.shard.count}`,
  };
}
