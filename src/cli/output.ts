/**
 * Where results go: a file, or "-" / nothing for standard output. A plain file is written under
 * a temporary name beside it and renamed when complete, so a scheduled job never picks up half a
 * file; on failure the partial file is removed. Devices, pipes and links are written in place. Writes wait for the stream to drain, so memory
 * stays flat however large the output grows.
 */
import { once } from 'node:events';
import { createWriteStream, lstatSync, type WriteStream } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { CliFailure } from './failure.ts';

export interface Output {
  /** The path, or "standard output". */
  readonly label: string;
  /** Queues a copy of `bytes` (the caller may reuse its buffer at once). */
  write(bytes: Uint8Array | string): void;
  /** Resolves when queued bytes have gone out far enough to take more. */
  drained(): Promise<void>;
  /** Starts the output over (files only); false for standard output, which cannot take bytes back. */
  restart(): Promise<boolean>;
  /** Finishes: the file appears under its name. */
  close(): Promise<void>;
  /** Gives up: a partial file is removed. */
  discard(): Promise<void>;
}

/** Standard output was closed by the reader (e.g. "| head"): stop quietly. */
export class OutputClosed extends Error {}

export function openOutput(path: string | undefined): Output {
  if (path === undefined || path === '-') return standardOutput();
  return replacesRegularFile(path) ? fileOutput(path) : directOutput(path);
}

/**
 * Only a new path or a plain file is written beside and renamed: a device (/dev/null), a named
 * pipe or a symbolic link must be written through, never replaced.
 */
function replacesRegularFile(path: string): boolean {
  try {
    const info = lstatSync(path);
    return info.isFile() && !info.isSymbolicLink();
  } catch {
    return true;
  }
}

function standardOutput(): Output {
  let closed = false;
  let failure: unknown = null;
  process.stdout.on('error', (error: NodeJS.ErrnoException) => {
    if (error.code === 'EPIPE') closed = true;
    else failure = error;
  });
  const check = () => {
    if (closed) throw new OutputClosed('standard output was closed');
    if (failure !== null) throw failure;
  };
  return {
    label: 'standard output',
    write(bytes) {
      check();
      process.stdout.write(typeof bytes === 'string' ? bytes : Buffer.from(bytes));
    },
    async drained() {
      check();
      await drain(process.stdout);
      check();
    },
    async restart() {
      return false;
    },
    async close() {
      check();
      await drain(process.stdout);
      check();
    },
    async discard() {},
  };
}

function fileOutput(path: string): Output {
  return streamOutput(path, join(dirname(path), `.${basename(path)}.${process.pid}.partial`));
}

/** Written in place: what is already there (a device, a pipe, a link's target) stays. */
function directOutput(path: string): Output {
  return streamOutput(path, null);
}

function streamOutput(path: string, partial: string | null): Output {
  const target = partial ?? path;
  let stream: WriteStream = open();
  let failure: unknown = null;

  function open(): WriteStream {
    const s = createWriteStream(target);
    s.on('error', (error) => {
      failure ??= error;
    });
    return s;
  }
  const check = () => {
    if (failure !== null) throw writeFailure(path, failure);
  };
  const end = async (s: WriteStream) => {
    if (s.closed) return;
    s.end();
    await Promise.race([once(s, 'close'), once(s, 'error')]).catch(() => undefined);
  };
  return {
    label: path,
    write(bytes) {
      check();
      stream.write(typeof bytes === 'string' ? bytes : Buffer.from(bytes));
    },
    async drained() {
      check();
      await drain(stream);
      check();
    },
    async restart() {
      // A pipe or device cannot take back what it was given.
      if (partial === null) return false;
      await end(stream);
      check();
      stream = open();
      return true;
    },
    async close() {
      await end(stream);
      check();
      if (partial === null) return;
      try {
        await rename(partial, path);
      } catch (error) {
        throw writeFailure(path, error);
      }
    },
    async discard() {
      await end(stream);
      if (partial !== null) await rm(partial, { force: true });
    },
  };
}

/** Waits until `stream` takes more bytes; an error ends the wait (the stream's error listener keeps it). */
async function drain(stream: NodeJS.WritableStream & { writableNeedDrain: boolean }): Promise<void> {
  if (!stream.writableNeedDrain) return;
  await once(stream, 'drain').catch(() => undefined);
}

function writeFailure(path: string, error: unknown): CliFailure {
  const code = (error as NodeJS.ErrnoException | null)?.code;
  const why =
    code === 'ENOENT' ? 'its folder does not exist' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code === 'ENOSPC' ? 'the disk is full' : code === 'EISDIR' ? 'it is a folder' : String((error as Error)?.message ?? error);
  return new CliFailure(`cannot write "${path}": ${why}.`, 'Choose a path in a folder you can write to.');
}
