// Types for the parts of odex 2.0.4 (E. Hairer and G. Wanner's ODEX, Gragg-Bulirsch-Stoer) that
// doab's tests use. The package ships its TypeScript source next to the JavaScript, and that source
// does not compile under strict settings, so package.json maps `#odex` to this file for the type
// checker ("types" condition) and to the package itself at run time ("default").

/** y' = f(x, y); returns a new array of length n. */
export type Derivative = (x: number, y: number[]) => number[];

/**
 * Called once at the start (step number 1, xOld = x) and after each accepted step. `dense(c, t)`
 * interpolates component c at t in [xOld, x]; it is given only when `denseOutput` is set, and it
 * is valid only during the call. Return false to stop the integration early.
 */
export type OutputFunction = (
  stepNumber: number,
  xOld: number,
  x: number,
  y: number[],
  dense?: (component: number, t: number) => number,
) => boolean | void;

export enum Outcome {
  Converged = 0,
  MaxStepsExceeded = 1,
  EarlyReturn = 2,
}

export interface SolveResult {
  y: number[];
  outcome: Outcome;
  nStep: number;
  xEnd: number;
  nAccept: number;
  nReject: number;
  nEval: number;
}

export class Solver {
  constructor(n: number);
  n: number;
  maxSteps: number;
  initialStepSize: number;
  maxStepSize: number;
  denseOutput: boolean;
  denseComponents: number[] | undefined;
  relativeTolerance: number | number[];
  absoluteTolerance: number | number[];
  solve(f: Derivative, x: number, y0: number[], xEnd: number, solOut?: OutputFunction): SolveResult;
  grid(dt: number, out: (x: number, y: number[]) => unknown): OutputFunction;
}
