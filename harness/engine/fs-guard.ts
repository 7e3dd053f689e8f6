/**
 * Folders and files the tool writes: created and checked so that a folder that cannot be made or written ends
 * the command with one line (exit 2) at once, and a disk that fills up mid-run ends it with one line (exit 74).
 *
 * Why not `mkdirSync(dir, { recursive: true })`: Node's recursive mkdir reads ENOENT as "the parent is
 * missing", creates the parent (which exists: EEXIST, fine) and retries the child, forever, when the kernel
 * answers ENOENT for a reason other than a missing parent. /proc does exactly that (`mkdir /proc/x` gives
 * ENOENT although /proc exists), so `run --out /proc/x` spun at 100% CPU. Here each missing component is
 * created once, non-recursively, and any error ends the walk.
 */
import { accessSync, closeSync, constants, fstatSync, ftruncateSync, mkdirSync, openSync, statSync, unlinkSync, writeSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { InputError } from "../errors.js";

/** Exit code of a storage failure while writing (disk full, quota, I/O error): sysexits' EX_IOERR. */
export const EXIT_STORAGE = 74;

/** The disk (or quota) ran out, or the device failed, while writing: one line, exit {@link EXIT_STORAGE}. */
export class StorageError extends InputError {
  readonly exitCode = EXIT_STORAGE;
  constructor(message: string) {
    super(message);
    this.name = "StorageError";
  }
}

/** Error codes that mean "this place cannot be written" (the user's choice of folder): exit 2. */
const UNWRITABLE = new Set(["EACCES", "EPERM", "EROFS", "ENOENT", "ENOTDIR", "EISDIR", "EEXIST", "ELOOP", "ENAMETOOLONG", "EINVAL"]);
/** Error codes that mean "the storage gave out" while writing: exit 74. */
const EXHAUSTED = new Set(["ENOSPC", "EDQUOT", "EIO", "EFBIG"]);

/** Plain words for the error codes a user meets when writing. */
const REASON: Readonly<Record<string, string>> = {
  EACCES: "permission denied",
  EPERM: "operation not permitted",
  EROFS: "read-only file system",
  ENOENT: "cannot be created there",
  ENOTDIR: "a part of the path is a file, not a folder",
  EISDIR: "is a folder",
  EEXIST: "exists and is not a folder",
  ELOOP: "too many symbolic links",
  ENAMETOOLONG: "name too long",
  EINVAL: "not a valid place for files",
  ENOSPC: "no space left on the device",
  EDQUOT: "disk quota exceeded",
  EIO: "input/output error",
  EFBIG: "file too large",
};

function codeOf(e: unknown): string {
  return (e as NodeJS.ErrnoException | null)?.code ?? "";
}

/**
 * Turns a file-system error met while writing into the one-line error the CLI prints, or null when it is not
 * one (then it stays an internal error with its stack). `label` names the place: an option (`--out`) or a path.
 */
export function writeFailure(e: unknown, label: string, path?: string): InputError | null {
  const code = codeOf(e);
  const where = path ?? (e as NodeJS.ErrnoException | null)?.path ?? "";
  const text = `${label}${where && where !== label ? `: '${where}'` : ""}: cannot write (${REASON[code] ?? code}, ${code})`;
  if (EXHAUSTED.has(code)) return new StorageError(text);
  if (UNWRITABLE.has(code)) return new InputError(text);
  return null;
}

/** Runs a write; a file-system failure becomes the one-line error of {@link writeFailure}. */
export function guardWrite<T>(label: string, path: string, write: () => T): T {
  try {
    return write();
  } catch (e) {
    throw writeFailure(e, label, path) ?? e;
  }
}

/**
 * Makes sure `dir` exists and the tool can write in it, creating missing folders one level at a time.
 * Throws a one-line InputError naming `label` (an option such as `--out`, or a command's folder) and the path.
 */
export function ensureWritableFolder(dir: string, label: string): string {
  const target = resolve(dir);
  // 1. Find the deepest existing ancestor; every component below it is created in order.
  const missing: string[] = [];
  let at = target;
  for (;;) {
    let kind: "dir" | "other" | "none";
    try {
      kind = statSync(at).isDirectory() ? "dir" : "other";
    } catch (e) {
      // ENOTDIR: an ancestor is a file; keep walking up to name it.
      if (codeOf(e) !== "ENOENT" && codeOf(e) !== "ENOTDIR") throw writeFailure(e, label, target) ?? e;
      kind = "none";
    }
    if (kind === "dir") break;
    if (kind === "other") throw new InputError(`${label}: '${target}': cannot create (${at === target ? "exists and is not a folder" : `'${at}' is a file, not a folder`})`);
    missing.push(at);
    const parent = dirname(at);
    if (parent === at) break;
    at = parent;
  }
  // 2. Create them top-down, each once: no retry loop can spin.
  for (const folder of missing.reverse()) {
    try {
      mkdirSync(folder);
    } catch (e) {
      if (codeOf(e) === "EEXIST" && statSync(folder).isDirectory()) continue; // another process made it meanwhile
      throw new InputError(`${label}: '${target}': cannot create (${REASON[codeOf(e)] ?? codeOf(e)}, ${codeOf(e)})`);
    }
  }
  assertWritableFolder(target, label);
  return target;
}

/**
 * Checks that files can be created in an existing folder: access(W_OK) (which also catches read-only mounts for
 * root) and a probe file created and removed, for file systems (procfs, sysfs) that pass access() but refuse files.
 */
export function assertWritableFolder(dir: string, label: string): void {
  const probe = join(dir, `.speedbound-probe-${process.pid}`);
  try {
    accessSync(dir, constants.W_OK);
    closeSync(openSync(probe, "wx"));
    unlinkSync(probe);
  } catch (e) {
    throw writeFailure(e, label, dir) ?? new InputError(`${label}: '${dir}': cannot write (${codeOf(e) || String(e)})`);
  }
}

/**
 * Appends `data` to an open file completely or not at all: short writes are continued, and a failure (disk full)
 * cuts the file back to where this append began, so a reader never meets half a line from it.
 */
export function appendWholeOrNothing(fd: number, data: string, label: string): void {
  const bytes = Buffer.from(data, "utf8");
  const start = fstatSync(fd).size;
  let done = 0;
  try {
    while (done < bytes.length) done += writeSync(fd, bytes, done, bytes.length - done);
  } catch (e) {
    try {
      ftruncateSync(fd, start);
    } catch {
      // The journal reader drops a torn last line anyway; the write error is the one to report.
    }
    throw writeFailure(e, label) ?? e;
  }
}
