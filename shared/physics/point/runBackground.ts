import { integrateBackground, type BackgroundResult } from '../background/integrateBackground.ts';
import { findInitialField } from '../background/initialField.ts';
import type { PointInput, PointStatus } from './types.ts';

/** Extra slow-roll e-folds asked of the initial-field search on top of the margin: the slow-roll count is only an estimate. */
const SEARCH_BUFFER = 2;
const MAX_ATTEMPTS = 4;

export type BackgroundOutcome =
  | { ok: true; background: BackgroundResult; phi0: number; evaluations: number }
  | { ok: false; status: PointStatus; reason: string; evaluations: number };

/**
 * Runs the background far enough up the potential that at least `needed` e-folds remain before
 * the end. With phi0 given it runs once; otherwise it asks the initial-field search and, when
 * the full equations give fewer e-folds than slow roll promised, asks again for more.
 */
export function runBackground(input: PointInput, needed: number): BackgroundOutcome {
  const { evaluate, params, end, precision } = input;
  const options = { rtol: precision.rtol, atol: precision.atol, maxEfolds: precision.maxEfolds, ...(input.backgroundRhs ? { rhs: input.backgroundRhs } : {}) };
  let evaluations = 0;
  if (input.phi0 !== undefined) {
    const background = integrateBackground(evaluate, params, input.phi0, end, options);
    evaluations += background.evaluations;
    if (background.status !== 'ok') return { ok: false, status: background.status, reason: background.reason, evaluations };
    return { ok: true, background, phi0: input.phi0, evaluations };
  }
  let target = needed + SEARCH_BUFFER;
  let last = '';
  for (let attempt = 0; attempt < MAX_ATTEMPTS; attempt++) {
    const start = findInitialField(evaluate, params, input.domain, end, target);
    if (!start.ok) return { ok: false, status: start.status, reason: start.reason, evaluations };
    const background = integrateBackground(evaluate, params, start.phi0, end, options);
    evaluations += background.evaluations;
    if (background.status !== 'ok') return { ok: false, status: background.status, reason: background.reason, evaluations };
    if (background.nEnd >= needed) return { ok: true, background, phi0: start.phi0, evaluations };
    last = `the full equations gave ${background.nEnd.toFixed(2)} e-folds from phi0 = ${start.phi0}, ${needed.toFixed(2)} needed`;
    target += needed - background.nEnd + SEARCH_BUFFER;
  }
  return { ok: false, status: 'too_few_efolds', reason: last, evaluations };
}
