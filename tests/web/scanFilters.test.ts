import { describe, expect, it } from 'vitest';
import type { ScanView } from '../../shared/api/scans.ts';
import { byNewest, filterScans } from '../../web/src/utils/scanFilters.ts';

let nextId = 1;
function scan(title: string, state: ScanView['state'], ownerId: number | null, createdAt = '2031-04-01T10:00:00.000Z'): ScanView {
  return {
    id: nextId++, title, notes: '', state, pointCount: 10, pointsDone: 0, pointsFailed: 0, pointsPerSecond: null, etaSeconds: null,
    planHash: 'h', physicsVersion: '1', basedOnScanId: null, owner: ownerId === null ? null : { id: ownerId, name: `u${ownerId}`, email: `u${ownerId}@example.org` },
    group: null, computeSeconds: 0, error: null, createdAt, startedAt: null, finishedAt: null,
  };
}
const scans = [
  scan('Plateau α survey, wide', 'completed', 1), scan('Hilltop power grid', 'running', 2),
  scan('Quick check, E-model', 'queued', 1), scan('Plateau reheating', 'failed', 2), scan('Old scan', 'cancelled', null),
];
const titles = (list: ScanView[]) => list.map((s) => s.title);
const none = { search: '', states: [], owner: 'all' } as const;

describe('scans list filter', () => {
  it('shows everything with no filter', () => {
    expect(filterScans(scans, none, 1)).toHaveLength(5);
  });
  it('matches every word of the search anywhere in the title, ignoring case and accents', () => {
    expect(titles(filterScans(scans, { ...none, search: 'plateau' }))).toEqual(['Plateau α survey, wide', 'Plateau reheating']);
    expect(titles(filterScans(scans, { ...none, search: '  SURVEY   plateau ' }))).toEqual(['Plateau α survey, wide']);
    expect(titles(filterScans([scan('Écart à la norme', 'completed', 1)], { ...none, search: 'ecart a' }))).toEqual(['Écart à la norme']);
    expect(filterScans(scans, { ...none, search: 'plateau grid' })).toEqual([]);
  });
  it('keeps only the chosen states', () => {
    expect(titles(filterScans(scans, { ...none, states: ['running', 'queued'] }))).toEqual(['Hilltop power grid', 'Quick check, E-model']);
  });
  it('tells my scans from those shared with me', () => {
    expect(titles(filterScans(scans, { ...none, owner: 'mine' }, 1))).toEqual(['Plateau α survey, wide', 'Quick check, E-model']);
    expect(titles(filterScans(scans, { ...none, owner: 'shared' }, 1))).toEqual(['Hilltop power grid', 'Plateau reheating', 'Old scan']);
    // Without a known user there is no "mine": the owner filter does nothing rather than hide all.
    expect(filterScans(scans, { ...none, owner: 'mine' })).toHaveLength(5);
  });
  it('combines search, states and owner', () => {
    expect(titles(filterScans(scans, { search: 'plateau', states: ['failed'], owner: 'shared' }, 1))).toEqual(['Plateau reheating']);
  });
  it('orders newest first, by id when submitted the same instant', () => {
    const a = scan('a', 'queued', 1, '2031-04-02T00:00:00.000Z');
    const b = scan('b', 'queued', 1, '2031-04-03T00:00:00.000Z');
    const c = scan('c', 'queued', 1, '2031-04-03T00:00:00.000Z');
    expect(titles([a, b, c].sort(byNewest))).toEqual(['c', 'b', 'a']);
  });
});
