/**
 * Where results go: a file, or "-" / nothing for standard output. A plain file is written under
 * a temporary name beside it and renamed when complete, so a scheduled job never picks up half a
 * file; on failure the partial file is removed. Devices, pipes and links are written in place.
 *
 * Files and devices are written synchronously, straight from the caller's buffer: no copy of the
 * bytes, nothing queued (an encoded million rows is hundreds of MB, and copying it into Buffers for
 * a stream cost 15–20 % of `apply`'s time). Standard output and pipes are streams, whose writes
 * wait for them to drain; either way memory stays flat however large the output grows. A path
 * ending in ".gz" is written gzip-compressed (RFC 1952), the compressing done on zlib's threads.
 */
import { once } from 'node:events';
import { closeSync, createWriteStream, lstatSync, openSync, statSync, writeSync } from 'node:fs';
import { rename, rm } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { constants, createGzip, type Gzip } from 'node:zlib';
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
  const output = replacesRegularFile(path)
    ? synchronousOutput(path, join(dirname(path), `.${basename(path)}.${process.pid}.partial`))
    : isFileOrDevice(path)
      ? synchronousOutput(path, null)
      : streamOutput(path);
  return COMPRESSED_PATH.test(path) ? gzipped(output) : output;
}

const COMPRESSED_PATH = /\.gz$/i;
/**
 * zlib's fastest level: encoded columns ("0,0,1,0") pack tightly at any level. The benchmark's 1M
 * rows (350 MB encoded): 41 MB in 8.0 s of `apply` at level 1, 28 MB in 15.2 s at the default
 * level 6, against 4.4 s uncompressed (2 cores, bench/README.md).
 */
const GZIP_LEVEL = constants.Z_BEST_SPEED;

/** `inner` receiving the bytes written gzip-compressed, in parts as zlib makes them. */
function gzipped(inner: Output): Output {
  let failure: unknown = null;
  const start = (): Gzip => {
    const gzip = createGzip({ level: GZIP_LEVEL });
    gzip.on('data', (part: Buffer) => {
      if (gzip !== current || failure !== null) return;
      try {
        inner.write(part);
      } catch (error) {
        failure = error;
      }
    });
    gzip.on('error', (error) => {
      failure ??= error;
    });
    return gzip;
  };
  let current = start();
  const check = () => {
    if (failure !== null) throw failure;
  };
  return {
    label: inner.label,
    write(bytes) {
      check();
      // A copy: the caller reuses its buffer at once, and zlib compresses later, on its own thread.
      current.write(typeof bytes === 'string' ? bytes : Buffer.from(bytes));
    },
    async drained() {
      check();
      await drain(current);
      check();
      await inner.drained();
    },
    async restart() {
      current.destroy();
      if (!(await inner.restart())) return false;
      failure = null;
      current = start();
      return true;
    },
    async close() {
      check();
      current.end();
      await once(current, 'end').catch(() => undefined);
      check();
      await inner.close();
    },
    async discard() {
      current.destroy();
      await inner.discard();
    },
  };
}

/** A file or a device (/dev/null), also behind a link: written synchronously. Pipes are not: a write would wait for their reader. */
function isFileOrDevice(path: string): boolean {
  try {
    const info = statSync(path);
    return info.isFile() || info.isCharacterDevice() || info.isBlockDevice();
  } catch {
    return false;
  }
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

/**
 * Written with writeSync as the bytes come. `partial`: the temporary name a plain file is written
 * under, renamed to `path` when complete (null: written in place). A failure to open or write is
 * kept and thrown by the next call, as a stream's would be.
 */
function synchronousOutput(path: string, partial: string | null): Output {
  const target = partial ?? path;
  let fd: number | null = null;
  let failure: unknown = null;
  const open = (): void => {
    try {
      fd = openSync(target, 'w');
    } catch (error) {
      failure ??= error;
    }
  };
  const closeFile = (): void => {
    if (fd === null) return;
    try {
      closeSync(fd);
    } catch (error) {
      failure ??= error;
    }
    fd = null;
  };
  const check = () => {
    if (failure !== null) throw writeFailure(path, failure);
  };
  open();
  return {
    label: path,
    write(bytes) {
      check();
      try {
        writeAll(fd!, typeof bytes === 'string' ? Buffer.from(bytes) : bytes);
      } catch (error) {
        failure ??= error;
        check();
      }
    },
    async drained() {
      check();
    },
    async restart() {
      // A device or a link's target written in place cannot take back what it was given.
      if (partial === null) return false;
      closeFile();
      check();
      open();
      check();
      return true;
    },
    async close() {
      closeFile();
      check();
      if (partial === null) return;
      try {
        await rename(partial, path);
      } catch (error) {
        throw writeFailure(path, error);
      }
    },
    async discard() {
      closeFile();
      if (partial !== null) await rm(partial, { force: true });
    },
  };
}

function writeAll(fd: number, bytes: Uint8Array): void {
  for (let at = 0; at < bytes.length; ) at += writeSync(fd, bytes, at, bytes.length - at);
}

/** A pipe or another special file, written in place as a stream. */
function streamOutput(path: string): Output {
  let failure: unknown = null;
  const stream = createWriteStream(path);
  stream.on('error', (error) => {
    failure ??= error;
  });
  const check = () => {
    if (failure !== null) throw writeFailure(path, failure);
  };
  const end = async () => {
    if (stream.closed) return;
    stream.end();
    await Promise.race([once(stream, 'close'), once(stream, 'error')]).catch(() => undefined);
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
      // A pipe cannot take back what it was given.
      return false;
    },
    async close() {
      await end();
      check();
    },
    async discard() {
      await end();
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
