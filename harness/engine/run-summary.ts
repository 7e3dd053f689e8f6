/** What a run of a study reports when it ends (printed by `run`, written into the manifest). */

/** What a run did. */
export interface RunSummary {
  readonly cellsTotal: number;
  readonly cellsDone: number;
  readonly cellsResumed: number;
  readonly errors: number;
  readonly censored: number;
  readonly skipped: number;
  readonly completeSizes: number[];
  readonly incompleteSizes: number[];
  readonly interrupted: NodeJS.Signals | null;
  readonly tornJournalLine: boolean;
}
