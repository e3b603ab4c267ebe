import { and, eq, isNotNull, sql } from 'drizzle-orm';
import type { ColumnRef } from '../../shared/api/results.ts';
import type { Region } from '../../shared/physics/bounds/score.ts';
import type { Database } from '../db/client.ts';
import { pointResults } from '../db/schema/pointResults.ts';
import { selection, valueOf, type RowSelection } from './resultsRepository.ts';

/** The n_s–r plane of a scan as parallel arrays, thinned in the database to at most `max` points. */

export interface PlaneSpec extends RowSelection {
  color?: ColumnRef | undefined;
  max: number;
}

export interface PlaneColumns {
  total: number;
  stride: number;
  ns: number[];
  r: number[];
  color: (number | null)[];
  pointIndex: number[];
  region: (Region | null)[];
}

/**
 * ok points with both n_s and r, in point order. When there are more than `max`, every
 * stride-th (stride = ceil(total / max)) is kept: even in point order, so a grid scan stays an even
 * sample of its grid. The arrays come back as one JSON text built by the database (PGlite decodes
 * results field by field, which for 10^5 points would cost more than the query).
 */
export async function planeColumns(db: Database, q: PlaneSpec): Promise<PlaneColumns> {
  const color = q.color === undefined ? sql`null::float8` : valueOf(q.color);
  const where = and(selection(q), eq(pointResults.status, 'ok'), isNotNull(pointResults.ns), isNotNull(pointResults.r));
  const numbered = db.select({
    ns: sql<number>`${pointResults.ns}`.as('ns'),
    r: sql<number>`${pointResults.r}`.as('r'),
    color: sql<number | null>`${color}`.as('color'),
    pointIndex: sql<number>`${pointResults.pointIndex}`.as('point_index'),
    region: sql<string | null>`${pointResults.region}`.as('region'),
    rn: sql<number>`row_number() over (order by ${pointResults.pointIndex})`.as('rn'),
    total: sql<number>`count(*) over ()`.as('total'),
  }).from(pointResults).where(where).as('numbered');
  const stride = sql`greatest(1, ceil(${numbered.total}::float8 / ${q.max}::int))::bigint`;
  const agg = (c: unknown) => sql`coalesce(json_agg(${c} order by ${numbered.pointIndex}), '[]')`;
  const json = sql<string>`json_build_object(
    'total', coalesce(max(${numbered.total}), 0), 'stride', coalesce(max(${stride}), 1),
    'ns', ${agg(numbered.ns)}, 'r', ${agg(numbered.r)}, 'color', ${agg(numbered.color)},
    'pointIndex', ${agg(numbered.pointIndex)}, 'region', ${agg(numbered.region)})::text`;
  const [row] = await db.select({ json }).from(numbered).where(sql`(${numbered.rn} - 1) % ${stride} = 0`);
  return JSON.parse(row!.json) as PlaneColumns;
}
