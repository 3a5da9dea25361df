/** Messages for the person: what happened, where, and what to do. Errors are announced at once. */
import type { Notice } from '../state/useWorkbench.ts';

export function Notices({ notices, onDismiss }: { readonly notices: readonly Notice[]; onDismiss(id: number): void }) {
  if (notices.length === 0) return null;
  return (
    <div className="notices">
      {notices.map((notice) => (
        <div key={notice.id} className={`notice tone-${notice.tone}`} role={notice.tone === 'error' ? 'alert' : 'status'}>
          <div className="notice-text">
            <strong>{notice.title}</strong>
            {notice.detail ? <span className="notice-detail"> {notice.detail}</span> : null}
            {notice.hint ? <span className="notice-hint"> {notice.hint}</span> : null}
          </div>
          {notice.action ? (
            <button
              type="button"
              className="button button-small"
              onClick={() => {
                notice.action?.run();
                onDismiss(notice.id);
              }}
            >
              {notice.action.label}
            </button>
          ) : null}
          <button type="button" className="notice-close" onClick={() => onDismiss(notice.id)} aria-label={`Dismiss: ${notice.title}`}>
            <span aria-hidden="true">×</span>
          </button>
        </div>
      ))}
    </div>
  );
}
