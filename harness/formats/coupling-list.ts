/**
 * The coupling list: speedbound's plain-text format for Ising cost functions (family `ising --from DIR`,
 * `speedbound solve FILE`).
 *
 * ```
 * # comment lines (first non-blank character '#') and blank lines may appear anywhere
 * 4            <- the number of spins n (a positive integer), the first line that is not a comment
 * 0 1 -1.5     <- a term: 0-based spin indices, then the coefficient J; it adds −J·s_0·s_1 to the energy
 * 2 0.25       <- one index: a local field, adds −0.25·s_2
 * 0 1 3 1e-3   <- any order; indices distinct within a term
 * ```
 * Tokens are separated by spaces or tabs; lines end in LF or CRLF. Repeated terms add up. The energy has no
 * constant offset. Malformed input throws {@link InputError} with the one-line message `FILE:LINE: what is wrong`.
 */
import { InputError } from "../errors.js";
import type { Ising } from "../model/ising.js";

/** Largest spin count the reader accepts (indices are stored as 32-bit integers). */
export const COUPLING_LIST_MAX_SPINS = 2 ** 31 - 1;

const INTEGER = /^[+-]?[0-9]+$/;
const DECIMAL = /^[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?$/;
const NON_FINITE = /^[+-]?(inf|infinity|nan)$/i;

/**
 * Parses a coupling list.
 * @param text - the file's contents.
 * @param file - the name used in error messages.
 * @throws InputError `FILE:LINE: what is wrong` on: an empty file or one without a spin count, a spin count that is
 *   not a positive integer, a term line with no index or no coefficient, a non-numeric token, an index out of
 *   range or repeated within its term, a non-finite coefficient.
 */
export function parseCouplingList(text: string, file: string): Ising {
  const lines = text.split(/\r?\n/);
  // A final newline leaves one empty string that is not a line of its own.
  if (lines.length > 1 && lines[lines.length - 1] === "") lines.pop();
  const fail = (line: number, what: string): never => {
    throw new InputError(`${file}:${line}: ${what}`);
  };
  let spins = -1;
  const spinList: number[] = [];
  const offsets: number[] = [0];
  const coefficients: number[] = [];
  for (let k = 0; k < lines.length; k++) {
    const lineNo = k + 1;
    const body = lines[k].trim();
    if (body === "" || body.startsWith("#")) continue;
    const tokens = body.split(/[ \t]+/);
    if (spins < 0) {
      // 1. The spin count.
      if (tokens.length > 1) fail(lineNo, `expected the number of spins alone on the line, found ${tokens.length} tokens`);
      const tok = tokens[0];
      if (INTEGER.test(tok)) {
        const v = Number(tok);
        if (v <= 0) fail(lineNo, `the number of spins must be a positive integer, found ${show(tok)}`);
        if (v > COUPLING_LIST_MAX_SPINS) fail(lineNo, `the number of spins ${show(tok)} exceeds ${COUPLING_LIST_MAX_SPINS}`);
        spins = v;
      } else if (DECIMAL.test(tok) || NON_FINITE.test(tok)) {
        fail(lineNo, `the number of spins must be a positive integer, found ${show(tok)}`);
      } else fail(lineNo, `non-numeric token ${show(tok)} where the number of spins was expected`);
      continue;
    }
    // 2. A term: indices, then the coefficient.
    for (const tok of tokens) {
      if (!DECIMAL.test(tok) && !NON_FINITE.test(tok)) fail(lineNo, `non-numeric token ${show(tok)}`);
    }
    if (tokens.length === 1) {
      if (INTEGER.test(tokens[0])) fail(lineNo, `missing coefficient after the spin index ${show(tokens[0])}`);
      fail(lineNo, `term has no spin index before the coefficient ${show(tokens[0])}`);
    }
    const start = spinList.length;
    for (let p = 0; p + 1 < tokens.length; p++) {
      const tok = tokens[p];
      if (!INTEGER.test(tok)) {
        fail(lineNo, `spin index ${show(tok)} is not an integer (token ${p + 1}; the coefficient comes last)`);
      }
      const i = Number(tok);
      if (i < 0 || i >= spins) fail(lineNo, `spin index ${show(tok)} out of range 0..${spins - 1}`);
      for (let q = start; q < spinList.length; q++) if (spinList[q] === i) fail(lineNo, `spin index ${i} repeated in one term`);
      spinList.push(i);
    }
    const last = tokens[tokens.length - 1];
    const J = Number(last);
    if (NON_FINITE.test(last) || !Number.isFinite(J)) fail(lineNo, `coefficient ${show(last)} is not finite`);
    coefficients.push(J);
    offsets.push(spinList.length);
  }
  if (spins < 0) {
    const blank = lines.join("").trim() === "";
    fail(Math.max(lines.length, 1), blank ? "empty file: no number of spins" : "no number of spins (only comments)");
  }
  return {
    spins,
    termOffsets: Int32Array.from(offsets),
    termSpins: Int32Array.from(spinList),
    coefficients: Float64Array.from(coefficients),
    constant: 0,
  };
}

/**
 * Writes a model as a coupling list; coefficients keep every bit (shortest round-trip decimal).
 * @param model - a model without constant offset (the format has none).
 * @param header - comment lines written first, each prefixed with `# ` (embedded line breaks split lines).
 * @throws RangeError when model.constant ≠ 0 or a term has no spin.
 */
export function writeCouplingList(model: Ising, header: ReadonlyArray<string> = []): string {
  if (model.constant !== 0) throw new RangeError(`coupling list: cannot write the constant offset ${model.constant}`);
  const out: string[] = [];
  for (const h of header) for (const line of h.split(/\r?\n/)) out.push(line === "" ? "#" : `# ${line}`);
  out.push(String(model.spins));
  const off = model.termOffsets;
  for (let t = 0; t + 1 < off.length; t++) {
    if (off[t + 1] === off[t]) throw new RangeError(`coupling list: term ${t} has no spin`);
    const parts: string[] = [];
    for (let p = off[t]; p < off[t + 1]; p++) parts.push(String(model.termSpins[p]));
    parts.push(String(model.coefficients[t]));
    out.push(parts.join(" "));
  }
  return out.join("\n") + "\n";
}

/** A token quoted for a message, cut short so the message stays one readable line. */
function show(tok: string): string {
  return `'${tok.length > 40 ? tok.slice(0, 37) + "..." : tok}'`;
}
