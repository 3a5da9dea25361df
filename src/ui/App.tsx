/**
 * The workbench: a top bar (the file, undo/redo, re-use, about), the column list on the left, the
 * selected column's decisions (or the output width) in the middle, and the encoded output below,
 * with the take-away buttons beside it. State and the worker live in useWorkbench.
 */
import { useCallback, useEffect, useMemo, useRef, useState, type KeyboardEvent } from 'react';
import type { ApplyReport } from '../core/apply-report.ts';
import { profileAsDecided } from '../core/fit.ts';
import { forecastWidth } from '../core/width.ts';
import { DEMO_NOTE } from '../demo/household-energy.ts';
import { AboutBox } from './about/AboutBox.tsx';
import { ColumnEditor } from './columns/ColumnEditor.tsx';
import { ColumnList } from './columns/ColumnList.tsx';
import { DropOverlay, useFileDrop } from './files/DropZone.tsx';
import { FileSummary } from './files/FileSummary.tsx';
import { MissingSpellings } from './files/MissingSpellings.tsx';
import { Notices } from './files/Notices.tsx';
import { DATA_FILE_ACCEPT, OpenFileButton } from './files/OpenFileButton.tsx';
import { TakeAway } from './files/TakeAway.tsx';
import { TaskBar } from './files/TaskBar.tsx';
import { useTakeAway } from './files/useTakeAway.ts';
import { PreviewPane } from './preview/PreviewPane.tsx';
import { Splitter } from './preview/Splitter.tsx';
import { ReportDialog } from './reuse/ReportDialog.tsx';
import { ReuseDialog } from './reuse/ReuseDialog.tsx';
import { redoLabel, undoLabel } from './state/history.ts';
import { useUndoKeys } from './state/useUndoKeys.ts';
import { useWorkbench } from './state/useWorkbench.ts';
import { WidthMeter } from './width/WidthMeter.tsx';

type CentreTab = 'column' | 'width' | 'missing';
const CENTRE_TABS: readonly CentreTab[] = ['column', 'width', 'missing'];

export function App() {
  const wb = useWorkbench();
  const { table, history, recipe, selected, setSelected, openFile, openDemo } = wb;
  const [aboutOpen, setAboutOpen] = useState(false);
  const [reuseOpen, setReuseOpen] = useState(false);
  const [tab, setTab] = useState<CentreTab>('column');
  const [shownReport, setShownReport] = useState<{ report: ApplyReport; fileName: string } | null>(null);
  const dragging = useFileDrop(openFile);
  const [editorShare, setEditorShare] = useState(0.5);
  const workspaceRef = useRef<HTMLElement>(null);

  useEffect(() => {
    void openDemo();
  }, [openDemo]);
  useUndoKeys(wb.undo, wb.redo);

  const showReport = useCallback((report: ApplyReport, fileName: string) => setShownReport({ report, fileName }), []);
  const takeAway = useTakeAway({ client: wb.client, run: wb.run, notify: wb.notify, showReport });

  // Profiles as the recipe reads them: a continuous column's numbers in the format chosen for it.
  const profiles = useMemo(() => {
    if (!table) return [];
    const byName = new Map(recipe?.columns.map((c) => [c.name, c]));
    return table.profiles.map((p) => {
      const decided = byName.get(p.name);
      return decided ? profileAsDecided(p, decided) : p;
    });
  }, [table, recipe]);
  const profile = profiles.find((p) => p.name === selected) ?? null;
  const column = recipe?.columns.find((c) => c.name === selected) ?? null;
  const forecast = useMemo(() => (recipe ? forecastWidth(recipe) : null), [recipe]);
  const isDemo = table !== null && wb.lastFile === null;
  const undoText = undoLabel(history);
  const redoText = redoLabel(history);
  const notices = <Notices notices={wb.notices} onDismiss={wb.dismiss} />;

  return (
    <div className="app">
      <header className="topbar">
        <div className="brand">
          <span className="brand-mark" aria-hidden="true" />
          <span className="brand-name">Levelwise</span>
        </div>
        <FileSummary table={table} isDemo={isDemo} demoNote={DEMO_NOTE} onSheet={(sheet) => wb.lastFile && void openFile(wb.lastFile, sheet)} />
        <div className="topbar-group" role="group" aria-label="Open">
          <OpenFileButton label="Open a file…" accept={DATA_FILE_ACCEPT} onFile={(f) => void openFile(f)} className="button button-primary" testId="open-file-input" />
          {!isDemo ? (
            <button type="button" className="button button-quiet" onClick={() => void openDemo()}>
              Demo data
            </button>
          ) : null}
        </div>
        <div className="topbar-group" role="group" aria-label="History">
          <button
            type="button"
            className="button"
            onClick={wb.undo}
            disabled={undoText === null}
            title={undoText ? `Undo “${undoText}” (Ctrl+Z)` : 'Nothing to undo'}
            aria-keyshortcuts="Control+Z"
          >
            <span aria-hidden="true">↶ </span>Undo
          </button>
          <button
            type="button"
            className="button"
            onClick={wb.redo}
            disabled={redoText === null}
            title={redoText ? `Redo “${redoText}” (Ctrl+Shift+Z)` : 'Nothing to redo'}
            aria-keyshortcuts="Control+Shift+Z"
          >
            <span aria-hidden="true">↷ </span>Redo
          </button>
        </div>
        <div className="topbar-group topbar-end">
          <button type="button" className="button" onClick={() => setReuseOpen(true)}>
            Re-use a recipe…
          </button>
          <button type="button" className="button button-quiet" onClick={() => setAboutOpen(true)}>
            About
          </button>
        </div>
      </header>
      <TaskBar task={reuseOpen ? null : wb.task} />
      {reuseOpen ? null : notices}

      <main
        className="workspace"
        ref={workspaceRef}
        style={{ gridTemplateRows: `minmax(0, ${editorShare}fr) 10px minmax(0, ${1 - editorShare}fr)` }}
      >
        <nav className="pane pane-columns" aria-label="Source columns">
          <h2 className="pane-title">
            Columns{table ? <span className="pane-count"> {table.names.length}</span> : null}
          </h2>
          <div className="pane-scroll">
            {table && recipe ? (
              <ColumnList profiles={profiles} recipe={recipe} selected={selected} onSelect={(name) => (setSelected(name), setTab('column'))} />
            ) : (
              <p className="muted pane-empty">{wb.task ? 'Reading…' : 'Open a file to see its columns.'}</p>
            )}
          </div>
        </nav>

        <section className="pane pane-centre" aria-label="Decisions">
          <div className="tabs" role="tablist" aria-label="Centre panel">
            <button type="button" role="tab" id="tab-column" aria-controls="panel-column" aria-selected={tab === 'column'} tabIndex={tab === 'column' ? 0 : -1} className="tab" onClick={() => setTab('column')} onKeyDown={(e) => tabKeys(e, setTab)}>
              Column{column ? `: ${column.name}` : ''}
            </button>
            <button type="button" role="tab" id="tab-width" aria-controls="panel-width" aria-selected={tab === 'width'} tabIndex={tab === 'width' ? 0 : -1} className="tab" onClick={() => setTab('width')} onKeyDown={(e) => tabKeys(e, setTab)}>
              Output width{forecast ? `: ${forecast.total.before} → ${forecast.total.after}` : ''}
            </button>
            <button type="button" role="tab" id="tab-missing" aria-controls="panel-missing" aria-selected={tab === 'missing'} tabIndex={tab === 'missing' ? 0 : -1} className="tab" onClick={() => setTab('missing')} onKeyDown={(e) => tabKeys(e, setTab)}>
              Missing values{recipe ? `: ${recipe.reading.missingTokens.length + 1} spellings` : ''}
            </button>
          </div>
          <div key={tab === 'column' ? `column:${selected ?? ''}` : tab} className="pane-scroll" role="tabpanel" id={`panel-${tab}`} aria-labelledby={`tab-${tab}`} tabIndex={0}>
            {tab === 'column' ? (
              profile && column ? (
                <ColumnEditor profile={profile} column={column} onDecide={wb.decide} />
              ) : (
                <p className="muted pane-empty">Choose a column on the left.</p>
              )
            ) : tab === 'width' ? (
              forecast ? <WidthMeter forecast={forecast} onDecide={wb.decide} /> : null
            ) : table && recipe ? (
              <MissingSpellings profiles={table.profiles} tokens={recipe.reading.missingTokens} busy={wb.task !== null} onChange={(tokens) => void wb.readMissingAs(tokens)} />
            ) : (
              <p className="muted pane-empty">Open a file to see how its missing values are spelled.</p>
            )}
          </div>
        </section>

        <Splitter share={editorShare} onChange={setEditorShare} container={() => workspaceRef.current} />

        <section className="pane pane-preview" aria-label="Output">
          <PreviewPane
            workbench={wb}
            actions={
              table && recipe ? (
                <TakeAway
                  onCsv={(compressed) => void takeAway.exportCsv({ slot: 'work', version: table.version, fileName: table.fileName, rowCount: table.rowCount, recipe }, compressed)}
                  onRecipe={() => takeAway.saveRecipe(recipe, table.fileName)}
                  onCodebook={(format) => takeAway.saveCodebook(recipe, table.fileName, format)}
                  busy={wb.task !== null}
                  noOutputs={recipe.columns.every((c) => c.outputs.length === 0)}
                />
              ) : null
            }
          />
        </section>
      </main>

      <DropOverlay visible={dragging} />
      <AboutBox open={aboutOpen} onClose={() => setAboutOpen(false)} />
      <ReuseDialog open={reuseOpen} onClose={() => setReuseOpen(false)} workbench={wb} current={recipe} exportCsv={takeAway.exportCsv}>
        {notices}
      </ReuseDialog>
      <ReportDialog shown={shownReport} reading={table} onClose={() => setShownReport(null)} />
    </div>
  );
}

/** Left and right arrows move between the tabs, round from the last to the first (WAI-ARIA Authoring Practices, tabs pattern). */
function tabKeys(event: KeyboardEvent<HTMLButtonElement>, setTab: (tab: CentreTab) => void) {
  if (event.key !== 'ArrowLeft' && event.key !== 'ArrowRight') return;
  event.preventDefault();
  const at = CENTRE_TABS.indexOf(event.currentTarget.id.slice('tab-'.length) as CentreTab);
  const next = CENTRE_TABS[(at + (event.key === 'ArrowRight' ? 1 : CENTRE_TABS.length - 1)) % CENTRE_TABS.length]!;
  setTab(next);
  document.getElementById(`tab-${next}`)?.focus();
}
