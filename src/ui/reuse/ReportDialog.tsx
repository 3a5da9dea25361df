/** The report of a full pass over the open file (after writing its encoded CSV), in a dialog. */
import { useId, useRef } from 'react';
import type { ApplyReport } from '../../core/apply-report.ts';
import type { ReadingFacts } from './report-model.ts';
import { ReuseReport } from './ReuseReport.tsx';
import { useModalDialog } from './useModalDialog.ts';

export interface ReportDialogProps {
  readonly shown: { readonly report: ApplyReport; readonly fileName: string } | null;
  readonly reading: ReadingFacts | null;
  onClose(): void;
}

export function ReportDialog({ shown, reading, onClose }: ReportDialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useModalDialog(ref, shown !== null);
  return (
    <dialog ref={ref} className="reuse" aria-labelledby={titleId} onCancel={(e) => (e.preventDefault(), onClose())}>
      <header className="reuse-head">
        <h2 id={titleId}>Report</h2>
        <button type="button" className="dialog-close" onClick={onClose} aria-label="Close">
          <span aria-hidden="true">×</span>
        </button>
      </header>
      <div className="reuse-body">
        {shown ? <ReuseReport report={shown.report} reading={reading ?? { rowIssues: [], rowIssueCount: 0 }} fileName={shown.fileName} /> : null}
      </div>
    </dialog>
  );
}
