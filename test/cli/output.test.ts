/**
 * Where the command line writes (src/cli/output.ts): plain files appear under their name only when
 * complete; files and devices are written synchronously from the caller's buffer, which it may
 * reuse at once; pipes are written as streams.
 */
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, lstatSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CliFailure } from '../../src/cli/failure.ts';
import { openOutput } from '../../src/cli/output.ts';

const work = mkdtempSync(join(tmpdir(), 'levelwise-output-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const bytes = (text: string): Uint8Array => new TextEncoder().encode(text);

describe('openOutput', () => {
  it('writes a new file under a partial name, and gives it its name when complete', async () => {
    const path = join(work, 'new.csv');
    const output = openOutput(path);
    const buffer = bytes('a,b\r\n');
    output.write(buffer);
    // The caller reuses its buffer at once (the CSV writer does): what was written stays.
    buffer.set(bytes('1,2\r\n'));
    output.write(buffer);
    output.write('3,4\r\n');
    await output.drained();
    expect(existsSync(path)).toBe(false);
    expect(readdirSync(work).filter((name) => name.startsWith('.new.csv.') && name.endsWith('.partial'))).toHaveLength(1);
    await output.close();
    expect(readFileSync(path, 'utf8')).toBe('a,b\r\n1,2\r\n3,4\r\n');
    expect(readdirSync(work).filter((name) => name.includes('.partial'))).toEqual([]);
  });

  it('replaces an existing file only when complete, and starts over when asked', async () => {
    const path = join(work, 'old.csv');
    writeFileSync(path, 'before\n');
    const output = openOutput(path);
    output.write('first try\n');
    expect(await output.restart()).toBe(true);
    output.write('second try\n');
    expect(readFileSync(path, 'utf8')).toBe('before\n');
    await output.close();
    expect(readFileSync(path, 'utf8')).toBe('second try\n');
  });

  it('leaves the old file and no partial one when given up', async () => {
    const path = join(work, 'kept.csv');
    writeFileSync(path, 'kept\n');
    const output = openOutput(path);
    output.write('half of it');
    await output.discard();
    expect(readFileSync(path, 'utf8')).toBe('kept\n');
    expect(readdirSync(work).filter((name) => name.includes('.partial'))).toEqual([]);
  });

  it('writes through a link and to a device in place, and cannot start over there', async () => {
    const target = join(work, 'target.csv');
    const link = join(work, 'link.csv');
    writeFileSync(target, '');
    symlinkSync(target, link);
    const viaLink = openOutput(link);
    viaLink.write('through the link\n');
    expect(await viaLink.restart()).toBe(false);
    await viaLink.close();
    expect(lstatSync(link).isSymbolicLink()).toBe(true);
    expect(readFileSync(target, 'utf8')).toBe('through the link\n');

    const device = openOutput('/dev/null');
    device.write(new Uint8Array(1 << 20));
    expect(await device.restart()).toBe(false);
    await device.close();
  });

  it('writes a named pipe as a stream, to its reader', async () => {
    const fifo = join(work, 'pipe');
    if (spawnSync('mkfifo', [fifo]).status !== 0) return; // no mkfifo on this system
    const reader = spawn('cat', [fifo]);
    const received: Buffer[] = [];
    reader.stdout.on('data', (chunk: Buffer) => received.push(chunk));
    const ended = new Promise((resolve) => reader.on('close', resolve));
    const output = openOutput(fifo);
    for (let i = 0; i < 64; i++) output.write(new Uint8Array(64 << 10).fill(65 + (i % 26)));
    await output.drained();
    await output.close();
    await ended;
    const all = Buffer.concat(received);
    expect(all.length).toBe(64 * (64 << 10));
    expect([all[0], all[(64 << 10) * 25], all.at(-1)]).toEqual([65, 90, 65 + (63 % 26)]);
  });

  it('says which path cannot be written and why, at the first write', async () => {
    const path = join(work, 'no such folder', 'out.csv');
    const output = openOutput(path);
    let failure: unknown = null;
    try {
      output.write('x');
    } catch (error) {
      failure = error;
    }
    expect(failure).toBeInstanceOf(CliFailure);
    expect((failure as CliFailure).message).toBe(`cannot write "${path}": its folder does not exist.`);
    await output.discard();
  });
});
