import type { RowFilter } from '../shared/api/client.ts';
import type { FilterOp } from '../shared/api/results.ts';
import { InvalidInputError } from '../shared/errors.ts';

/** `ns>0.96` on the command line is `ns.gt=0.96` in the API; columns are checked by the server. */
const OPS: Record<string, FilterOp> = { '>': 'gt', '>=': 'gte', '<': 'lt', '<=': 'lte', '=': 'eq' };
const FILTER = /^\s*([A-Za-z_][A-Za-z0-9_.]*)\s*(>=|<=|>|<|=)\s*(\S+)\s*$/;

export function parseFilter(text: string): RowFilter {
  const match = FILTER.exec(text);
  const value = match ? Number(match[3]) : Number.NaN;
  if (!match || !Number.isFinite(value)) {
    throw new InvalidInputError(`--filter: "${text}" is not of the form <column><op><number> with op one of > >= < <= = (e.g. 'ns>0.96', 'param.alpha<=2')`, '--filter');
  }
  return { column: match[1]!, op: OPS[match[2]!]!, value };
}
