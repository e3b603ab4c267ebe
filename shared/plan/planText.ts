import { parseDocument, type YAMLError } from 'yaml';
import { PlanValidationError, type PlanIssue } from './planError.ts';

/**
 * Reads a plan's text into data, with syntax errors at a line and column as an editor counts them.
 * The YAML core schema only builds plain data (maps, lists, strings, numbers, booleans, null);
 * nothing in the text is ever run.
 */

/** A table of 5,000,000 characters (pointRequest's limit) plus the rest of the plan. */
export const MAX_PLAN_TEXT = 6_000_000;

export type PlanFormat = 'yaml' | 'json';

function lineColumn(text: string, offset: number): string {
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  return `line ${line}, column ${offset - before.lastIndexOf('\n')}`;
}

const POSITION = / in JSON at position (\d+)/;

/** Error offset of a JSON.parse failure; V8 leaves the position out of "unexpected token" messages. */
function jsonErrorOffset(text: string, message: string): number {
  const at = POSITION.exec(message);
  if (at !== null) return Number(at[1]);
  // The shortest failing prefix that is not merely cut short (an error at its very end) ends at the error.
  const brokenWithin = (n: number): boolean => {
    try {
      JSON.parse(text.slice(0, n));
      return false;
    } catch (err) {
      const m = (err as Error).message;
      if (m.startsWith('Unexpected end of JSON input')) return false;
      const pos = POSITION.exec(m);
      return pos === null || Number(pos[1]) < n;
    }
  };
  let lo = 0;
  let hi = text.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (brokenWithin(mid)) hi = mid;
    else lo = mid + 1;
  }
  return Math.max(0, lo - 1);
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (err) {
    const message = (err as Error).message;
    const reason = message.replace(POSITION, '').replace(/, (\.\.\.)?".*" is not valid JSON$/s, '');
    const where = reason.startsWith('Unexpected end') ? `${lineColumn(text, text.length)} (the end of the text)` : lineColumn(text, jsonErrorOffset(text, message));
    throw new PlanValidationError([{ path: '', message: `JSON syntax error at ${where}: ${reason}` }]);
  }
}

function yamlIssue(e: YAMLError): PlanIssue {
  const reason = e.message.split(/ at line \d+, column \d+/)[0] ?? e.message;
  const at = e.linePos?.[0];
  const where = at === undefined ? '' : ` at line ${at.line}, column ${at.col}`;
  return { path: '', message: `YAML syntax error${where}: ${reason}` };
}

function parseYaml(text: string): unknown {
  const doc = parseDocument(text, { prettyErrors: true, uniqueKeys: true });
  // Warnings too: an unknown tag (e.g. !!js/function) would otherwise silently become a string.
  const problems = [...doc.errors, ...doc.warnings];
  if (problems.length > 0) throw new PlanValidationError(problems.map(yamlIssue));
  try {
    return doc.toJS({ maxAliasCount: 100 });
  } catch (err) {
    // An alias without its anchor, or aliases that would expand the document without bound.
    throw new PlanValidationError([{ path: '', message: `YAML error: ${(err as Error).message}` }]);
  }
}

/** Plain data from a plan's text; JSON when `format` says so or the text starts with "{". */
export function readPlanText(text: string, format?: PlanFormat): unknown {
  if (typeof text !== 'string') throw new PlanValidationError([{ path: '', message: 'the plan must be given as text' }]);
  if (text.length > MAX_PLAN_TEXT) {
    throw new PlanValidationError([{ path: '', message: `the plan is ${text.length} characters long; at most ${MAX_PLAN_TEXT} are allowed` }]);
  }
  const nul = text.indexOf('\u0000');
  if (nul >= 0) throw new PlanValidationError([{ path: '', message: `the plan contains a NUL character at ${lineColumn(text, nul)}; a plan is plain text` }]);
  const json = format === 'json' || (format === undefined && text.trimStart().startsWith('{'));
  return json ? parseJson(text) : parseYaml(text);
}
