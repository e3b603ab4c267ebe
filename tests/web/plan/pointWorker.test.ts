import { describe, expect, it } from 'vitest';
import { effectScope, nextTick } from 'vue';
import { handlePreview, type PreviewReply, type PreviewRequest } from '../../../web/src/workers/pointProtocol.ts';
import { usePointWorker, type PointWorkerLike } from '../../../web/src/composables/usePointWorker.ts';
import { emptyAxis, emptyForm } from '../../../web/src/components/plan/planForm.ts';
import { previewRequest } from '../../../web/src/composables/usePlanForm.ts';

const quadratic = { potential: { family: 'quadratic' }, params: {}, pivot: { efolds: 60 } };

describe('preview worker messages', () => {
  it('answers a point with its trajectory and V(phi) over the field it rolls through', () => {
    const reply = handlePreview({ id: 7, request: quadratic, curveSamples: 50 });
    if (!reply.ok) throw new Error(reply.error.message);
    expect(reply.id).toBe(7);
    // Quadratic inflation at N_* = 60: n_s ≈ 1 - 2/N ≈ 0.967, r ≈ 8/N ≈ 0.13 (Liddle & Lyth 2000).
    expect(reply.result.ns).toBeCloseTo(0.967, 2);
    expect(reply.result.r).toBeCloseTo(0.133, 2);
    expect(reply.trajectory?.pivotIndex).toBeGreaterThan(0);
    expect(reply.curve.phi).toHaveLength(50);
    const { phiStart, phiEnd } = reply.result;
    expect(reply.curve.phi[0]!).toBeLessThan(phiEnd);
    expect(reply.curve.phi.at(-1)!).toBeGreaterThan(phiStart);
    // V0 phi^2 with V0 = 1 (the family's expression).
    reply.curve.phi.forEach((phi, i) => expect(reply.curve.V[i]!).toBeCloseTo(phi * phi, 9));
    // Replies cross the worker boundary by structured clone.
    expect(structuredClone(reply)).toEqual(reply);
  });

  it('names the field of a bad expression', () => {
    const reply = handlePreview({ id: 1, request: { potential: { expression: 'V0 * phi^' }, params: { V0: 1 }, pivot: { efolds: 50 } } });
    expect(reply).toMatchObject({ ok: false, error: { field: 'potential.expression' } });
    if (!reply.ok) expect(reply.error.message).toMatch(/syntax error/);
  });

  it('names the field of a request that does not fit the point schema', () => {
    const reply = handlePreview({ id: 2, request: { ...quadratic, pivot: { efolds: -3 } } as never });
    expect(reply).toMatchObject({ ok: false, error: { field: 'pivot.efolds' } });
  });

  it('reports a physical failure as the point status, not as an error', () => {
    const reply = handlePreview({ id: 3, request: { ...quadratic, phi0: 5 } });
    expect(reply).toMatchObject({ ok: true, result: { status: 'too_few_efolds' } });
  });

  it('previews the same request as the scan expansion gives for a sample point', () => {
    const form = { ...emptyForm(), family: 'e-model', axes: [{ ...emptyAxis('alpha'), kind: 'values' as const, values: '0.5, 2' }], efolds: '50' };
    const sample = previewRequest(form, 1);
    if (!('request' in sample)) throw new Error('expected a request');
    expect(sample.values).toEqual({ alpha: 2 });
    expect(sample.request).toMatchObject({ potential: { family: 'e-model' }, params: { alpha: 2 }, pivot: { efolds: 50 } });
    expect(previewRequest({ ...form, axes: [] }, 0)).toMatchObject({ issues: [{ path: 'axes' }] });
  });
});

/** Runs the real handler behind the Worker interface, answering asynchronously like a thread. */
function fakeWorker(log: number[]): PointWorkerLike {
  const worker: PointWorkerLike = {
    onmessage: null,
    onerror: null,
    postMessage(message: PreviewRequest) {
      log.push(message.id);
      setTimeout(() => worker.onmessage?.({ data: handlePreview(message) } as MessageEvent<PreviewReply>), 5);
    },
    terminate() {},
  };
  return worker;
}

describe('usePointWorker', () => {
  it('keeps only the latest request while one is running and drops superseded replies', async () => {
    const sent: number[] = [];
    const scope = effectScope();
    const worker = scope.run(() => usePointWorker(() => fakeWorker(sent)))!;
    const first = worker.compute(quadratic);
    worker.compute({ ...quadratic, pivot: { efolds: 50 } });
    const last = worker.compute({ ...quadratic, pivot: { efolds: 40 } });
    expect(worker.busy.value).toBe(true);
    for (let i = 0; i < 200 && worker.busy.value; i++) await new Promise((r) => setTimeout(r, 10));
    await nextTick();
    expect(sent).toEqual([first, last]);
    expect(worker.reply.value).toMatchObject({ id: last, ok: true, result: { nPivot: 40 } });
    scope.stop();
  });
});
