// A circuit file may declare millions of work qubits (and classical bits) that no gate touches:
// verify drops the idle tail before checking, so that a 200-byte file cannot cost gigabytes and
// a minute of CPU (2^26 idle qubits took 73 s and 5.4 GB under --prove), and no index moves.
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { ROOT } from "../helpers/cli.js";
import { readCircuitJson, withoutIdleTail } from "../helpers/lib.js";

const doc = (qubits: number, work: number, clbits: number, gates: string): string =>
  `{"format":"clausegate-circuit","version":1,"qubits":${qubits},"clbits":${clbits},"registers":[{"name":"vars","role":"search","start":0,"size":3},` +
  `{"name":"work","role":"work","start":3,"size":${work}}],"gates":[${gates}]}`;

describe("withoutIdleTail", () => {
  it("drops work qubits after the last touched one and classical bits after the last used one", () => {
    const c = readCircuitJson(doc(3 + 1000, 1000, 50, `{"op":"ccx","qubits":[0,1,5]},{"op":"measure","qubits":[5],"clbit":2},{"op":"x","qubits":[0],"if":7}`)).circuit!;
    const t = withoutIdleTail(c);
    expect(t.qubits).toBe(6);
    expect(t.clbits).toBe(8);
    expect(t.registers.map((r) => [r.name, r.start, r.size])).toEqual([["vars", 0, 3], ["work", 3, 3]]);
    expect(Array.from(t.ops)).toEqual(Array.from(c.ops));
  });
  it("returns the circuit itself when nothing is idle at the end", () => {
    const c = readCircuitJson(doc(4, 1, 0, `{"op":"cx","qubits":[0,3]},{"op":"gphase","qubits":[],"angle":4}`)).circuit!;
    expect(withoutIdleTail(c)).toBe(c);
  });
});

describe("verify --prove of a circuit declaring 2^26 idle work qubits", () => {
  it("ends in seconds with the mismatch", () => {
    const file = join(ROOT, "examples/allotment-pair.cnf");
    const circuit = doc(2 ** 26, 2 ** 26 - 3, 2 ** 26, "").replace('"size":3}', '"size":4}').replace('"start":3,', '"start":4,').replace(`"size":${2 ** 26 - 3}`, `"size":${2 ** 26 - 4}`);
    const r = spawnSync(process.execPath, [join(ROOT, "dist/src/cli/bin.js"), "verify", file, "--circuit", "-", "--prove"], { input: circuit, encoding: "utf8", timeout: 20_000, killSignal: "SIGKILL" });
    expect(r.signal).toBeNull();
    expect(r.status).toBe(1);
    expect(r.stdout).toMatch(/^mismatch: /);
  });
});
