/**
 * Progress on standard error, only when it is a terminal: scheduled jobs and pipes get clean
 * output. One line, rewritten at most a few times a second, cleared at the end.
 */
const EVERY_MS = 250;

export interface Progress {
  update(bytes: number, rows: number): void;
  done(): void;
}

export function createProgress(label: string, totalBytes: number | null): Progress {
  if (!process.stderr.isTTY) return { update() {}, done() {} };
  let last = 0;
  let shown = false;
  return {
    update(bytes, rows) {
      const now = Date.now();
      if (now - last < EVERY_MS) return;
      last = now;
      const share = totalBytes !== null && totalBytes > 0 && bytes > 0 ? ` (${Math.round((100 * bytes) / totalBytes)}%)` : '';
      process.stderr.write(`\r\u001b[2K${label}: ${rows.toLocaleString('en-US')} rows${share}`);
      shown = true;
    },
    done() {
      if (shown) process.stderr.write('\r\u001b[2K');
    },
  };
}
