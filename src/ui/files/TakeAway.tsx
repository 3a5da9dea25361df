/** The three things to take away: the encoded CSV (plain or gzip-compressed), the recipe, and the codebook (Markdown or HTML). */
import { useId, useState } from 'react';
import type { CodebookFormat } from './useTakeAway.ts';

export interface TakeAwayProps {
  /** `compressed`: gzip-compressed, a .csv.gz file. */
  onCsv(compressed: boolean): void;
  onRecipe(): void;
  onCodebook(format: CodebookFormat): void;
  readonly busy: boolean;
  /** The recipe makes no output columns (every column excluded): the encoded file would be empty lines. */
  readonly noOutputs?: boolean;
}

export function TakeAway({ onCsv, onRecipe, onCodebook, busy, noOutputs = false }: TakeAwayProps) {
  const [format, setFormat] = useState<CodebookFormat>('markdown');
  const [compressed, setCompressed] = useState(false);
  const formatId = useId();
  const csvFormatId = useId();
  const noteId = useId();
  return (
    <div className="take-away" role="group" aria-label="Take away">
      <span className="joined">
        <button
          type="button"
          className="button button-primary"
          onClick={() => onCsv(compressed)}
          disabled={busy || noOutputs}
          aria-describedby={noOutputs ? noteId : undefined}
        >
          Encoded CSV
        </button>
        <label htmlFor={csvFormatId} className="visually-hidden">
          Encoded CSV file type
        </label>
        <select
          id={csvFormatId}
          className="select-compact"
          value={compressed ? 'gzip' : 'plain'}
          onChange={(e) => setCompressed(e.target.value === 'gzip')}
          title="A .csv.gz file is the same CSV, gzip-compressed: a fraction of the size"
          data-testid="csv-file-type"
        >
          <option value="plain">.csv</option>
          <option value="gzip">.csv.gz</option>
        </select>
      </span>
      {noOutputs ? (
        <span id={noteId} className="muted take-away-note">
          Every column is excluded: there is nothing to encode. Give at least one column a level.
        </span>
      ) : null}
      <button type="button" className="button" onClick={onRecipe}>
        Recipe
      </button>
      <span className="joined">
        <button type="button" className="button" onClick={() => onCodebook(format)}>
          Codebook
        </button>
        <label htmlFor={formatId} className="visually-hidden">
          Codebook format
        </label>
        <select id={formatId} className="select-compact" value={format} onChange={(e) => setFormat(e.target.value as CodebookFormat)}>
          <option value="markdown">.md</option>
          <option value="html">.html</option>
        </select>
      </span>
    </div>
  );
}
