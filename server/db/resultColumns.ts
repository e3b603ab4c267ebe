import { getTableColumns } from 'drizzle-orm';
import { CasingCache } from 'drizzle-orm/casing';
import { pointResults, type NewPointResultRow } from './schema/pointResults.ts';

export type ColumnKind = 'int4' | 'float8' | 'text' | 'jsonb';

export interface ResultColumn {
  key: keyof NewPointResultRow;
  /** The SQL name, as drizzle's snake_case casing renders it. */
  name: string;
  kind: ColumnKind;
  /** What a missing value becomes: the column's default, else NULL. */
  fallback: unknown;
}

const KINDS: Record<string, ColumnKind> = {
  PgInteger: 'int4',
  PgDoublePrecision: 'float8',
  PgText: 'text',
  PgJsonb: 'jsonb',
};

const casing = new CasingCache('snake_case');

/**
 * point_results' columns in schema order, for the writers that bypass drizzle's insert builder.
 * A column type the encoders do not know fails here, at import, rather than mid-scan.
 */
export const RESULT_COLUMNS: readonly ResultColumn[] = Object.entries(getTableColumns(pointResults)).map(
  ([key, column]) => {
    const kind = KINDS[column.columnType];
    if (kind === undefined) throw new Error(`point_results.${key}: no writer for column type ${column.columnType}`);
    return { key: key as keyof NewPointResultRow, name: casing.getColumnCasing(column), kind, fallback: column.default ?? null };
  },
);

export const RESULT_COLUMN_LIST = RESULT_COLUMNS.map((c) => `"${c.name}"`).join(', ');
