#!/usr/bin/env node
// No node flags on the line above: a line with flags needs `env -S`, which BusyBox (Alpine images)
// and coreutils before 8.30 lack, and a scheduled job there would not start. V8's
// --no-concurrent-recompilation made draft and apply 4-8 % faster on 2 cores (bench/README.md);
// `node --no-concurrent-recompilation bin/levelwise.js …` still gets that by hand.
// Launcher for the `levelwise` command line, which is written in TypeScript (src/cli/main.ts).
//
// A fresh clone needs no build step. Compiling the sources on every run (tsx's loader) took most of
// a second before the command did anything, so the first run bundles src/cli/main.ts and the
// project files it imports into one file under node_modules/.cache/levelwise-cli/BUILD/cli.mjs
// (esbuild, which tsx brings along), and later runs load that. The packages it loads at start (zod,
// papaparse) go into the bundle too: loaded as packages, resolving and compiling their hundred-odd
// modules took ~40 ms of every run's start (about 130 against 90 ms to the first command, under the
// profiler). The workbook reader stays a package, imported only when a workbook is read.
// Beside it goes a second, smaller bundle for the reading threads
// (src/cli/read-thread.ts alone): a thread starts in ~45 ms from it against ~130 ms from the whole
// command line, whose packages (zod) a reading thread never uses.
// Stale code never runs: before using the bundle, every run compares a hash of each source file it
// was made from — the very bytes esbuild compiled, the packages' files among them — and of the
// tsconfig and this launcher with the ones recorded when it was made; any difference makes a new
// bundle. When no bundle can be made
// (esbuild missing, a read-only install) or LEVELWISE_NO_BUNDLE=1, the sources run through tsx.
import { createHash } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { dirname, extname, join, relative } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const ENTRY = 'src/cli/main.ts';
/** The reading threads' own entry (it must stay in the folder of ENTRY's bundle: read-thread.ts finds it there). */
const THREAD_ENTRY = 'src/cli/read-thread.ts';
const TSCONFIG = 'tsconfig.json';
const CACHE = join(ROOT, 'node_modules', '.cache', 'levelwise-cli');
const MANIFEST = join(CACHE, 'manifest.json');
/** How long another build must have gone unused before it is removed. */
const OLD_BUILD_MS = 10 * 60 * 1000;
/** Source files esbuild may meet, and how it reads each. */
const LOADERS = { '.ts': 'ts', '.tsx': 'tsx', '.mts': 'ts', '.cts': 'ts', '.js': 'js', '.mjs': 'js', '.cjs': 'js', '.json': 'json' };

const { main } = await loadCommandLine();
process.exitCode = await main(process.argv.slice(2));

async function loadCommandLine() {
  if (process.env.LEVELWISE_NO_BUNDLE !== '1') {
    const bundle = freshBundle() ?? (await makeBundle().catch(() => null));
    if (bundle !== null) {
      markInUse(dirname(bundle));
      if (process.env.LEVELWISE_DEBUG === '1') process.setSourceMapsEnabled(true);
      try {
        return await import(pathToFileURL(bundle).href);
      } catch (error) {
        // Another run may have just replaced it; the sources are still there.
        if (error?.code !== 'ERR_MODULE_NOT_FOUND') throw error;
      }
    }
  }
  const { register } = await import('tsx/esm/api');
  register({ tsconfig: join(ROOT, TSCONFIG) });
  return import(pathToFileURL(join(ROOT, ENTRY)).href);
}

function hash(bytes) {
  return createHash('sha256').update(bytes).digest('hex');
}

/** What the bundle depends on besides the sources: how it is made (this file) and the tsconfig. */
function buildKey() {
  return hash(Buffer.concat([readFileSync(fileURLToPath(import.meta.url)), Buffer.from('\0'), readFileSync(join(ROOT, TSCONFIG))]));
}

/** The bundle, when it was made from exactly the files on disk now; else null. */
function freshBundle() {
  let manifest;
  try {
    manifest = JSON.parse(readFileSync(MANIFEST, 'utf8'));
    if (manifest.key !== buildKey()) return null;
    for (const [file, sourceHash] of Object.entries(manifest.sources)) {
      if (hash(readFileSync(join(ROOT, file))) !== sourceHash) return null;
    }
  } catch {
    return null;
  }
  return join(CACHE, manifest.bundle);
}

/** Bundles the sources, recording the hash of every file as esbuild read it; returns the bundle's path. */
async function makeBundle() {
  const key = buildKey();
  const esbuild = await import('esbuild');
  const sources = {};
  const hashSources = {
    name: 'hash-sources',
    setup(build) {
      build.onLoad({ filter: /.*/ }, ({ path }) => {
        const loader = LOADERS[extname(path)];
        if (loader === undefined) return undefined;
        const contents = readFileSync(path);
        sources[relative(ROOT, path).split('\\').join('/')] = hash(contents);
        return { contents, loader };
      });
    },
  };
  let result;
  try {
    result = await esbuild.build({
      absWorkingDir: ROOT,
      entryPoints: { cli: ENTRY, 'read-thread': THREAD_ENTRY },
      entryNames: '[name]',
      outExtension: { '.js': '.mjs' },
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      // Loaded only for a workbook, by a dynamic import (no start-up cost), and written for require(): left a package.
      external: ['read-excel-file', 'read-excel-file/*'],
      tsconfig: TSCONFIG,
      sourcemap: 'linked',
      metafile: true,
      write: false,
      outdir: join(CACHE, 'build'),
      logLevel: 'silent',
      plugins: [hashSources],
    });
  } finally {
    await esbuild.stop?.();
  }
  // Every input must have been read (and hashed) by the plugin, or the bundle could go stale unseen.
  if (Object.keys(result.metafile.inputs).some((input) => !(input in sources))) return null;
  // Each build has its own folder, named for what it was made from; the files keep their names in it.
  const folder = `build-${hash(JSON.stringify([key, sources])).slice(0, 16)}`;
  const temporary = join(CACHE, `${folder}.${process.pid}.tmp`);
  mkdirSync(temporary, { recursive: true });
  for (const file of result.outputFiles) writeFileSync(join(temporary, relative(join(CACHE, 'build'), file.path)), file.text);
  try {
    renameSync(temporary, join(CACHE, folder));
  } catch {
    // Another run made the same build at the same moment: its folder holds the same files.
    rmSync(temporary, { recursive: true, force: true });
  }
  const bundle = `${folder}/cli.mjs`;
  writeAtomically(MANIFEST, JSON.stringify({ key, bundle, sources }, null, 1));
  removeOldBuilds(folder);
  return join(CACHE, bundle);
}

/**
 * A build's folder is stamped with the time of every run that uses it, so that another build's
 * clean-up (removeOldBuilds) never takes a folder a run has just started from.
 */
function markInUse(folder) {
  const now = new Date();
  try {
    utimesSync(folder, now, now);
  } catch {
    // Read-only install: nothing removes builds there either.
  }
}

/**
 * Other builds (and leftovers of interrupted ones) go once no run has used them for a few minutes:
 * a run of the command line that started from one may still start reading threads from its folder.
 */
function removeOldBuilds(current) {
  const now = Date.now();
  for (const old of readdirSync(CACHE)) {
    if (old === current || old === 'manifest.json') continue;
    const path = join(CACHE, old);
    try {
      if (now - statSync(path).mtimeMs > OLD_BUILD_MS) rmSync(path, { recursive: true, force: true });
    } catch {
      // Already removed by another run.
    }
  }
}

/** Several runs may make the same bundle at once: each writes its own file and renames it into place. */
function writeAtomically(path, text) {
  const temporary = `${path}.${process.pid}.tmp`;
  writeFileSync(temporary, text);
  renameSync(temporary, path);
}
