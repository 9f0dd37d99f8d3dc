// The two readers, one behaviour: the byte scanner (fast path) against the parser generated from
// grammar/*.g4 (the specification), on generated valid inputs and on corruptions of them.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { readWithGrammarSync, scanDimacs } from "../helpers/lib.js";

const typed = (_k: string, v: unknown): unknown => (ArrayBuffer.isView(v) ? Array.from(v as Int32Array) : v);

const space = fc.constantFrom(" ", "  ", "\t", "\n", "\r\n", " \n", "\n\n");
const comment = fc.constantFrom("c\n", "c hello 1 2 0\n", "c\tp cnf 9 9\n", "c %\n", "c caf\xc3\xa9\n");

/** A DIMACS text with random layout: clauses, comments and spacing. */
const dimacsText = fc
  .record({
    vars: fc.integer({ min: 0, max: 12 }),
    clauses: fc.array(fc.array(fc.integer({ min: -12, max: 12 }).filter((x) => x !== 0), { maxLength: 5 }), { maxLength: 8 }),
    seps: fc.array(space, { minLength: 64, maxLength: 64 }),
    comments: fc.array(fc.option(comment, { freq: 4 }), { minLength: 16, maxLength: 16 }),
    declared: fc.integer({ min: -1, max: 1 }),
    // Endings: none, SATLIB's '%' then '0', and lone '0' lines (rule S5: an end marker once the
    // declared clauses are complete, an empty clause before, an extra clause when more follows).
    // A leading '^' first removes the trailing separator, so the 0 shares the last clause's line.
    ending: fc.constantFrom(
      "", "\n%\n0\n", "0\n", "\n0\n", "\n  0 c end\nc\n", "\r\n0\r\n", "\n0", "\n0\n%\n0\n", "\n0\n0\n", "\n0\n1 0\n",
      "\n0\n%x\n", "^ 0\n", "^\t0 c x\n", "^\r0\n", "^ 0\n0\n",
    ),
    dropLastZero: fc.boolean(),
  })
  .map((r) => {
    let s = r.comments[0] ?? "";
    let k = 0;
    const sep = (): string => r.seps[k++ % 64]!;
    s += `p cnf ${r.vars} ${Math.max(0, r.clauses.length + r.declared)}\n`;
    r.clauses.forEach((c, i) => {
      s += r.comments[(i + 1) % 16] ?? "";
      for (const l of c) s += `${l}${sep()}`;
      s += i === r.clauses.length - 1 && r.dropLastZero ? "" : `0${sep()}`;
    });
    s = r.ending.startsWith("^") ? s.replace(/[ \t\r\n]+$/, "") + r.ending.slice(1) : s + r.ending;
    return s;
  });

/** Corruptions: replace, insert or delete bytes with characters that matter to the grammar. */
const alphabet = fc.constantFrom(..." \t\r\n0123456789-cp%x.\x80\xff\0".split(""), "cnf", "p cnf 3 2", "-0", "99999999999");
const corrupted = fc
  .tuple(dimacsText, fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 2 }), alphabet), { minLength: 1, maxLength: 3 }))
  .map(([s, edits]) => {
    for (const [pos, op, ch] of edits) {
      const i = s.length === 0 ? 0 : pos % (s.length + 1);
      if (op === 0) s = s.slice(0, i) + ch + s.slice(i + 1);
      else if (op === 1) s = s.slice(0, i) + ch + s.slice(i);
      else s = s.slice(0, i) + s.slice(i + 1);
    }
    return s;
  });

/** Diagnostic codes seen by `agree`, so a test can show that its generator reaches a case. */
const seen = new Map<string, number>();

function agree(src: string): void {
  const bytes = Buffer.from(src, "latin1");
  const r = scanDimacs(bytes);
  for (const d of r.diagnostics) seen.set(d.code, (seen.get(d.code) ?? 0) + 1);
  const a = JSON.stringify(r, typed);
  const b = JSON.stringify(readWithGrammarSync(bytes), typed);
  expect(a, `input ${JSON.stringify(src)}`).toBe(b);
}

describe("byte scanner and grammar reader agree", () => {
  it("on generated valid inputs (clauses, diagnostics and positions)", () => {
    seen.clear();
    fc.assert(fc.property(dimacsText, agree), { numRuns: 400 });
    // The lone-0 endings reach both sides of rule S5: end marker, and extra clause.
    expect(seen.get("trailing-zero-end-marker") ?? 0).toBeGreaterThan(10);
    expect(seen.get("too-many-clauses") ?? 0).toBeGreaterThan(10);
  });
  it("on corrupted inputs (same error, line and column)", () => {
    fc.assert(fc.property(corrupted, agree), { numRuns: 1500 });
  });
  it("on random byte strings", () => {
    fc.assert(fc.property(fc.string({ unit: fc.constantFrom(..." \n0123456789-cp%\r\t".split("")), maxLength: 40 }), agree), { numRuns: 800 });
  });
});
