// Type declarations for the odex package (it ships TypeScript source but no .d.ts).
declare module 'odex' {
  export type Derivative = (x: number, y: number[]) => number[];
  export type OutputFunction = (nr: number, xOld: number, x: number, y: number[]) => boolean | void;
  export enum Outcome {
    Converged = 0,
    MaxStepsExceeded = 1,
    EarlyReturn = 2,
  }
  export class Solver {
    constructor(n: number);
    n: number;
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number;
    denseOutput: boolean;
    relativeTolerance: number | number[];
    absoluteTolerance: number | number[];
    solve(
      f: Derivative,
      x: number,
      y0: number[],
      xEnd: number,
      solOut?: OutputFunction,
    ): { y: number[]; outcome: Outcome; nStep: number; xEnd: number; nAccept: number; nReject: number; nEval: number };
  }
}
