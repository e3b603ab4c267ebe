import { describe, expect, it } from 'vitest';
import { parseResultsQuery, RESULTS_PAGE_MAX } from '../../shared/api/results.ts';
import { filterBounds, isQueryColumn, pageQuery, ResultsQueryError, rowQuery, type GridFilterModel } from '../../web/src/api/resultsQuery.ts';

const asObject = (p: URLSearchParams) => Object.fromEntries(p.entries());
const number = (type: string, filter: number | null, filterTo?: number | null) => ({ filterType: 'number', type, filter, ...(filterTo === undefined ? {} : { filterTo }) });

describe('grid models → results query', () => {
  it('maps each offered number option to its API operator', () => {
    const model: GridFilterModel = {
      ns: number('greaterThanOrEqual', 0.96), r: number('lessThan', 0.036), chi2: number('lessThanOrEqual', 6),
      'param.alpha': number('greaterThan', 1), pointIndex: number('equals', 7),
    };
    expect(asObject(rowQuery([], model))).toEqual({ 'ns.gte': '0.96', 'r.lt': '0.036', 'chi2.lte': '6', 'param.alpha.gt': '1', 'pointIndex.eq': '7' });
  });

  it('turns an inclusive range into gte and lte, whichever end was typed first', () => {
    expect(asObject(rowQuery([], { ns: number('inRange', 0.97, 0.95) }))).toEqual({ 'ns.gte': '0.95', 'ns.lte': '0.97' });
  });

  it('keeps the tighter bound when AND-combined conditions bound the same side', () => {
    const model: GridFilterModel = { ns: { filterType: 'number', operator: 'AND', conditions: [number('greaterThan', 0.95), number('greaterThan', 0.96), number('lessThanOrEqual', 0.98)] } };
    expect(asObject(rowQuery([], model))).toEqual({ 'ns.gt': '0.96', 'ns.lte': '0.98' });
    const two = { r: { operator: 'AND' as const, conditions: [number('lessThan', 0.1), number('lessThan', 0.01)] } };
    expect(filterBounds(two).get('r.lt')).toBe(0.01);
  });

  it('skips a condition whose number is not typed yet', () => {
    expect(asObject(rowQuery([], { ns: number('greaterThan', null), r: number('inRange', 0, null) }))).toEqual({});
  });

  it('refuses what the API cannot express, naming the column, rather than dropping it', () => {
    expect(() => rowQuery([], { ns: { operator: 'OR', conditions: [number('lessThan', 0.9), number('greaterThan', 1)] } })).toThrow(/^ns: .*AND/);
    expect(() => rowQuery([], { r: number('notEqual', 0) })).toThrow(/^r: the filter "notEqual" is not supported/);
    expect(() => rowQuery([], { r: number('blank', null) })).toThrow(ResultsQueryError);
    expect(() => rowQuery([], { status: { filterType: 'text', type: 'equals', filter: 1 } })).toThrow(/^status: /);
    expect(() => rowQuery([], { ns: { operator: 'AND', conditions: [number('equals', 1), number('equals', 2)] } })).toThrow(/cannot equal both 1 and 2/);
    expect(() => rowQuery([], { ns: number('equals', Number.POSITIVE_INFINITY) })).toThrow(/finite/);
  });

  it('sorts by the first sort column only, and only by a column the API knows', () => {
    expect(asObject(rowQuery([{ colId: 'chi2', sort: 'asc' }, { colId: 'ns', sort: 'desc' }], {}))).toEqual({ sort: 'chi2', order: 'asc' });
    expect(asObject(rowQuery([{ colId: 'param.mu', sort: 'desc' }], {}))).toEqual({ sort: 'param.mu', order: 'desc' });
    expect(() => rowQuery([{ colId: 'status', sort: 'asc' }], {})).toThrow(/^status: this column cannot be sorted/);
    expect(() => rowQuery([{ colId: 'param.bad-name', sort: 'asc' }], {})).toThrow(ResultsQueryError);
  });

  it('adds the outcome and region selection as comma lists', () => {
    expect(asObject(rowQuery([], {}, { status: ['ok', 'never_ends'], region: ['inside68'] }))).toEqual({ status: 'ok,never_ends', region: 'inside68' });
    expect(asObject(rowQuery([], {}, { status: [], region: [] }))).toEqual({});
  });

  it('pages by offset, or by cursor when one is known, capped at the API maximum', () => {
    const base = rowQuery([{ colId: 'ns', sort: 'asc' }], {});
    expect(asObject(pageQuery(base, 400, 600))).toEqual({ sort: 'ns', order: 'asc', limit: '200', offset: '400' });
    expect(asObject(pageQuery(base, 200, 400, 'abc'))).toEqual({ sort: 'ns', order: 'asc', limit: '200', cursor: 'abc' });
    expect(pageQuery(base, 0, 10 * RESULTS_PAGE_MAX).get('limit')).toBe(String(RESULTS_PAGE_MAX));
    expect(() => pageQuery(base, 10, 10)).toThrow(RangeError);
    expect(base.has('offset')).toBe(false); // the base is not changed by paging
  });

  it('produces queries the server parses back to the same filters and sort', () => {
    const model: GridFilterModel = { ns: number('inRange', 0.95, 0.97), 'param.alpha': number('greaterThan', 0.5), evaluations: number('lessThan', 5000) };
    const query = pageQuery(rowQuery([{ colId: 'r', sort: 'desc' }], model, { region: ['inside95', 'inside68'] }), 0, 100);
    const parsed = parseResultsQuery(asObject(query));
    expect(parsed).toMatchObject({ sort: { kind: 'column', name: 'r' }, order: 'desc', limit: 100, offset: 0, region: ['inside95', 'inside68'] });
    expect(parsed.filters.map((f) => [f.field, f.value])).toEqual([['ns.gte', 0.95], ['ns.lte', 0.97], ['param.alpha.gt', 0.5], ['evaluations.lt', 5000]]);
  });

  it('knows which columns can be queried', () => {
    expect(['ns', 'pointIndex', 'computeMs', 'param.V0', 'param._x1'].every(isQueryColumn)).toBe(true);
    expect(['status', 'region', 'params', 'param.', 'param.1a', 'ns; drop'].some(isQueryColumn)).toBe(false);
  });
});
