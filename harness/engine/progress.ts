/** What the run loop tells about its progress; the CLI edge (cli/progress.ts) shows it, tests ignore it. */

/** Progress events of a run. */
export interface Progress {
  start(total: number, alreadyDone: number): void;
  tick(key: string): void;
  sizeDone(n: number, complete: boolean): void;
  note(line: string): void;
  stop(): void;
}

/** A progress reporter that says nothing. */
export const silentProgress: Progress = { start() {}, tick() {}, sizeDone() {}, note() {}, stop() {} };
