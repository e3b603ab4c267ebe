import { z } from 'zod';
import { refText, type ColumnRef } from '../../shared/api/results.ts';
import { InvalidInputError } from '../../shared/errors.ts';
import type { Keyset } from './resultsRepository.ts';

/**
 * The opaque keyset cursor: the sort it belongs to and the last row's (sort value, pointIndex).
 * A page after it is a range condition, so page 10,000 costs what page 1 costs, unlike OFFSET.
 * The sort is inside so that a cursor reused with another sort is refused instead of skipping rows.
 */
const cursorSchema = z.tuple([z.string(), z.enum(['asc', 'desc']), z.number().nullable(), z.number().int().min(0)]);

export function encodeCursor(sort: ColumnRef, order: 'asc' | 'desc', at: Keyset): string {
  return Buffer.from(JSON.stringify([refText(sort), order, at.value, at.pointIndex])).toString('base64url');
}

export function decodeCursor(text: string, sort: ColumnRef, order: 'asc' | 'desc'): Keyset {
  let decoded: unknown;
  try {
    decoded = JSON.parse(Buffer.from(text, 'base64url').toString('utf8'));
  } catch {
    decoded = undefined;
  }
  const parsed = cursorSchema.safeParse(decoded);
  if (!parsed.success) throw new InvalidInputError('cursor: not a cursor from this API; pass a previous page\'s nextCursor unchanged', 'cursor');
  const [cursorSort, cursorOrder, value, pointIndex] = parsed.data;
  if (cursorSort !== refText(sort) || cursorOrder !== order) {
    throw new InvalidInputError(`cursor: belongs to sort=${cursorSort}&order=${cursorOrder}; repeat that sort, or start again without a cursor`, 'cursor');
  }
  return { value, pointIndex };
}
