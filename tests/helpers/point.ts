import { computePoint } from '../../shared/physics/point/computePoint.ts';
import { preparePoint } from '../../shared/physics/point/preparePoint.ts';
import type { PointResult } from '../../shared/physics/point/types.ts';
import { pointRequestSchema, type PointRequestInput } from '../../shared/plan/pointRequest.ts';

/** One point from request data, through the same validation and preparation as the CLI. */
export function point(request: PointRequestInput): PointResult {
  return computePoint(preparePoint(pointRequestSchema.parse(request)));
}

export const family = (id: string, params: Record<string, number> = {}) => ({ potential: { family: id }, params });
