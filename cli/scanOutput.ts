import type { ScanDetail, ScanView } from '../shared/api/scans.ts';
import { printFields, printTable, type Column } from './table.ts';
import { bar, count, formatDuration, painter, STATE_COLOURS } from './terminal.ts';

/** How scans read in a terminal: the table of `rollway scans`, the fields of `show`, one-line summaries. */

const fraction = (v: ScanView): number => (v.pointCount > 0 ? v.pointsDone / v.pointCount : 1);
const percent = (v: ScanView): string => `${Math.floor(fraction(v) * 100)}%`;
const pad = (n: number): string => String(n).padStart(2, '0');
/** Local time to the minute, as people read a clock. */
export function when(iso: string | null): string {
  if (iso === null) return '—';
  const d = new Date(iso);
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

export function printScans(scans: readonly ScanView[]): void {
  const paint = painter();
  const columns: Column<ScanView>[] = [
    { header: 'ID', value: (s) => String(s.id), right: true },
    { header: 'TITLE', value: (s) => (s.title.length > 40 ? `${s.title.slice(0, 39)}…` : s.title) },
    { header: 'STATE', value: (s) => paint(STATE_COLOURS[s.state] ?? 'bold', s.state) },
    { header: 'PROGRESS', value: (s) => `${count(s.pointsDone)}/${count(s.pointCount)} ${percent(s).padStart(4)}`, right: true },
    { header: 'OWNER', value: (s) => s.owner?.name || s.owner?.email || '—' },
    { header: 'CREATED', value: (s) => when(s.createdAt) },
  ];
  printTable(columns, scans, 'No scans yet: submit one with rollway submit PLAN');
}

export function printScanDetail(scan: ScanDetail): void {
  const paint = painter();
  const fields: Array<[string, string]> = [
    ['scan', `${scan.id} "${scan.title}"`],
    ['state', paint(STATE_COLOURS[scan.state] ?? 'bold', scan.state)],
    ['progress', `${count(scan.pointsDone)}/${count(scan.pointCount)} points (${percent(scan)}), ${count(scan.pointsFailed)} not ok`],
    ['rate', scan.pointsPerSecond === null ? '—' : `${scan.pointsPerSecond.toFixed(0)} points/s, ETA ${formatDuration(scan.etaSeconds)}`],
    ['compute', `${scan.computeSeconds.toFixed(1)} s`],
    ['owner', scan.owner ? `${scan.owner.name} <${scan.owner.email}>` : '—'],
    ['group', scan.group?.name ?? '—'],
    ['based on', scan.basedOnScanId === null ? '—' : `scan ${scan.basedOnScanId}`],
    ['plan hash', scan.planHash],
    ['physics', scan.physicsVersion],
    ['created', when(scan.createdAt)],
    ['started', when(scan.startedAt)],
    ['finished', when(scan.finishedAt)],
  ];
  if (scan.error) fields.push(['error', paint('red', scan.error)]);
  if (scan.notes) fields.push(['notes', scan.notes.trim().replace(/\n/g, '\n'.padEnd(12))]);
  printFields(fields);
}

/** The live line of `watch`: bar, percentage, points, rate and ETA. */
export function progressLine(v: ScanView): string {
  const rate = v.pointsPerSecond === null ? '' : `  ${v.pointsPerSecond.toFixed(0)} points/s  ETA ${formatDuration(v.etaSeconds)}`;
  return `${bar(fraction(v))} ${percent(v).padStart(4)}  ${count(v.pointsDone)}/${count(v.pointCount)} points${rate}  ${v.state}`;
}

export function scanSummary(v: ScanView): string {
  const wall = v.startedAt && v.finishedAt ? `, ${formatDuration((Date.parse(v.finishedAt) - Date.parse(v.startedAt)) / 1000)} wall clock` : '';
  const failed = v.pointsFailed > 0 ? ` (${count(v.pointsFailed)} not ok)` : '';
  const error = v.error ? `: ${v.error}` : '';
  return `scan ${v.id} "${v.title}" ${v.state}${error}: ${count(v.pointsDone)}/${count(v.pointCount)} points${failed}, ${v.computeSeconds.toFixed(1)} s of compute${wall}`;
}
