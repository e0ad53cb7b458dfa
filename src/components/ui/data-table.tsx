import { createColumnHelper, tableFeatures, useTable } from '@tanstack/react-table';
import type { ColumnDef, ColumnHelper, RowData } from '@tanstack/react-table';
import type { ReactNode } from 'react';
import { Button } from './button';

/** What a column may say about how it is drawn, beyond its header and cells. */
export type DataColumnMeta = {
  /** The column that names each row: its cells are row headers (`<th scope="row">`) for screen readers. */
  rowHeader?: boolean;
  /** `end` for figures (money, meters), so digits line up. */
  align?: 'start' | 'end';
  /** Left out below the `md` width, so a phone keeps the columns that matter without scrolling. */
  hideOnPhone?: boolean;
};

/**
 * No sorting or filtering in the table itself: lists come from the server a page at a time
 * (cursor paging), so ordering and search belong to the request, not to the rows already fetched.
 */
const features = tableFeatures({ columnMeta: {} as DataColumnMeta });

export type DataTableFeatures = typeof features;
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- TanStack's own type for columns of mixed value types.
export type DataColumns<Row extends RowData> = ColumnDef<DataTableFeatures, Row, any>[];

/**
 * The column helper for a DataTable of `Row`: `const col = dataColumns<Customer>()`, then
 * `col.columns([col.accessor('name', { header: 'Name', meta: { rowHeader: true } }), …])`.
 * Keep the columns at module scope (or memoised): a new array each render re-builds the table.
 */
export function dataColumns<Row extends RowData>(): ColumnHelper<DataTableFeatures, Row> {
  return createColumnHelper<DataTableFeatures, Row>();
}

/**
 * The cursor paging an infinite query already has (`useInfiniteQuery`'s result fits as it is):
 * a page at a time, "Show more" appends the next one.
 */
export type CursorPaging = {
  hasNextPage: boolean;
  isFetchingNextPage: boolean;
  fetchNextPage: () => unknown;
  /** The last "show more" failed; the rows already shown stay. */
  isFetchNextPageError?: boolean;
};

type DataTableProps<Row extends RowData> = {
  /** Names the table for screen readers; shown above it unless `hideCaption`. */
  caption: string;
  hideCaption?: boolean;
  columns: DataColumns<Row>;
  /** Keep this array stable between renders (a query's `select`, a memo). */
  rows: Row[];
  /** A stable key per row: the record's id. */
  getRowId: (row: Row) => string;
  paging?: CursorPaging;
  /** Shown in place of the table when there are no rows: say what to do next. */
  empty?: ReactNode;
  /** The "show more" button's words, e.g. "Show more customers". */
  moreLabel?: string;
};

const alignClass = { start: 'text-left', end: 'text-right' } as const;

function cellClass(meta: DataColumnMeta | undefined): string {
  return `${alignClass[meta?.align ?? 'start']} ${meta?.hideOnPhone ? 'hidden md:table-cell' : ''}`;
}

/**
 * A plain, high-contrast table over rows fetched a page at a time. Wide tables scroll sideways
 * inside their own box, so a phone never scrolls the whole page sideways.
 */
export function DataTable<Row extends RowData>({
  caption,
  hideCaption = false,
  columns,
  rows,
  getRowId,
  paging,
  empty,
  moreLabel = 'Show more',
}: DataTableProps<Row>) {
  const table = useTable({ features, columns, data: rows, getRowId: (row) => getRowId(row) });

  if (rows.length === 0 && empty) return <>{empty}</>;

  return (
    <div className="grid gap-3">
      <div className="overflow-x-auto rounded-plate border-2 border-rule bg-panel">
        <table className="w-full border-collapse text-base">
          <caption className={hideCaption ? 'sr-only' : 'px-4 pt-3 text-left text-lg font-bold'}>
            {caption}
          </caption>
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b-2 border-ink">
                {group.headers.map((header) => (
                  <th
                    key={header.id}
                    scope="col"
                    className={`px-4 py-3 font-bold whitespace-nowrap ${cellClass(header.column.columnDef.meta)}`}
                  >
                    {header.isPlaceholder ? null : <table.FlexRender header={header} />}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="border-b border-rule align-top last:border-b-0">
                {row.getAllCells().map((cell) => {
                  const meta = cell.column.columnDef.meta;
                  const className = `px-4 py-3 ${cellClass(meta)}`;
                  return meta?.rowHeader ? (
                    <th key={cell.id} scope="row" className={`${className} font-bold`}>
                      <table.FlexRender cell={cell} />
                    </th>
                  ) : (
                    <td key={cell.id} className={className}>
                      <table.FlexRender cell={cell} />
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {paging ? <MoreRows paging={paging} label={moreLabel} shown={rows.length} /> : null}
    </div>
  );
}

function MoreRows({ paging, label, shown }: { paging: CursorPaging; label: string; shown: number }) {
  if (!paging.hasNextPage) {
    return (
      <p className="text-base text-ink-soft">
        {shown === 1 ? 'That is the only one.' : `All ${shown} shown.`}
      </p>
    );
  }
  return (
    <div className="flex flex-wrap items-center gap-3">
      <Button
        variant="secondary"
        onClick={() => void paging.fetchNextPage()}
        disabled={paging.isFetchingNextPage}
      >
        {paging.isFetchingNextPage ? 'Loading more…' : label}
      </Button>
      <span className="text-base text-ink-soft" aria-live="polite">
        {paging.isFetchNextPageError ? 'The next page did not load. Try again.' : `${shown} shown so far.`}
      </span>
    </div>
  );
}
