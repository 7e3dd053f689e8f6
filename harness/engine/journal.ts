/**
 * The append-only record of finished cells (journal.jsonl in the output folder), the single source every
 * table is rebuilt from. One JSON object a line. Each record is written to the file descriptor at once (so a
 * killed process loses nothing the kernel has), and fsync'ed every {@link SYNC_EVERY_RECORDS} records or
 * {@link SYNC_EVERY_MS} ms, whichever comes first (so a power cut loses at most that much).
 */
import { closeSync, existsSync, fsyncSync, openSync, readFileSync, truncateSync } from "node:fs";
import type { CellStatus } from "../types.js";
import { appendWholeOrNothing, guardWrite } from "./fs-guard.js";

/** fsync batch size (records). */
export const SYNC_EVERY_RECORDS = 32;
/** fsync batch age (ms). */
export const SYNC_EVERY_MS = 2000;

/** Fields every record has. */
interface RecordBase {
  readonly key: string;
  readonly n: number;
  readonly index: number;
  readonly file: string;
  readonly status: CellStatus;
  readonly wall_ns: number;
  readonly message: string;
}

/** Ground truth of one instance (also the exhaustive solver's timed run). */
export interface TruthRecord extends RecordBase {
  readonly kind: "truth";
  readonly seed: string;
  readonly meta: Readonly<Record<string, number | string | boolean>>;
  readonly optimum: number | null;
  readonly degeneracy: number | null;
  readonly assignments: number;
  /** Configurations actually evaluated (absent in journals written before it was recorded). */
  readonly evaluated?: number;
  /** Fixed per-cell cost (sum over slices of a one-configuration call), ns; absent in older journals. */
  readonly floor_ns?: number | null;
  readonly mean: number | null;
  /**
   * Elapsed time of the cell, ns, from dispatching its first slice to merging its last (runs.csv `wall_ns`);
   * `wall_ns` of a truth record is the sum over its parallel slices (runs.csv `cpu_ns`). Absent in journals written
   * before it was recorded: their runs.csv `wall_ns` stays empty.
   */
  readonly elapsed_ns?: number;
  // --- issue 16 (exact counting); absent in journals written before it (read as enumeration) ---
  /** "enumeration", "count" (model counter) or "maxsat" (branch and bound). */
  readonly truth_method?: string;
  /** The degeneracy as an exact decimal (may exceed 2^53, where `degeneracy` is rounded). */
  readonly degeneracy_exact?: string;
  /** Decisions made by the counting methods (their work measure). */
  readonly nodes?: number;
  // --- end issue 16 ---
}

/** Trials of a randomised solver at one run length. */
export interface RunRecord extends RecordBase {
  readonly kind: "run";
  readonly solver: string;
  readonly run_length: number;
  readonly trials: number;
  readonly successes: number;
  readonly work: number;
  readonly best: number | null;
  readonly beta_start: number | null;
  readonly beta_end: number | null;
  /** Fixed per-cell cost (the same call with zero trials), ns; absent in older journals. */
  readonly floor_ns?: number | null;
  /**
   * Run-length distribution (solvers that report one, e.g. breakwalk): steps to solution of each finished trial,
   * −1 where the trial was censored at the run length.
   */
  readonly steps_to_solution?: ReadonlyArray<number>;
  /** Tempering: exchange acceptance rate per neighbouring pair of temperatures, hot end first (null: never tried). */
  readonly exchange_acceptance?: ReadonlyArray<number | null>;
  // Further scalar fields come from a solver's `extra` (solvers/types.ts) or an external cell (start-up floor).
}

/**
 * The fields every run record has and the report treats itself; any other scalar field of a run record is a
 * solver's extra result, which runs.csv shows as a column of its own.
 */
export const RUN_RECORD_FIELDS: ReadonlySet<string> = new Set([
  "key", "n", "index", "file", "status", "wall_ns", "message", "kind", "solver", "run_length", "trials", "successes", "work",
  "best", "beta_start", "beta_end", "steps_to_solution", "exchange_acceptance", "floor_ns",
]);

/**
 * A predictor's worker-side numerics at one parameter value. The kind and the field `b` keep the names of the
 * spectral method, the first such predictor, so that older journals resume; `predictor` is absent for it.
 */
export interface SpectralRecord extends RecordBase {
  readonly kind: "spectral";
  /** Predictor name; absent means "spectral". */
  readonly predictor?: string;
  /** The cell's parameter value (b for the spectral method). */
  readonly b: number;
  readonly row: Readonly<Record<string, number | string | boolean | null>>;
}

export type JournalRecord = TruthRecord | RunRecord | SpectralRecord;

/** What was read back from a journal file. */
export interface JournalContents {
  readonly records: JournalRecord[];
  /** Set when the last line was torn (a kill mid-write) and was dropped. */
  readonly tornLine: boolean;
}

/**
 * Reads a journal. A last line without its newline, or that does not parse, is a torn write: it is
 * dropped (and cut from the file when `repair` is set, so later appends start on a clean line).
 * A bad line anywhere else is corruption and throws.
 */
export function readJournal(path: string, repair = false): JournalContents {
  if (!existsSync(path)) return { records: [], tornLine: false };
  const text = readFileSync(path, "utf8");
  const records: JournalRecord[] = [];
  let at = 0;
  let lineNo = 0;
  let tornLine = false;
  while (at < text.length) {
    const end = text.indexOf("\n", at);
    lineNo++;
    const line = end < 0 ? text.slice(at) : text.slice(at, end);
    let parsed: JournalRecord | null = null;
    try {
      parsed = JSON.parse(line) as JournalRecord;
    } catch {
      parsed = null;
    }
    if (end < 0 || parsed === null) {
      if (end >= 0 && end + 1 < text.length) throw new Error(`${path}:${lineNo}: journal line does not parse (the file is damaged)`);
      tornLine = true;
      if (repair) truncateSync(path, Buffer.byteLength(text.slice(0, at), "utf8"));
      break;
    }
    records.push(parsed);
    at = end + 1;
  }
  return { records, tornLine };
}

/** Appends records to a journal file. */
export class JournalWriter {
  private readonly fd: number;
  private unsynced = 0;
  private lastSync = Date.now();

  constructor(private readonly path: string) {
    this.fd = guardWrite(path, path, () => openSync(path, "a"));
  }

  /** Writes one record (one line) now; syncs by batch. */
  append(record: JournalRecord): void {
    // Whole line or nothing: a full disk must not leave half a record that a later append would continue.
    appendWholeOrNothing(this.fd, JSON.stringify(record) + "\n", this.path);
    this.unsynced++;
    if (this.unsynced >= SYNC_EVERY_RECORDS || Date.now() - this.lastSync >= SYNC_EVERY_MS) this.sync();
  }

  /** Forces buffered records to disk. */
  sync(): void {
    if (this.unsynced === 0) return;
    guardWrite(this.path, this.path, () => fsyncSync(this.fd));
    this.unsynced = 0;
    this.lastSync = Date.now();
  }

  close(): void {
    try {
      this.sync();
    } finally {
      closeSync(this.fd);
    }
  }
}
