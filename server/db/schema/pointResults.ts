import { doublePrecision, index, integer, jsonb, pgTable, primaryKey, text } from 'drizzle-orm/pg-core';
import type { Region } from '../../../shared/physics/bounds/score.ts';
import type { PointStatus } from '../../../shared/physics/point/types.ts';
import { scans } from './scans.ts';

/**
 * An observable column. Nullable because NaN and ±Infinity (failed points, a chi2 that cannot be
 * scored) are stored as NULL: JSON, the API's format, has no NaN, and PostgreSQL sorts 'NaN'
 * above every number, which would put failed points first in a descending sort.
 */
const observable = (name?: string) => (name === undefined ? doublePrecision() : doublePrecision(name));

/** One row per computed point; columns mirror PointResult so the database can sort and filter them. */
export const pointResults = pgTable(
  'point_results',
  {
    scanId: integer()
      .notNull()
      .references(() => scans.id, { onDelete: 'cascade' }),
    pointIndex: integer().notNull(),
    // Parameter values of this point by name (N_* included when it is an axis).
    params: jsonb().$type<Record<string, number>>().notNull(),
    status: text().$type<PointStatus>().notNull(),
    reason: text().notNull().default(''),
    nTotal: observable(),
    nPivot: observable(),
    phiStart: observable(),
    phiEnd: observable(),
    phiPivot: observable(),
    deltaPhi: observable(),
    eps1: observable(),
    eps2: observable(),
    eps3: observable(),
    ns: observable(),
    r: observable(),
    nt: observable(),
    alphaS: observable(),
    // Explicit names where snake_case would give "as" (a keyword) or "ge_v".
    As: observable('a_s'),
    amplitude: observable(),
    energyScaleGeV: observable('energy_scale_gev'),
    hubbleGeV: observable('hubble_gev'),
    // From the Mukhanov–Sasaki spectra; NULL unless the plan's precision is 'exact'.
    exactNs: observable(),
    exactR: observable(),
    exactNt: observable(),
    exactAlphaS: observable(),
    exactAs: observable('exact_a_s'),
    exactAmplitude: observable(),
    chi2: observable(),
    region: text().$type<Region>(),
    computeMs: doublePrecision().notNull(),
    // Right-hand-side evaluations: a machine-independent cost, comparable across workers.
    evaluations: integer(),
    // Hash of the point's full request (potential, parameters, pivot, precision): a scan derived
    // from another copies the rows whose key it already has instead of computing them again.
    pointKey: text(),
  },
  (t) => [
    // Makes result writes idempotent: a retried batch conflicts instead of duplicating.
    primaryKey({ name: 'point_results_pkey', columns: [t.scanId, t.pointIndex] }),
    index('point_results_scan_id_ns_idx').on(t.scanId, t.ns),
    index('point_results_scan_id_r_idx').on(t.scanId, t.r),
    index('point_results_scan_id_chi2_idx').on(t.scanId, t.chi2),
    index('point_results_scan_id_status_idx').on(t.scanId, t.status),
    index('point_results_scan_id_point_key_idx').on(t.scanId, t.pointKey),
  ],
);

export type PointResultRow = typeof pointResults.$inferSelect;
export type NewPointResultRow = typeof pointResults.$inferInsert;
