/** Shared argument checks for the commands. */
import { UserError } from "./io.js";

/** The single FILE|- positional of a command. */
export function oneInput(positionals: string[], command: string): string {
  if (positionals.length !== 1) {
    throw new UserError(
      `clausegate ${command}: error: expected one input file (or - for standard input) but got ${positionals.length}; see clausegate ${command} --help`,
    );
  }
  return positionals[0]!;
}

/** Parses an integer option within [min, max]; undefined when absent. */
export function intOption(raw: string | undefined, name: string, min: number, max: number): number | undefined {
  if (raw === undefined) return undefined;
  const v = /^\d+$/.test(raw) ? Number(raw) : NaN;
  if (!Number.isSafeInteger(v) || v < min || v > max) {
    throw new UserError(`clausegate: error: ${name} expects a whole number in ${min}..${max} but got '${raw}'`);
  }
  return v;
}
