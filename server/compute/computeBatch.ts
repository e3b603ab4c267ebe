import { createScorer } from '../../shared/physics/bounds/score.ts';
import { computePoint } from '../../shared/physics/point/computePoint.ts';
import { toPointInput } from '../../shared/physics/point/pointInput.ts';
import { fromPortable, type PortablePotential, type PreparedPotential } from '../../shared/physics/potential/portable.ts';
import { createPointSource, type PointSource } from '../../shared/plan/expandPlan.ts';
import { PIVOT_AXIS, planBoundSet, type ScanPlan } from '../../shared/plan/scanPlan.ts';
import { encodeRows, type EncodedRows } from '../db/copyBinary.ts';
import type { ResultColumn } from '../db/resultColumns.ts';
import type { NewPointResultRow } from '../db/schema/pointResults.ts';
import { pointKey } from './pointKey.ts';

export interface BatchTask {
  scanId: number;
  /** Identifies the plan so a worker compiles it once, not once per batch. */
  planHash: string;
  plan: ScanPlan;
  /** The plan's potential compiled by the server (portablePotential): threads never load the expression compiler. */
  potential: PortablePotential;
  firstIndex: number;
  pointCount: number;
  /** Only these point indices (a derived scan copies the others); default: the whole range. */
  indices?: number[];
  /** When given (RESULT_COLUMNS), the rows come back encoded for binary COPY instead of as objects. */
  encodeWith?: readonly ResultColumn[];
}

/** A batch's results: as rows, or (encodeWith) as one binary COPY stream with rows left empty. */
export interface BatchOutput {
  rows: NewPointResultRow[];
  encoded?: EncodedRows;
  computeSeconds: number;
}

/** Points a batch output holds, in either form. */
export const pointsIn = (output: BatchOutput): number => output.encoded?.count ?? output.rows.length;

interface CompiledPlan {
  source: PointSource;
  prepared: PreparedPotential;
  score: ReturnType<typeof createScorer>;
}

const compiled = new Map<string, CompiledPlan>();
const CACHE_LIMIT = 16;

function compile(task: BatchTask): CompiledPlan {
  const hit = compiled.get(task.planHash);
  if (hit) return hit;
  const source = createPointSource(task.plan);
  const entry = { source, prepared: fromPortable(task.potential), score: createScorer(planBoundSet(task.plan)) };
  if (compiled.size >= CACHE_LIMIT) compiled.delete(compiled.keys().next().value!);
  compiled.set(task.planHash, entry);
  return entry;
}

const orNull = (x: number | undefined): number | null => (x === undefined || !Number.isFinite(x) ? null : x);

/** Computes one batch of a scan's points; a failed point is a row with its status, never a throw. */
export function computeBatch(task: BatchTask): BatchOutput {
  const { source, prepared, score } = compile(task);
  const rows: NewPointResultRow[] = [];
  const started = performance.now();
  const withPivot = source.axisNames.includes(PIVOT_AXIS);
  const indices = task.indices ?? Array.from({ length: task.pointCount }, (_, i) => task.firstIndex + i);
  for (const index of indices) {
    const request = source.requestAt(index);
    const t0 = performance.now();
    const result = computePoint(toPointInput(request, prepared));
    const computeMs = performance.now() - t0;
    const scored = result.status === 'ok' ? score(result) : { chi2: Number.NaN, region: null };
    rows.push({
      scanId: task.scanId,
      pointIndex: index,
      // The request holds every parameter; N_* joins them when it is an axis.
      params: withPivot ? { ...request.params, [PIVOT_AXIS]: (request.pivot as { efolds: number }).efolds } : request.params,
      status: result.status,
      reason: result.reason,
      nTotal: orNull(result.nTotal), nPivot: orNull(result.nPivot), phiStart: orNull(result.phiStart),
      phiEnd: orNull(result.phiEnd), phiPivot: orNull(result.phiPivot), deltaPhi: orNull(result.deltaPhi),
      eps1: orNull(result.eps1), eps2: orNull(result.eps2), eps3: orNull(result.eps3),
      ns: orNull(result.ns), r: orNull(result.r), nt: orNull(result.nt), alphaS: orNull(result.alphaS),
      As: orNull(result.As), amplitude: orNull(result.amplitude),
      energyScaleGeV: orNull(result.energyScaleGeV), hubbleGeV: orNull(result.hubbleGeV),
      exactNs: orNull(result.exact?.ns), exactR: orNull(result.exact?.r), exactNt: orNull(result.exact?.nt),
      exactAlphaS: orNull(result.exact?.alphaS), exactAs: orNull(result.exact?.As), exactAmplitude: orNull(result.exact?.amplitude),
      chi2: orNull(scored.chi2),
      region: scored.region,
      computeMs,
      evaluations: result.evaluations,
      pointKey: pointKey(request),
    });
  }
  const computeSeconds = (performance.now() - started) / 1000;
  return task.encodeWith ? { rows: [], encoded: encodeRows(task.encodeWith, task.scanId, rows), computeSeconds } : { rows, computeSeconds };
}
