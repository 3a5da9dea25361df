/**
 * "Open a file…": a real file input, visually a button, so it works with the keyboard, screen
 * readers and the browser's own file chooser.
 */
import { useId, type ChangeEvent } from 'react';

export const DATA_FILE_ACCEPT =
  '.csv,.tsv,.tab,.txt,.psv,.gz,.xlsx,text/csv,text/tab-separated-values,text/plain,application/gzip,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

export interface OpenFileButtonProps {
  readonly label: string;
  readonly accept: string;
  onFile(file: File): void;
  readonly disabled?: boolean;
  readonly className?: string;
  /** Test hook and accessible description. */
  readonly testId?: string;
}

export function OpenFileButton({ label, accept, onFile, disabled = false, className = 'button', testId }: OpenFileButtonProps) {
  const id = useId();
  const onChange = (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    // Clearing lets the same file be chosen again (after editing it elsewhere).
    event.target.value = '';
    if (file) onFile(file);
  };
  return (
    <span className={`file-button ${className}${disabled ? ' is-disabled' : ''}`}>
      <input id={id} type="file" accept={accept} onChange={onChange} disabled={disabled} data-testid={testId} className="file-button-input" />
      <label htmlFor={id}>{label}</label>
    </span>
  );
}
