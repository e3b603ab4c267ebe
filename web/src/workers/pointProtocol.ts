import { InvalidInputError } from '../../../shared/errors.ts';
import { preparePoint, preparePotential, type PreparedPotential } from '../../../shared/physics/point/preparePoint.ts';
import { computePointWithTrajectory, type SampledTrajectory } from '../../../shared/physics/point/trajectory.ts';
import type { PointResult } from '../../../shared/physics/point/types.ts';
import { pointRequestSchema, type PointRequestInput } from '../../../shared/plan/pointRequest.ts';
import { formatPath } from '../../../shared/plan/planIssues.ts';

/**
 * Messages between the page and the preview worker (point.worker.ts). The handler is a plain
 * function so that tests run it in node without a Worker.
 */
export interface PreviewRequest {
  id: number;
  /** One point, as a scan plan's expansion builds it (createPointSource(plan).requestAt(i)). */
  request: PointRequestInput;
  /** Samples of V(phi) and of the trajectory. */
  curveSamples?: number;
  trajectorySamples?: number;
}

export interface PotentialCurve {
  phi: number[];
  /** V as given (before normalising to the target A_s); null where it is not finite. */
  V: (number | null)[];
}

export type PreviewReply =
  | { id: number; ok: true; result: PointResult; trajectory: SampledTrajectory | null; curve: PotentialCurve; ms: number }
  | { id: number; ok: false; error: { field: string; message: string } };

export const DEFAULT_CURVE_SAMPLES = 200;
/** Share of the rolled-through field interval added on each side of the V(phi) plot. */
const CURVE_PADDING = 0.25;

// Compiling an expression differentiates it symbolically: keep the last one while only numbers change.
let cached: { key: string; prepared: PreparedPotential } | undefined;

function prepared(request: PointRequestInput & { potential: object; params: Record<string, number> }): PreparedPotential {
  const key = JSON.stringify([request.potential, Object.keys(request.params)]);
  if (cached?.key !== key) cached = { key, prepared: preparePotential(request.potential, Object.keys(request.params)) };
  return cached.prepared;
}

function curveRange(result: PointResult, domain: { min: number; max: number }): [number, number] {
  const ends = [result.phiStart, result.phiEnd].filter(Number.isFinite);
  if (ends.length < 2) return [domain.min, domain.max];
  const lo = Math.min(...ends);
  const hi = Math.max(...ends);
  const pad = CURVE_PADDING * (hi - lo || 1);
  const clip = (x: number, fallback: number) => (Number.isFinite(x) ? x : fallback);
  return [Math.max(lo - pad, clip(domain.min, -Infinity)), Math.min(hi + pad, clip(domain.max, Infinity))];
}

function sampleCurve(evaluate: (phi: number, p: Float64Array, out: Float64Array) => void, params: Float64Array, [lo, hi]: [number, number], samples: number): PotentialCurve {
  const out = new Float64Array(3);
  const curve: PotentialCurve = { phi: [], V: [] };
  for (let i = 0; i < samples; i++) {
    const phi = lo + ((hi - lo) * i) / (samples - 1);
    evaluate(phi, params, out);
    curve.phi.push(phi);
    curve.V.push(Number.isFinite(out[0]!) ? out[0]! : null);
  }
  return curve;
}

/** One preview: the point with its trajectory and V(phi) around it. Never throws. */
export function handlePreview(message: PreviewRequest): PreviewReply {
  const { id } = message;
  const started = performance.now();
  const parsed = pointRequestSchema.safeParse(message.request);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return { id, ok: false, error: { field: formatPath(issue.path), message: issue.message } };
  }
  try {
    const input = preparePoint(parsed.data, prepared(parsed.data));
    const { result, trajectory } = computePointWithTrajectory(input, message.trajectorySamples);
    const curve = sampleCurve(input.evaluate, input.params, curveRange(result, input.domain), message.curveSamples ?? DEFAULT_CURVE_SAMPLES);
    return { id, ok: true, result, trajectory, curve, ms: performance.now() - started };
  } catch (err) {
    if (err instanceof InvalidInputError) return { id, ok: false, error: { field: err.field ?? '', message: err.message } };
    return { id, ok: false, error: { field: '', message: `the preview failed: ${(err as Error).message}` } };
  }
}
