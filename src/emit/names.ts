/** Register-relative names of qubits, shared by the emitters. */
import type { Circuit } from "../ir/circuit.js";

/** Returns a function naming qubit q as `register[index]`. */
export function qubitNamer(c: Circuit): (q: number) => string {
  const regs = c.registers.filter((r) => r.size > 0);
  return (q) => {
    for (const r of regs) if (q >= r.start && q < r.start + r.size) return `${r.name}[${q - r.start}]`;
    throw new Error(`qubit ${q} is in no register`);
  };
}

/** An angle of k eighths of 2pi... in units of pi/4, printed as OpenQASM expects. */
export function angleText(k: number): string {
  const names = ["0", "pi/4", "pi/2", "3*pi/4", "pi", "5*pi/4", "3*pi/2", "7*pi/4"];
  return names[((k % 8) + 8) % 8]!;
}
