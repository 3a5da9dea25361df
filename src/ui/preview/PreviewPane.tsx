/** The output pane: a toolbar (shape of the output, originals on demand, take-away) over the grid. */
import { useId, useMemo, useState, type ReactNode } from 'react';
import type { Workbench } from '../state/useWorkbench.ts';
import { formatCount } from '../files/format.ts';
import { PreviewGrid } from './PreviewGrid.tsx';
import { previewGroups } from './preview-model.ts';
import { useWindow, type WindowTarget } from './useWindow.ts';

export interface PreviewPaneProps {
  readonly workbench: Workbench;
  /** The take-away buttons, placed in the toolbar. */
  readonly actions: ReactNode;
}

export function PreviewPane({ workbench, actions }: PreviewPaneProps) {
  const { table, shown, selected, setSelected, client } = workbench;
  const [showOriginals, setShowOriginals] = useState(false);
  const toggleId = useId();
  const titleId = useId();

  const target = useMemo<WindowTarget | null>(
    () => (table && shown ? { slot: 'work', version: table.version, revision: shown.revision, rowCount: table.rowCount } : null),
    [table, shown],
  );
  const { window, problem, onVisibleRows } = useWindow(client, target, shown?.window ?? null);
  const groups = useMemo(() => (shown && table ? previewGroups(shown.recipe, table.names, showOriginals) : []), [shown, table, showOriginals]);

  return (
    <div className="preview">
      <div className="preview-toolbar">
        <h2 className="pane-title" id={titleId}>
          Output
          {table && shown ? (
            <span className="pane-count" data-testid="output-shape">
              {' '}
              {formatCount(table.rowCount)} rows × {formatCount(shown.outputs.length)} columns
            </span>
          ) : null}
        </h2>
        <label className="check" htmlFor={toggleId}>
          <input id={toggleId} type="checkbox" checked={showOriginals} onChange={(e) => setShowOriginals(e.target.checked)} />
          Show original values
        </label>
        {problem ? (
          <span className="inline-problem" role="alert">
            {problem}
          </span>
        ) : null}
        <div className="toolbar-end">{actions}</div>
      </div>
      {table && shown ? (
        <PreviewGrid
          groups={groups}
          columnCount={table.names.length}
          rowCount={table.rowCount}
          window={window}
          selected={selected}
          onSelect={setSelected}
          onVisibleRows={onVisibleRows}
        />
      ) : (
        <p className="muted pane-empty">The encoded output appears here.</p>
      )}
    </div>
  );
}
