/** The re-use report, laid out: verdict, counts, then one section per kind of surprise. */
import { useId } from 'react';
import type { ApplyReport } from '../../core/apply-report.ts';
import { formatCount } from '../files/format.ts';
import { linesText, reportView, type ReadingFacts, type TallyView } from './report-model.ts';

/** Values listed per table; the rest are counted in a last line. */
export const VALUES_LISTED = 50;
/** Rejected rows listed; the rest are counted. */
export const REJECTED_LISTED = 200;

export interface ReuseReportProps {
  readonly report: ApplyReport;
  readonly reading: ReadingFacts;
  readonly fileName: string;
}

export function ReuseReport({ report, reading, fileName }: ReuseReportProps) {
  const view = reportView(report, reading);
  const headingId = useId();
  return (
    <section className="report" aria-labelledby={headingId} data-testid="reuse-report">
      <h3 id={headingId} className="report-title">
        What the recipe did to “{fileName}”
      </h3>
      <p className={`report-verdict ${view.fits ? 'is-fit' : 'is-attention'}`}>{view.headline}</p>
      <dl className="report-facts">
        {view.facts.map((f) => (
          <div key={f.label}>
            <dt>{f.label}</dt>
            <dd>{formatCount(f.value)}</dd>
          </div>
        ))}
      </dl>

      {view.missingColumns.length > 0 ? (
        <section className="report-section">
          <h4>Columns the file lacks</h4>
          <ul>
            {view.missingColumns.map((c) => (
              <li key={c.name}>
                <strong>{c.name}</strong>: {c.effect}.
              </li>
            ))}
          </ul>
        </section>
      ) : null}

      {view.extraColumns.length > 0 ? (
        <section className="report-section">
          <h4>Columns the recipe does not mention</h4>
          <p>Left out of the output: {view.extraColumns.map((c) => `“${c}”`).join(', ')}.</p>
        </section>
      ) : null}

      {view.renamed.length > 0 ? (
        <section className="report-section">
          <h4>Column names changed while reading</h4>
          <ul>
            {view.renamed.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
        </section>
      ) : null}

      {view.reading.length > 0 ? (
        <section className="report-section">
          <h4>Rows with the wrong number of fields</h4>
          <ul>
            {view.reading.map((line) => (
              <li key={line}>{line}</li>
            ))}
          </ul>
          {view.readingMore > 0 ? <p>… and {formatCount(view.readingMore)} more.</p> : null}
        </section>
      ) : null}

      {view.columns.map((c) => (
        <section key={c.name} className="report-section" data-column={c.name}>
          <h4>
            {c.name} <span className="report-level">{c.level}</span>
          </h4>
          {c.unseen ? <TallyTable caption="Levels the recipe has not seen" tally={c.unseen} /> : null}
          {c.invalid ? <TallyTable caption="Values that did not read as numbers" tally={c.invalid} /> : null}
          {c.missing ? (
            <p>
              {formatCount(c.missing.count)} missing {c.missing.count === 1 ? 'cell' : 'cells'}: {c.missing.action}.
            </p>
          ) : null}
        </section>
      ))}

      {view.rejected.length > 0 ? (
        <section className="report-section">
          <h4>Rows left out</h4>
          <table className="report-table">
            <caption className="visually-hidden">Rows left out by an error policy</caption>
            <thead>
              <tr>
                <th scope="col">Line</th>
                <th scope="col">Column</th>
                <th scope="col">Why</th>
              </tr>
            </thead>
            <tbody>
              {view.rejected.slice(0, REJECTED_LISTED).map((r) => (
                <tr key={r.row}>
                  <td className="num">{r.line}</td>
                  <td>{r.column}</td>
                  <td>{r.reason}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {view.rejected.length > REJECTED_LISTED || view.rejectedMore > 0 ? (
            <p>… and {formatCount(view.rejected.length - Math.min(REJECTED_LISTED, view.rejected.length) + view.rejectedMore)} more rows left out.</p>
          ) : null}
        </section>
      ) : null}
    </section>
  );
}

function TallyTable({ caption, tally }: { readonly caption: string; readonly tally: TallyView }) {
  return (
    <table className="report-table">
      <caption>
        {caption}: {formatCount(tally.total)} {tally.total === 1 ? 'cell' : 'cells'} — {tally.action}.
      </caption>
      <thead>
        <tr>
          <th scope="col">Value</th>
          <th scope="col" className="num">
            Count
          </th>
          <th scope="col">Where</th>
        </tr>
      </thead>
      <tbody>
        {tally.values.slice(0, VALUES_LISTED).map((v) => (
          <tr key={v.value}>
            <td>
              <code>{v.value === '' ? '(empty)' : v.value}</code>
            </td>
            <td className="num">{formatCount(v.count)}</td>
            <td>{linesText(v)}</td>
          </tr>
        ))}
      </tbody>
      {tally.values.length > VALUES_LISTED ? (
        <tfoot>
          <tr>
            <td colSpan={3}>
              … and {formatCount(tally.values.length - VALUES_LISTED)} more values ({formatCount(countBeyond(tally))} cells), each treated the same way.
            </td>
          </tr>
        </tfoot>
      ) : null}
    </table>
  );
}

/** Cells held by the values beyond the listed ones. */
function countBeyond(tally: TallyView): number {
  return tally.values.slice(VALUES_LISTED).reduce((n, v) => n + v.count, 0);
}
