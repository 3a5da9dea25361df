// @vitest-environment jsdom
/**
 * A long job's progress moves the progress bar without rendering the rest of the page again: on a
 * million-row file every such render was a long task on the main thread (bench/README.md).
 */
import { act, cleanup, render, screen } from '@testing-library/react';
import { afterEach, describe, expect, it } from 'vitest';
import type { Job, Progress } from '../../../src/worker/client.ts';
import { Cancelled } from '../../../src/worker/protocol.ts';
import { TaskBar } from '../../../src/ui/files/TaskBar.tsx';
import { useTask } from '../../../src/ui/state/useTask.ts';

afterEach(cleanup);

/** A job driven by hand: the test reports its progress and ends it. */
function manualJob() {
  let report: (p: Progress) => void = () => undefined;
  let finish: (value: string) => void = () => undefined;
  let fail: (error: unknown) => void = () => undefined;
  const start = (onProgress: (p: Progress) => void): Job<string> => {
    report = onProgress;
    const result = new Promise<string>((resolve, reject) => {
      finish = resolve;
      fail = reject;
    });
    return { id: 1, result, cancel: () => fail(new Cancelled()) };
  };
  return { start, report: (p: Progress) => report(p), finish: (v: string) => finish(v) };
}

describe('the running task', () => {
  it('moves the progress bar on each step while the page holding the task renders only when the task starts and ends', async () => {
    const job = manualJob();
    let pageRenders = 0;
    let run: ReturnType<typeof useTask>['run'] | null = null;
    function Page() {
      const task = useTask();
      run = task.run;
      pageRenders++;
      return <TaskBar task={task.task} />;
    }
    render(<Page />);
    const rendersAtStart = pageRenders;
    let done: Promise<string> | null = null;
    act(() => {
      done = run!('Reading big.csv', job.start);
    });
    expect(pageRenders).toBe(rendersAtStart + 1);
    const bar = screen.getByRole('progressbar', { name: 'Reading big.csv' });
    expect(bar.getAttribute('aria-valuenow')).toBeNull();

    // 40 of 160 bytes = 25 %, then 120 of 160 = 75 %.
    act(() => job.report({ phase: 'reading', done: 40, total: 160 }));
    expect(bar.getAttribute('aria-valuenow')).toBe('25');
    act(() => job.report({ phase: 'reading', done: 120, total: 160 }));
    expect(bar.getAttribute('aria-valuenow')).toBe('75');
    expect(screen.getByText('75 %')).toBeTruthy();
    expect(pageRenders).toBe(rendersAtStart + 1);

    await act(async () => {
      job.finish('opened');
      await done;
    });
    expect(await done).toBe('opened');
    expect(screen.queryByRole('progressbar')).toBeNull();
    expect(pageRenders).toBe(rendersAtStart + 2);
  });
});
