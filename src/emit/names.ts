/** Register-relative names of qubits, shared by the emitters. */
import type { Circuit } from "../ir/circuit.js";

/** Returns a function naming qubit q as `register[index]`. */
export function qubitNamer(c: Circuit): (q: number) => string {
  const regs = c.registers.filter((r) => r.size > 0);
  const prefixes = regs.map((r) => `${r.name}[`);
  return (q) => {
    for (let i = 0; i < regs.length; i++) {
      const r = regs[i]!;
      if (q >= r.start && q < r.start + r.size) return prefixes[i]! + (q - r.start) + "]";
    }
    throw new Error(`qubit ${q} is in no register`);
  };
}

/** An angle of k eighths of 2pi... in units of pi/4, printed as OpenQASM expects. */
export function angleText(k: number): string {
  const names = ["0", "pi/4", "pi/2", "3*pi/4", "pi", "5*pi/4", "3*pi/2", "7*pi/4"];
  return names[((k % 8) + 8) % 8]!;
}
