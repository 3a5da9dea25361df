/**
 * The output preview: every encoded column, grouped under the source column it comes from, for
 * every row of the file. Rows and columns are both virtualised: only the cells on screen exist in
 * the page, and the worker encodes only the rows around them (useWindow). The table model
 * (@tanstack/react-table) gives the grouped headers and column offsets; the virtualisers
 * (@tanstack/react-virtual) give what is on screen.
 */
import { memo, useEffect, useMemo, useRef } from 'react';
import {
  columnSizingFeature,
  createColumnHelper,
  metaHelper,
  tableFeatures,
  useTable,
  type Header,
} from '@tanstack/react-table';
import { useVirtualizer } from '@tanstack/react-virtual';
import type { PreviewWindow } from '../../worker/protocol.ts';
import { cellDisplay, leafWidth, type PreviewGroup, type PreviewLeaf } from './preview-model.ts';
import { useFixedRows } from './useFixedRows.ts';

interface RowRef {
  /** 0-based row of the table. */
  readonly row: number;
}

const features = tableFeatures({
  columnSizingFeature,
  columnMeta: metaHelper<{ leaf?: PreviewLeaf; group?: PreviewGroup }>(),
});
type Features = typeof features;
const helper = createColumnHelper<Features, RowRef>();

export const ROW_HEIGHT = 28;
const HEADER_ROW_HEIGHT = 30;
const GUTTER_WIDTH = 64;

export interface PreviewGridProps {
  readonly groups: readonly PreviewGroup[];
  readonly columnCount: number;
  readonly rowCount: number;
  readonly window: PreviewWindow | null;
  /** Source column whose group is highlighted and scrolled into view. */
  readonly selected: string | null;
  onSelect(name: string): void;
  onVisibleRows(rows: { first: number; last: number }): void;
}

function useColumns(groups: readonly PreviewGroup[], columnCount: number, windowRef: { current: PreviewWindow | null }) {
  return useMemo(
    () =>
      helper.columns(
        groups.map((group) =>
          helper.group({
            id: group.id,
            header: group.name,
            meta: { group },
            columns: helper.columns(
              group.leaves.map((leaf) =>
              helper.accessor((r: RowRef) => cellDisplay(windowRef.current, columnCount, r.row, leaf), {
                id: leaf.id,
                header: leaf.short,
                size: leafWidth(leaf),
                meta: { leaf },
              }),
              ),
            ),
          }),
        ),
      ),
    [groups, columnCount, windowRef],
  );
}

/**
 * Drawn again only when what it shows changes: a decision redraws the page around it at once, and
 * the grid only when the worker has encoded the rows for the new recipe.
 */
export const PreviewGrid = memo(function PreviewGrid({ groups, columnCount, rowCount, window, selected, onSelect, onVisibleRows }: PreviewGridProps) {
  const scrollRef = useRef<HTMLDivElement>(null);
  const windowRef = useRef<PreviewWindow | null>(window);
  windowRef.current = window;

  const columns = useColumns(groups, columnCount, windowRef);
  const data = useMemo<RowRef[]>(() => {
    if (window === null) return [];
    return Array.from({ length: window.end - window.start }, (_, i) => ({ row: window.start + i }));
  }, [window]);
  const table = useTable({ features, columns, data });

  const leafHeaders = table.getLeafHeaders().filter((h) => h.column.columnDef.meta?.leaf);
  const topHeaders = table.getHeaderGroups()[0]?.headers ?? [];
  computeStartsInOrder(topHeaders);
  const groupHeaders = topHeaders.filter((h) => h.column.columnDef.meta?.group);
  const rows = table.getRowModel().rows;

  // Rows have one height, so the rows on screen are found by arithmetic (useFixedRows), at a cost
  // that does not grow with the file; columns vary in width and keep the general virtualiser.
  const { rows: virtualRows, totalSize: rowsHeight } = useFixedRows(scrollRef, rowCount, ROW_HEIGHT, 8, HEADER_ROW_HEIGHT * 2);
  const columnVirtualizer = useVirtualizer({
    horizontal: true,
    count: leafHeaders.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: (i) => leafHeaders[i]?.getSize() ?? 100,
    overscan: 4,
  });
  // Sizes change when the recipe adds or removes outputs; the column virtualiser must forget old ones.
  useEffect(() => columnVirtualizer.measure(), [columns, columnVirtualizer]);

  const virtualColumns = columnVirtualizer.getVirtualItems();
  const firstRow = virtualRows[0]?.index ?? 0;
  const lastRow = virtualRows.at(-1)?.index ?? 0;
  useEffect(() => onVisibleRows({ first: firstRow, last: lastRow }), [firstRow, lastRow, onVisibleRows]);

  useScrollToSelected(selected, groupHeaders, scrollRef);

  const firstColumn = virtualColumns[0]?.index ?? 0;
  const lastColumn = virtualColumns.at(-1)?.index ?? -1;
  const leafIndex = new Map(leafHeaders.map((h, i) => [h.column.id, i]));
  const visibleGroups = groupHeaders.filter((g) => overlaps(g, leafIndex, firstColumn, lastColumn));
  const totalWidth = GUTTER_WIDTH + table.getTotalSize();
  const headerHeight = HEADER_ROW_HEIGHT * 2;

  return (
    <div
      className="grid-scroll"
      ref={scrollRef}
      tabIndex={0}
      role="grid"
      aria-label="Encoded output preview"
      aria-rowcount={rowCount + 2}
      aria-colcount={leafHeaders.length + 1}
    >
      <div className="grid-canvas" style={{ width: totalWidth, height: headerHeight + rowsHeight }}>
        <div className="grid-head" style={{ height: headerHeight, width: totalWidth }} role="rowgroup">
          <div role="row" aria-rowindex={1} className="grid-head-row" style={{ height: HEADER_ROW_HEIGHT }}>
            <div className="grid-corner" role="columnheader" aria-colindex={1} style={{ width: GUTTER_WIDTH, height: HEADER_ROW_HEIGHT }}>
              source
            </div>
            {visibleGroups.map((header) => {
              const group = header.column.columnDef.meta?.group;
              if (!group) return null;
              return (
                <div
                  key={header.id}
                  role="columnheader"
                  aria-colspan={header.colSpan}
                  className={`grid-group level-${group.level}${group.name === selected ? ' is-selected' : ''}`}
                  style={{ left: GUTTER_WIDTH + header.getStart(), width: header.getSize(), height: HEADER_ROW_HEIGHT }}
                  title={`${group.name} (${group.level})`}
                >
                  <button type="button" className="grid-group-button" onClick={() => onSelect(group.name)}>
                    {group.name}
                  </button>
                </div>
              );
            })}
          </div>
          <div role="row" aria-rowindex={2} className="grid-head-row" style={{ height: HEADER_ROW_HEIGHT, top: HEADER_ROW_HEIGHT }}>
            <div className="grid-corner" role="columnheader" aria-colindex={1} style={{ width: GUTTER_WIDTH, height: HEADER_ROW_HEIGHT }}>
              line
            </div>
            {virtualColumns.map((vc) => {
              const header = leafHeaders[vc.index];
              const leaf = header?.column.columnDef.meta?.leaf;
              if (!header || !leaf) return null;
              return (
                <div
                  key={header.id}
                  role="columnheader"
                  aria-colindex={vc.index + 2}
                  className={`grid-leaf kind-${leaf.kind}`}
                  style={{ left: GUTTER_WIDTH + vc.start, width: vc.size, height: HEADER_ROW_HEIGHT }}
                  title={leaf.label}
                  data-output={leaf.kind === 'original' ? undefined : leaf.label}
                >
                  <table.FlexRender header={header} />
                </div>
              );
            })}
          </div>
        </div>
        <div role="rowgroup">
          {virtualRows.map((vr) => {
            const inWindow = window !== null && vr.index >= window.start && vr.index < window.end;
            const tableRow = inWindow ? rows[vr.index - window.start] : undefined;
            const rejected = inWindow && window.rejected[vr.index - window.start] === 1;
            const line = inWindow ? window.lines[vr.index - window.start] : undefined;
            return (
              <div
                key={vr.index}
                role="row"
                aria-rowindex={vr.index + 3}
                className={`grid-row${vr.index % 2 === 1 ? ' is-odd' : ''}${rejected ? ' is-rejected' : ''}`}
                style={{ top: headerHeight + vr.start, height: ROW_HEIGHT, width: totalWidth }}
              >
                <div className="grid-gutter" role="rowheader" aria-colindex={1} style={{ width: GUTTER_WIDTH }} title={rejected ? 'A policy rejects this row: it is left out of the output.' : undefined}>
                  {line ?? ''}
                  {rejected ? <span className="visually-hidden"> (rejected)</span> : null}
                </div>
                {virtualColumns.map((vc) => {
                  const header = leafHeaders[vc.index];
                  const leaf = header?.column.columnDef.meta?.leaf;
                  if (!header || !leaf) return null;
                  const text = tableRow ? (tableRow.getValue(header.column.id) as string | null) : null;
                  return (
                    <div
                      key={header.id}
                      role="gridcell"
                      aria-colindex={vc.index + 2}
                      className={`grid-cell kind-${leaf.kind}${text === null ? ' is-pending' : ''}`}
                      style={{ left: GUTTER_WIDTH + vc.start, width: vc.size }}
                    >
                      {text ?? ''}
                    </div>
                  );
                })}
              </div>
            );
          })}
        </div>
      </div>
    </div>
  );
});

type AnyHeader = Header<Features, RowRef, unknown>;

/**
 * A header's getStart() adds up the headers before it, recursively, remembering each answer. Asked
 * first about a header thousands of places in (a file of 10,000 columns), it overflows the call
 * stack; asked in order, every call finds its neighbour's answer remembered and stays one deep.
 */
function computeStartsInOrder(headers: readonly AnyHeader[]): void {
  for (const header of headers) header.getStart();
}

function overlaps(group: AnyHeader, leafIndex: ReadonlyMap<string, number>, first: number, last: number): boolean {
  const leaves = group.column.getLeafColumns();
  const from = leafIndex.get(leaves[0]?.id ?? '') ?? Infinity;
  const to = leafIndex.get(leaves.at(-1)?.id ?? '') ?? -Infinity;
  return from <= last && to >= first;
}

/** When another column is chosen in the list, bring its outputs into view (unless already visible). */
function useScrollToSelected(selected: string | null, groups: readonly AnyHeader[], scrollRef: { current: HTMLDivElement | null }) {
  const target = groups.find((g) => g.column.columnDef.meta?.group?.name === selected);
  const start = target ? target.getStart() : null;
  const size = target ? target.getSize() : 0;
  useEffect(() => {
    const element = scrollRef.current;
    if (element === null || start === null) return;
    const viewStart = element.scrollLeft;
    const viewEnd = viewStart + element.clientWidth - GUTTER_WIDTH;
    if (start >= viewStart && start + size <= viewEnd) return;
    element.scrollTo({ left: Math.max(0, start - 24) });
  }, [selected, start, size, scrollRef]);
}
