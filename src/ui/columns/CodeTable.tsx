/**
 * What each level of a categorical column becomes: one row per level, one column per output,
 * read from the same code table the encoder uses, so what is shown is what is written.
 */
import { codesForColumn, codesOf } from '../../core/encoders/index.ts';
import type { CategoricalColumn } from '../../core/recipe.ts';
import './CodeTable.css';

/** Beyond this the table stops being readable in a side panel; the preview grid shows the rest. */
const MAX_LEVELS = 12;
const MAX_WIDTH = 8;

export interface CodeTableProps {
  readonly column: CategoricalColumn;
}

export function CodeTable({ column }: CodeTableProps) {
  const codes = codesForColumn(column);
  if (codes.levels.length === 0) return <p className="lw-note">This column has no levels yet.</p>;
  if (codes.levels.length > MAX_LEVELS || codes.width > MAX_WIDTH)
    return (
      <p className="lw-note">
        {codes.levels.length} levels × {codes.width} output columns: too large to show here; the preview shows the encoded rows.
      </p>
    );
  // Output names come first in `outputs`, in code order; a missing indicator, if any, follows them.
  const heading = (label: string, j: number) => column.outputs[j] ?? label;
  return (
    <div className="lw-codes__scroll">
      <table className="lw-codes">
        <caption className="lw-codes__caption">What each level becomes</caption>
        <thead>
          <tr>
            <th scope="col">Level</th>
            {codes.columnLabels.map((label, j) => (
              <th scope="col" key={j} className="lw-codes__num">
                {heading(label, j)}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {codes.levels.map((level, i) => (
            <tr key={level}>
              <th scope="row">{level}</th>
              {codesOf(codes, i).map((code, j) => (
                <td key={j} className="lw-codes__num" data-code={code}>
                  {formatCode(code)}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function formatCode(code: number): string {
  // Shares (frequency coding) get three decimals; integer codes print as they are; −1 with a real minus.
  if (Number.isInteger(code)) return code < 0 ? `−${Math.abs(code)}` : String(code);
  return code.toFixed(3);
}
