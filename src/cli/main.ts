/** The clausegate command line: dispatches to one command, maps errors to one line and an exit code. */
import { readFileSync } from "node:fs";
import { countCommand, countHelp } from "./count.js";
import { structureCommand, structureHelp } from "./structure.js";
import { costCommand, costHelp, oracleCommand, oracleHelp } from "./oracle.js";
import { verifyCommand, verifyHelp } from "./verify.js";
import { drawCommand, drawHelp, planCommand, planHelp, searchCommand, searchHelp } from "./search.js";
import { forecastCommand, forecastHelp } from "./forecast.js";
import { EXIT_BAD_INPUT, oneLine, UserError } from "./io.js";
import { checkpoint, commitOutputs, discardOutputs, OutputError } from "./output.js";
import { PassError } from "../internal.js";

const commands: Record<string, { run: (argv: string[]) => Promise<number>; summary: string; help: string }> = {
  oracle: { run: oracleCommand, summary: "compile a DIMACS CNF formula into an oracle circuit", help: oracleHelp },
  verify: { run: verifyCommand, summary: "check that a circuit is an oracle for a formula", help: verifyHelp },
  cost: { run: costCommand, summary: "tabulate what an oracle for the formula costs, per strategy", help: costHelp },
  plan: { run: planCommand, summary: "plan a Grover search: iterations, success probability, classical comparison", help: planHelp },
  search: { run: searchCommand, summary: "write the complete search circuit and its whole-run costs", help: searchHelp },
  draw: { run: drawCommand, summary: "draw an oracle or search circuit as SVG", help: drawHelp },
  forecast: { run: forecastCommand, summary: "estimate a fault-tolerant run (qubits, time) beside the classical time: a model", help: forecastHelp },
  count: { run: countCommand, summary: "count the models of a DIMACS CNF formula exactly", help: countHelp },
  structure: { run: structureCommand, summary: "recover gate definitions, parities and one-hot groups; the free variables", help: structureHelp },
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

Exit codes: 0 success, 1 a check failed, 2 bad input or usage, 3 unsatisfiable (plan, forecast; search and
draw --search without --iterations).
Errors are one line on stderr: WHERE: error: WHAT; hint: WHAT TO DO.
`;
}

/** Node's argument-parser messages, reworded into our one-line shape. */
function argumentError(e: Error, command: string): string {
  const msg = e.message.replace(/\s+/g, " ").trim();
  const where = `clausegate ${command}`;
  const hint = `hint: see clausegate ${command} --help`;
  let m = /^Unknown option '([^']+)'/.exec(msg);
  if (m) return `${where}: error: unknown option '${m[1]}'; ${hint}`;
  m = /^Option '(?:-\w, )?(--[\w-]+)[^']*' argument missing/.exec(msg);
  if (m) return `${where}: error: option ${m[1]} needs a value; ${hint}`;
  m = /^Option '(?:-\w, )?(--[\w-]+)[^']*' does not take an argument/.exec(msg);
  if (m) return `${where}: error: option ${m[1]} takes no value; ${hint}`;
  // parseArgs will not take a value that starts with '-' after a space (it could be an option).
  m = /^Option '(?:-\w, )?(-\w|--[\w-]+)[^']*' argument is ambiguous/.exec(msg);
  if (m) {
    const eq = m[1]!.startsWith("--") ? `${m[1]}=VALUE` : `${m[1]}VALUE`;
    return `${where}: error: option ${m[1]} is followed by a value that starts with '-', which reads as an option; hint: write ${eq} for such a value`;
  }
  m = /^Unexpected argument '([^']+)'/.exec(msg);
  if (m) return `${where}: error: unexpected argument '${m[1]}'; ${hint}`;
  return `${where}: error: ${msg.replace(/[.;]\s.*$/, "")}; ${hint}`;
}

/** Runs the CLI with the given arguments; resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
  const [first, ...rest] = argv;
  try {
    if (first === undefined) {
      process.stderr.write(mainHelp());
      return EXIT_BAD_INPUT;
    }
    if (first === "-h" || first === "--help" || first === "help") {
      const topic = first === "help" && rest[0] !== undefined ? commands[rest[0]] : undefined;
      if (first === "help" && rest[0] !== undefined && topic === undefined) {
        throw new UserError(`clausegate: error: unknown command '${rest[0]}'; hint: run clausegate --help for the list`);
      }
      process.stdout.write(topic ? topic.help : mainHelp());
      return 0;
    }
    if (first === "-v" || first === "--version") {
      process.stdout.write(`${version()}\n`);
      return 0;
    }
    const command = commands[first];
    if (command === undefined) {
      throw new UserError(`clausegate: error: unknown command '${first}'; hint: run clausegate --help for the list`);
    }
    const code = await command.run(rest);
    // Signals that arrived during synchronous work are handled here, before anything is committed.
    await checkpoint();
    if (code === EXIT_BAD_INPUT) discardOutputs();
    else await commitOutputs();
    return code;
  } catch (e) {
    discardOutputs();
    if (e instanceof UserError || e instanceof OutputError) {
      // Shared checks (option values, output destinations) say "clausegate:": name the command,
      // as every other error line of a command does.
      const message = first !== undefined && Object.hasOwn(commands, first) && e.message.startsWith("clausegate: ")
        ? `clausegate ${first}: ${e.message.slice("clausegate: ".length)}`
        : e.message;
      if (message !== "") process.stderr.write(`${oneLine(message)}\n`);
      return e instanceof UserError ? e.exitCode : EXIT_BAD_INPUT;
    }
    const code = (e as { code?: string }).code;
    if (typeof code === "string" && code.startsWith("ERR_PARSE_ARGS")) {
      process.stderr.write(`${oneLine(argumentError(e as Error, first ?? ""))}\n`);
      return EXIT_BAD_INPUT;
    }
    if (e instanceof PassError) {
      process.stderr.write(`clausegate: internal error: ${e.message}; hint: rerun with --no-optimize to skip the passes, and please report this with the input\n`);
      return 70;
    }
    process.stderr.write(`clausegate: internal error: ${((e as Error).message ?? String(e)).replace(/\s+/g, " ")}; hint: please report this with the input\n`);
    if (process.env["CLAUSEGATE_DEBUG"]) process.stderr.write(`${(e as Error).stack}\n`);
    return 70;
  }
}
