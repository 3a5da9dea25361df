/**
 * Re-using a recipe: load a recipe (a .json saved earlier, or the one on the workbench), then a new
 * file; the recipe is applied to it as it is — nothing is refitted — and the report says what it
 * met. The encoded CSV of the new file can then be taken away.
 */
import { useCallback, useId, useRef, useState, type ReactNode } from 'react';
import type { ApplyReport } from '../../core/apply-report.ts';
import type { Recipe } from '../../core/recipe.ts';
import { MAX_RECIPE_BYTES, parseRecipe, recipeTooLargeMessage } from '../../core/recipe-io.ts';
import { Cancelled, type OpenedTable } from '../../worker/protocol.ts';
import { DATA_FILE_ACCEPT, OpenFileButton } from '../files/OpenFileButton.tsx';
import { TaskBar } from '../files/TaskBar.tsx';
import { formatCount } from '../files/format.ts';
import type { ExportTarget } from '../files/useTakeAway.ts';
import { errorNotice, type Workbench } from '../state/useWorkbench.ts';
import { otherFileProblem } from './report-model.ts';
import { ReuseReport } from './ReuseReport.tsx';
import { useModalDialog } from './useModalDialog.ts';

export interface ReuseDialogProps {
  readonly open: boolean;
  onClose(): void;
  readonly workbench: Workbench;
  /** The recipe on the workbench, offered as a shortcut. */
  readonly current: Recipe | null;
  exportCsv(target: ExportTarget): Promise<void>;
  /** Messages, shown inside the dialog while it is open (the page behind is inert). */
  readonly children?: ReactNode;
}

interface LoadedRecipe {
  readonly recipe: Recipe;
  readonly from: string;
}

interface Checked {
  readonly opened: OpenedTable;
  readonly report: ApplyReport;
  readonly recipe: Recipe;
}

export function ReuseDialog({ open, onClose, workbench, current, exportCsv, children }: ReuseDialogProps) {
  const dialogRef = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const [loaded, setLoaded] = useState<LoadedRecipe | null>(null);
  const [recipeErrors, setRecipeErrors] = useState<readonly string[]>([]);
  const [checked, setChecked] = useState<Checked | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const { client, run, task } = workbench;

  useModalDialog(dialogRef, open);

  const close = useCallback(() => {
    task?.cancel();
    void client.call('close', { slot: 'reuse' }).catch(() => undefined);
    onClose();
  }, [client, onClose, task]);

  const loadRecipeFile = async (file: File) => {
    setChecked(null);
    setProblem(null);
    // Refused on its size before reading: a file that large is not a recipe, and reading it would stall the page.
    const parsed = file.size > MAX_RECIPE_BYTES ? { ok: false as const, errors: [recipeTooLargeMessage(file.size)], unlisted: 0 } : parseRecipe(await file.text());
    if (parsed.ok) {
      setLoaded({ recipe: parsed.recipe, from: file.name });
      setRecipeErrors([]);
    } else {
      setLoaded(null);
      setRecipeErrors(parsed.unlisted > 0 ? [...parsed.errors, `… and ${parsed.unlisted.toLocaleString('en-US')} more ${parsed.unlisted === 1 ? 'problem' : 'problems'}.`] : parsed.errors);
    }
  };

  const applyTo = async (file: File) => {
    if (!loaded) return;
    setProblem(null);
    setChecked(null);
    const { recipe } = loaded;
    try {
      const opened = await run(`Reading ${file.name}`, (onProgress) =>
        client.start(
          'open',
          {
            slot: 'reuse',
            source: { kind: 'file', file },
            draft: false,
            missingTokens: recipe.reading.missingTokens,
            delimiter: recipe.reading.delimiter,
            ...(workbench.maxBytes === undefined ? {} : { maxBytes: workbench.maxBytes }),
          },
          { onProgress },
        ),
      );
      const elsewhere = otherFileProblem(recipe, opened.names, opened.fileName);
      if (elsewhere !== null) {
        setProblem(`This recipe does not fit ${opened.fileName} — ${elsewhere}`);
        return;
      }
      const report = await run('Applying the recipe', (onProgress) => client.start('check', { slot: 'reuse', version: opened.version, recipe }, { onProgress }));
      setChecked({ opened, report, recipe });
    } catch (error) {
      if (error instanceof Cancelled) return;
      const notice = errorNotice(error, `Could not apply the recipe to ${file.name}`);
      setProblem([notice.title, notice.detail, notice.hint].filter(Boolean).join(' — '));
    }
  };

  const outputs = loaded ? loaded.recipe.columns.reduce((n, c) => n + c.outputs.length, 0) : 0;

  return (
    <dialog ref={dialogRef} className="reuse" aria-labelledby={titleId} onCancel={(e) => (e.preventDefault(), close())}>
      <header className="reuse-head">
        <h2 id={titleId}>Re-use a recipe on a new file</h2>
        <button type="button" className="dialog-close" onClick={close} aria-label="Close">
          <span aria-hidden="true">×</span>
        </button>
      </header>
      <div className="reuse-body">
        <TaskBar task={task} />
        {children}
        <ol className="reuse-steps">
          <li className="reuse-step">
            <h3>The recipe</h3>
            <p className="muted">A recipe saved from Levelwise (.json). It is applied as it is: levels, statistics and policies are not refitted.</p>
            <div className="row-of-buttons">
              <OpenFileButton label="Load a recipe…" accept=".json,application/json" onFile={(f) => void loadRecipeFile(f)} testId="reuse-recipe-input" />
              {current ? (
                <button
                  type="button"
                  className="button button-quiet"
                  onClick={() => {
                    setLoaded({ recipe: current, from: 'the workbench' });
                    setRecipeErrors([]);
                    setChecked(null);
                  }}
                >
                  Use the recipe on the workbench
                </button>
              ) : null}
            </div>
            {loaded ? (
              <p className="reuse-loaded" data-testid="reuse-recipe-summary">
                Recipe from {loaded.from}: fitted on {loaded.recipe.source.file ? `“${loaded.recipe.source.file}”` : 'an unnamed file'} (
                {formatCount(loaded.recipe.source.rows)} rows); {formatCount(loaded.recipe.columns.length)} source columns →{' '}
                {formatCount(outputs)} output columns.
              </p>
            ) : null}
            {recipeErrors.length > 0 ? (
              <div className="inline-problem" role="alert">
                <strong>This is not a recipe Levelwise can use:</strong>
                <ul>
                  {recipeErrors.slice(0, 12).map((e) => (
                    <li key={e}>{e}</li>
                  ))}
                </ul>
                {recipeErrors.length > 12 ? <p>… and {recipeErrors.length - 12} more.</p> : null}
              </div>
            ) : null}
          </li>
          <li className="reuse-step">
            <h3>The new file</h3>
            <p className="muted">CSV, TSV, semicolon- or pipe-separated text, or XLSX (first sheet). It is read on this computer only.</p>
            <OpenFileButton label="Choose the new file…" accept={DATA_FILE_ACCEPT} onFile={(f) => void applyTo(f)} disabled={!loaded} testId="reuse-data-input" />
            {problem ? (
              <p className="inline-problem" role="alert">
                {problem}
              </p>
            ) : null}
          </li>
        </ol>
        {checked ? (
          <>
            <ReuseReport report={checked.report} reading={checked.opened} fileName={checked.opened.fileName} />
            <div className="row-of-buttons reuse-actions">
              <button
                type="button"
                className="button button-primary"
                onClick={() =>
                  void exportCsv({
                    slot: 'reuse',
                    version: checked.opened.version,
                    fileName: checked.opened.fileName,
                    rowCount: checked.opened.rowCount,
                    recipe: checked.recipe,
                  })
                }
              >
                Download the encoded CSV of this file
              </button>
            </div>
          </>
        ) : null}
      </div>
    </dialog>
  );
}
