/**
 * DIMACS CNF, the open standard exchange format for SAT instances (the "satisfiability suggested format"
 * of the DIMACS Challenge, 1993). We accept what real files contain: `c` comment lines anywhere, extra
 * white space in the `p cnf` line, clauses spread over several lines, and the SATLIB trailer of a `%` line
 * followed by a lone `0`.
 */
import { InputError } from "../errors.js";
import { type Cnf, clausesOf } from "../model/cnf.js";

/**
 * Parses DIMACS CNF text. Throws {@link InputError} with `FILE:LINE: what is wrong` on malformed input.
 * @param text - the file contents.
 * @param file - the name used in error messages.
 */
export function parseDimacs(text: string, file: string): Cnf {
  const lines = text.split(/\r?\n/);
  let header: { variables: number; clauses: number; line: number } | null = null;
  const literals: number[] = [];
  const offsets: number[] = [0];
  let open = false;
  let openLine = 0;
  let lastLine = 0;
  const fail = (line: number, what: string): never => {
    throw new InputError(`${file}:${line}: ${what}`);
  };

  for (let i = 0; i < lines.length; i++) {
    const lineNo = i + 1;
    const line = lines[i].trim();
    if (line === "" || line.startsWith("c")) continue;
    if (line.startsWith("%")) {
      // SATLIB trailer: '%' then a lone '0'; nothing of substance may follow.
      for (let j = i + 1; j < lines.length; j++) {
        const rest = lines[j].trim();
        if (rest !== "" && rest !== "0" && !rest.startsWith("c")) fail(j + 1, `unexpected '${rest}' after the '%' end marker`);
      }
      break;
    }
    if (line.startsWith("p")) {
      if (header) fail(lineNo, "second 'p' header line");
      const parts = line.split(/\s+/);
      if (parts.length !== 4 || parts[0] !== "p" || parts[1] !== "cnf") {
        fail(lineNo, `bad header '${line}' (expected 'p cnf VARIABLES CLAUSES')`);
      }
      const variables = Number(parts[2]);
      const clauses = Number(parts[3]);
      if (!/^\d+$/.test(parts[2]) || !Number.isSafeInteger(variables)) fail(lineNo, `bad variable count '${parts[2]}' in header`);
      if (!/^\d+$/.test(parts[3]) || !Number.isSafeInteger(clauses)) fail(lineNo, `bad clause count '${parts[3]}' in header`);
      header = { variables, clauses, line: lineNo };
      continue;
    }
    if (!header) fail(lineNo, `clause data before the 'p cnf' header: '${truncate(line)}'`);
    const h = header as { variables: number; clauses: number; line: number };
    for (const token of line.split(/\s+/)) {
      if (!/^-?\d+$/.test(token)) fail(lineNo, `non-numeric token '${truncate(token)}'`);
      const lit = Number(token);
      if (lit === 0) {
        offsets.push(literals.length);
        open = false;
        continue;
      }
      if (Math.abs(lit) > h.variables) fail(lineNo, `literal ${lit} out of range (header declares ${h.variables} variables)`);
      if (!open) {
        open = true;
        openLine = lineNo;
      }
      literals.push(lit);
    }
    lastLine = lineNo;
  }

  if (!header) {
    if (lines.every((l) => l.trim() === "" || l.trim().startsWith("c"))) fail(1, "empty file (no 'p cnf' header)");
    fail(1, "missing 'p cnf' header");
  }
  const h = header as { variables: number; clauses: number; line: number };
  if (open) fail(openLine, "clause not terminated by 0");
  const found = offsets.length - 1;
  if (found !== h.clauses) {
    fail(found > h.clauses ? lastLine : h.line, `clause count mismatch: header declares ${h.clauses}, file has ${found}`);
  }
  return { variables: h.variables, literals: Int32Array.from(literals), offsets: Int32Array.from(offsets) };
}

/**
 * Writes DIMACS CNF text: optional comment lines, the header, one clause a line.
 * @param comments - lines written as `c …` before the header (a generator records its seed and parameters here).
 */
export function writeDimacs(cnf: Cnf, comments: ReadonlyArray<string> = []): string {
  const out: string[] = comments.map((c) => `c ${c}`);
  const clauses = clausesOf(cnf);
  out.push(`p cnf ${cnf.variables} ${clauses.length}`);
  for (const c of clauses) out.push(`${c.join(" ")} 0`);
  return out.join("\n") + "\n";
}

function truncate(s: string): string {
  return s.length > 24 ? `${s.slice(0, 24)}…` : s;
}
