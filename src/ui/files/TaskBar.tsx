/** The long job running: what it is, how far it got, and a way to stop it. */
import { useTaskProgress, type TaskView } from '../state/useTask.ts';

const PHASE_WORDS = { reading: 'reading', profiling: 'looking at the columns', encoding: 'encoding', writing: 'writing', checking: 'checking' } as const;

export function TaskBar({ task }: { readonly task: TaskView | null }) {
  return task === null ? null : <RunningTask task={task} />;
}

function RunningTask({ task }: { readonly task: TaskView }) {
  const progress = useTaskProgress(task);
  const fraction = progress && progress.total ? Math.min(1, progress.done / progress.total) : null;
  const percent = fraction === null ? null : Math.round(fraction * 100);
  return (
    <div className="taskbar" role="status" aria-live="polite">
      <span className="taskbar-label">
        {task.label}
        {progress ? ` — ${PHASE_WORDS[progress.phase]}` : '…'}
      </span>
      <div
        className={`taskbar-track${percent === null ? ' is-unknown' : ''}`}
        role="progressbar"
        aria-label={task.label}
        aria-valuemin={0}
        aria-valuemax={100}
        {...(percent === null ? {} : { 'aria-valuenow': percent })}
      >
        <div className="taskbar-fill" style={{ width: percent === null ? '30%' : `${percent}%` }} />
      </div>
      <span className="taskbar-percent">{percent === null ? '' : `${percent} %`}</span>
      <button type="button" className="button button-quiet" onClick={task.cancel}>
        Cancel
      </button>
    </div>
  );
}
