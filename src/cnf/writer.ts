/**
 * The canonical DIMACS form: header, then one clause per line, literals separated by one space,
 * each clause ending in " 0" (an empty clause is the line "0"). Reading it back gives the same Cnf.
 */
import { clauseCount, type Cnf } from "./cnf.js";

/**
 * Writes a formula as canonical DIMACS CNF text. `comments` become leading `c` lines.
 *
 * @example
 * ```ts
 * writeDimacs(cnfFromClauses(2, [[1, -2]])); // "p cnf 2 1\n1 -2 0\n"
 * ```
 */
export function writeDimacs(cnf: Cnf, comments: readonly string[] = []): string {
  const parts: string[] = [];
  for (const c of comments) {
    for (const line of c.split(/\r?\n/)) parts.push(line === "" ? "c\n" : `c ${line}\n`);
  }
  const m = clauseCount(cnf);
  parts.push(`p cnf ${cnf.variables} ${m}\n`);
  for (let i = 0; i < m; i++) {
    const s = cnf.clauseStart[i]!;
    const e = cnf.clauseStart[i + 1]!;
    let line = "";
    for (let k = s; k < e; k++) line += `${cnf.lits[k]} `;
    parts.push(`${line}0\n`);
  }
  return parts.join("");
}
