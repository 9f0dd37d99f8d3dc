// Minimal declarations for the npm package logic-solver (MiniSat compiled to JavaScript), which
// ships none. Only what the tests use.
declare module "logic-solver" {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type -- opaque: tests only hand formulas back to the solver
  interface Formula {}
  interface Solution {
    getFormula(): Formula;
    getTrueVars(): string[];
  }
  class Solver {
    require(...f: (Formula | string)[]): void;
    forbid(...f: (Formula | string)[]): void;
    solve(): Solution | null;
  }
  const Logic: {
    Solver: typeof Solver;
    or(...f: (Formula | string)[]): Formula;
    not(f: Formula | string): Formula;
  };
  export default Logic;
}
