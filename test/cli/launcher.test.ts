/**
 * bin/levelwise.js runs the command line from a bundle it makes and keeps under
 * node_modules/.cache/levelwise-cli/. These tests run it in a copy of the project (its own
 * node_modules folder, holding links to the real packages, so its cache is its own) and change the
 * copy's sources between runs: the output must always come from the sources as they are now.
 */
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, symlinkSync, utimesSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '../..');
const copy = mkdtempSync(join(tmpdir(), 'levelwise-launcher-'));
afterAll(() => rmSync(copy, { recursive: true, force: true }));

for (const part of ['bin', 'src', 'package.json', 'tsconfig.json']) cpSync(join(ROOT, part), join(copy, part), { recursive: true });
mkdirSync(join(copy, 'node_modules'));
for (const entry of readdirSync(join(ROOT, 'node_modules'))) {
  if (entry !== '.cache') symlinkSync(join(ROOT, 'node_modules', entry), join(copy, 'node_modules', entry));
}
const CACHE = join(copy, 'node_modules/.cache/levelwise-cli');
const input = join(copy, 'in.csv');
writeFileSync(input, 'id,n\nA,1\nB,3\n');
const recipeFile = join(copy, 'recipe.json');

function levelwise(args: readonly string[], env: NodeJS.ProcessEnv = {}) {
  const run = spawnSync(process.execPath, [join(copy, 'bin/levelwise.js'), ...args], { cwd: copy, env: { ...process.env, LEVELWISE_DEBUG: '', ...env } });
  return { status: run.status, stdout: run.stdout.toString('utf8'), stderr: run.stderr.toString('utf8') };
}

function edit(file: string, from: string, to: string): void {
  const path = join(copy, file);
  const text = readFileSync(path, 'utf8');
  expect(text).toContain(from);
  writeFileSync(path, text.replace(from, to));
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

describe('the launcher', () => {
  it('makes a bundle on the first run and records the hash of every source file in it', () => {
    const run = levelwise(['--help']);
    expect(run.status).toBe(0);
    expect(run.stdout).toContain('Usage: levelwise VERB [options]');
    const manifest = JSON.parse(readFileSync(join(CACHE, 'manifest.json'), 'utf8')) as { bundle: string; sources: Record<string, string> };
    expect(existsSync(join(CACHE, manifest.bundle))).toBe(true);
    expect(Object.keys(manifest.sources)).toEqual(expect.arrayContaining(['src/cli/main.ts', 'src/cli/verbs/apply.ts', 'src/core/csv-write.ts']));
    // The packages' files are in the bundle and in the record: an updated package makes a new bundle.
    expect(Object.keys(manifest.sources).some((file) => file.endsWith('papaparse/papaparse.js'))).toBe(true);
    for (const [file, hash] of Object.entries(manifest.sources)) expect([file, sha256(readFileSync(join(copy, file)))]).toEqual([file, hash]);
  });

  it('never runs a source file as it was: a change to the entry or to a file deep in the imports shows at once', () => {
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options]', 'Usage: levelwise VERB [options] (changed)');
    expect(levelwise(['--help']).stdout).toContain('Usage: levelwise VERB [options] (changed)');
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options] (changed)', 'Usage: levelwise VERB [options]');
    expect(levelwise(['--help']).stdout).not.toContain('(changed)');

    expect(levelwise(['draft', input, '-o', recipeFile]).status).toBe(0);
    const before = levelwise(['apply', recipeFile, input]);
    expect(before.stdout).toContain('\r\n');
    edit('src/core/csv-write.ts', "export const LINE_END = '\\r\\n';", "export const LINE_END = '\\n';");
    const after = levelwise(['apply', recipeFile, input]);
    expect(after.stdout).toBe(before.stdout.replaceAll('\r\n', '\n'));
    edit('src/core/csv-write.ts', "export const LINE_END = '\\n';", "export const LINE_END = '\\r\\n';");
    expect(levelwise(['apply', recipeFile, input]).stdout).toBe(before.stdout);
  });

  it('runs the sources through tsx when asked to, with the same result', () => {
    const bundled = levelwise(['apply', recipeFile, input]);
    const direct = levelwise(['apply', recipeFile, input], { LEVELWISE_NO_BUNDLE: '1' });
    expect([direct.status, direct.stdout, direct.stderr]).toEqual([bundled.status, bundled.stdout, bundled.stderr]);
  });

  it('runs nothing old when a source no longer compiles', () => {
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options]', 'Usage: levelwise VERB [options]` +');
    const run = levelwise(['--help']);
    expect(run.status).not.toBe(0);
    expect(run.stdout).not.toContain('Usage');
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options]` +', 'Usage: levelwise VERB [options]');
    expect(levelwise(['--help']).stdout).toContain('Usage: levelwise VERB [options]');
  });

  it('writes the reading threads a bundle of their own beside the command line bundle, without the packages they never use', () => {
    const manifest = JSON.parse(readFileSync(join(CACHE, 'manifest.json'), 'utf8')) as { bundle: string };
    const folder = dirname(join(CACHE, manifest.bundle));
    expect(readdirSync(folder).sort()).toEqual(['cli.mjs', 'cli.mjs.map', 'read-thread.mjs', 'read-thread.mjs.map']);
    const thread = readFileSync(join(folder, 'read-thread.mjs'), 'utf8');
    expect(thread).toContain('levelwise-reading-thread');
    // Packages are bundled: the threads' bundle holds papaparse (the delimiter's choice) but none of zod's code.
    expect(thread).not.toMatch(/from "zod"|ZodError|\$ZodType/);
    expect(readFileSync(join(folder, 'cli.mjs'), 'utf8')).toMatch(/ZodError/);
    // Threads read a file from it: three threads, 3 kB segments, the same output as one thread.
    const rows = Array.from({ length: 3000 }, (_, i) => `ID-${String(i).padStart(5, '0')},${i % 7}`).join('\n');
    const big = join(copy, 'big.csv');
    writeFileSync(big, `id,n\n${rows}\n`);
    const threads = { LEVELWISE_READING_THREADS: '3', LEVELWISE_SEGMENT_BYTES: '3000', LEVELWISE_PARALLEL_FROM_BYTES: '1000' };
    const onThreads = levelwise(['profile', big, '--format', 'json'], threads);
    const onOne = levelwise(['profile', big, '--format', 'json'], { LEVELWISE_NO_BUNDLE: '1' });
    expect(onThreads.status).toBe(0);
    expect(onThreads.stdout).toBe(onOne.stdout);
  });

  it('removes other builds once no run has used them for a few minutes, not before (a run may still start threads from one)', () => {
    const builds = () => readdirSync(CACHE).filter((f) => f !== 'manifest.json').sort();
    const inUse = () => dirname((JSON.parse(readFileSync(join(CACHE, 'manifest.json'), 'utf8')) as { bundle: string }).bundle);
    const elevenMinutesAgo = new Date(Date.now() - 11 * 60 * 1000);
    for (const build of builds()) utimesSync(join(CACHE, build), elevenMinutesAgo, elevenMinutesAgo);
    // A run of the current build (made long ago) marks it as just used.
    expect(levelwise(['--help']).status).toBe(0);
    const used = inUse();
    const old = join(CACHE, 'build-0000000000000000');
    const recent = join(CACHE, 'build-1111111111111111');
    for (const folder of [old, recent]) mkdirSync(folder);
    utimesSync(old, elevenMinutesAgo, elevenMinutesAgo);
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options]', 'Usage: levelwise VERB [options] (again)');
    expect(levelwise(['--help']).stdout).toContain('(again)');
    edit('src/cli/help.ts', 'Usage: levelwise VERB [options] (again)', 'Usage: levelwise VERB [options]');
    expect(builds()).toEqual([inUse(), used, 'build-1111111111111111'].sort());
  });
});
