import { InvalidInputError } from '../../errors.ts';
import { createNaturalSpline } from './spline.ts';
import type { CompiledPotential } from './types.ts';

export interface PotentialTable {
  readonly phi: Float64Array;
  readonly V: Float64Array;
}

/** Limits on an uploaded table: a spline needs a few knots; the cap bounds memory per upload. */
export const TABLE_LIMITS = { minRows: 4, maxRows: 100_000 } as const;

const COLUMN_NAMES = ['phi', 'V'] as const;
// Plain decimal literals only: Number() would also accept '', '0x1f' and '1_0'-like surprises.
const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;
// Written by numpy.savetxt and many plotting tools; recognised so the message says "not finite".
const NON_FINITE = /^[+-]?(nan|inf|infinity)$/i;

function parseNumber(token: string): number | undefined {
  if (DECIMAL.test(token)) return Number(token);
  if (!NON_FINITE.test(token)) return undefined;
  if (token.toLowerCase().includes('nan')) return NaN;
  return token.startsWith('-') ? -Infinity : Infinity;
}

/**
 * Reads a two-column table "phi, V" from CSV or whitespace-separated text. Allows `#` comments,
 * blank lines and one header line before the data (a line with no number in it, e.g. `phi,V`).
 * Every error names the line (1-based, as an editor shows it) and the column.
 */
export function parseTabulatedPotential(csvText: string, field = 'table'): PotentialTable {
  const phi: number[] = [];
  const V: number[] = [];
  const lines = csvText.split(/\r\n|\n|\r/);
  let seenContent = false;
  let previousLine = 0;
  for (let index = 0; index < lines.length; index++) {
    const lineNo = index + 1;
    const hash = lines[index]!.indexOf('#');
    const text = (hash >= 0 ? lines[index]!.slice(0, hash) : lines[index]!).trim();
    if (text === '') continue;
    const tokens = text.split(/\s*[,;\t]\s*|\s+/);
    const values = tokens.map(parseNumber);
    // A header ("phi,V", "phi V [M_pl^4]") is a first line without a single number in it.
    const isHeader = !seenContent && values.every((v) => v === undefined);
    seenContent = true;
    if (isHeader) continue;
    if (tokens.length !== 2) {
      throw new InvalidInputError(
        `${field} line ${lineNo}: expected 2 columns (phi, V), found ${tokens.length}`,
        field,
      );
    }
    for (let col = 0; col < 2; col++) {
      if (values[col] === undefined) {
        throw new InvalidInputError(
          `${field} line ${lineNo}, column ${col + 1} (${COLUMN_NAMES[col]}): "${tokens[col]}" is not a number`,
          field,
        );
      }
      if (!Number.isFinite(values[col]!)) {
        throw new InvalidInputError(
          `${field} line ${lineNo}, column ${col + 1} (${COLUMN_NAMES[col]}): "${tokens[col]}" is not finite`,
          field,
        );
      }
    }
    const p = values[0]!;
    const last = phi[phi.length - 1];
    if (last !== undefined && !(p > last)) {
      throw new InvalidInputError(
        `${field} line ${lineNo}, column 1 (phi): ${p} is not greater than ${last} on line ${previousLine}; phi must be strictly increasing`,
        field,
      );
    }
    if (phi.length === TABLE_LIMITS.maxRows) {
      throw new InvalidInputError(
        `${field} line ${lineNo}: more than ${TABLE_LIMITS.maxRows} rows; the limit is ${TABLE_LIMITS.maxRows}`,
        field,
      );
    }
    phi.push(p);
    V.push(values[1]!);
    previousLine = lineNo;
  }
  if (phi.length < TABLE_LIMITS.minRows) {
    throw new InvalidInputError(
      `${field}: needs at least ${TABLE_LIMITS.minRows} rows of (phi, V), found ${phi.length}`,
      field,
    );
  }
  return { phi: Float64Array.from(phi), V: Float64Array.from(V) };
}

/**
 * A tabulated potential as the integrator sees it: V0 times the natural cubic spline of the table
 * (V0 defaults to 1 when the parameter vector is empty). Outside the table V, V', V'' are NaN, so
 * a trajectory that leaves the table fails as a point instead of running on an extrapolation.
 */
export function compileTabulatedPotential(table: PotentialTable): CompiledPotential {
  const spline = createNaturalSpline(table.phi, table.V);
  const range = `table of ${spline.size} points, phi in [${spline.xMin}, ${spline.xMax}]`;
  return {
    parameterNames: ['V0'],
    evaluate(phi: number, params: Float64Array, out: Float64Array): void {
      const v0 = params[0] ?? 1;
      spline.evaluate(phi, out);
      out[0] = v0 * out[0]!;
      out[1] = v0 * out[1]!;
      out[2] = v0 * out[2]!;
    },
    formula: {
      V: `V0 * spline(${range})`,
      dV: `V0 * spline'(${range})`,
      d2V: `V0 * spline''(${range})`,
    },
  };
}
