// Type declarations for the part of the odex package used here (it ships TypeScript source but no .d.ts).
declare module 'odex' {
  export type Derivative = (x: number, y: number[], yp: number[]) => number[] | void;
  export interface Options {
    maxSteps: number;
    initialStepSize: number;
    maxStepSize: number;
    maxExtrapolationColumns: number;
    stepSizeSequence: number;
    denseOutput: boolean;
    relativeTolerance: number | number[];
    absoluteTolerance: number | number[];
    rawFunction: boolean;
  }
  export interface SolutionSegment {
    x0: number;
    x1: number;
    y: number[];
  }
  export class Solver {
    constructor(f: Derivative, n: number, options?: Partial<Options>);
    /** Right-hand-side evaluations over the solver's life (not reset between solves). */
    readonly nEval: number;
    solutionSegments(x: number, y0: number[], xEnd?: number): Generator<SolutionSegment, undefined>;
  }
}
