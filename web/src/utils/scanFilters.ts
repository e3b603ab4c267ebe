import type { ScanView } from '../../../shared/api/scans.ts';

export type ScanState = ScanView['state'];
/** `mine`: scans the signed-in user submitted; `shared`: their groups' scans by others. */
export type OwnerFilter = 'all' | 'mine' | 'shared';
export interface ScanFilter { search: string; states: readonly ScanState[]; owner: OwnerFilter }

/**
 * The scans list's search and filters. Search matches every word of the query anywhere in the
 * title (case and accents ignored), so "plateau survey" finds "Plateau α survey, wide".
 */
const fold = (text: string) => text.normalize('NFD').replace(/\p{M}/gu, '').toLowerCase();

export function filterScans(scans: readonly ScanView[], filter: ScanFilter, userId?: number): ScanView[] {
  const words = fold(filter.search).split(/\s+/).filter(Boolean);
  return scans.filter((scan) => {
    if (filter.states.length > 0 && !filter.states.includes(scan.state)) return false;
    if (filter.owner !== 'all' && userId !== undefined) {
      const mine = scan.owner?.id === userId;
      if (filter.owner === 'mine' ? !mine : mine) return false;
    }
    const title = fold(scan.title);
    return words.every((w) => title.includes(w));
  });
}

/** Newest first: the scan just submitted is at the top. */
export const byNewest = (a: ScanView, b: ScanView): number => b.createdAt.localeCompare(a.createdAt) || b.id - a.id;
