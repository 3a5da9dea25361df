/** The three things to take away: the encoded CSV, the recipe, and the codebook (Markdown or HTML). */
import { useId, useState } from 'react';
import type { CodebookFormat } from './useTakeAway.ts';

export interface TakeAwayProps {
  onCsv(): void;
  onRecipe(): void;
  onCodebook(format: CodebookFormat): void;
  readonly busy: boolean;
}

export function TakeAway({ onCsv, onRecipe, onCodebook, busy }: TakeAwayProps) {
  const [format, setFormat] = useState<CodebookFormat>('markdown');
  const formatId = useId();
  return (
    <div className="take-away" role="group" aria-label="Take away">
      <button type="button" className="button button-primary" onClick={onCsv} disabled={busy}>
        Encoded CSV
      </button>
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
