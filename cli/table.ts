import { visibleLength } from './terminal.ts';

export interface Column<T> {
  header: string;
  value: (row: T) => string;
  /** Numbers read best right-aligned. */
  right?: boolean;
}

/** Aligned columns separated by two spaces; cells may carry colour codes. */
export function formatTable<T>(columns: readonly Column<T>[], rows: readonly T[]): string {
  const cells = rows.map((row) => columns.map((c) => c.value(row)));
  const widths = columns.map((c, i) => Math.max(visibleLength(c.header), ...cells.map((r) => visibleLength(r[i]!))));
  const line = (values: string[]) => values
    .map((v, i) => {
      const padding = ' '.repeat(widths[i]! - visibleLength(v));
      return columns[i]!.right ? padding + v : v + padding;
    })
    .join('  ')
    .trimEnd();
  return [line(columns.map((c) => c.header)), ...cells.map(line)].join('\n');
}

export function printTable<T>(columns: readonly Column<T>[], rows: readonly T[], empty: string): void {
  process.stdout.write(rows.length === 0 ? `${empty}\n` : `${formatTable(columns, rows)}\n`);
}

/** `label  value` lines with the labels aligned. */
export function printFields(fields: ReadonlyArray<[string, string]>): void {
  const width = Math.max(...fields.map(([label]) => label.length));
  process.stdout.write(`${fields.map(([label, value]) => `${label.padEnd(width)}  ${value}`).join('\n')}\n`);
}
