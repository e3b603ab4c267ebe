import { readFile } from 'node:fs/promises';
import { InvalidInputError } from '../shared/errors.ts';
import type { PlanFormat } from '../shared/plan/planText.ts';

/** A plan file's text and its format by extension (YAML unless it ends in .json). */
export async function readPlanFile(file: string): Promise<{ planText: string; format?: PlanFormat }> {
  const planText = await readFile(file, 'utf8').catch((error: NodeJS.ErrnoException) => {
    const why = error.code === 'ENOENT' ? 'no such file' : error.code === 'EISDIR' ? 'it is a folder' : error.code ?? error.message;
    throw new InvalidInputError(`FILE: cannot read "${file}" (${why})`, 'FILE');
  });
  return /\.json$/i.test(file) ? { planText, format: 'json' } : { planText };
}

/** A positive whole number given on the command line, e.g. a scan id. */
export function positiveId(text: string, what = 'ID'): number {
  if (!/^\d{1,12}$/.test(text) || Number(text) < 1) throw new InvalidInputError(`${what}: "${text}" is not an id (a positive whole number)`, what);
  return Number(text);
}
