/**
 * The one long job the page may be running (reading a file, writing the encoded CSV, checking a
 * recipe): its label and progress for the progress bar, and its cancel button. Starting another
 * long job cancels the one running.
 */
import { useCallback, useRef, useState, useSyncExternalStore } from 'react';
import type { Job, Progress } from '../../worker/client.ts';

export interface TaskView {
  readonly label: string;
  /**
   * How far the job got. It changes a few hundred times per job, so it is kept out of React state:
   * only the progress bar subscribes (useTaskProgress), and the rest of the page is not rendered
   * again for every step (on a million-row file each such render was a long task).
   */
  readonly progress: ProgressSource;
  cancel(): void;
}

export interface ProgressSource {
  get(): Progress | null;
  subscribe(listener: () => void): () => void;
}

function progressSource(): ProgressSource & { set(progress: Progress): void } {
  let latest: Progress | null = null;
  const listeners = new Set<() => void>();
  return {
    get: () => latest,
    subscribe: (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    set: (progress) => {
      latest = progress;
      for (const listener of listeners) listener();
    },
  };
}

/** The task's latest progress; re-renders only the component that calls it. */
export function useTaskProgress(task: TaskView): Progress | null {
  return useSyncExternalStore(task.progress.subscribe, task.progress.get);
}

export function useTask() {
  const [task, setTask] = useState<TaskView | null>(null);
  const current = useRef<Job<unknown> | null>(null);

  /** Runs `start` as the current task; resolves with its result, rejects as the job does. */
  const run = useCallback(async <T,>(label: string, start: (onProgress: (p: Progress) => void) => Job<T>): Promise<T> => {
    current.current?.cancel();
    let job: Job<T> | null = null;
    const progress = progressSource();
    job = start((step) => {
      if (current.current === job) progress.set(step);
    });
    current.current = job;
    setTask({ label, progress, cancel: () => job?.cancel() });
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
