/**
 * One writer per output folder: a lock file (`.lock`) holding the owner's pid, its start time and host. A second
 * run into the same folder is refused with one line; a lock whose owner is gone (killed, crashed, rebooted) is
 * taken over, because the pid is checked for life and its start time compared (a recycled pid does not count).
 */
import { linkSync, readFileSync, readdirSync, renameSync, unlinkSync, writeFileSync } from "node:fs";
import { hostname } from "node:os";
import { join } from "node:path";
import { InputError } from "../errors.js";
import { guardWrite } from "./fs-guard.js";

/** The lock file's name inside an output folder. */
export const LOCK_FILE = ".lock";

/** What a lock file holds. */
interface LockOwner {
  readonly pid: number;
  /** Process start time from /proc/PID/stat (clock ticks since boot), or null where /proc is absent. */
  readonly start: string | null;
  readonly host: string;
  readonly since: string;
  readonly command: string;
}

/** Start time of a process (field 22 of /proc/PID/stat), or null when unknown. */
function processStart(pid: number): string | null {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    // The command name (field 2) is in parentheses and may hold spaces: count fields after the last ')'.
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return fields[19] ?? null;
  } catch {
    return null;
  }
}

/** True when the lock's owner still runs (same host, pid alive, same start time). */
function ownerAlive(owner: LockOwner): boolean {
  if (owner.host !== hostname()) return true; // another machine (shared file system): cannot tell, so respect it
  try {
    process.kill(owner.pid, 0);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ESRCH") return false;
  }
  const start = processStart(owner.pid);
  return owner.start === null || start === null || start === owner.start;
}

function readOwner(path: string): LockOwner | null {
  try {
    return JSON.parse(readFileSync(path, "utf8")) as LockOwner;
  } catch {
    return null;
  }
}

/** A held lock; release it when the command ends (it is also released at process exit). */
export interface FolderLock {
  release(): void;
}

/**
 * Takes the lock of `dir` (an existing, writable folder) for this process, or throws a one-line InputError naming
 * the running owner. `label` names the folder's option in messages (e.g. `--out`).
 */
export function lockFolder(dir: string, label: string, command: string): FolderLock {
  const path = join(dir, LOCK_FILE);
  const me: LockOwner = { pid: process.pid, start: processStart(process.pid), host: hostname(), since: new Date().toISOString(), command };
  const tmp = join(dir, `${LOCK_FILE}.${process.pid}`);
  guardWrite(label, dir, () => writeFileSync(tmp, JSON.stringify(me) + "\n"));
  try {
    for (let attempt = 0; attempt < 3; attempt++) {
      try {
        linkSync(tmp, path); // atomic: fails when a lock exists
        break;
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code !== "EEXIST") throw e;
      }
      const owner = readOwner(path);
      if (owner && ownerAlive(owner)) {
        throw new InputError(
          `${label}: '${dir}' is in use by another speedbound run (pid ${owner.pid} on ${owner.host}, since ${owner.since}); wait for it to end or use another folder${owner.host === hostname() ? "" : ` (its liveness cannot be checked from ${hostname()}: if that run is gone, remove ${path})`}`,
        );
      }
      // Stale (its owner is gone, or the file is unreadable): move it aside so exactly one taker removes it.
      const aside = join(dir, `${LOCK_FILE}.stale-${process.pid}`);
      try {
        renameSync(path, aside);
        unlinkSync(aside);
      } catch {
        // another process took it over first; the next attempt sees its lock
      }
      if (attempt === 2) throw new InputError(`${label}: '${dir}': could not take its lock file ${LOCK_FILE}; retry`);
    }
  } finally {
    try {
      unlinkSync(tmp);
    } catch {
      // already gone
    }
  }
  let held = true;
  const release = (): void => {
    if (!held) return;
    held = false;
    process.off("exit", release);
    const owner = readOwner(path);
    if (owner && owner.pid === process.pid && owner.start === me.start) {
      try {
        unlinkSync(path);
      } catch {
        // the folder went away
      }
    }
  };
  process.on("exit", release);
  return { release };
}

/** Lock files left in a folder (for tests and diagnostics). */
export function lockFilesIn(dir: string): string[] {
  return readdirSync(dir).filter((f) => f.startsWith(LOCK_FILE));
}
