/**
 * How wide the output gets: source columns before, output columns after, per column and in total.
 * A column that makes more output columns than the threshold is flagged with one-click remedies:
 * keep only the most frequent levels, switch to frequency coding (one column), or leave it out.
 */
import { useId } from 'react';
import type { Decision } from '../../core/decisions.ts';
import { LEVEL_LABELS, countOf, formatCount, formatShare } from '../columns/labels.ts';
import type { ColumnWidth, WidthForecast } from './types.ts';
import './WidthMeter.css';

export interface WidthMeterProps {
  forecast: WidthForecast;
  /** A column making more output columns than this gets a warning; 30 unless told otherwise. */
  threshold?: number;
  onDecide(d: Decision): void;
  /** How many levels the "keep the most frequent" remedy keeps; 20 unless told otherwise. */
  keepTop?: number;
}

/**
 * Rows of the table, and wide-column warnings, drawn at most. A file of thousands of columns would
 * otherwise fill the page with rows nobody reads and make it slow; past this the widest columns are
 * shown and the rest are counted, so every output column is still accounted for.
 */
export const ROWS_LISTED = 200;
export const WARNINGS_LISTED = 50;

export function WidthMeter({ forecast, threshold = 30, onDecide, keepTop = 20 }: WidthMeterProps) {
  const headingId = useId();
  const wide = forecast.perColumn.filter((c) => c.after > threshold);
  const widest = forecast.perColumn.reduce((most, c) => Math.max(most, c.after), threshold);
  const rows = listedRows(forecast.perColumn);
  const unlisted = forecast.perColumn.length - rows.length;
  const unlistedOutputs = forecast.total.after - rows.reduce((n, c) => n + c.after, 0);
  return (
    <section className="lw-width" aria-labelledby={headingId}>
      <h2 className="lw-width__title" id={headingId}>
        Output width
      </h2>
      <p className="lw-width__total">
        <span className="lw-width__figure">{countOf(forecast.total.before, 'source column', 'source columns')}</span>
        <span className="lw-width__arrow" aria-hidden="true">
          {' '}→{' '}
        </span>
        <span className="lw-width__sr"> become </span>
        <span className="lw-width__figure lw-width__figure--after">
          {countOf(forecast.total.after, 'output column', 'output columns')}
        </span>
      </p>
      {forecast.total.after > 0 ? (
        <p className="lw-width__zeros">About {formatShare(forecast.total.zeroShare)} of the output cells will be 0.</p>
      ) : null}
      {wide.length > 0 ? (
        <div className="lw-width__warnings" role="region" aria-label="Wide columns">
          {wide.slice(0, WARNINGS_LISTED).map((c) => (
            <WideColumnWarning key={c.name} column={c} threshold={threshold} keepTop={keepTop} onDecide={onDecide} />
          ))}
          {wide.length > WARNINGS_LISTED ? (
            <p className="lw-width__warning-text">
              … and {countOf(wide.length - WARNINGS_LISTED, 'more wide column', 'more wide columns')}; deal with these first.
            </p>
          ) : null}
        </div>
      ) : (
        <p className="lw-width__ok">No column makes more than {formatCount(threshold)} output columns.</p>
      )}
      <table className="lw-width__table">
        <caption className="lw-width__caption">
          {unlisted > 0 ? `Output columns per source column: the ${formatCount(rows.length)} widest` : 'Output columns per source column'}
        </caption>
        <thead>
          <tr>
            <th scope="col">Column</th>
            <th scope="col" className="lw-width__level">
              Level
            </th>
            <th scope="col" className="lw-width__num">
              Outputs
            </th>
            <th scope="col">
              <span className="lw-width__sr">Relative width</span>
            </th>
            <th scope="col" className="lw-width__num">
              Zeros
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((c) => (
            <tr key={c.name} data-column={c.name} data-wide={c.after > threshold}>
              <th scope="row" className="lw-width__name">
                {c.name}
              </th>
              <td className="lw-width__level">{LEVEL_LABELS[c.level]}</td>
              <td className="lw-width__num" data-after={c.after}>
                {formatCount(c.after)}
              </td>
              <td className="lw-width__barcell">
                <WidthBar after={c.after} widest={widest} threshold={threshold} />
              </td>
              <td className="lw-width__num">{c.after > 0 ? formatShare(c.zeroShare) : '—'}</td>
            </tr>
          ))}
        </tbody>
        {unlisted > 0 ? (
          <tfoot>
            <tr>
              <td colSpan={5} className="lw-width__more" data-testid="width-more">
                … and {countOf(unlisted, 'more source column', 'more source columns')}, making{' '}
                {countOf(unlistedOutputs, 'output column', 'output columns')} in all.
              </td>
            </tr>
          </tfoot>
        ) : null}
      </table>
    </section>
  );
}

/** Every column when there are few; otherwise the widest, in file order among equals. */
function listedRows(columns: readonly ColumnWidth[]): readonly ColumnWidth[] {
  if (columns.length <= ROWS_LISTED) return columns;
  const widest = columns
    .map((column, index) => ({ column, index }))
    .sort((a, b) => b.column.after - a.column.after || a.index - b.index)
    .slice(0, ROWS_LISTED);
  return widest.map((entry) => entry.column);
}

function WidthBar({ after, widest, threshold }: { readonly after: number; readonly widest: number; readonly threshold: number }) {
  const share = (n: number) => `${Math.min(100, (n / widest) * 100)}%`;
  return (
    <span className="lw-width__track" aria-hidden="true">
      <span className="lw-width__bar" data-over={after > threshold} style={{ width: share(after) }} />
      <span className="lw-width__mark" style={{ left: share(threshold) }} />
    </span>
  );
}

interface WideColumnWarningProps {
  readonly column: ColumnWidth;
  readonly threshold: number;
  readonly keepTop: number;
  readonly onDecide: (d: Decision) => void;
}

function WideColumnWarning({ column, threshold, keepTop, onDecide }: WideColumnWarningProps) {
  const { name } = column;
  // Grouping and frequency coding are nominal options; any other wide column can only be left out here.
  const nominal = column.level === 'nominal';
  return (
    <div className="lw-width__warning" data-column={name}>
      <p className="lw-width__warning-text">
        <strong>{name}</strong> makes {countOf(column.after, 'output column', 'output columns')}, more than {formatCount(threshold)}.
        {nominal ? ' Most of its levels are rare; a model learns little from them.' : ''}
      </p>
      <div className="lw-width__remedies">
        {nominal ? (
          <>
            <button
              type="button"
              className="lw-width__remedy"
              aria-label={`Keep the ${keepTop} most frequent levels of ${name}`}
              onClick={() => onDecide({ type: 'set-rare', column: name, rare: { minCount: null, minShare: null, keepTop } })}
            >
              Keep the {keepTop} most frequent levels
            </button>
            <button
              type="button"
              className="lw-width__remedy"
              aria-label={`Use frequency coding for ${name}`}
              onClick={() => onDecide({ type: 'set-nominal-coding', column: name, coding: 'frequency' })}
            >
              Use frequency coding
            </button>
          </>
        ) : null}
        <button
          type="button"
          className="lw-width__remedy"
          aria-label={`Leave out ${name}`}
          onClick={() => onDecide({ type: 'set-level', column: name, level: 'excluded' })}
        >
          Leave out
        </button>
      </div>
    </div>
  );
}
