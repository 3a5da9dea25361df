/**
 * Starting the measured processes. Every process is started with the peak-RSS probe preloaded
 * (peak-rss-probe.mjs), so in-process measurements and the command line report memory the same way.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { findResult, type MeasureKind } from './child-result.ts';

const LIB_DIR = dirname(fileURLToPath(import.meta.url));
export const PROJECT_ROOT = join(LIB_DIR, '..', '..');
const PROBE = join(LIB_DIR, 'peak-rss-probe.mjs');
const MEASURE = join(LIB_DIR, 'measure.ts');
export const CLI = join(PROJECT_ROOT, 'bin', 'levelwise.js');

export interface ProcessRun {
  readonly exitCode: number | null;
  readonly stdout: string;
  readonly stderr: string;
  /** From spawn to exit, start-up included. */
  readonly wallSeconds: number;
  /** Peak resident set size; NaN when the process did not report it (killed, or crashed early). */
  readonly peakRssBytes: number;
  /** CPU time of the whole process, all threads, start-up included; NaN when not reported. */
  readonly cpuSeconds: number;
}

/** Runs `node [nodeFlags] --import probe script args` and waits for it to exit. */
export async function runNode(nodeFlags: readonly string[], script: string, args: readonly string[]): Promise<ProcessRun> {
  const scratch = mkdtempSync(join(tmpdir(), 'levelwise-bench-'));
  const rssFile = join(scratch, 'peak-rss');
  try {
    const started = performance.now();
    const child = spawn(process.execPath, [...nodeFlags, '--import', PROBE, script, ...args], {
      cwd: PROJECT_ROOT,
      env: { ...process.env, LEVELWISE_BENCH_PEAK_RSS_FILE: rssFile },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    const stdout: Buffer[] = [];
    const stderr: Buffer[] = [];
    child.stdout.on('data', (part: Buffer) => stdout.push(part));
    child.stderr.on('data', (part: Buffer) => stderr.push(part));
    const exitCode = await new Promise<number | null>((resolve, reject) => {
      child.once('error', reject);
      child.once('close', (code) => resolve(code));
    });
    const wallSeconds = (performance.now() - started) / 1000;
    return {
      exitCode,
      stdout: Buffer.concat(stdout).toString('utf8'),
      stderr: Buffer.concat(stderr).toString('utf8'),
      wallSeconds,
      ...readProbe(rssFile),
    };
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

function readProbe(path: string): { peakRssBytes: number; cpuSeconds: number } {
  try {
    const { peakRssBytes, cpuSeconds } = JSON.parse(readFileSync(path, 'utf8')) as { peakRssBytes: number; cpuSeconds: number };
    return { peakRssBytes, cpuSeconds };
  } catch {
    return { peakRssBytes: NaN, cpuSeconds: NaN };
  }
}

export interface Measured<T> {
  readonly result: T;
  readonly peakRssBytes: number;
}

/** One measurement in a fresh process (measure.ts); throws with its output when it fails. */
export async function measureInChild<T>(kind: MeasureKind, args: readonly string[], extraFlags: readonly string[] = []): Promise<Measured<T>> {
  const flags = ['--import', 'tsx', ...(kind === 'table-memory' ? ['--expose-gc'] : []), ...extraFlags];
  const run = await runNode(flags, MEASURE, [kind, ...args]);
  if (run.exitCode !== 0) throw new Error(`measure ${kind} ${args.join(' ')} failed (exit ${run.exitCode}):\n${run.stderr.slice(-3000)}`);
  return { result: findResult<T>(run.stdout), peakRssBytes: run.peakRssBytes };
}

/**
 * The command line exactly as a person starts it (`npx levelwise …args`, which runs the launcher
 * through its first line): node with the flags that line gives, then bin/levelwise.js.
 */
export function runCli(args: readonly string[], nodeFlags: readonly string[] = []): Promise<ProcessRun> {
  return runNode([...launcherFlags(readFileSync(CLI, 'utf8')), ...nodeFlags], CLI, args);
}

/** The node flags on a launcher's first line (`#!/usr/bin/env -S node --flag …`). */
export function launcherFlags(source: string): string[] {
  const first = source.slice(0, source.indexOf('\n'));
  const words = first.replace(/^#!\s*/, '').split(/\s+/).filter((word) => word !== '');
  const node = words.findIndex((word) => word === 'node' || word.endsWith('/node'));
  if (node === -1) throw new Error(`the launcher's first line does not start node: ${first}`);
  return words.slice(node + 1);
}
