import type { Heatmap } from '../../../../shared/api/results.ts';
import type { RegionLevel } from './planeRegions.ts';

/**
 * Outlines of a heatmap's 68% and 95% regions along cell edges. A cell's region is the best
 * region of the points in it (server/results/heatmapRepository.ts), so a cell is inside the 95%
 * outline when that is inside68 or inside95.
 */

/** Which side of cell (ix, iy) an edge lies on. */
export type Side = 'left' | 'right' | 'bottom' | 'top';
export type CellEdge = [ix: number, iy: number, side: Side];

const RANK = { inside68: 0, inside95: 1, outside: 2 } as const;
const inside = (cell: Heatmap['region'][number][number] | undefined, level: RegionLevel): boolean =>
  cell !== null && cell !== undefined && RANK[cell] <= RANK[level];

/** Every edge between a cell inside `level` and one that is not (or the grid's border). */
export function regionEdges(region: Heatmap['region'], level: RegionLevel): CellEdge[] {
  const edges: CellEdge[] = [];
  region.forEach((row, iy) => {
    row.forEach((cell, ix) => {
      if (!inside(cell, level)) return;
      if (!inside(row[ix - 1], level)) edges.push([ix, iy, 'left']);
      if (!inside(row[ix + 1], level)) edges.push([ix, iy, 'right']);
      if (!inside(region[iy - 1]?.[ix], level)) edges.push([ix, iy, 'bottom']);
      if (!inside(region[iy + 1]?.[ix], level)) edges.push([ix, iy, 'top']);
    });
  });
  return edges;
}

/** The segment of an edge in pixels, from the cell's centre and size (y grows downwards on screen). */
export function edgeSegment(center: [number, number], size: [number, number], side: Side): { x1: number; y1: number; x2: number; y2: number } {
  const [cx, cy] = center;
  const hx = size[0] / 2;
  const hy = size[1] / 2;
  switch (side) {
    case 'left': return { x1: cx - hx, y1: cy - hy, x2: cx - hx, y2: cy + hy };
    case 'right': return { x1: cx + hx, y1: cy - hy, x2: cx + hx, y2: cy + hy };
    case 'bottom': return { x1: cx - hx, y1: cy + hy, x2: cx + hx, y2: cy + hy };
    case 'top': return { x1: cx - hx, y1: cy - hy, x2: cx + hx, y2: cy - hy };
  }
}
