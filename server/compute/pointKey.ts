import { createHash } from 'node:crypto';
import { canonicalJson } from '../../shared/plan/canonicalJson.ts';
import type { PointRequest } from '../../shared/plan/pointRequest.ts';
import { PHYSICS_VERSION } from '../../shared/physics/version.ts';

/**
 * Identity of a point's computation: the whole request (potential, parameters, pivot, precision)
 * and the physics version. Two points with the same key give the same numbers.
 */
export function pointKey(request: PointRequest): string {
  return createHash('sha256').update(PHYSICS_VERSION).update(canonicalJson(request)).digest('base64url');
}
