/** The names of the output columns a source column becomes, in order. */
import type { ColumnRecipe } from '../../core/recipe.ts';
import { countOf } from './labels.ts';
import './OutputNames.css';

/** Names listed; a wide column's others are counted (the width tab and the preview show them all). */
export const NAMES_LISTED = 100;

export interface OutputNamesProps {
  readonly column: ColumnRecipe;
}

export function OutputNames({ column }: OutputNamesProps) {
  if (column.outputs.length === 0)
    return <p className="lw-note">This column is left out, so it makes no output column.</p>;
  return (
    <div className="lw-outputs">
      <p className="lw-note">
        Becomes <strong>{countOf(column.outputs.length, 'output column', 'output columns')}</strong>
        {column.level === 'identifier' ? ', copied as it is' : ''}:
      </p>
      <ol className="lw-outputs__list" aria-label={`Output columns of ${column.name}`}>
        {column.outputs.slice(0, NAMES_LISTED).map((name) => (
          <li key={name}>
            <code className="lw-outputs__name">{name}</code>
          </li>
        ))}
      </ol>
      {column.outputs.length > NAMES_LISTED ? (
        <p className="lw-note">… and {countOf(column.outputs.length - NAMES_LISTED, 'more', 'more')}.</p>
      ) : null}
    </div>
  );
}
