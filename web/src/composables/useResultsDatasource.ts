import type { IDatasource, IGetRowsParams } from 'ag-grid-community';
import { scansApi } from '../api/scans.ts';
import { pageQuery, rowQuery, type GridFilterModel, type GridSortItem, type RowSelection } from '../api/resultsQuery.ts';

/**
 * AG Grid's infinite row model over GET /scans/:id/results: one request per block of rows, never
 * the whole scan. Scrolling on from a block uses the keyset cursor the server returned for it
 * (a deep offset costs the database a scan of every skipped row); a jump far down uses the offset.
 * Cursors are kept only for the sort and filters they were made under.
 */
export function createResultsDatasource(scanId: number, selection: () => RowSelection, events: {
  onError: (error: unknown) => void;
  onLoaded?: (total: number, query: URLSearchParams) => void;
}): IDatasource {
  let cursorsFor = '';
  const cursors = new Map<number, string>();
  return {
    getRows(params: IGetRowsParams) {
      let base: URLSearchParams;
      try {
        base = rowQuery(params.sortModel as GridSortItem[], (params.filterModel ?? {}) as GridFilterModel, selection());
      } catch (error) {
        events.onError(error);
        params.failCallback();
        return;
      }
      const key = base.toString();
      if (key !== cursorsFor) {
        cursorsFor = key;
        cursors.clear();
      }
      scansApi.results(scanId, pageQuery(base, params.startRow, params.endRow, cursors.get(params.startRow))).then(
        (page) => {
          if (page.nextCursor !== null) cursors.set(params.startRow + page.rows.length, page.nextCursor);
          params.successCallback(page.rows, page.total);
          events.onLoaded?.(page.total, base);
        },
        (error: unknown) => {
          events.onError(error);
          params.failCallback();
        },
      );
    },
  };
}
