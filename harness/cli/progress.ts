/**
 * Progress reporting: a bar with ETA on a terminal (cli-progress), one log line per finished size otherwise
 * (nightly cron logs), nothing in tests.
 */
import cliProgress from "cli-progress";

import type { Progress } from "../engine/progress.js";

export { silentProgress, type Progress } from "../engine/progress.js";

/** Chooses the bar on a TTY and log lines otherwise; messages go to stderr so stdout stays for data. */
export function consoleProgress(stream: NodeJS.WriteStream = process.stderr): Progress {
  if (!stream.isTTY) {
    const started = Date.now();
    let count = 0;
    return {
      start(total, alreadyDone) {
        stream.write(`speedbound: ${total} cells${alreadyDone ? ` (${alreadyDone} already in the journal, resuming)` : ""}\n`);
      },
      tick() {
        count++;
      },
      sizeDone(n, complete) {
        stream.write(`speedbound: n=${n} ${complete ? "complete" : "INCOMPLETE"}, ${count} cells this run, ${((Date.now() - started) / 1000).toFixed(1)} s\n`);
      },
      note(line) {
        stream.write(`speedbound: ${line}\n`);
      },
      stop() {},
    };
  }
  const bar = new cliProgress.SingleBar(
    { format: "cells {bar} {value}/{total} | {percentage}% | elapsed {duration_formatted} | ETA {eta_formatted} | {last}", stream, hideCursor: true, etaBuffer: 50 },
    cliProgress.Presets.shades_classic,
  );
  return {
    start(total, alreadyDone) {
      bar.start(total, alreadyDone, { last: "" });
    },
    tick(key) {
      bar.increment(1, { last: key });
    },
    sizeDone() {},
    note(line) {
      stream.write(`\n${line}\n`);
    },
    stop() {
      bar.stop();
    },
  };
}
