/**
 * The one long job the page may be running (reading a file, writing the encoded CSV, checking a
 * recipe): its label and progress for the progress bar, and its cancel button. Starting another
 * long job cancels the one running.
 */
import { useCallback, useRef, useState } from 'react';
import type { Job, Progress } from '../../worker/client.ts';

export interface TaskView {
  readonly label: string;
  readonly progress: Progress | null;
  cancel(): void;
}

export function useTask() {
  const [task, setTask] = useState<TaskView | null>(null);
  const current = useRef<Job<unknown> | null>(null);

  /** Runs `start` as the current task; resolves with its result, rejects as the job does. */
  const run = useCallback(async <T,>(label: string, start: (onProgress: (p: Progress) => void) => Job<T>): Promise<T> => {
    current.current?.cancel();
    let job: Job<T> | null = null;
    const view = (progress: Progress | null): TaskView => ({ label, progress, cancel: () => job?.cancel() });
    job = start((progress) => {
      if (current.current === job) setTask(view(progress));
    });
    current.current = job;
    setTask(view(null));
    try {
      return await job.result;
    } finally {
      if (current.current === job) {
        current.current = null;
        setTask(null);
      }
    }
  }, []);

  return { task, run };
}
