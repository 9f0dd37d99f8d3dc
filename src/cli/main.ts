/** The clausegate command line: dispatches to one command, maps errors to one line and an exit code. */
import { readFileSync } from "node:fs";
import { countCommand, countHelp } from "./count.js";
import { costCommand, costHelp, oracleCommand, oracleHelp } from "./oracle.js";
import { verifyCommand, verifyHelp } from "./verify.js";
import { drawCommand, drawHelp, planCommand, planHelp, searchCommand, searchHelp } from "./search.js";
import { EXIT_BAD_INPUT, UserError } from "./io.js";
import { PassError } from "../index.js";

const commands: Record<string, { run: (argv: string[]) => Promise<number>; summary: string; help: string }> = {
  oracle: { run: oracleCommand, summary: "compile a DIMACS CNF formula into an oracle circuit", help: oracleHelp },
  verify: { run: verifyCommand, summary: "check that a circuit is an oracle for a formula", help: verifyHelp },
  cost: { run: costCommand, summary: "tabulate what an oracle for the formula costs, per strategy", help: costHelp },
  plan: { run: planCommand, summary: "plan a Grover search: iterations, success probability, classical comparison", help: planHelp },
  search: { run: searchCommand, summary: "write the complete search circuit and its whole-run costs", help: searchHelp },
  draw: { run: drawCommand, summary: "draw an oracle or search circuit as SVG", help: drawHelp },
  count: { run: countCommand, summary: "count the models of a DIMACS CNF formula exactly", help: countHelp },
};

function version(): string {
  const pkg = JSON.parse(readFileSync(new URL("../../../package.json", import.meta.url), "utf8")) as { version: string };
  return pkg.version;
}

function mainHelp(): string {
  const rows = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(10)} ${c.summary}`);
  return `clausegate ${version()}: compile DIMACS CNF formulas into verified, costed quantum search oracles

Usage: clausegate COMMAND [options]

Commands:
${rows.join("\n")}

Options:
  -h, --help      show this help (clausegate COMMAND --help for a command)
  -v, --version   print the version

Exit codes: 0 success, 1 a check failed, 2 bad input or usage, 3 unsatisfiable (plan).
`;
}

/** Runs the CLI with the given arguments; resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
  const [first, ...rest] = argv;
  try {
    if (first === undefined || first === "-h" || first === "--help" || first === "help") {
      if (first === "help" && rest[0] !== undefined && commands[rest[0]]) {
        process.stdout.write(commands[rest[0]]!.help);
        return 0;
      }
      process.stdout.write(mainHelp());
      return first === undefined ? EXIT_BAD_INPUT : 0;
    }
    if (first === "-v" || first === "--version") {
      process.stdout.write(`${version()}\n`);
      return 0;
    }
    const command = commands[first];
    if (command === undefined) {
      throw new UserError(`clausegate: error: unknown command '${first}'; run clausegate --help for the list`);
    }
    return await command.run(rest);
  } catch (e) {
    if (e instanceof UserError) {
      if (e.message !== "") process.stderr.write(`${e.message}\n`);
      return e.exitCode;
    }
    const code = (e as { code?: string }).code;
    if (typeof code === "string" && code.startsWith("ERR_PARSE_ARGS")) {
      process.stderr.write(`clausegate ${first}: error: ${(e as Error).message}; see clausegate ${first} --help\n`);
      return EXIT_BAD_INPUT;
    }
    if (e instanceof PassError) {
      process.stderr.write(`clausegate: internal error: ${e.message}; rerun with --no-optimize to skip the passes, and please report this with the input\n`);
      return 70;
    }
    process.stderr.write(`clausegate: internal error: ${(e as Error).message ?? String(e)} (please report this with the input)\n`);
    if (process.env["CLAUSEGATE_DEBUG"]) process.stderr.write(`${(e as Error).stack}\n`);
    return 70;
  }
}
