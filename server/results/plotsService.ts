import type { Filter } from '../../shared/api/results.ts';
import type { Plane, PlaneQuery, PointDetail } from '../../shared/api/plots.ts';
import { InvalidInputError, NotFoundError } from '../../shared/errors.ts';
import { preparePoint } from '../../shared/physics/point/preparePoint.ts';
import { computePointWithTrajectory } from '../../shared/physics/point/trajectory.ts';
import { spectraAroundPivot } from '../../shared/physics/spectra/spectraAroundPivot.ts';
import { createPointSource } from '../../shared/plan/expandPlan.ts';
import { planBoundSet, type ScanPlan } from '../../shared/plan/scanPlan.ts';
import type { Database } from '../db/client.ts';
import { findScan } from '../scans/scansRepository.ts';
import { planeColumns } from './planeRepository.ts';
import { planParameters } from './planParameters.ts';
import { selectPage } from './resultsRepository.ts';

/** Plot data of one scan: the n_s–r plane and a point's detail. Mounted beside the results routes. */
export type PlotsService = ReturnType<typeof createPlotsService>;

export function createPlotsService(db: Database) {
  const scanOrThrow = async (id: number) => {
    const scan = await findScan(db, id);
    if (!scan) throw new NotFoundError(`scan ${id} does not exist`);
    return scan;
  };

  return {
    async plane(id: number, q: PlaneQuery): Promise<Plane> {
      const scan = await scanOrThrow(id);
      const params = planParameters(scan.plan);
      const named: Pick<Filter, 'ref' | 'field'>[] = [...q.filters, ...(q.color ? [{ ref: q.color, field: 'color' }] : [])];
      for (const { ref, field } of named) {
        if (ref.kind === 'param' && !params.has(ref.name)) {
          throw new InvalidInputError(`${field}: scan ${id} has no parameter "${ref.name}"; its parameters are ${[...params.keys()].join(', ') || 'none'}`, field);
        }
      }
      const columns = await planeColumns(db, { scanId: id, filters: q.filters, region: q.region, color: q.color, max: q.max });
      const colorBy = q.color === undefined ? null : q.color.kind === 'param' ? `param.${q.color.name}` : q.color.name;
      return {
        scanId: id, colorBy, downsampled: columns.stride > 1, ...columns,
        boundSet: planBoundSet(scan.plan as Pick<ScanPlan, 'boundSet'>),
      };
    },

    /**
     * The stored row plus what is not stored: the trajectory, recomputed from the point's request
     * (rebuilt from the plan by its index, so it is the very request the scan computed), and for
     * exact scans the spectra at a few k around the pivot.
     */
    async point(id: number, index: number): Promise<PointDetail> {
      const scan = await scanOrThrow(id);
      if (index >= scan.pointCount) throw new NotFoundError(`scan ${id} has points 0 to ${scan.pointCount - 1}; there is no point ${index}`);
      const [stored] = await selectPage(db, {
        scanId: id, filters: [{ ref: { kind: 'column', name: 'pointIndex' }, op: 'eq', value: index, field: 'index' }],
        sort: { kind: 'column', name: 'pointIndex' }, order: 'asc', limit: 1,
      });
      if (!stored) throw new NotFoundError(`point ${index} of scan ${id} is not computed yet`);
      const plan = scan.plan as unknown as ScanPlan;
      const input = preparePoint(createPointSource(plan).requestAt(index));
      const { result, trajectory } = computePointWithTrajectory({ ...input, exact: false });
      const exact = plan.precision.preset === 'exact' && result.status === 'ok';
      const spectra = exact ? spectraAroundPivot(input, result.phiStart, result.nPivot) : null;
      return {
        scanId: id,
        row: stored.row,
        trajectory: trajectory && {
          N: trajectory.N, phi: trajectory.phi, eps1: trajectory.eps1, eps2: trajectory.eps2,
          pivotN: Number.isFinite(trajectory.pivotN) ? trajectory.pivotN : null, nEnd: trajectory.nEnd,
        },
        trajectoryNote: trajectory ? '' : `no trajectory to show: ${result.reason || stored.row.reason || result.status}`,
        spectra: spectra && { samples: spectra.samples, failures: spectra.failures },
      };
    },
  };
}
