/**
 * Taking results away: the encoded CSV (written by the worker in parts, plain or gzip-compressed),
 * the recipe as JSON, and the codebook as Markdown or HTML (both from core, built from the recipe alone).
 */
import { useCallback } from 'react';
import type { ApplyReport } from '../../core/apply-report.ts';
import { codebookHtml, codebookMarkdown } from '../../core/codebook.ts';
import type { Recipe } from '../../core/recipe.ts';
import { stringifyRecipe } from '../../core/recipe-io.ts';
import type { WorkbenchClient } from '../../worker/client.ts';
import { Cancelled, type Slot } from '../../worker/protocol.ts';
import { formatBytes, formatCount } from './format.ts';
import { baseName, openPartSink, saveText } from './save.ts';
import type { Notice } from '../state/useWorkbench.ts';
import { errorNotice } from '../state/useWorkbench.ts';
import type { useTask } from '../state/useTask.ts';

export type CodebookFormat = 'markdown' | 'html';

export interface ExportTarget {
  readonly slot: Slot;
  readonly version: number;
  readonly fileName: string;
  readonly rowCount: number;
  readonly recipe: Recipe;
}

interface Deps {
  readonly client: WorkbenchClient;
  readonly run: ReturnType<typeof useTask>['run'];
  notify(notice: Omit<Notice, 'id'>): void;
  /** Shows the full report of what the recipe did (rows left out, unseen levels …). */
  showReport(report: ApplyReport, fileName: string): void;
}

/** The two kinds of file the encoded CSV is saved as (type and extension, for a save dialog). */
const CSV_FILE = { type: 'text/csv', extension: '.csv', description: 'CSV file' } as const;
const GZIP_FILE = { type: 'application/gzip', extension: '.gz', description: 'gzip-compressed CSV file' } as const;
/** How much smaller gzip makes an encoded CSV, roughly (the benchmark's 1M rows in Chromium: 341 → 29 MB). */
const COMPRESSION_GUESS = 10;

/** A rough guess of the CSV's size, to decide between a download and streaming to disk. */
export function estimateCsvBytes(rowCount: number, recipe: Recipe): number {
  const outputs = recipe.columns.reduce((n, c) => n + c.outputs.length, 0);
  return rowCount * outputs * 3;
}

export function useTakeAway({ client, run, notify, showReport }: Deps) {
  const exportCsv = useCallback(
    async (target: ExportTarget, compressed = false) => {
      const fileName = `${baseName(target.fileName)} — encoded.${compressed ? 'csv.gz' : 'csv'}`;
      const estimate = estimateCsvBytes(target.rowCount, target.recipe) / (compressed ? COMPRESSION_GUESS : 1);
      const sink = await openPartSink(fileName, compressed ? GZIP_FILE : CSV_FILE, estimate);
      if (sink === null) return;
      try {
        const summary = await run('Writing the encoded CSV', (onProgress) =>
          client.start(
            'export',
            // Blob parts: the file's bytes go from the worker to the browser's blob store (or the disk), never through this thread.
            { slot: target.slot, version: target.version, recipe: target.recipe, parts: 'blobs', ...(compressed ? { compress: 'gzip' as const } : {}) },
            { onProgress, onBlob: (part) => sink.write(part) },
          ),
        );
        await sink.finish();
        const { report } = summary;
        const left = report.rowsRejected;
        const size = summary.compressedBytes === null ? formatBytes(summary.bytes) : `${formatBytes(summary.compressedBytes)} gzip-compressed (${formatBytes(summary.bytes)} of CSV)`;
        notify({
          tone: left > 0 ? 'warning' : 'success',
          title: `Encoded CSV of ${target.fileName} ${sink.kind === 'disk' ? 'saved' : 'ready'}: ${formatCount(summary.rowsWritten)} rows, ${size}`,
          ...(left > 0 ? { detail: `${formatCount(left)} ${left === 1 ? 'row was' : 'rows were'} left out by an “error” policy.` } : {}),
          action: { label: left > 0 ? 'See which rows' : 'See the report', run: () => showReport(report, target.fileName) },
        });
      } catch (error) {
        await sink.abort();
        if (!(error instanceof Cancelled)) notify(errorNotice(error, 'The encoded CSV could not be written'));
      }
    },
    [client, run, notify, showReport],
  );

  const saveRecipe = useCallback((recipe: Recipe, fileName: string) => {
    saveText(stringifyRecipe(recipe), `${baseName(fileName)}.recipe.json`, 'application/json');
  }, []);

  const saveCodebook = useCallback((recipe: Recipe, fileName: string, format: CodebookFormat) => {
    if (format === 'html') saveText(codebookHtml(recipe), `${baseName(fileName)} — codebook.html`, 'text/html');
    else saveText(codebookMarkdown(recipe), `${baseName(fileName)} — codebook.md`, 'text/markdown');
  }, []);

  return { exportCsv, saveRecipe, saveCodebook };
}
